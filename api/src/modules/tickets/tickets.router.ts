// /api/tickets: thin handlers. Parse at the edge, call the service, send the result.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { intakeSchema, listQuerySchema, moveSchema, ticketPathParams } from './tickets.schemas';
import { getTicketDetail, listTickets, moveTicket, openTicket } from './tickets.service';

export function createTicketsRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router();
  router.use(requireSignedIn);

  router.post('/', requireRole('member', 'technician', 'admin'), async (req, res) => {
    const input = parseInput(intakeSchema, req.body);
    res.status(201).json(await openTicket(deps, currentUser(req), input));
  });

  router.get('/', async (req, res) => {
    const query = parseInput(listQuerySchema, req.query);
    res.json(await listTickets(deps, currentUser(req), query));
  });

  router.get('/:tag', async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    res.json(await getTicketDetail(deps, currentUser(req), { tag }));
  });

  router.post('/:tag/moves', requireRole('technician', 'admin'), async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const input = parseInput(moveSchema, req.body);
    res.json(await moveTicket(deps, currentUser(req), { tag, ...input }));
  });

  return router;
}
