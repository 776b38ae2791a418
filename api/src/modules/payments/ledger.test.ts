// Fees, charges, waivers, cash payments, refunds and the hand-back guard, through the HTTP API
// against the real database. Amounts are worked by hand beside each check.
import { after, before, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { tableSnapshot } from '../../../test/helpers';
import { recordedFactsOf } from '../tickets/tickets.service';
import { parseTag } from '../tickets/tag';
import { addCharge, openTicket, paymentsWorld, type PaymentsWorld } from '../../../test/payments-fixtures';

let w: PaymentsWorld;
before(async () => {
  w = await paymentsWorld();
});
after(() => w.close());

describe('fee schedule', () => {
  it('lists items with the price in force today; a new price from a later date leaves today\'s in force', async () => {
    const future = new Date(Date.now() + 40 * 86400_000).toISOString().slice(0, 10);
    const res = await w.treasurer.post(`/api/fees/${w.fees.diagnosis}/prices`, { memberPrice: 600, nonMemberPrice: 950, effectiveFrom: future });
    assert.equal(res.status, 201, res.text);
    const item = res.body.items.find((i: { id: number }) => i.id === w.fees.diagnosis);
    assert.deepEqual(item.current, { effectiveFrom: res.body.today, memberPrice: 500, nonMemberPrice: 800 });
    assert.equal(item.prices.length, 2);
    const list = await w.member.get('/api/fees').expect(200);
    assert.equal(list.body.currency, 'GBP');
  });
  it('refuses a price starting in the past, a duplicate code, and fractional or negative prices; nothing stored', async () => {
    const before = await tableSnapshot(w.t.sequelize);
    const past = await w.treasurer.post(`/api/fees/${w.fees.session}/prices`, { memberPrice: 1, nonMemberPrice: 2, effectiveFrom: '2020-01-01' });
    assert.equal(past.status, 422);
    assert.equal(past.body.error.code, 'price_in_past');
    const today = new Date().toISOString().slice(0, 10);
    const dup = await w.treasurer.post('/api/fees', { code: 'diagnosis', name: 'Again', unit: 'each', memberPrice: 1, nonMemberPrice: 1, effectiveFrom: today });
    assert.equal(dup.status, 409);
    const frac = await w.treasurer.post('/api/fees', { code: 'reflash', name: 'Reflash', unit: 'each', memberPrice: 12.5, nonMemberPrice: -1, effectiveFrom: today });
    assert.equal(frac.status, 400);
    assert.match(frac.body.error.fields.memberPrice, /whole minor units/);
    assert.match(frac.body.error.fields.nonMemberPrice, /negative/);
    const tech = await w.tech.post('/api/fees', { code: 'reflash', name: 'Reflash', unit: 'each', memberPrice: 1, nonMemberPrice: 1, effectiveFrom: today });
    assert.equal(tech.status, 403);
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before);
  });
});

describe('charges, waivers, payments and refunds on a ticket (worked example)', () => {
  let tag = '';
  it('a technician adds session 300 + labour 2 h × 1200 + parts 437 at member rates: balance 3137', async () => {
    tag = await openTicket(w.member);
    await addCharge(w.tech, tag, { feeItemId: w.fees.session, quantity: 1 });
    await addCharge(w.tech, tag, { feeItemId: w.fees.labour, quantity: 2 });
    const ledger = await addCharge(w.tech, tag, { description: 'Fuse holder, 30 A', amount: 437 });
    assert.deepEqual(ledger.charges.map((c: { amount: number }) => c.amount), [300, 2400, 437]);
    assert.ok(ledger.charges.slice(0, 2).every((c: { memberRate: boolean }) => c.memberRate));
    assert.equal(ledger.balance, 300 + 2400 + 437);
    assert.equal(ledger.settled, false);
  });
  it('a non-member owner (handed in at the bench) pays the non-member rate: diagnosis 800', async () => {
    const res = await w.tech.post('/api/tickets', {
      equipmentKind: 'amplifier',
      makeModel: 'Visitor amplifier',
      units: [],
      faultReported: 'No output on 40 m.',
      accessories: [],
      reflashConsent: false,
      notifyByEmail: false,
      owner: { name: 'Visitor', email: 'visitor@elsewhere.example' },
    });
    const ledger = await addCharge(w.tech, res.body.tag, { feeItemId: w.fees.diagnosis, quantity: 1 });
    assert.equal(ledger.charges[0].amount, 800);
    assert.equal(ledger.charges[0].memberRate, false);
  });
  it('bad input stores nothing: negative, fractional, zero parts; unknown fee; waiver above the balance; member adding charges', async () => {
    const before = await tableSnapshot(w.t.sequelize);
    for (const body of [{ description: 'Part', amount: -5 }, { description: 'Part', amount: 4.5 }, { description: 'Part', amount: 0 }, { feeItemId: 999999, quantity: 1 }, { feeItemId: w.fees.labour, quantity: 0.5 }]) {
      const res = await w.tech.post(`/api/tickets/${tag}/ledger/charges`, body);
      assert.equal(res.status, 400, `${JSON.stringify(body)} → ${res.status} ${res.text}`);
      assert.equal(typeof res.body.error.message, 'string');
    }
    const ledger = (await w.treasurer.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    const labour = ledger.charges[1];
    const above = await w.treasurer.post(`/api/charges/${labour.id}/waivers`, { amount: 2401, reason: 'Too much' });
    assert.equal(above.status, 422);
    assert.equal(above.body.error.code, 'waiver_above_balance');
    const byMember = await w.member.post(`/api/tickets/${tag}/ledger/charges`, { description: 'Part', amount: 100 });
    assert.equal(byMember.status, 403);
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before);
  });
  it('the treasurer waives 1200 of labour (one hour as goodwill): balance 1937; the event is on the timeline', async () => {
    const ledger = (await w.treasurer.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    const res = await w.treasurer.post(`/api/charges/${ledger.charges[1].id}/waivers`, { amount: 1200, reason: 'One hour as goodwill: long-standing member.' });
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.balance, 3137 - 1200);
    assert.equal(res.body.charges[1].waived, 1200);
    const detail = (await w.member.get(`/api/tickets/${tag}`).expect(200)).body;
    assert.deepEqual(detail.events.map((e: { kind: string }) => e.kind).filter((k: string) => k !== 'opened'), ['charge_added', 'charge_added', 'charge_added', 'charge_waived']);
  });
  it('cash above the balance and a zero amount are refused; 1000 in cash leaves 937; a receipt mail is queued', async () => {
    const before = await tableSnapshot(w.t.sequelize);
    assert.equal((await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 1938, reference: 'Cash book 12' })).status, 422);
    assert.equal((await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 0, reference: 'Cash book 12' })).status, 400);
    assert.equal((await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cheque', amount: 100, reference: 'x' })).status, 400);
    assert.equal((await w.tech.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 100, reference: 'x' })).status, 403);
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before);
    const res = await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 1000, reference: 'Cash book 12' });
    assert.equal(res.status, 201, res.text);
    assert.equal(res.body.balance, 937);
    assert.match(res.body.payments[0].receiptNumber, /^R-\d{6}$/);
    // Allocated oldest first: session 300 paid, labour 1200 (2400 − 1200 waived) gets 700.
    assert.deepEqual(res.body.charges.map((c: { paid: number; open: number }) => [c.paid, c.open]), [[300, 0], [700, 500], [0, 437]]);
    const mails = await w.t.sequelize.query<{ subject: string }>("SELECT subject FROM outbox WHERE kind = 'payment_receipt'", { type: QueryTypes.SELECT });
    assert.equal(mails.length, 1);
    assert.match(mails[0]!.subject, /£10\.00/);
  });
  it('the hand-back guard reads balanceSettled false while 937 is owed (recordedFactsOf)', async () => {
    assert.equal((await recordedFactsOf(w.t.sequelize, parseTag(tag)!)).balanceSettled, false);
  });
  it('a bank transfer of the remaining 937 settles it; refunds above the payment are refused; a 200 refund makes 200 owed', async () => {
    const paid = await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'bank_transfer', amount: 937, reference: 'BACS KFRS-0042' });
    assert.equal(paid.status, 201, paid.text);
    assert.equal(paid.body.balance, 0);
    assert.equal(paid.body.settled, true);
    assert.equal((await recordedFactsOf(w.t.sequelize, parseTag(tag)!)).balanceSettled, true, 'the guard sees it settled');
    const zero = await w.treasurer.post(`/api/tickets/${tag}/ledger/payments`, { method: 'cash', amount: 1, reference: 'x' });
    assert.equal(zero.status, 422);
    assert.equal(zero.body.error.code, 'nothing_to_pay');
    const cash = paid.body.payments.find((p: { method: string }) => p.method === 'cash');
    const before = await tableSnapshot(w.t.sequelize);
    const tooMuch = await w.treasurer.post(`/api/payments/${cash.id}/refunds`, { amount: 1001, reason: 'Oops' });
    assert.equal(tooMuch.status, 422);
    assert.equal(tooMuch.body.error.code, 'refund_above_payment');
    assert.equal((await w.member.post(`/api/payments/${cash.id}/refunds`, { amount: 1, reason: 'Mine' })).status, 403);
    assert.deepEqual(await tableSnapshot(w.t.sequelize), before);
    const refunded = await w.treasurer.post(`/api/payments/${cash.id}/refunds`, { amount: 200, reason: 'Fuse holder returned unused.' });
    assert.equal(refunded.status, 201, refunded.text);
    assert.equal(refunded.body.balance, 200);
    assert.equal(refunded.body.totals.refunds, 200);
  });
  it('the receipt PDF: the owner and the treasurer get it, another member does not', async () => {
    const ledger = (await w.member.get(`/api/tickets/${tag}/ledger`).expect(200)).body;
    const id = ledger.payments[0].id;
    const pdf = await w.member.get(`/api/payments/${id}/receipt.pdf`).buffer(true).parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });
    assert.equal(pdf.status, 200);
    assert.equal(pdf.headers['content-type'], 'application/pdf');
    assert.equal((pdf.body as Buffer).subarray(0, 5).toString('latin1'), '%PDF-');
    assert.equal((await w.otherMember.get(`/api/payments/${id}/receipt.pdf`)).status, 404);
    assert.equal((await w.otherMember.get(`/api/tickets/${tag}/ledger`)).status, 404);
  });
});
