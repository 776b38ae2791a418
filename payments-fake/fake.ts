// A local fake of the payment provider's HTTP API: the subset Rigwright calls through the official
// `stripe` SDK, with the provider's documented object shapes, so that development and tests never
// reach the real service. It keeps everything in memory (a restart forgets it), like a test double.
//
// What it follows (docs.stripe.com, API reference and guides):
// - Requests: form-encoded bodies with bracketed keys (`metadata[ticketId]=7`), the secret key as
//   a Bearer token; errors as `{ error: { type, code, message, param } }` with 4xx statuses
//   ("Errors", docs.stripe.com/api/errors).
// - Objects: checkout.session (docs.stripe.com/api/checkout/sessions/object), payment_intent
//   (/api/payment_intents/object), refund (/api/refunds/object), balance_transaction
//   (/api/balance_transactions/object), payout (/api/payouts/object), event (/api/events/object),
//   lists as `{ object: 'list', data, has_more, url }` with `limit` and `starting_after`
//   ("Pagination", /api/pagination). Amounts are integers in the smallest currency unit.
// - Idempotency ("Idempotent requests", docs.stripe.com/api/idempotent_requests): the first
//   response of a POST with an `Idempotency-Key` is saved and a retry with the same key gets it
//   back (header `Idempotent-Replayed: true`); the same key with other parameters is an
//   `idempotency_error` (400).
// - Test cards ("Testing", docs.stripe.com/testing): 4242 4242 4242 4242 succeeds; 4000 0000 0000
//   0002 is declined with `card_declined` / `generic_decline`; other numbers are refused as
//   `incorrect_number`.
// - Webhooks ("Check the webhook signatures", docs.stripe.com/webhooks#verify-manually): JSON
//   event POSTed with header `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of
//   "<t>.<body>" keyed with the endpoint secret>`; a delivery that does not get a 2xx is retried
//   with back-off, signed afresh (new timestamp) each time.
// - Payouts ("Payouts", docs.stripe.com/payouts): automatic daily payouts of the available
//   balance, net of the processing fees held back from each charge's balance transaction.
import express, { type NextFunction, type Request, type Response } from 'express';
import { createHmac, randomBytes } from 'node:crypto';
import { isDeepStrictEqual } from 'node:util';

export interface PaymentsFakeOptions {
  /** Where events are POSTed (the app's webhook route); none: events are only kept. */
  webhookUrl?: string;
  /** Endpoint signing secret shared with the app (whsec_...). */
  webhookSecret: string;
  /** The fake's own public base URL (for the hosted checkout page links). */
  publicUrl: string;
  /** Processing fee: percentage in basis points plus a fixed amount (UK standard cards: 150 bp + 20). */
  feePercentBasisPoints?: number;
  feeFixed?: number;
  /** Delivery attempts per event and the first retry delay (doubling). */
  maxDeliveryAttempts?: number;
  retryBaseMs?: number;
  /** Current time in ms (tests may move it). */
  now?: () => number;
  /** Set false to deliver events only when asked (POST /_fake/events/:id/deliver). */
  autoDeliver?: boolean;
}

type Json = Record<string, unknown>;

interface StoredIdempotent {
  fingerprint: unknown;
  status: number;
  body: unknown;
}

export interface DeliveryRecord {
  eventId: string;
  attempt: number;
  signature: string;
  status: number | null;
  at: number;
}

export const TEST_CARDS = {
  succeeds: '4242424242424242',
  declined: '4000000000000002',
} as const;

export interface PaymentsFake {
  app: express.Express;
  /** Pays out every available balance (what the daily run does); returns the payouts made. */
  runPayouts(): Json[];
  /** Delivers one stored event again (as the provider's "resend"); resolves to the HTTP status. */
  deliver(eventId: string): Promise<number | null>;
  events: Json[];
  deliveries: DeliveryRecord[];
  /** Delays the next API answer by `ms` after doing the work (to test a client timeout). */
  delayNextResponse(ms: number): void;
  /** Waits for deliveries in flight. */
  idle(): Promise<void>;
}

const id = (prefix: string) => `${prefix}_test_${randomBytes(12).toString('base64url').replace(/[-_]/g, 'x')}`;

/** The `Stripe-Signature` header value for `payload` signed at `timestamp` (seconds). */
export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${v1}`;
}

class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly code?: string,
    readonly param?: string,
    readonly extra: Json = {},
  ) {
    super(message);
  }
}

function int(value: unknown, param: string, { required = false, min = 0 } = {}): number | undefined {
  if (value === undefined || value === '') {
    if (required) throw new ApiError(400, 'invalid_request_error', `Missing required param: ${param}.`, 'parameter_missing', param);
    return undefined;
  }
  const s = String(value);
  if (!/^-?\d+$/.test(s)) throw new ApiError(400, 'invalid_request_error', `Invalid integer: ${s}`, 'parameter_invalid_integer', param);
  const n = Number(s);
  if (n < min) throw new ApiError(400, 'invalid_request_error', `This value must be greater than or equal to ${min}.`, 'parameter_invalid_integer', param);
  return n;
}

function str(value: unknown): string | undefined {
  return typeof value === 'string' ? value : undefined;
}

function metadataOf(value: unknown): Record<string, string> {
  if (!value || typeof value !== 'object') return {};
  return Object.fromEntries(Object.entries(value as Json).map(([k, v]) => [k, String(v)]));
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export function createPaymentsFake(options: PaymentsFakeOptions): PaymentsFake {
  const now = options.now ?? (() => Date.now());
  const seconds = () => Math.floor(now() / 1000);
  const feeBp = options.feePercentBasisPoints ?? 150;
  const feeFixed = options.feeFixed ?? 20;
  const maxAttempts = options.maxDeliveryAttempts ?? 5;
  const retryBaseMs = options.retryBaseMs ?? 1000;
  const autoDeliver = options.autoDeliver ?? true;

  const sessions = new Map<string, Json>();
  const intents = new Map<string, Json>();
  const charges = new Map<string, Json & { amount_refunded: number }>();
  const refunds = new Map<string, Json>();
  const balanceTransactions: (Json & { payout?: string | null })[] = [];
  const payouts: Json[] = [];
  const events: Json[] = [];
  const deliveries: DeliveryRecord[] = [];
  const idempotency = new Map<string, StoredIdempotent>();
  const inFlight = new Set<Promise<unknown>>();
  let delayNext = 0;

  const app = express();
  app.disable('x-powered-by');
  // The SDK sends bracketed keys (metadata[ticketId], line_items[0][price_data][currency]).
  app.set('query parser', 'extended');
  app.use(express.urlencoded({ extended: true, limit: '100kb' }));
  app.use(express.json({ limit: '100kb' }));

  function fee(amount: number): number {
    return Math.floor((amount * feeBp + 5000) / 10000) + feeFixed;
  }

  // ---- events and webhook delivery ------------------------------------------------------------
  function emit(type: string, object: Json, request: { id: string | null; idempotency_key: string | null } = { id: null, idempotency_key: null }): Json {
    const event: Json = {
      id: id('evt'),
      object: 'event',
      api_version: '2026-10-28.endive',
      created: seconds(),
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: options.webhookUrl ? 1 : 0,
      request,
      type,
    };
    events.push(event);
    if (options.webhookUrl && autoDeliver) track(deliverWithRetries(event));
    return event;
  }

  function track<T>(p: Promise<T>): Promise<T> {
    inFlight.add(p);
    void p.finally(() => inFlight.delete(p));
    return p;
  }

  async function deliverOnce(event: Json, attempt: number): Promise<number | null> {
    const payload = JSON.stringify(event, null, 2);
    // Signed afresh on every attempt: the timestamp is the time of this delivery.
    const signature = signatureHeader(payload, options.webhookSecret, seconds());
    let status: number | null = null;
    try {
      const res = await fetch(options.webhookUrl!, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json; charset=utf-8', 'Stripe-Signature': signature, 'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)' },
        body: payload,
        signal: AbortSignal.timeout(10_000),
      });
      status = res.status;
      await res.arrayBuffer();
    } catch {
      status = null;
    }
    deliveries.push({ eventId: String(event.id), attempt, signature, status, at: now() });
    return status;
  }

  async function deliverWithRetries(event: Json): Promise<void> {
    for (let attempt = 1; attempt <= maxAttempts; attempt++) {
      const status = await deliverOnce(event, attempt);
      if (status !== null && status >= 200 && status < 300) {
        event.pending_webhooks = 0;
        return;
      }
      if (attempt < maxAttempts) await new Promise((r) => setTimeout(r, retryBaseMs * 2 ** (attempt - 1)));
    }
  }

  // ---- the API ----------------------------------------------------------------------------------
  app.use('/v1', (req: Request, _res: Response, next: NextFunction) => {
    const auth = req.get('authorization') ?? '';
    if (!/^Bearer sk_(test|live)_\S+$/.test(auth)) {
      throw new ApiError(401, 'invalid_request_error', 'Invalid API Key provided. Set a secret key (sk_test_...).', 'api_key_invalid');
    }
    next();
  });

  /** Runs a POST handler once per idempotency key; replays its saved answer, refuses other parameters. */
  function idempotent(handler: (req: Request) => { status: number; body: unknown }) {
    return async (req: Request, res: Response) => {
      const key = req.get('idempotency-key');
      const fingerprint = { path: req.path, body: req.body ?? {} };
      const send = async (status: number, body: unknown, replayed: boolean) => {
        if (key) res.setHeader('Idempotency-Key', key);
        if (replayed) res.setHeader('Idempotent-Replayed', 'true');
        res.setHeader('Request-Id', `req_${randomBytes(8).toString('hex')}`);
        if (delayNext > 0) {
          const ms = delayNext;
          delayNext = 0;
          await new Promise((r) => setTimeout(r, ms));
        }
        res.status(status).json(body);
      };
      if (key) {
        const scoped = `${req.get('authorization')}\0${key}`;
        const stored = idempotency.get(scoped);
        if (stored) {
          if (!isDeepStrictEqual(stored.fingerprint, fingerprint)) {
            throw new ApiError(
              400,
              'idempotency_error',
              `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
            );
          }
          return send(stored.status, stored.body, true);
        }
        let result: { status: number; body: unknown };
        try {
          result = handler(req);
        } catch (err) {
          if (!(err instanceof ApiError)) throw err;
          result = { status: err.status, body: errorBody(err) };
        }
        idempotency.set(scoped, { fingerprint, ...result });
        return send(result.status, result.body, false);
      }
      const result = handler(req);
      return send(result.status, result.body, false);
    };
  }

  function list(req: Request, all: Json[], url: string): Json {
    const limit = Math.min(int(req.query.limit, 'limit', { min: 1 }) ?? 10, 100);
    const after = str(req.query.starting_after);
    let start = 0;
    if (after) {
      const i = all.findIndex((o) => o.id === after);
      start = i < 0 ? all.length : i + 1;
    }
    const data = all.slice(start, start + limit);
    return { object: 'list', data, has_more: start + limit < all.length, url };
  }

  function rangeFilter(value: unknown, field: string): (o: Json) => boolean {
    if (value === undefined) return () => true;
    if (typeof value === 'string') return (o) => o[field] === Number(value);
    const r = value as Record<string, string>;
    return (o) => {
      const v = Number(o[field]);
      if (r.gte !== undefined && !(v >= Number(r.gte))) return false;
      if (r.gt !== undefined && !(v > Number(r.gt))) return false;
      if (r.lte !== undefined && !(v <= Number(r.lte))) return false;
      if (r.lt !== undefined && !(v < Number(r.lt))) return false;
      return true;
    };
  }

  app.post(
    '/v1/checkout/sessions',
    idempotent((req) => {
      const b = req.body as Json;
      if (b.mode !== 'payment') throw new ApiError(400, 'invalid_request_error', 'This fake supports mode=payment only.', 'parameter_invalid_string', 'mode');
      const successUrl = str(b.success_url);
      if (!successUrl) throw new ApiError(400, 'invalid_request_error', 'Missing required param: success_url.', 'parameter_missing', 'success_url');
      const items = Array.isArray(b.line_items) ? (b.line_items as Json[]) : [];
      if (items.length === 0) throw new ApiError(400, 'invalid_request_error', 'Missing required param: line_items.', 'parameter_missing', 'line_items');
      let currency: string | undefined;
      let total = 0;
      items.forEach((item, i) => {
        const pd = (item.price_data ?? {}) as Json;
        const quantity = int(item.quantity, `line_items[${i}][quantity]`, { required: true, min: 1 })!;
        const unit = int(pd.unit_amount, `line_items[${i}][price_data][unit_amount]`, { required: true, min: 0 })!;
        const c = str(pd.currency)?.toLowerCase();
        if (!c) throw new ApiError(400, 'invalid_request_error', 'Missing required param: currency.', 'parameter_missing', `line_items[${i}][price_data][currency]`);
        currency ??= c;
        total += unit * quantity;
      });
      if (total < 30) throw new ApiError(400, 'invalid_request_error', 'The Checkout Session\'s total amount due must add up to at least 30 in the smallest currency unit.', 'amount_too_small');
      const sessionId = id('cs');
      const session: Json = {
        id: sessionId,
        object: 'checkout.session',
        amount_subtotal: total,
        amount_total: total,
        cancel_url: str(b.cancel_url) ?? null,
        client_reference_id: str(b.client_reference_id) ?? null,
        created: seconds(),
        currency,
        customer_email: str(b.customer_email) ?? null,
        expires_at: seconds() + 24 * 3600,
        livemode: false,
        metadata: metadataOf(b.metadata),
        mode: 'payment',
        payment_intent: null,
        payment_status: 'unpaid',
        status: 'open',
        success_url: successUrl,
        url: `${options.publicUrl.replace(/\/$/, '')}/checkout/${sessionId}`,
      };
      sessions.set(sessionId, session);
      return { status: 200, body: session };
    }),
  );

  app.get('/v1/checkout/sessions/:id', (req, res) => {
    const s = sessions.get(String(req.params.id));
    if (!s) throw new ApiError(404, 'invalid_request_error', `No such checkout.session: '${req.params.id}'`, 'resource_missing', 'id');
    res.json(s);
  });

  app.get('/v1/payment_intents/:id', (req, res) => {
    const pi = intents.get(String(req.params.id));
    if (!pi) throw new ApiError(404, 'invalid_request_error', `No such payment_intent: '${req.params.id}'`, 'resource_missing', 'id');
    res.json(pi);
  });

  app.post(
    '/v1/refunds',
    idempotent((req) => {
      const b = req.body as Json;
      const piId = str(b.payment_intent);
      const chargeId = str(b.charge) ?? (piId ? String(intents.get(piId)?.latest_charge ?? '') : undefined);
      const charge = chargeId ? charges.get(chargeId) : undefined;
      if (!charge) throw new ApiError(404, 'invalid_request_error', `No such payment_intent: '${piId ?? chargeId}'`, 'resource_missing', piId ? 'payment_intent' : 'charge');
      const remaining = Number(charge.amount) - charge.amount_refunded;
      if (remaining <= 0) throw new ApiError(400, 'invalid_request_error', `Charge ${charge.id} has already been refunded.`, 'charge_already_refunded');
      const amount = int(b.amount, 'amount', { min: 1 }) ?? remaining;
      if (amount > remaining) {
        throw new ApiError(400, 'invalid_request_error', `Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining})`, 'amount_too_large', 'amount');
      }
      charge.amount_refunded += amount;
      charge.refunded = charge.amount_refunded === Number(charge.amount);
      const refund: Json = {
        id: id('re'),
        object: 'refund',
        amount,
        balance_transaction: null,
        charge: charge.id,
        created: seconds(),
        currency: charge.currency,
        metadata: metadataOf(b.metadata),
        payment_intent: charge.payment_intent,
        reason: str(b.reason) ?? null,
        status: 'succeeded',
      };
      const txn = balanceTransaction('refund', -amount, 0, String(refund.id), String(charge.currency), `REFUND FOR CHARGE (${charge.id})`);
      refund.balance_transaction = txn.id;
      refunds.set(String(refund.id), refund);
      emit('refund.created', refund);
      emit('charge.refunded', charge);
      return { status: 200, body: refund };
    }),
  );

  app.get('/v1/refunds/:id', (req, res) => {
    const r = refunds.get(String(req.params.id));
    if (!r) throw new ApiError(404, 'invalid_request_error', `No such refund: '${req.params.id}'`, 'resource_missing', 'id');
    res.json(r);
  });

  app.get('/v1/balance_transactions', (req, res) => {
    let all = balanceTransactions.filter(rangeFilter(req.query.created, 'created'));
    if (req.query.payout) all = all.filter((t) => t.payout === req.query.payout && t.type !== 'payout');
    if (req.query.type) all = all.filter((t) => t.type === req.query.type);
    // Newest first, as the provider lists them.
    res.json(list(req, [...all].reverse().map(({ payout: _p, ...t }) => t), '/v1/balance_transactions'));
  });

  app.get('/v1/payouts', (req, res) => {
    const all = payouts.filter(rangeFilter(req.query.arrival_date, 'arrival_date')).filter(rangeFilter(req.query.created, 'created'));
    res.json(list(req, [...all].reverse(), '/v1/payouts'));
  });

  app.get('/v1/payouts/:id', (req, res) => {
    const p = payouts.find((x) => x.id === req.params.id);
    if (!p) throw new ApiError(404, 'invalid_request_error', `No such payout: '${req.params.id}'`, 'resource_missing', 'id');
    res.json(p);
  });

  function balanceTransaction(type: 'charge' | 'refund' | 'payout', amount: number, feeAmount: number, source: string, currency: string, description: string) {
    const txn = {
      id: id('txn'),
      object: 'balance_transaction',
      amount,
      available_on: seconds(),
      created: seconds(),
      currency,
      description,
      fee: feeAmount,
      fee_details: feeAmount ? [{ amount: feeAmount, application: null, currency, description: 'Stripe processing fees', type: 'stripe_fee' }] : [],
      net: amount - feeAmount,
      reporting_category: type,
      source,
      status: 'available',
      type,
      payout: null as string | null,
    };
    balanceTransactions.push(txn);
    return txn;
  }

  // ---- the hosted test checkout page -----------------------------------------------------------
  function pay(session: Json, cardNumber: string): { ok: true } | { ok: false; message: string; code: string } {
    if (session.status !== 'open') return { ok: false, message: 'This checkout has already been completed.', code: 'session_not_open' };
    const digits = cardNumber.replace(/[\s-]/g, '');
    const amount = Number(session.amount_total);
    const currency = String(session.currency);
    let pi = session.payment_intent ? intents.get(String(session.payment_intent)) : undefined;
    if (!pi) {
      pi = {
        id: id('pi'),
        object: 'payment_intent',
        amount,
        amount_received: 0,
        currency,
        created: seconds(),
        latest_charge: null,
        last_payment_error: null,
        livemode: false,
        metadata: session.metadata,
        status: 'requires_payment_method',
      };
      intents.set(String(pi.id), pi);
      session.payment_intent = pi.id;
    }
    if (digits === TEST_CARDS.declined) {
      pi.last_payment_error = { type: 'card_error', code: 'card_declined', decline_code: 'generic_decline', message: 'Your card was declined.' };
      emit('payment_intent.payment_failed', pi);
      return { ok: false, message: 'Your card was declined.', code: 'card_declined' };
    }
    if (digits !== TEST_CARDS.succeeds) {
      return { ok: false, message: 'Your card number is incorrect. Use a test card: 4242 4242 4242 4242 (succeeds) or 4000 0000 0000 0002 (declined).', code: 'incorrect_number' };
    }
    const chargeId = id('ch');
    const txn = balanceTransaction('charge', amount, fee(amount), chargeId, currency, `Checkout ${session.id}`);
    charges.set(chargeId, { id: chargeId, object: 'charge', amount, amount_refunded: 0, balance_transaction: txn.id, currency, payment_intent: pi.id, refunded: false, status: 'succeeded', created: seconds() });
    pi.status = 'succeeded';
    pi.amount_received = amount;
    pi.latest_charge = chargeId;
    pi.last_payment_error = null;
    session.status = 'complete';
    session.payment_status = 'paid';
    emit('payment_intent.succeeded', pi);
    emit('checkout.session.completed', session);
    return { ok: true };
  }

  function page(session: Json, error?: string): string {
    const amount = Number(session.amount_total);
    const currency = String(session.currency).toUpperCase();
    const shown = new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(amount / 10 ** (new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2));
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Test checkout</title><style>
:root{color-scheme:light dark;font-family:system-ui,sans-serif}body{margin:0;display:grid;place-items:center;min-height:100vh;background:Canvas;color:CanvasText}
main{width:min(420px,calc(100vw - 32px));border:1px solid GrayText;border-radius:12px;padding:24px}h1{font-size:1.25rem;margin:0 0 4px}
.amount{font-size:2rem;font-variant-numeric:tabular-nums;margin:8px 0 16px}.note{font-size:.9rem;opacity:.8}label{display:block;margin:12px 0 4px}
input{width:100%;box-sizing:border-box;font-size:1rem;padding:10px;border:1px solid GrayText;border-radius:6px}
button{margin-top:16px;width:100%;min-height:48px;font-size:1rem;border-radius:6px;border:0;background:#00677f;color:#fff;cursor:pointer}
.error{border:1px solid #b3261e;color:#b3261e;padding:8px;border-radius:6px;margin-top:12px}a{color:inherit}</style></head>
<body><main><h1>Test checkout</h1><p class="note">A local test double of the payment provider. No real card is charged.</p>
<div class="amount" data-testid="amount">${escapeHtml(shown)}</div>
<form method="post" action="/checkout/${escapeHtml(String(session.id))}">
<label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" required value="">
<label for="expiry">Expiry (MM / YY)</label><input id="expiry" name="expiry" value="12 / 34">
<label for="cvc">CVC</label><input id="cvc" name="cvc" value="123">
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ''}
<button type="submit">Pay ${escapeHtml(shown)}</button></form>
<p class="note">Test cards: 4242 4242 4242 4242 succeeds; 4000 0000 0000 0002 is declined.</p>
${session.cancel_url ? `<p><a href="${escapeHtml(String(session.cancel_url))}">Cancel and go back</a></p>` : ''}</main></body></html>`;
  }

  app.get('/checkout/:id', (req, res) => {
    const s = sessions.get(String(req.params.id));
    if (!s) return void res.status(404).type('text').send('No such checkout session.');
    if (s.status !== 'open') return void res.redirect(303, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)));
    res.type('html').send(page(s));
  });

  app.post('/checkout/:id', (req, res) => {
    const s = sessions.get(String(req.params.id));
    if (!s) return void res.status(404).type('text').send('No such checkout session.');
    const result = pay(s, String((req.body as Json)?.card ?? ''));
    if (!result.ok) return void res.status(402).type('html').send(page(s, result.message));
    res.redirect(303, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', String(s.id)));
  });

  // ---- payouts --------------------------------------------------------------------------------
  function runPayouts(): Json[] {
    const due = balanceTransactions.filter((t) => t.type !== 'payout' && !t.payout && t.status === 'available');
    const byCurrency = new Map<string, typeof due>();
    for (const t of due) byCurrency.set(String(t.currency), [...(byCurrency.get(String(t.currency)) ?? []), t]);
    const made: Json[] = [];
    for (const [currency, txns] of byCurrency) {
      const amount = txns.reduce((n, t) => n + Number(t.net), 0);
      if (amount <= 0) continue;
      const payoutId = id('po');
      const txn = balanceTransaction('payout', -amount, 0, payoutId, currency, 'STRIPE PAYOUT');
      const payout: Json = {
        id: payoutId,
        object: 'payout',
        amount,
        arrival_date: seconds(),
        automatic: true,
        balance_transaction: txn.id,
        created: seconds(),
        currency,
        description: 'STRIPE PAYOUT',
        livemode: false,
        metadata: {},
        method: 'standard',
        status: 'paid',
        type: 'bank_account',
      };
      for (const t of txns) t.payout = payoutId;
      txn.payout = payoutId;
      payouts.push(payout);
      made.push(payout);
      emit('payout.paid', payout);
    }
    return made;
  }

  // ---- controls of the fake (not part of the provider's API) ------------------------------------
  app.post('/_fake/payouts', (_req, res) => {
    res.json({ payouts: runPayouts() });
  });
  app.post('/_fake/checkout/:id/pay', (req, res) => {
    const s = sessions.get(String(req.params.id));
    if (!s) throw new ApiError(404, 'invalid_request_error', 'No such checkout session.', 'resource_missing');
    const r = pay(s, String((req.body as Json)?.card ?? ''));
    res.status(r.ok ? 200 : 402).json({ result: r, session: s });
  });
  app.post('/_fake/events/:id/deliver', async (req, res) => {
    res.json({ status: await deliver(String(req.params.id)) });
  });
  app.get('/_fake/events', (_req, res) => {
    res.json({ events, deliveries });
  });
  app.get('/_fake/health', (_req, res) => {
    res.json({ ok: true });
  });

  app.use((_req, _res, next) => next(new ApiError(404, 'invalid_request_error', 'Unrecognized request URL.', 'resource_missing')));
  app.use((err: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof ApiError) return void res.status(err.status).json(errorBody(err));
    const status = (err as { status?: number }).status;
    if (status && status < 500) return void res.status(status).json({ error: { type: 'invalid_request_error', message: 'The request could not be read.' } });
    res.status(500).json({ error: { type: 'api_error', message: 'The fake failed to answer.' } });
  });

  function errorBody(err: ApiError) {
    return { error: { type: err.type, message: err.message, ...(err.code ? { code: err.code } : {}), ...(err.param ? { param: err.param } : {}), ...err.extra } };
  }

  async function deliver(eventId: string): Promise<number | null> {
    const event = events.find((e) => e.id === eventId);
    if (!event || !options.webhookUrl) return null;
    const attempt = deliveries.filter((d) => d.eventId === eventId).length + 1;
    return track(deliverOnce(event, attempt));
  }

  return {
    app,
    runPayouts,
    deliver,
    events,
    deliveries,
    delayNextResponse(ms: number) {
      delayNext = ms;
    },
    async idle() {
      while (inFlight.size) await Promise.allSettled([...inFlight]);
    },
  };
}
