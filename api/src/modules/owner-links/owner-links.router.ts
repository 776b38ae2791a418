// /api/owner: the owner's pages behind a link from an e-mail; no account, so no role guard.
// The random token in the path is the key (stored hashed; see owner-link-tokens.ts). Protected by:
// the token (256 bits, single use for the decision, refused for another ticket or purpose, after
// expiry or once the ticket is closed), a per-address rate limit (express-rate-limit on the shared
// rate_limits table), and, on the two POSTs, the same anti-forgery token as every other mutating
// route (an anonymous visitor's XSRF-TOKEN cookie, echoed by the client in X-XSRF-TOKEN).
import { Router } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { AppDeps } from '../../deps';
import { AppError, parseInput } from '../../errors';
import { addressKey, SqlRateLimitStore } from '../auth/throttle';
import { decisionSchema, ownerLinkParams } from './owner-links.schemas';
import { ownerApproval, ownerCheckout, ownerDecides, ownerGivesConsent, ownerStatus } from './owner-links.service';

export function ownerLinkLimiter(deps: Pick<AppDeps, 'sequelize' | 'config'>) {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit: deps.config.RW_OWNER_LINK_MAX_PER_ADDRESS,
    keyGenerator: addressKey,
    standardHeaders: false,
    legacyHeaders: false,
    store: new SqlRateLimitStore(deps.sequelize, 'owner-link'),
    validate: { xForwardedForHeader: false },
    handler: (_req, res, next) => {
      res.setHeader('Retry-After', '900');
      next(new AppError(429, 'too_many_requests', 'Too many requests from here. Try the link again in 15 minutes.'));
    },
  });
}

/** Mounted at /api/owner. */
export function createOwnerLinksRouter(deps: Pick<AppDeps, 'sequelize' | 'config' | 'clock'>): Router {
  const router = Router();
  router.use(ownerLinkLimiter(deps));

  router.get('/status/:tag/:token', async (req, res) => {
    res.json(await ownerStatus(deps, parseInput(ownerLinkParams, req.params)));
  });

  router.post('/status/:tag/:token/consent', async (req, res) => {
    res.json(await ownerGivesConsent(deps, parseInput(ownerLinkParams, req.params)));
  });

  router.post('/status/:tag/:token/checkout', async (req, res) => {
    res.status(201).json(await ownerCheckout(deps, parseInput(ownerLinkParams, req.params)));
  });

  router.get('/approval/:tag/:token', async (req, res) => {
    res.json(await ownerApproval(deps, parseInput(ownerLinkParams, req.params)));
  });

  router.post('/approval/:tag/:token', async (req, res) => {
    const params = parseInput(ownerLinkParams, req.params);
    const input = parseInput(decisionSchema, req.body);
    res.json(await ownerDecides(deps, { ...params, ...input }));
  });

  return router;
}
