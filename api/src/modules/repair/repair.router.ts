// /api/tickets/:tag/repair-log: work and parts on a ticket. Read by technicians, treasurers (parts
// at cost) and admins; recorded by technicians and admins. Members never see the bench's log.
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { partSchema, repairLogQuerySchema, workSchema } from './repair.schemas';
import { addPart, addWork, listRepairLog } from './repair.service';

/** Mounted at /api/tickets/:tag/repair-log. */
export function createRepairRouter(deps: Pick<AppDeps, 'sequelize' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);

  router.get('/', requireRole('technician', 'treasurer', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.json(await listRepairLog(deps, currentUser(req), tag, parseInput(repairLogQuerySchema, req.query)));
  });

  router.post('/work', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await addWork(deps, currentUser(req), tag, parseInput(workSchema, req.body)));
  });

  router.post('/parts', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await addPart(deps, currentUser(req), tag, parseInput(partSchema, req.body)));
  });

  return router;
}

/** The ticket's tag from the mount path (mergeParams), checked like GET /api/tickets/:tag. */
export function tagOf(req: Request): string {
  return parseInput(ticketPathParams, { tag: String((req.params as Record<string, unknown>).tag ?? '') }).tag;
}
