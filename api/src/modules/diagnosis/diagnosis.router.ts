// /api/tickets/:tag/diagnosis and /api/tickets/:tag/reflash-consent: bench records (technicians
// and admins). Guards sit on each route, so requests for other paths under the ticket pass by.
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { consentSchema, diagnosisSchema } from './diagnosis.schemas';
import { getDiagnosis, saveDiagnosis } from './diagnosis.service';
import { getConsent, recordConsent } from './reflash-consent.service';

const tagOf = (req: Request) => parseInput(ticketPathParams, req.params).tag;

/** Mounted at /api/tickets/:tag. */
export function createDiagnosisRouter(deps: Pick<AppDeps, 'sequelize' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  const bench = [requireSignedIn, requireRole('technician', 'admin')];

  router.get('/diagnosis', ...bench, async (req, res) => {
    res.json(await getDiagnosis(deps, currentUser(req), { tag: tagOf(req) }));
  });

  router.put('/diagnosis', ...bench, async (req, res) => {
    const tag = tagOf(req);
    const input = parseInput(diagnosisSchema, req.body);
    res.json(await saveDiagnosis(deps, currentUser(req), { tag, ...input }));
  });

  router.get('/reflash-consent', ...bench, async (req, res) => {
    res.json(await getConsent(deps, currentUser(req), { tag: tagOf(req) }));
  });

  router.post('/reflash-consent', ...bench, async (req, res) => {
    const tag = tagOf(req);
    const input = parseInput(consentSchema, req.body);
    res.status(201).json(await recordConsent(deps, currentUser(req), { tag, ...input }));
  });

  return router;
}
