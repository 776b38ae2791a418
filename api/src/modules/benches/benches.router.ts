// /api/benches: benches and their instruments, opening rules, the club's booking settings.
// Reading benches and settings: anyone signed in (the booking page needs them); changes: admins.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { requireRole, requireSignedIn } from '../auth/guards';
import { createBenchBody, createRuleBody, idParam, patchBenchBody, patchSettingsBody } from './benches.schemas';
import { createBench, createRule, deleteRule, listBenches, listRules, updateBench } from './benches.service';
import { readBookingSettings, updateBookingSettings } from './booking-settings';

export function createBenchesRouter(deps: Pick<AppDeps, 'sequelize'>): Router {
  const router = Router();
  const admin = requireRole('admin');

  router.get('/', requireSignedIn, async (_req, res) => {
    res.json(await listBenches());
  });
  router.post('/', admin, async (req, res) => {
    res.status(201).json(await createBench(parseInput(createBenchBody, req.body)));
  });

  router.get('/settings', requireSignedIn, async (_req, res) => {
    res.json(await readBookingSettings(deps.sequelize));
  });
  router.patch('/settings', admin, async (req, res) => {
    res.json(await updateBookingSettings(deps.sequelize, parseInput(patchSettingsBody, req.body)));
  });

  router.get('/opening-rules', admin, async (_req, res) => {
    res.json(await listRules());
  });
  router.post('/opening-rules', admin, async (req, res) => {
    res.status(201).json(await createRule(parseInput(createRuleBody, req.body)));
  });
  router.delete('/opening-rules/:ruleId', admin, async (req, res) => {
    const { ruleId } = parseInput(idParam('ruleId'), req.params) as { ruleId: number };
    await deleteRule(ruleId);
    res.status(204).end();
  });

  router.patch('/:benchId', admin, async (req, res) => {
    const { benchId } = parseInput(idParam('benchId'), req.params) as { benchId: number };
    res.json(await updateBench(benchId, parseInput(patchBenchBody, req.body)));
  });

  return router;
}
