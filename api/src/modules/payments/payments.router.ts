// Fees and payments: thin handlers. Parse at the edge, call a service, send the result.
// Mounted in app.ts: /api/fees, /api/tickets/:tag/ledger, /api/charges, /api/payments (the
// provider's webhook included, with its raw body), /api/reconciliation, /api/bookings/:bookingId/charges.
import { Router, type Request } from 'express';
import type { AppDeps } from '../../deps';
import { parseInput, ValidationError } from '../../errors';
import { currentUser, requireRole, requireSignedIn } from '../auth/guards';
import { csrfExemptPaths } from '../auth/csrf';
import { ticketPathParams } from '../tickets/tickets.schemas';
import {
  bookingPathParams,
  chargePathParams,
  chargeSchema,
  checkoutSchema,
  createFeeSchema,
  feePathParams,
  feePriceSchema,
  monthPathParams,
  offlinePaymentSchema,
  paymentPathParams,
  refundSchema,
  waiverSchema,
} from './payments.schemas';
import { addFeePrice, createFeeItem, feeSchedule } from './fees.service';
import { addBookingCharge, addTicketCharge, getBookingLedger, getTicketLedger, receiptPdfFor, recordOfflinePayment, refundPayment, waiveCharge } from './ledger.service';
import { handleWebhookEvent, providerRefunds, startCheckoutForMember, verifyWebhook } from './checkout.service';
import { closeMonth, monthCsv, reconcileMonth } from './reconciliation.service';

type Deps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

/** The webhook's path under /api: exempt from the anti-forgery check (it is signed instead). */
export const WEBHOOK_PATH = '/payments/webhook';
csrfExemptPaths.add(WEBHOOK_PATH);

export function createFeesRouter(deps: Deps): Router {
  const router = Router();
  router.use(requireSignedIn);
  router.get('/', async (_req, res) => {
    res.json(await feeSchedule(deps));
  });
  router.post('/', requireRole('treasurer'), async (req, res) => {
    res.status(201).json(await createFeeItem(deps, currentUser(req), parseInput(createFeeSchema, req.body)));
  });
  router.post('/:feeId/prices', requireRole('treasurer'), async (req, res) => {
    const { feeId } = parseInput(feePathParams, req.params);
    res.status(201).json(await addFeePrice(deps, currentUser(req), { feeId, ...parseInput(feePriceSchema, req.body) }));
  });
  return router;
}

/** Mounted at /api/tickets/:tag/ledger. */
export function createTicketLedgerRouter(deps: Deps): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);
  const tagOf = (req: Request) => parseInput(ticketPathParams, { tag: (req.params as Record<string, string>).tag }).tag;
  router.get('/', async (req, res) => {
    res.json(await getTicketLedger(deps, currentUser(req), { tag: tagOf(req) }));
  });
  router.post('/charges', requireRole('technician', 'treasurer', 'admin'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await addTicketCharge(deps, currentUser(req), { tag, ...parseInput(chargeSchema, req.body) }));
  });
  router.post('/payments', requireRole('treasurer'), async (req, res) => {
    const tag = tagOf(req);
    res.status(201).json(await recordOfflinePayment(deps, currentUser(req), { tag, ...parseInput(offlinePaymentSchema, req.body) }));
  });
  // The owner pays online (members only here; the owner's signed status link calls startTicketCheckout).
  router.post('/checkout', requireRole('member'), async (req, res) => {
    const tag = tagOf(req);
    parseInput(checkoutSchema, req.body ?? {});
    res.status(201).json(await startCheckoutForMember(deps, currentUser(req), { tag }));
  });
  return router;
}

export function createChargesRouter(deps: Deps): Router {
  const router = Router();
  router.use(requireSignedIn);
  router.post('/:chargeId/waivers', requireRole('treasurer'), async (req, res) => {
    const { chargeId } = parseInput(chargePathParams, req.params);
    res.status(201).json(await waiveCharge(deps, currentUser(req), { chargeId, ...parseInput(waiverSchema, req.body) }));
  });
  return router;
}

/** Mounted at /api/payments; app.ts reads the webhook's body raw (express.raw) before the JSON parser. */
export function createPaymentsRouter(deps: Deps): Router {
  const router = Router();
  router.post('/webhook', async (req, res) => {
    if (!Buffer.isBuffer(req.body)) throw new ValidationError('The webhook body could not be read.');
    const event = verifyWebhook(deps, req.body, req.get('stripe-signature'));
    const outcome = await handleWebhookEvent(deps, event);
    res.json({ received: true, outcome });
  });
  router.post('/:paymentId/refunds', requireRole('treasurer'), async (req, res) => {
    const { paymentId } = parseInput(paymentPathParams, req.params);
    res.status(201).json(await refundPayment(deps, currentUser(req), { paymentId, ...parseInput(refundSchema, req.body) }, providerRefunds(deps.config)));
  });
  router.get('/:paymentId/receipt.pdf', requireSignedIn, async (req, res) => {
    const { paymentId } = parseInput(paymentPathParams, req.params);
    const { filename, bytes } = await receiptPdfFor(deps, currentUser(req), { paymentId });
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
    res.send(bytes);
  });
  return router;
}

export function createReconciliationRouter(deps: Deps): Router {
  const router = Router();
  router.use(requireSignedIn, requireRole('treasurer'));
  router.get('/:month', async (req, res) => {
    res.json(await reconcileMonth(deps, currentUser(req), parseInput(monthPathParams, req.params)));
  });
  router.get('/:month/csv', async (req, res) => {
    const input = parseInput(monthPathParams, req.params);
    const csv = await monthCsv(deps, currentUser(req), input);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="rigwright-${input.month}.csv"`);
    res.send(csv);
  });
  router.post('/:month/close', async (req, res) => {
    res.json(await closeMonth(deps, currentUser(req), parseInput(monthPathParams, req.params)));
  });
  return router;
}

/** Mounted at /api/bookings/:bookingId/charges. */
export function createBookingChargesRouter(deps: Deps): Router {
  const router = Router({ mergeParams: true });
  router.use(requireSignedIn);
  const idOf = (req: Request) => parseInput(bookingPathParams, { bookingId: (req.params as Record<string, string>).bookingId }).bookingId;
  router.get('/', async (req, res) => {
    res.json(await getBookingLedger(deps, currentUser(req), { bookingId: idOf(req) }));
  });
  router.post('/', requireRole('technician', 'treasurer', 'admin'), async (req, res) => {
    const bookingId = idOf(req);
    res.status(201).json(await addBookingCharge(deps, currentUser(req), { bookingId, ...parseInput(chargeSchema, req.body) }));
  });
  return router;
}
