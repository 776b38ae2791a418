// /api/tickets/:tag/quotes (read by whoever may see the ticket, written by the bench) and
// /api/club/quote-settings (the club's currency and approval threshold; admins change them).
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { ticketPathParams } from '../tickets/tickets.schemas';
import { quoteSettingsSchema, writeQuoteSchema } from './quotes.schemas';
import { listQuotes, writeQuote } from './quotes.service';
import { readQuoteSettings, updateQuoteSettings } from './quote-settings';

const tagOf = (req: Request) => parseInput(ticketPathParams, req.params).tag;

/** Mounted at /api/tickets/:tag/quotes. */
export function createQuotesRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);

  router.get('/', async (req, res) => {
    res.json(await listQuotes(deps, currentUser(req), { tag: tagOf(req) }));
  });

  router.post('/', requireRole('technician', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    const input = parseInput(writeQuoteSchema, req.body);
    res.status(201).json(await writeQuote(deps, currentUser(req), { tag, ...input }));
  });

  return router;
}

/** Mounted at /api/club/quote-settings. */
export function createQuoteSettingsRouter(deps: Pick<AppDeps, 'sequelize'>): Router {
  const router = Router();
  router.use(requireSignedIn);

  router.get('/', async (_req, res) => {
    res.json(await readQuoteSettings(deps.sequelize));
  });

  router.patch('/', requireRole('admin'), async (req, res) => {
    const patch = parseInput(quoteSettingsSchema, req.body);
    res.json(await updateQuoteSettings(deps.sequelize, patch));
  });

  return router;
}
