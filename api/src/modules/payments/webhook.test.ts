// Paying online through the local fake, and the webhook route (reliability.md tests 18-20):
// signatures (valid, wrong secret, one byte changed, missing, stale, future), duplicates in
// sequence and at once, a second event for one payment, events out of order, a storm of events,
// and a retried payment creation after a timeout. Every case ends with one payment and one receipt.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import supertest from 'supertest';
import { addCharge, deliverTo, eventsOf, openTicket, payAtFake, paymentsWorld, type PaymentsWorld } from '../../../test/payments-fixtures';
import { anonymous, tableSnapshot } from '../../../test/helpers';
import { issueOwnerLink } from '../owner-links/owner-link-tokens';
import { parseTag } from '../tickets/tag';
import { startTicketCheckout } from './checkout.service';

let w: PaymentsWorld;
before(async () => {
  w = await paymentsWorld();
});
after(() => w.close());

type Event = { id: string; type: string; data: { object: { id: string } } };

async function receipts(tag: string): Promise<number> {
  const [row] = await w.t.sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM outbox WHERE kind = 'payment_receipt' AND ticket_id = :id", {
    replacements: { id: parseTag(tag) },
    type: QueryTypes.SELECT,
  });
  return Number(row!.n);
}

async function succeeded(tag: string): Promise<number> {
  const [row] = await w.t.sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM payments WHERE status = 'succeeded' AND ticket_id = :id", {
    replacements: { id: parseTag(tag) },
    type: QueryTypes.SELECT,
  });
  return Number(row!.n);
}

/** A member's ticket with a 500 diagnosis charge, its checkout paid at the fake: the events it made. */
async function paidTicket(): Promise<{ tag: string; events: Event[]; sessionId: string }> {
  const tag = await openTicket(w.member);
  await addCharge(w.tech, tag, { feeItemId: w.fees.diagnosis, quantity: 1 });
  const checkout = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
  assert.equal(checkout.status, 201, checkout.text);
  const paid = await payAtFake(w.fake, checkout.body.url);
  assert.equal(paid.status, 200, paid.text);
  const sessionId = checkout.body.url.split('/').pop();
  return { tag, events: eventsOf(w.fake, sessionId) as Event[], sessionId };
}

describe('paying a balance online', () => {
  it('the owner pays through the signed status link, with no account: balance shown, checkout made, paid once', async () => {
    const tag = await openTicket(w.member);
    const token = await w.t.sequelize.transaction((transaction) => issueOwnerLink(transaction, { purpose: 'status', ticketId: parseTag(tag)! }, new Date()));
    const owner = await anonymous(w.t.app);
    const zero = await owner.post(`/api/owner/status/${tag}/${token}/checkout`, {});
    assert.equal(zero.status, 422);
    assert.equal(zero.body.error.code, 'nothing_to_pay');
    await addCharge(w.tech, tag, { feeItemId: w.fees.diagnosis, quantity: 1 });
    const status = await owner.get(`/api/owner/status/${tag}/${token}`);
    assert.equal(status.status, 200, status.text);
    assert.ok(status.body.balanceDueMinor > 0, 'the status page shows what is owed');
    // A changed token is refused, and so is another ticket's tag with this token.
    assert.equal((await owner.post(`/api/owner/status/${tag}/${token.slice(0, -2)}xx/checkout`, {})).status, 404);
    const res = await owner.post(`/api/owner/status/${tag}/${token}/checkout`, {});
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.amount, status.body.balanceDueMinor);
    assert.match(res.body.url, /\/checkout\/cs_test_/);
    assert.equal((await payAtFake(w.fake, res.body.url)).status, 200);
    const sessionId = res.body.url.split('/').pop();
    for (const e of eventsOf(w.fake, sessionId) as Event[]) await deliverTo(w.t.app, e);
    assert.equal(await succeeded(tag), 1);
    assert.equal((await owner.get(`/api/owner/status/${tag}/${token}`)).body.balanceDueMinor, 0);
  });

  it('the owner gets a checkout for the whole balance; others may not; a zero balance cannot be paid', async () => {
    const tag = await openTicket(w.member);
    const before = await tableSnapshot(w.t.sequelize);
    const zero = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
    assert.equal(zero.status, 422);
    assert.equal(zero.body.error.code, 'nothing_to_pay');
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before, 'nothing stored for a zero balance');
    await addCharge(w.tech, tag, { feeItemId: w.fees.session, quantity: 1 });
    assert.equal((await w.otherMember.post(`/api/tickets/${tag}/ledger/checkout`, {})).status, 404);
    const res = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.amount, 300);
    assert.match(res.body.url, /\/checkout\/cs_test_/);
    // A second click while the balance is unchanged: the same checkout and the same payment.
    const again = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
    assert.equal(again.body.url, res.body.url);
    assert.equal(again.body.paymentId, res.body.paymentId);
  });

  it('a retried payment creation after a timeout creates one payment (the same idempotency key)', async () => {
    const tag = await openTicket(w.member);
    await addCharge(w.tech, tag, { feeItemId: w.fees.diagnosis, quantity: 1 });
    const deps = { sequelize: w.t.sequelize, clock: w.t.clock, config: { ...w.t.config, RW_STRIPE_TIMEOUT_MS: 300, RW_STRIPE_MAX_RETRIES: 2 } };
    w.fake.fake.delayNextResponse(900); // the fake does the work, then answers after the client gave up
    const back = { successUrl: 'http://127.0.0.1/ok', cancelUrl: 'http://127.0.0.1/no' };
    const first = await startTicketCheckout(deps, parseTag(tag)!, back);
    const second = await startTicketCheckout(deps, parseTag(tag)!, back);
    assert.equal(second.url, first.url, 'one checkout session');
    const [row] = await w.t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM payments WHERE ticket_id = :id', { replacements: { id: parseTag(tag) }, type: QueryTypes.SELECT });
    assert.equal(Number(row!.n), 1, 'one payment row');
  });

  it('the fake\'s events mark the payment received once, with one receipt mail, and settle the balance', async () => {
    const { tag, events } = await paidTicket();
    assert.deepEqual(events.map((e) => e.type).sort(), ['checkout.session.completed', 'payment_intent.succeeded']);
    for (const e of events) assert.equal((await deliverTo(w.t.app, e)).status, 200);
    assert.equal(await succeeded(tag), 1);
    assert.equal(await receipts(tag), 1);
    const ledger = (await w.member.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    assert.equal(ledger.balance, 0);
    assert.equal(ledger.payments[0].method, 'card');
    const detail = (await w.member.get(`/api/tickets/${tag}`).expect(200)).body;
    assert.equal(detail.events.filter((e: { kind: string }) => e.kind === 'payment_received').length, 1);
  });
});

describe('webhook signatures', () => {
  let event: Event;
  let tag = '';
  before(async () => {
    const p = await paidTicket();
    tag = p.tag;
    event = p.events.find((e) => e.type === 'checkout.session.completed')!;
  });
  const refused = async (res: supertest.Response, what: string) => {
    assert.equal(res.status, 400, `${what}: ${res.status} ${res.text}`);
    assert.equal(res.body.error.code, 'webhook_signature_invalid', what);
  };
  it('wrong secret, one byte changed, missing header, stale (301 s), future (301 s): 400, nothing stored', async () => {
    const before = await tableSnapshot(w.t.sequelize);
    await refused(await deliverTo(w.t.app, event, { secret: 'whsec_someone_elses_secret_000' }), 'wrong secret');
    await refused(await deliverTo(w.t.app, event, { mutate: (b) => b.replace('"paid"', '"pai_"') }), 'one byte changed');
    await refused(await supertest(w.t.app).post('/api/payments/webhook').set('Content-Type', 'application/json').send(JSON.stringify(event)), 'missing header');
    const now = Math.floor(Date.now() / 1000);
    await refused(await deliverTo(w.t.app, event, { at: now - 301 }), 'stale');
    await refused(await deliverTo(w.t.app, event, { at: now + 301 }), 'future');
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before);
    assert.equal(await succeeded(tag), 0);
  });
  it('valid (and no anti-forgery token needed): 200, paid', async () => {
    const res = await deliverTo(w.t.app, event);
    assert.equal(res.status, 200, res.text);
    assert.equal(res.body.outcome, 'paid');
    assert.equal(await succeeded(tag), 1);
  });
});

describe('duplicates and order', () => {
  it('the same event twice in sequence: one payment, one receipt', async () => {
    const { tag, events } = await paidTicket();
    const e = events.find((x) => x.type === 'checkout.session.completed')!;
    assert.equal((await deliverTo(w.t.app, e)).body.outcome, 'paid');
    assert.equal((await deliverTo(w.t.app, e)).body.outcome, 'duplicate');
    assert.equal(await succeeded(tag), 1);
    assert.equal(await receipts(tag), 1);
  });
  it('the same event ten times at once: one payment, one receipt', async () => {
    const { tag, events } = await paidTicket();
    const e = events.find((x) => x.type === 'payment_intent.succeeded')!;
    const answers = await Promise.all(Array.from({ length: 10 }, () => deliverTo(w.t.app, e)));
    assert.ok(answers.every((a) => a.status === 200), answers.map((a) => a.status).join(','));
    assert.equal(answers.filter((a) => a.body.outcome === 'paid').length, 1);
    assert.equal(await succeeded(tag), 1);
    assert.equal(await receipts(tag), 1);
  });
  it('a second event for the same payment, and events out of order (succeeded before completed, a late failure): one payment, never un-paid', async () => {
    const { tag, events } = await paidTicket();
    const pi = events.find((x) => x.type === 'payment_intent.succeeded')!;
    const session = events.find((x) => x.type === 'checkout.session.completed')!;
    assert.equal((await deliverTo(w.t.app, pi)).body.outcome, 'paid');
    assert.equal((await deliverTo(w.t.app, session)).body.outcome, 'already_paid');
    // A failure event for the same payment intent arriving late (as after a first declined card).
    const lateFailure = { ...pi, id: `${pi.id}_late_failure`, type: 'payment_intent.payment_failed', data: { object: { ...pi.data.object, status: 'requires_payment_method', last_payment_error: { message: 'Your card was declined.' } } } };
    assert.equal((await deliverTo(w.t.app, lateFailure)).body.outcome, 'already_paid');
    assert.equal(await succeeded(tag), 1);
    assert.equal(await receipts(tag), 1);
    const ledger = (await w.member.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    assert.equal(ledger.balance, 0);
  });
  it('a declined card, then a good one on the same checkout: pending, then paid once', async () => {
    const tag = await openTicket(w.member);
    await addCharge(w.tech, tag, { feeItemId: w.fees.session, quantity: 1 });
    const checkout = (await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {}).expect(201)).body;
    assert.equal((await payAtFake(w.fake, checkout.url, '4000000000000002')).status, 402);
    const sessionId = checkout.url.split('/').pop();
    for (const e of eventsOf(w.fake, sessionId)) assert.equal((await deliverTo(w.t.app, e)).body.outcome, 'failed');
    assert.equal(await succeeded(tag), 0);
    assert.equal((await payAtFake(w.fake, checkout.url)).status, 200);
    const outcomes = [];
    for (const e of eventsOf(w.fake, sessionId) as Event[]) outcomes.push((await deliverTo(w.t.app, e)).body.outcome);
    assert.deepEqual(outcomes.filter((o) => o === 'paid').length, 1);
    assert.equal(await succeeded(tag), 1);
    assert.equal(await receipts(tag), 1);
  });
});

describe('a storm of 1,000 events', () => {
  it('each sent up to three times, shuffled, 20 at a time: every charge paid exactly once, one receipt each', { timeout: 600_000 }, async () => {
    // 500 tickets × (checkout.session.completed + payment_intent.succeeded) = 1,000 events.
    const tags: string[] = [];
    const all: Event[] = [];
    const one = async (i: number) => {
      const tag = await openTicket(w.member, `Storm rig ${i}`);
      await addCharge(w.tech, tag, { feeItemId: w.fees.session, quantity: 1 });
      const checkout = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
      assert.equal(checkout.status, 201, checkout.text);
      assert.equal((await payAtFake(w.fake, checkout.body.url)).status, 200);
      all.push(...(eventsOf(w.fake, checkout.body.url.split('/').pop()) as Event[]));
      tags.push(tag);
    };
    for (let i = 0; i < 500; i += 10) await Promise.all(Array.from({ length: 10 }, (_, k) => one(i + k)));
    assert.equal(all.length, 1000);
    // Each event 1 to 3 times (seeded, so a failure can be replayed), shuffled (Fisher-Yates).
    let seed = 20261202;
    const random = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const sends = all.flatMap((e) => Array.from({ length: 1 + Math.floor(random() * 3) }, () => e));
    for (let i = sends.length - 1; i > 0; i--) {
      const j = Math.floor(random() * (i + 1));
      [sends[i], sends[j]] = [sends[j]!, sends[i]!];
    }
    for (let i = 0; i < sends.length; i += 20) {
      const answers = await Promise.all(sends.slice(i, i + 20).map((e) => deliverTo(w.t.app, e)));
      for (const a of answers) assert.equal(a.status, 200, a.text);
    }
    const rows = await w.t.sequelize.query<{ ticket_id: number; paid: number; receipts: number; allocated: number }>(
      `SELECT t.id AS ticket_id,
              (SELECT COUNT(*) FROM payments p WHERE p.ticket_id = t.id AND p.status = 'succeeded') AS paid,
              (SELECT COUNT(*) FROM outbox o WHERE o.ticket_id = t.id AND o.kind = 'payment_receipt') AS receipts,
              (SELECT COALESCE(SUM(a.amount), 0) FROM payment_allocations a JOIN charges c ON c.id = a.charge_id WHERE c.ticket_id = t.id) AS allocated
       FROM tickets t WHERE t.id IN (:ids)`,
      { replacements: { ids: tags.map((t) => parseTag(t)) }, type: QueryTypes.SELECT },
    );
    assert.equal(rows.length, 500);
    const wrong = rows.filter((r) => Number(r.paid) !== 1 || Number(r.receipts) !== 1 || Number(r.allocated) !== 300);
    assert.deepEqual(wrong, [], 'every charge paid exactly once, one receipt each');
  });
});
