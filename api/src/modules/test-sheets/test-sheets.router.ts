// /api/tickets/:tag/test-sheets: test sheets and their PDF reports. Read by anyone who may see the
// ticket (its owner included); recorded by technicians and admins.
import { Router } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { tagOf } from '../repair/repair.router';
import { sheetPathParams, testLimitsPatchSchema, testSheetListSchema, testSheetSchema } from './test-sheets.schemas';
import { listTestSheets, saveTestSheet, testReportPdf } from './test-sheets.service';
import { readTestLimits, updateTestLimits } from './test-limits.service';

/** Mounted at /api/tickets/:tag/test-sheets. */
export function createTestSheetsRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);

  router.get('/', async (req, res) => {
    const tag = tagOf(req);
    res.json(await listTestSheets(deps, currentUser(req), tag, parseInput(testSheetListSchema, req.query)));
  });

  router.post('/', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await saveTestSheet(deps, currentUser(req), tag, parseInput(testSheetSchema, req.body)));
  });

  router.get('/:sheetId/report.pdf', async (req, res) => {
    const tag = tagOf(req);
    const { sheetId } = parseInput(sheetPathParams, { sheetId: req.params.sheetId });
    const { pdf, fileName } = await testReportPdf(deps, currentUser(req), tag, sheetId);
    res.attachment(fileName);
    res.type('application/pdf');
    res.set('Cache-Control', 'private, no-store');
    res.send(pdf);
  });

  return router;
}

/** /api/test-limits: the club's limits for test sheets; everyone signed in reads them, admins set them. */
export function createTestLimitsRouter(deps: Pick<AppDeps, 'sequelize' | 'clock'>): Router {
  const router = Router();
  router.use(requireSignedIn);
  router.get('/', async (_req, res) => {
    res.json(await readTestLimits());
  });
  router.patch('/', requireRole('admin'), async (req, res) => {
    res.json(await updateTestLimits(deps, currentUser(req), parseInput(testLimitsPatchSchema, req.body)));
  });
  return router;
}
