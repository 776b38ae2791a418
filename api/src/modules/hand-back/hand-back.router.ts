// /api/tickets/:tag/hand-back: the returned-items checklist. Read by anyone who may see the ticket;
// recorded by technicians and admins.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { tagOf } from '../repair/repair.router';
import { handBackSchema } from './hand-back.schemas';
import { getHandBack, recordHandBack } from './hand-back.service';

/** Mounted at /api/tickets/:tag/hand-back. */
export function createHandBackRouter(deps: Pick<AppDeps, 'sequelize' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);
  router.get('/', async (req, res) => {
    const tag = tagOf(req);
    res.json(await getHandBack(deps, currentUser(req), tag));
  });
  router.post('/', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await recordHandBack(deps, currentUser(req), tag, parseInput(handBackSchema, req.body)));
  });
  return router;
}
