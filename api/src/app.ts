// createApp(): middleware, routers and the central error handler. index.ts listens.
import express, { type NextFunction, type Request, type Response } from 'express';
import helmet from 'helmet';
import cookieParser from 'cookie-parser';
import { pinoHttp } from 'pino-http';
import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { appDeps, type AppDepsInit } from './deps';
import { AppError, NotFoundError, ValidationError } from './errors';
import { CalcInputError } from './domain/input-error';
import { clientErrorAnswer, jsonBodyOptions } from './client-errors';
import { permissionsPolicy } from './permissions-policy';
import { sessionMiddleware } from './modules/auth/session';
import { csrfProtection } from './modules/auth/csrf';
import { requireSignedIn } from './modules/auth/guards';
import { createAuthRouter } from './modules/auth/auth.router';
import { createUsersRouter } from './modules/users/users.router';
import { createTicketsRouter } from './modules/tickets/tickets.router';
import { createBoardRouter } from './modules/board/board.router';
import { calcRouter } from './modules/calc/calc.router';
import { createFirmwareRouter } from './modules/firmware/firmware.router';
import { createFlashAttemptsRouter } from './modules/firmware/flash-attempts.router';
import { createBenchesRouter } from './modules/benches/benches.router';
import { createBookingsRouter } from './modules/bookings/bookings.router';
import { createRepairRouter } from './modules/repair/repair.router';
import { createTestLimitsRouter, createTestSheetsRouter } from './modules/test-sheets/test-sheets.router';
import { createHandBackRouter } from './modules/hand-back/hand-back.router';
import { createDiagnosisRouter } from './modules/diagnosis/diagnosis.router';
import { createNotesRouter } from './modules/notes/notes.router';
import { createQuoteSettingsRouter, createQuotesRouter } from './modules/quotes/quotes.router';
import { createOwnerLinksRouter } from './modules/owner-links/owner-links.router';
import { createTechniciansRouter, createTicketMovesRouter } from './modules/moves/moves.router';
import { createBookingChargesRouter, createChargesRouter, createFeesRouter, createPaymentsRouter, createReconciliationRouter, createTicketLedgerRouter, WEBHOOK_PATH } from './modules/payments/payments.router';
import { createIntakeRouter } from './modules/intake/intake.router';
import { createPhotosRouter } from './modules/intake/photos.router';

export function createApp(init: AppDepsInit): express.Express {
  const deps = appDeps(init);
  const { config, logger } = deps;
  const app = express();
  app.disable('x-powered-by');
  // Rigwright is reached directly on loopback or behind one proxy configured by the admin;
  // never trust X-Forwarded-For by default (it would let anyone reset sign-in throttling).
  app.set('trust proxy', false);

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Angular Material sets inline styles at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'none'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'"],
        },
      },
      referrerPolicy: { policy: 'same-origin' },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use(permissionsPolicy);
  app.use(
    pinoHttp({
      logger,
      genReqId: (req, res) => {
        const id = randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      autoLogging: { ignore: (req) => !(req.url ?? '').startsWith('/api') },
      // One short line per request: no headers (cookies, tokens) and no query strings in the log.
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, path: req.url.split('?')[0] }),
        res: (res: { statusCode: number }) => ({ status: res.statusCode }),
      },
    }),
  );
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  // The provider's webhook is verified over its exact bytes: read raw, before the JSON parser.
  app.use(`/api${WEBHOOK_PATH}`, express.raw({ type: () => true, limit: '256kb' }));
  app.use(express.json(jsonBodyOptions));
  app.use(cookieParser());
  app.use('/api', sessionMiddleware(deps));
  app.use('/api', csrfProtection(deps));

  app.use('/api/auth', createAuthRouter(deps));
  app.use('/api/users', createUsersRouter(deps));
  app.use('/api/tickets/:tag/flash-attempts', createFlashAttemptsRouter(deps));
  app.use('/api/tickets/:tag/repair-log', createRepairRouter(deps));
  app.use('/api/tickets/:tag/test-sheets', createTestSheetsRouter(deps));
  app.use('/api/tickets/:tag/hand-back', createHandBackRouter(deps));
  app.use('/api/test-limits', createTestLimitsRouter(deps));
  app.use('/api/tickets/:tag/notes', createNotesRouter(deps));
  app.use('/api/tickets/:tag/quotes', createQuotesRouter(deps));
  app.use('/api/tickets/:tag', createDiagnosisRouter(deps));
  app.use('/api/tickets/:tag', createTicketMovesRouter(deps));
  app.use('/api/technicians', createTechniciansRouter());
  app.use('/api/tickets/:tag/ledger', createTicketLedgerRouter(deps));
  app.use('/api/tickets/:tag/photos', createPhotosRouter(deps));
  app.use('/api/tickets', createIntakeRouter(deps));
  app.use('/api/tickets', createTicketsRouter(deps));
  app.use('/api/club/quote-settings', createQuoteSettingsRouter(deps));
  app.use('/api/owner', createOwnerLinksRouter(deps));
  app.use('/api/board', createBoardRouter(deps));
  app.use('/api/calc', requireSignedIn, calcRouter);
  app.use('/api/firmware', createFirmwareRouter(deps));
  app.use('/api/benches', createBenchesRouter(deps));
  app.use('/api/bookings/:bookingId/charges', createBookingChargesRouter(deps));
  app.use('/api/bookings', createBookingsRouter(deps));
  app.use('/api/fees', createFeesRouter(deps));
  app.use('/api/charges', createChargesRouter(deps));
  app.use('/api/payments', createPaymentsRouter(deps));
  app.use('/api/reconciliation', createReconciliationRouter(deps));
  app.use('/api', (_req, _res, next) => next(new NotFoundError('No such API route.', 'route_not_found')));

  // The built client, with the single-page fallback for its routes.
  const dist = path.resolve(config.RW_CLIENT_DIST);
  if (config.RW_CLIENT_DIST && existsSync(path.join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(dist, 'index.html'));
    });
  }

  // Anything else (another method on a client path, or no client built): the same JSON 404.
  app.use((_req, _res, next) => next(new NotFoundError('Nothing here. Check the address.', 'not_found')));

  // Central error handler: one JSON shape, never a stack trace or SQL.
  app.use((err: unknown, req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof AppError) {
      res.status(err.status).json(err.toBody());
      return;
    }
    // A domain computation refused its input: 400 with the field named, like a schema's refusal.
    if (err instanceof CalcInputError) {
      res.status(400).json(new ValidationError(`${err.field}: ${err.message}`, { [err.field]: err.message }).toBody());
      return;
    }
    // Express, body-parser and friends: a status below 500 is the client's mistake and keeps it.
    const client = clientErrorAnswer(err);
    if (client) {
      res.status(client.status).json(client.body);
      return;
    }
    const e = err as { name?: string };
    if (e?.name?.startsWith('SequelizeConnection') || e?.name === 'SequelizeConnectionAcquireTimeoutError') {
      req.log?.error({ err }, 'database unavailable');
      res.status(503).json({ error: { code: 'database_unavailable', message: 'The database is not answering. Try again in a minute.' } });
      return;
    }
    req.log?.error({ err }, 'unhandled error');
    res.status(500).json({ error: { code: 'internal_error', message: 'Something went wrong on the server. Try again; if it keeps happening, tell a club officer.' } });
  });

  return app;
}
