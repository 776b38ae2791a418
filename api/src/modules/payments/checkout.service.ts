// Paying online through the provider's official SDK, and the provider's webhooks.
//
// The SDK is configured with host, port and protocol from settings (RW_STRIPE_*): on this machine
// they point at the local fake (payments-fake/), in production at the provider. Each checkout
// carries an idempotency key made from the ticket and the state of its ledger, so a retried or
// repeated request (a double click, a timeout the SDK retries) makes one checkout and one payment.
//
// Webhooks: the raw body is verified with the SDK's webhooks.constructEvent (HMAC-SHA256 over
// "<t>.<body>", docs.stripe.com/webhooks#verify-manually) with a tolerance; a timestamp further
// in the future than the tolerance is refused as well (the SDK checks only the age). Each event id
// is stored once (a replay changes nothing), and a payment only ever moves pending → succeeded or
// pending → failed → succeeded: an event out of order never un-pays it.
import Stripe from 'stripe';
import { UniqueConstraintError } from 'sequelize';
import type { Config } from '../../config';
import type { AppDeps } from '../../deps';
import { AppError, ForbiddenError, NotFoundError, RuleError } from '../../errors';
import type { CheckoutDto } from '../../contracts/payments';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { Ticket } from '../tickets/ticket.model';
import { formatTag, parseTag } from '../tickets/tag';
import { Charge, Payment, Refund, Waiver, WebhookEvent } from './payments.model';
import { clubMoney, lockTicket, recordPaymentReceived, ticketBalance, type PaymentsDeps, type ProviderRefunds } from './ledger.service';

const clients = new Map<string, Stripe>();

/** One SDK client per configuration (host, port, protocol and key from settings). */
export function providerClient(config: Config): Stripe {
  const key = `${config.RW_STRIPE_SECRET_KEY}|${config.RW_STRIPE_HOST}|${config.RW_STRIPE_PORT}|${config.RW_STRIPE_PROTOCOL}|${config.RW_STRIPE_TIMEOUT_MS}|${config.RW_STRIPE_MAX_RETRIES}`;
  let client = clients.get(key);
  if (!client) {
    client = new Stripe(config.RW_STRIPE_SECRET_KEY, {
      host: config.RW_STRIPE_HOST,
      port: config.RW_STRIPE_PORT,
      protocol: config.RW_STRIPE_PROTOCOL,
      timeout: config.RW_STRIPE_TIMEOUT_MS,
      // The SDK retries timeouts and connection errors itself, with the same idempotency key.
      maxNetworkRetries: config.RW_STRIPE_MAX_RETRIES,
      telemetry: false,
    });
    clients.set(key, client);
  }
  return client;
}

export class ProviderUnavailableError extends AppError {
  constructor() {
    super(502, 'payment_provider_unavailable', 'The payment service did not answer. Nothing was charged; try again in a minute.');
  }
}

/**
 * The idempotency key of a checkout: the ticket and the ledger's state (counts of charges,
 * waivers, received payments and refunds, and the balance). The same state gives the same key, so
 * the provider answers a repeat with the checkout it already made; any change gives a new one.
 */
async function checkoutKey(ticketId: number, balance: number): Promise<string> {
  const [charges, waivers, paid, refunds] = await Promise.all([
    Charge.count({ where: { ticketId } }),
    Waiver.count({ include: [{ association: 'charge', where: { ticketId }, required: true }] }),
    Payment.count({ where: { ticketId, status: 'succeeded' } }),
    Refund.count({ include: [{ association: 'payment', where: { ticketId }, required: true }] }),
  ]);
  return `rw-checkout-${ticketId}-c${charges}-w${waivers}-p${paid}-r${refunds}-b${balance}`;
}

export interface CheckoutReturn {
  successUrl: string;
  cancelUrl: string;
  customerEmail?: string;
}

/**
 * Starts paying a ticket's whole balance online: one pending payment and one checkout session per
 * ledger state. The member's route calls it after checking ownership; the owner's signed status
 * link can call it too (with its own return addresses).
 */
export async function startTicketCheckout(deps: PaymentsDeps, ticketId: number, back: CheckoutReturn): Promise<CheckoutDto> {
  const { currency } = await clubMoney(deps.sequelize);
  const balance = await ticketBalance(ticketId);
  if (balance <= 0) throw new RuleError('nothing_to_pay', 'Nothing is owed on this ticket, so there is nothing to pay.');
  const key = await checkoutKey(ticketId, balance);
  const tag = formatTag(ticketId);

  const payment = await deps.sequelize.transaction(async (transaction) => {
    await lockTicket(ticketId, transaction);
    const existing = await Payment.findOne({ where: { idempotencyKey: key }, transaction });
    if (existing) return existing;
    return Payment.create(
      {
        ticketId,
        method: 'card',
        status: 'pending',
        amount: balance,
        currency,
        reference: null,
        idempotencyKey: key,
        checkoutSessionId: null,
        checkoutUrl: null,
        paymentIntentId: null,
        providerChargeId: null,
        failureMessage: null,
        receiptNumber: null,
        paidAt: null,
        ledgerMonth: null,
        recordedBy: null,
        createdAt: deps.clock(),
      },
      { transaction },
    );
  });
  if (payment.status === 'succeeded') throw new RuleError('nothing_to_pay', 'This balance has just been paid.');

  let session: Stripe.Checkout.Session;
  try {
    session = await providerClient(deps.config).checkout.sessions.create(
      {
        mode: 'payment',
        client_reference_id: String(payment.id),
        customer_email: back.customerEmail,
        line_items: [{ quantity: 1, price_data: { currency: currency.toLowerCase(), unit_amount: payment.amount, product_data: { name: `Bench fees for ${tag}` } } }],
        metadata: { paymentId: String(payment.id), ticketId: String(ticketId) },
        payment_intent_data: { metadata: { paymentId: String(payment.id), ticketId: String(ticketId) } },
        success_url: back.successUrl,
        cancel_url: back.cancelUrl,
      },
      { idempotencyKey: key },
    );
  } catch (err) {
    if (err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError) throw new ProviderUnavailableError();
    throw err;
  }
  if (!payment.checkoutSessionId) {
    payment.checkoutSessionId = session.id;
    payment.checkoutUrl = session.url;
    await payment.save();
  }
  return { paymentId: payment.id, url: session.url ?? '', amount: payment.amount, currency };
}

/** The member's own route: only the ticket's owner pays it online here. */
export async function startCheckoutForMember(deps: PaymentsDeps, user: SessionUser, input: { tag: string }): Promise<CheckoutDto> {
  const id = parseTag(input.tag);
  const ticket = id ? await Ticket.findByPk(id) : null;
  if (!ticket || (ticket.ownerUserId !== user.id && !hasRole(user, 'technician', 'treasurer', 'admin'))) {
    throw new NotFoundError(`There is no ticket ${input.tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  }
  if (ticket.ownerUserId !== user.id) throw new ForbiddenError('Only the owner pays a ticket online; record cash or a bank transfer instead.', 'not_owner');
  const page = `${deps.config.RW_PUBLIC_URL.replace(/\/$/, '')}/tickets/${formatTag(ticket.id)}`;
  return startTicketCheckout(deps, ticket.id, { successUrl: `${page}?payment=done`, cancelUrl: `${page}?payment=cancelled`, customerEmail: ticket.ownerEmail ?? undefined });
}

/** Card refunds at the provider through the SDK (idempotency key from the caller). */
export function providerRefunds(config: Config): ProviderRefunds {
  return {
    async refund(payment, amount, idempotencyKey) {
      if (!payment.paymentIntentId) throw new RuleError('refund_not_possible', 'This card payment has no provider record yet; wait for it to arrive and try again.');
      try {
        const refund = await providerClient(config).refunds.create({ payment_intent: payment.paymentIntentId, amount, metadata: { paymentId: String(payment.id) } }, { idempotencyKey });
        return refund.id;
      } catch (err) {
        if (err instanceof Stripe.errors.StripeInvalidRequestError) throw new RuleError('refund_refused', `The payment service refused the refund: ${err.message}`);
        if (err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError) throw new ProviderUnavailableError();
        throw err;
      }
    },
  };
}

// ---- webhooks ----------------------------------------------------------------------------------

export class WebhookSignatureError extends AppError {
  constructor(message: string) {
    super(400, 'webhook_signature_invalid', message);
  }
}

/** Verifies the signature and the timestamp (neither stale nor from the future) and parses the event. */
export function verifyWebhook(deps: Pick<AppDeps, 'config' | 'clock'>, rawBody: Buffer, header: string | undefined): Stripe.Event {
  if (!header) throw new WebhookSignatureError('The Stripe-Signature header is missing.');
  const tolerance = deps.config.RW_WEBHOOK_TOLERANCE_SECONDS;
  const nowMs = deps.clock().getTime();
  const t = Number(/(?:^|,)t=(\d+)/.exec(header)?.[1]);
  if (Number.isFinite(t) && t - Math.floor(nowMs / 1000) > tolerance) throw new WebhookSignatureError('The signature timestamp is in the future.');
  try {
    return Stripe.webhooks.constructEvent(rawBody, header, deps.config.RW_STRIPE_WEBHOOK_SECRET, tolerance, undefined, nowMs);
  } catch (err) {
    throw new WebhookSignatureError(`The webhook signature did not verify: ${(err as Error).message.split('\n')[0]}`);
  }
}

type Outcome = 'paid' | 'already_paid' | 'failed' | 'ignored' | 'unknown_payment' | 'duplicate';

interface PaymentLookup {
  paymentId?: number;
  sessionId?: string;
  paymentIntentId?: string;
}

async function findPayment(lookup: PaymentLookup, transaction: import('sequelize').Transaction): Promise<Payment | null> {
  if (lookup.sessionId) {
    const p = await Payment.findOne({ where: { checkoutSessionId: lookup.sessionId }, transaction });
    if (p) return p;
  }
  if (lookup.paymentIntentId) {
    const p = await Payment.findOne({ where: { paymentIntentId: lookup.paymentIntentId }, transaction });
    if (p) return p;
  }
  // The session's metadata names our payment (its id may not be saved yet when the event wins the race).
  if (lookup.paymentId) {
    const p = await Payment.findByPk(lookup.paymentId, { transaction });
    const sameSession = lookup.sessionId ? !p?.checkoutSessionId || p.checkoutSessionId === lookup.sessionId : true;
    const sameIntent = lookup.paymentIntentId ? !p?.paymentIntentId || p.paymentIntentId === lookup.paymentIntentId : true;
    if (p && p.method === 'card' && sameSession && sameIntent) return p;
  }
  return null;
}

/**
 * Handles one verified event. The event id row and the payment's change commit together: of two
 * deliveries of one event (in sequence or at the same moment) one inserts the row and the other
 * finds it, and of two events about one payment the second finds it already received.
 */
export async function handleWebhookEvent(deps: PaymentsDeps, event: Stripe.Event): Promise<Outcome> {
  const obj = event.data.object as unknown as Record<string, unknown>;
  const objectId = typeof obj.id === 'string' ? obj.id : null;
  const metadata = (obj.metadata ?? {}) as Record<string, string>;
  const paymentId = /^\d{1,10}$/.test(metadata.paymentId ?? '') ? Number(metadata.paymentId) : undefined;
  let lookup: PaymentLookup | null = null;
  let kind: 'succeeded' | 'failed' | null = null;
  let paymentIntentId: string | null = null;
  let providerChargeId: string | null = null;
  let failure: string | null = null;

  if (event.type === 'checkout.session.completed' || event.type === 'checkout.session.async_payment_succeeded') {
    const s = event.data.object as Stripe.Checkout.Session;
    if (s.payment_status === 'paid') kind = 'succeeded';
    paymentIntentId = typeof s.payment_intent === 'string' ? s.payment_intent : (s.payment_intent?.id ?? null);
    lookup = { sessionId: s.id, paymentIntentId: paymentIntentId ?? undefined, paymentId };
  } else if (event.type === 'payment_intent.succeeded' || event.type === 'payment_intent.payment_failed') {
    const pi = event.data.object as Stripe.PaymentIntent;
    kind = event.type === 'payment_intent.succeeded' ? 'succeeded' : 'failed';
    paymentIntentId = pi.id;
    providerChargeId = typeof pi.latest_charge === 'string' ? pi.latest_charge : (pi.latest_charge?.id ?? null);
    failure = pi.last_payment_error?.message ?? null;
    lookup = { paymentIntentId: pi.id, paymentId };
  }

  return deps.sequelize.transaction(async (transaction) => {
    let outcome: Outcome = 'ignored';
    try {
      await WebhookEvent.create({ eventId: event.id, type: event.type.slice(0, 60), objectId, outcome: 'received', receivedAt: deps.clock() }, { transaction });
    } catch (err) {
      if (err instanceof UniqueConstraintError) return 'duplicate';
      throw err;
    }
    if (lookup && kind) {
      const found = await findPayment(lookup, transaction);
      if (!found) {
        outcome = 'unknown_payment';
      } else {
        if (found.ticketId) await lockTicket(found.ticketId, transaction);
        const payment = (await Payment.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
        if (kind === 'succeeded') {
          const changed = await recordPaymentReceived(deps, transaction, payment, { actorId: null, paymentIntentId, providerChargeId });
          outcome = changed ? 'paid' : 'already_paid';
        } else if (payment.status === 'pending') {
          // A failed attempt: the checkout stays open for another card; a success later still counts.
          payment.failureMessage = (failure ?? 'The card was declined.').slice(0, 200);
          if (paymentIntentId && !payment.paymentIntentId) payment.paymentIntentId = paymentIntentId;
          await payment.save({ transaction });
          outcome = 'failed';
        } else {
          outcome = 'already_paid';
        }
      }
    }
    await WebhookEvent.update({ outcome }, { where: { eventId: event.id }, transaction });
    return outcome;
  });
}
