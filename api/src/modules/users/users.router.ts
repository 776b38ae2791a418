// /api/users: the admin's accounts list and changes. Every route requires the admin role.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole } from '../auth/guards';
import { createUserBody, listUsersQuery, patchUserBody, userIdParam } from './users.schemas';
import { createUserByAdmin, listUsers, patchUser } from './users.service';

export function createUsersRouter(deps: Pick<AppDeps, 'config' | 'sequelize'>): Router {
  const router = Router();
  router.use(requireRole('admin'));

  router.get('/', async (req, res) => {
    res.json(await listUsers(deps, currentUser(req), parseInput(listUsersQuery, req.query)));
  });

  router.post('/', async (req, res) => {
    const body = parseInput(createUserBody, req.body);
    const row = await createUserByAdmin(deps, currentUser(req), { ...body, callSign: body.callSign ?? null });
    req.log?.info({ event: 'account_created', by: currentUser(req).id, userId: row.id, roles: row.roles }, 'account created');
    res.status(201).json(row);
  });

  router.patch('/:id', async (req, res) => {
    const { id } = parseInput(userIdParam, req.params);
    const patch = parseInput(patchUserBody, req.body);
    const row = await patchUser(deps, currentUser(req), { id, ...patch });
    req.log?.info({ event: 'account_changed', by: currentUser(req).id, userId: id, fields: Object.keys(patch) }, 'account changed');
    res.json(row);
  });

  return router;
}
