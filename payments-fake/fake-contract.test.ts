// The local fake against the provider's published behaviour, driven through the official SDK.
// Each check names the page it follows (docs.stripe.com). No database: the fake alone.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import Stripe from 'stripe';
import supertest from 'supertest';
import { startFake, type RunningFake } from '../api/test/payments-fixtures';
import { DEV_STRIPE_SECRET_KEY, DEV_STRIPE_WEBHOOK_SECRET } from '../api/src/config';
import { signatureHeader } from './fake';

let f: RunningFake;
let stripe: Stripe;

before(async () => {
  f = await startFake();
  stripe = new Stripe(DEV_STRIPE_SECRET_KEY, { host: '127.0.0.1', port: f.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
});
after(() => f.close());

const sessionParams = (amount: number): Stripe.Checkout.SessionCreateParams => ({
  mode: 'payment',
  line_items: [{ quantity: 1, price_data: { currency: 'gbp', unit_amount: amount, product_data: { name: 'Bench fees' } } }],
  metadata: { paymentId: '7' },
  success_url: 'http://127.0.0.1/tickets/RW-0001?payment=done',
  cancel_url: 'http://127.0.0.1/tickets/RW-0001?payment=cancelled',
});

describe('checkout sessions (docs.stripe.com/api/checkout/sessions/object)', () => {
  it('creates an open, unpaid session with integer amounts, the metadata and a hosted url', async () => {
    const s = await stripe.checkout.sessions.create(sessionParams(1237));
    assert.match(s.id, /^cs_test_/);
    assert.equal(s.object, 'checkout.session');
    assert.equal(s.amount_total, 1237);
    assert.equal(s.currency, 'gbp');
    assert.equal(s.status, 'open');
    assert.equal(s.payment_status, 'unpaid');
    assert.deepEqual(s.metadata, { paymentId: '7' });
    assert.match(s.url!, new RegExp(`/checkout/${s.id}$`));
    const again = await stripe.checkout.sessions.retrieve(s.id);
    assert.equal(again.id, s.id);
  });
  it('a missing session is a 404 resource_missing (docs.stripe.com/api/errors)', async () => {
    await assert.rejects(stripe.checkout.sessions.retrieve('cs_test_nope'), (e: unknown) => e instanceof Stripe.errors.StripeInvalidRequestError && e.code === 'resource_missing' && e.statusCode === 404);
  });
  it('a bad API key is refused with 401 (docs.stripe.com/api/authentication)', async () => {
    const res = await supertest(f.fake.app).get('/v1/payouts').set('Authorization', 'Bearer nonsense');
    assert.equal(res.status, 401);
  });
});

describe('idempotent requests (docs.stripe.com/api/idempotent_requests)', () => {
  it('the same key with the same parameters replays the saved response (Idempotent-Replayed: true)', async () => {
    const first = await stripe.checkout.sessions.create(sessionParams(900), { idempotencyKey: 'contract-replay' });
    const second = await stripe.checkout.sessions.create(sessionParams(900), { idempotencyKey: 'contract-replay' });
    assert.equal(second.id, first.id);
    assert.equal(second.lastResponse.headers['idempotent-replayed'], 'true');
  });
  it('the same key with different parameters is an idempotency_error (400)', async () => {
    await stripe.checkout.sessions.create(sessionParams(900), { idempotencyKey: 'contract-mismatch' });
    await assert.rejects(
      stripe.checkout.sessions.create(sessionParams(901), { idempotencyKey: 'contract-mismatch' }),
      (e: unknown) => e instanceof Stripe.errors.StripeIdempotencyError && e.statusCode === 400 && /same parameters/.test(e.message),
    );
  });
  it('a client timeout retried by the SDK with the same key makes one session', async () => {
    const retrying = new Stripe(DEV_STRIPE_SECRET_KEY, { host: '127.0.0.1', port: f.port, protocol: 'http', maxNetworkRetries: 2, timeout: 300, telemetry: false });
    const before = f.fake.events.length;
    f.fake.delayNextResponse(800); // the first answer comes after the client has given up
    const s = await retrying.checkout.sessions.create(sessionParams(1500), { idempotencyKey: 'contract-timeout' });
    const replay = await stripe.checkout.sessions.create(sessionParams(1500), { idempotencyKey: 'contract-timeout' });
    assert.equal(replay.id, s.id, 'one session for the key');
    assert.equal(f.fake.events.length, before, 'creating a session sends no event');
  });
});

describe('test cards (docs.stripe.com/testing)', () => {
  it('4242 4242 4242 4242 succeeds: session complete and paid, payment intent succeeded with a charge', async () => {
    const s = await stripe.checkout.sessions.create(sessionParams(1237));
    const res = await supertest(f.fake.app).post(`/checkout/${s.id}`).type('form').send({ card: '4242 4242 4242 4242' });
    assert.equal(res.status, 303);
    assert.equal(res.headers.location, s.success_url);
    const done = await stripe.checkout.sessions.retrieve(s.id);
    assert.equal(done.status, 'complete');
    assert.equal(done.payment_status, 'paid');
    const pi = await stripe.paymentIntents.retrieve(done.payment_intent as string);
    assert.equal(pi.status, 'succeeded');
    assert.equal(pi.amount_received, 1237);
    assert.match(String(pi.latest_charge), /^ch_test_/);
  });
  it('4000 0000 0000 0002 is declined (card_declined, generic_decline) and the session stays open', async () => {
    const s = await stripe.checkout.sessions.create(sessionParams(1237));
    const res = await supertest(f.fake.app).post(`/checkout/${s.id}`).type('form').send({ card: '4000000000000002' });
    assert.equal(res.status, 402);
    assert.match(res.text, /Your card was declined/);
    const still = await stripe.checkout.sessions.retrieve(s.id);
    assert.equal(still.status, 'open');
    const failed = f.fake.events.find((e) => e.type === 'payment_intent.payment_failed' && (e.data as { object: { id: string } }).object.id === still.payment_intent);
    assert.ok(failed, 'a payment_intent.payment_failed event');
    assert.equal(((failed!.data as { object: Stripe.PaymentIntent }).object.last_payment_error as { decline_code: string }).decline_code, 'generic_decline');
  });
  it('the hosted page shows the amount in the currency and the test card numbers', async () => {
    const s = await stripe.checkout.sessions.create(sessionParams(1237));
    const res = await supertest(f.fake.app).get(`/checkout/${s.id}`);
    assert.equal(res.status, 200);
    assert.match(res.text, /£12\.37/);
    assert.match(res.text, /4242 4242 4242 4242/);
  });
});

describe('webhook signatures (docs.stripe.com/webhooks#verify-manually)', () => {
  it('the fake signs t=<seconds>,v1=<HMAC-SHA256 of "t.payload"> and the SDK\'s own constructEvent verifies it', async () => {
    const s = await stripe.checkout.sessions.create(sessionParams(600));
    await supertest(f.fake.app).post(`/checkout/${s.id}`).type('form').send({ card: '4242424242424242' });
    const event = f.fake.events.find((e) => e.type === 'checkout.session.completed' && (e.data as { object: { id: string } }).object.id === s.id)!;
    const payload = JSON.stringify(event, null, 2);
    const header = signatureHeader(payload, DEV_STRIPE_WEBHOOK_SECRET, Math.floor(Date.now() / 1000));
    assert.match(header, /^t=\d+,v1=[0-9a-f]{64}$/);
    const verified = stripe.webhooks.constructEvent(payload, header, DEV_STRIPE_WEBHOOK_SECRET);
    assert.equal(verified.id, event.id);
    assert.equal(verified.type, 'checkout.session.completed');
    // The SDK's own test header for the same payload and time is the same string.
    const t = Number(/t=(\d+)/.exec(header)![1]);
    assert.equal(stripe.webhooks.generateTestHeaderString({ payload, secret: DEV_STRIPE_WEBHOOK_SECRET, timestamp: t }), header);
    assert.throws(() => stripe.webhooks.constructEvent(payload, header, 'whsec_another_secret_entirely'), Stripe.errors.StripeSignatureVerificationError);
  });
});

describe('refunds, balance transactions and payouts (docs.stripe.com/api/refunds, /api/balance_transactions, /api/payouts)', () => {
  it('pays out the available balance net of fees: amount = Σ net, net = amount − fee (1.5% + 20p)', async () => {
    const g = await startFake();
    const sdk = new Stripe(DEV_STRIPE_SECRET_KEY, { host: '127.0.0.1', port: g.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
    try {
      const paid: string[] = [];
      for (const amount of [1000, 1237]) {
        const s = await sdk.checkout.sessions.create(sessionParams(amount));
        await supertest(g.fake.app).post(`/checkout/${s.id}`).type('form').send({ card: '4242424242424242' });
        paid.push((await sdk.checkout.sessions.retrieve(s.id)).payment_intent as string);
      }
      const refund = await sdk.refunds.create({ payment_intent: paid[0], amount: 250 });
      assert.equal(refund.object, 'refund');
      assert.equal(refund.status, 'succeeded');
      await assert.rejects(sdk.refunds.create({ payment_intent: paid[0], amount: 751 }), (e: unknown) => e instanceof Stripe.errors.StripeInvalidRequestError && e.code === 'amount_too_large');
      await supertest(g.fake.app).post('/_fake/payouts').expect(200);
      const payouts = await sdk.payouts.list({ limit: 10 });
      assert.equal(payouts.data.length, 1);
      const payout = payouts.data[0]!;
      const txns = (await sdk.balanceTransactions.list({ payout: payout.id, limit: 100 })).data;
      // 1000: fee 15 + 20 = 35, net 965; 1237: fee 18.555 → 19 + 20 = 39, net 1198; refund −250, fee 0.
      assert.deepEqual(
        txns.map((t) => [t.type, t.amount, t.fee, t.net]).sort(),
        [
          ['charge', 1000, 35, 965],
          ['charge', 1237, 39, 1198],
          ['refund', -250, 0, -250],
        ].sort(),
      );
      assert.equal(payout.amount, 965 + 1198 - 250);
      assert.equal(payout.object, 'payout');
      assert.equal(payout.status, 'paid');
    } finally {
      await g.close();
    }
  });
});
