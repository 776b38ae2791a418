// /api/tickets: thin handlers. Parse at the edge, call the service, send the result.
import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import type { Config } from '../../config';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { intakeSchema, listQuerySchema, moveSchema, ticketPathParams } from './tickets.schemas';
import { getTicketDetail, listTickets, moveTicket, openTicket } from './tickets.service';

export interface TicketsRouterDeps {
  sequelize: Sequelize;
  config: Config;
}

export function createTicketsRouter(deps: TicketsRouterDeps): Router {
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
    res.json(await getTicketDetail(deps, currentUser(req), tag));
  });

  router.post('/:tag/moves', requireRole('technician', 'admin'), async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const input = parseInput(moveSchema, req.body);
    res.json(await moveTicket(deps, currentUser(req), tag, input));
  });

  return router;
}
