// Routes of the moves module: undo a move, the parts-on-order flag, technician assignment (under
// /api/tickets/:tag), and the technicians a ticket can be given to (/api/technicians). Thin
// handlers: parse at the edge, call the service, send the result.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole } from '../auth/guards';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { assignSchema, partsOnOrderSchema, undoPathParams, undoSchema } from './moves.schemas';
import { assignTechnician, listTechnicians, setPartsOnOrder, undoMove } from './moves.service';

/** Mounted at /api/tickets/:tag (mergeParams). */
export function createTicketMovesRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  const bench = requireRole('technician', 'admin');

  router.post('/moves/:eventId/undo', bench, async (req, res) => {
    const { tag, eventId } = parseInput(undoPathParams, req.params);
    const { version } = parseInput(undoSchema, req.body);
    res.json(await undoMove(deps, currentUser(req), { tag, eventId, version }));
  });

  router.post('/parts-on-order', bench, async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const input = parseInput(partsOnOrderSchema, req.body);
    res.json(await setPartsOnOrder(deps, currentUser(req), { tag, ...input }));
  });

  router.post('/technician', bench, async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const input = parseInput(assignSchema, req.body);
    res.json(await assignTechnician(deps, currentUser(req), { tag, ...input }));
  });

  return router;
}

/** Mounted at /api/technicians. */
export function createTechniciansRouter(): Router {
  const router = Router();
  router.get('/', requireRole('technician', 'admin'), async (req, res) => {
    res.json({ items: await listTechnicians(currentUser(req)) });
  });
  return router;
}
