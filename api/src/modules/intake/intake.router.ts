// Intake routes beside /api/tickets: the member search for hand-in at the bench, intake edits and
// the intake tag PDF. Thin handlers: parse at the edge, call the service, send the result.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { intakeEditSchema, ownerSearchSchema, ticketPathParams } from '../tickets/tickets.schemas';
import { editIntake, intakeTagOf, searchOwners } from './intake.service';

/** Mounted at /api/tickets, before the tickets router (so /owners is not read as a tag). */
export function createIntakeRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router();

  router.get('/owners', requireSignedIn, requireRole('technician', 'admin'), async (req, res) => {
    const { q } = parseInput(ownerSearchSchema, req.query);
    res.json(await searchOwners(currentUser(req), q));
  });

  router.patch('/:tag/intake', requireSignedIn, requireRole('technician', 'admin'), async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const input = parseInput(intakeEditSchema, req.body);
    res.json(await editIntake(deps, currentUser(req), { tag, ...input }));
  });

  // Anyone who may see the ticket: its owner, technicians, treasurers and admins (others: 404).
  router.get('/:tag/intake-tag.pdf', requireSignedIn, async (req, res) => {
    const { tag } = parseInput(ticketPathParams, req.params);
    const { pdf, fileName } = await intakeTagOf(deps, currentUser(req), tag);
    res.setHeader('Cache-Control', 'private, no-store');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    // inline: the browser's PDF viewer opens it for printing; the name is ours, never the user's.
    res.setHeader('Content-Disposition', `inline; filename="${fileName}"`);
    res.type('application/pdf').send(pdf);
  });

  return router;
}
