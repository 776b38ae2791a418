// Reconciliation worked example (issue 11): a month with card payments, a refund, a cash payment and
// two payouts reconciles, and a deliberately missing payment (its webhook never arrived) shows as
// unmatched. Fees are the local fake's 1.5% + 20p, rounded half up (api/src/domain/money.ts).
// Then closing a month: later corrections land in the next month as adjustments.
import { after, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import supertest from 'supertest';
import { createTestClock } from '../../../test/helpers';
import { addCharge, deliverTo, eventsOf, openTicket, payAtFake, paymentsWorld, type PaymentsWorld } from '../../../test/payments-fixtures';
import { csvCell } from './reconciliation.service';

const worlds: PaymentsWorld[] = [];
after(async () => {
  for (const w of worlds.reverse()) await w.close();
});

async function payOnline(w: PaymentsWorld, tag: string, deliver = true): Promise<void> {
  const checkout = await w.member.post(`/api/tickets/${tag}/ledger/checkout`, {});
  assert.equal(checkout.status, 201, checkout.text);
  assert.equal((await payAtFake(w.fake, checkout.body.url)).status, 200);
  if (deliver) for (const e of eventsOf(w.fake, checkout.body.url.split('/').pop())) assert.equal((await deliverTo(w.t.app, e)).status, 200);
}

describe('a month reconciled (worked example)', () => {
  it('payments matched to charges, payouts to payments with fees, one missing payment unmatched, totals, CSV', async () => {
    const w = await paymentsWorld();
    worlds.push(w);
    const month = new Date().toISOString().slice(0, 7);

    // A: diagnosis 500 by card. Fee 500 × 1.5% = 7.5 → 8, + 20 = 28; net 472.
    const a = await openTicket(w.member, 'Ticket A');
    await addCharge(w.tech, a, { feeItemId: w.fees.diagnosis, quantity: 1 });
    await payOnline(w, a);
    // B: labour 1 h 1200 + session 300 = 1500 by card. Fee 22.5 → 23, + 20 = 43; net 1457. Then 300 refunded.
    const b = await openTicket(w.member, 'Ticket B');
    await addCharge(w.tech, b, { feeItemId: w.fees.labour, quantity: 1 });
    await addCharge(w.tech, b, { feeItemId: w.fees.session, quantity: 1 });
    await payOnline(w, b);
    const bLedger = (await w.treasurer.get(`/api/tickets/${b}/ledger`).expect(200)).body;
    const refund = await w.treasurer.post(`/api/payments/${bLedger.payments[0].id}/refunds`, { amount: 300, reason: 'Session not used: the bench was closed.' });
    assert.equal(refund.status, 201, refund.text);
    // C: session 300 in cash, with a reference a spreadsheet would read as a formula.
    const c = await openTicket(w.member, 'Ticket C');
    await addCharge(w.tech, c, { feeItemId: w.fees.session, quantity: 1 });
    await w.treasurer.post(`/api/tickets/${c}/ledger/payments`, { method: 'cash', amount: 300, reference: '=1+1 cash book 14' }).expect(201);
    // Payout 1: 472 + 1457 − 300 = 1629.
    const p1 = (await supertest(w.fake.fake.app).post('/_fake/payouts').expect(200)).body.payouts;
    assert.equal(p1[0].amount, 1629);
    // D: diagnosis 500 paid at the provider, but its events never reach us (the missing payment).
    const d = await openTicket(w.member, 'Ticket D');
    await addCharge(w.tech, d, { feeItemId: w.fees.diagnosis, quantity: 1 });
    await payOnline(w, d, false);
    // E: diagnosis 500 by card, delivered. Payout 2: 472 (D) + 472 (E) = 944.
    const e = await openTicket(w.member, 'Ticket E');
    await addCharge(w.tech, e, { feeItemId: w.fees.diagnosis, quantity: 1 });
    await payOnline(w, e);
    const p2 = (await supertest(w.fake.fake.app).post('/_fake/payouts').expect(200)).body.payouts;
    assert.equal(p2[0].amount, 944);

    const r = (await w.treasurer.get(`/api/reconciliation/${month}`).expect(200)).body;
    assert.equal(r.providerError, null);
    assert.equal(r.payments.length, 4, 'A, B, C and E; D never arrived');
    assert.ok(r.payments.every((p: { matched: boolean }) => p.matched), 'every payment matched to its charges');
    assert.deepEqual(r.payments.map((p: { ticketTag: string; amount: number; payoutId: string | null }) => [p.ticketTag, p.amount, p.payoutId !== null]), [
      [a, 500, true],
      [b, 1500, true],
      [c, 300, false],
      [e, 500, true],
    ]);
    const [first, second] = [...r.payouts].sort((x: { amount: number }, y: { amount: number }) => y.amount - x.amount);
    assert.deepEqual([first.amount, first.gross, first.fees, first.itemsNet, first.addsUp], [1629, 1700, 71, 1629, true]);
    assert.deepEqual([second.amount, second.gross, second.fees, second.itemsNet, second.addsUp], [944, 1000, 56, 944, false]);
    assert.deepEqual(
      r.problems.map((p: { kind: string; amount: number }) => [p.kind, p.amount]),
      [['provider_payment_unknown', 500]],
      'only the missing payment is unmatched',
    );
    assert.deepEqual(r.totalsByMethod, [
      { method: 'card', received: 2500, refunded: 300, net: 2200 },
      { method: 'cash', received: 300, refunded: 0, net: 300 },
      { method: 'bank_transfer', received: 0, refunded: 0, net: 0 },
    ]);
    assert.deepEqual(
      r.totalsByFeeItem.map((t: { name: string; charged: number; waived: number }) => [t.name, t.charged, t.waived]),
      [
        ['Bench session', 600, 0],
        ['Diagnosis', 1500, 0],
        ['Labour', 1200, 0],
      ],
    );
    // Received 2800, refunded 300, provider fees 28 + 43 + 28 + 28 = 127 (D's included: it is in a payout).
    assert.deepEqual(r.totals, { received: 2800, refunded: 300, fees: 127, paidOut: 2573, net: 2373 });
    const today = r.daily.find((x: { date: string }) => x.date === new Date().toISOString().slice(0, 10));
    assert.deepEqual([today.card, today.cash], [2200, 300]);

    const csv = await w.treasurer.get(`/api/reconciliation/${month}/csv`).expect(200);
    assert.match(csv.headers['content-type'], /^text\/csv/);
    assert.match(csv.headers['content-disposition'], /attachment; filename="rigwright-\d{4}-\d{2}\.csv"/);
    const lines = csv.text.trim().split('\r\n');
    assert.equal(lines[0], 'record,date,ticket,receipt,method,reference,amount,fee,net,payout,matched,note');
    assert.equal(lines.filter((l) => l.startsWith('payment,')).length, 4);
    assert.equal(lines.filter((l) => l.startsWith('refund,')).length, 1);
    assert.equal(lines.filter((l) => l.startsWith('payout,')).length, 2);
    assert.equal(lines.filter((l) => l.startsWith('unmatched,')).length, 1);
    assert.ok(lines.some((l) => l.includes(",'=1+1 cash book 14,3.00,0.00,3.00,")), 'a formula-looking reference is defused');
    assert.ok(lines.some((l) => l.startsWith('payment,') && l.includes(',15.00,0.43,14.57,')), 'B: 15.00 gross, 0.43 fee, 14.57 net');

    assert.equal((await w.tech.get(`/api/reconciliation/${month}`)).status, 403);
    assert.equal((await w.treasurer.get('/api/reconciliation/2026-13')).status, 400);
    const early = await w.treasurer.post(`/api/reconciliation/${month}/close`, {});
    assert.equal(early.status, 422);
    assert.equal(early.body.error.code, 'month_not_over');
  });
});

describe('closing a month', () => {
  it('locks its records: a later waiver on its charge goes into the next month as an adjustment', async () => {
    const clock = createTestClock(new Date('2026-03-15T12:00:00Z'));
    const w = await paymentsWorld({}, { clock });
    worlds.push(w);
    const tag = await openTicket(w.member);
    await addCharge(w.tech, tag, { feeItemId: w.fees.labour, quantity: 2 });
    await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 1200, reference: 'Cash book 15' }).expect(201);
    clock.set(new Date('2026-04-02T09:00:00Z'));
    const closed = await w.treasurer.post('/api/reconciliation/2026-03/close', {});
    assert.equal(closed.status, 200, closed.text);
    assert.equal(closed.body.closed.byName, 'treasurer');
    assert.equal((await w.treasurer.post('/api/reconciliation/2026-03/close', {})).status, 409);
    const ledger = (await w.treasurer.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    const waived = await w.treasurer.post(`/api/charges/${ledger.charges[0].id}/waivers`, { amount: 1200, reason: 'Second hour waived after the close.' });
    assert.equal(waived.status, 201, waived.text);
    assert.equal(waived.body.charges[0].waivers[0].adjustment, true);
    const march = (await w.treasurer.get('/api/reconciliation/2026-03').expect(200)).body;
    assert.equal(march.totalsByFeeItem[0].waived, 0, 'the closed month is unchanged');
    const april = (await w.treasurer.get('/api/reconciliation/2026-04').expect(200)).body;
    assert.deepEqual(april.totalsByFeeItem.map((t: { name: string; waived: number }) => [t.name, t.waived]), [['Labour', 1200]]);
  });
});

describe('CSV cells (RFC 4180 §2; OWASP CSV Injection)', () => {
  it('quotes commas and quotes, defuses formulas, leaves numbers alone', () => {
    assert.equal(csvCell('a,b'), '"a,b"');
    assert.equal(csvCell('say "hi"'), '"say ""hi"""');
    assert.equal(csvCell('=HYPERLINK("x")'), `"'=HYPERLINK(""x"")"`);
    assert.equal(csvCell('@cmd'), "'@cmd");
    assert.equal(csvCell(-12), '-12');
    assert.equal(csvCell(null), '');
  });
});
