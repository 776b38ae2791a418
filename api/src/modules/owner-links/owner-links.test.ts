// Issue 7, the bench records and the owner's links, end to end through the API against MariaDB:
// diagnosis, notes and their audience, quotes (integer minor units), the hold, the owner's signed
// links (forgery, reuse, another ticket, closed tickets) and what reaches the owner's mails.
import { after, before, test } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { anonymous, createTestClock, createUser, setupTestApp, signIn, tableSnapshot, type TestApp, type TestClient } from '../../../test/helpers';

const PASSWORD = 'owner-link-test-passphrase';
const clock = createTestClock(new Date('2026-03-02T10:00:00Z'));
let t: TestApp;
let tech: TestClient;
let admin: TestClient;
let owner: TestClient;
let other: TestClient;

const INTERNAL_NOTE = 'Internal: suspect the owner dropped it; keep an eye on the PA board.';

before(async () => {
  t = await setupTestApp({}, { clock });
  await createUser(t.sequelize, { email: 'tech@owner-links.example', password: PASSWORD, roles: ['technician'], displayName: 'Ivo Marsh' });
  await createUser(t.sequelize, { email: 'admin@owner-links.example', password: PASSWORD, roles: ['admin'] });
  await createUser(t.sequelize, { email: 'owner@owner-links.example', password: PASSWORD, roles: ['member'], displayName: 'Wren Tallis' });
  await createUser(t.sequelize, { email: 'other@owner-links.example', password: PASSWORD, roles: ['member'] });
  tech = await signIn(t.app, 'tech@owner-links.example', PASSWORD);
  admin = await signIn(t.app, 'admin@owner-links.example', PASSWORD);
  owner = await signIn(t.app, 'owner@owner-links.example', PASSWORD);
  other = await signIn(t.app, 'other@owner-links.example', PASSWORD);
  await admin.patch('/api/club/quote-settings', { currency: 'GBP', approvalThresholdMinor: 5000 }).expect(200);
});

after(() => t.close());

async function handIn(client: TestClient, makeModel: string): Promise<{ tag: string; version: number }> {
  const res = await client.post('/api/tickets', {
    equipmentKind: 'transceiver',
    makeModel,
    units: ['main body'],
    faultReported: 'Relay clicks, display stays dark.',
    accessories: ['DC lead'],
    reflashConsent: false,
    notifyByEmail: true,
  });
  assert.equal(res.status, 201, res.text);
  return { tag: res.body.tag, version: res.body.version };
}

async function toDiagnosis(tag: string, version: number): Promise<number> {
  const res = await tech.post(`/api/tickets/${tag}/moves`, { to: 'diagnosis', version });
  assert.equal(res.status, 200, res.text);
  return res.body.version;
}

async function mails(tag: string): Promise<{ kind: string; text_body: string; subject: string }[]> {
  return t.sequelize.query('SELECT kind, subject, text_body FROM outbox WHERE ticket_id = :id ORDER BY id', {
    replacements: { id: Number(tag.slice(3)) },
    type: QueryTypes.SELECT,
  });
}

function linkIn(text: string, kind: 'approve' | 'status'): { tag: string; token: string; path: string } {
  const m = new RegExp(`/owner/${kind}/(RW-\\d+)/([A-Za-z0-9_-]{43})`).exec(text);
  assert.ok(m, `a ${kind} link in: ${text}`);
  return { tag: m[1]!, token: m[2]!, path: `/api/owner/${kind === 'approve' ? 'approval' : 'status'}/${m[1]}/${m[2]}` };
}

/** 13.8 V supply, 2 m of AWG 18 (NEC Ch. 9 Table 8: 7.95 Ω/kft at 75 °C), 20 A: the lead explains low voltage. */
const DIAGNOSIS = {
  version: 0,
  checks: {
    cableOut: { done: true, result: 'CAT lead unplugged' },
    dcRemoved: { done: true },
    waited: { done: true, result: '30 s' },
    poweredCableOut: { done: true, result: 'still dark' },
    supplyUnderLoad: { done: true, result: 'sags on transmit' },
  },
  supplyAtRadioV: 11.2,
  idleCurrentA: 1.8,
  transmitCurrentA: 19.5,
  lead: { lengthM: 2, gauge: 'awg:18', sourceV: 13.8 },
  findings: 'Display head does not boot; main board answers on the bootloader.',
  decision: 'reflash',
};

let mainTag = '';
let mainVersion = 0;

test('diagnosis: saved while in Diagnosis, versioned, validated, and an internal event', async () => {
  ({ tag: mainTag, version: mainVersion } = await handIn(owner, 'Q-Series HF transceiver'));
  // Not in Diagnosis yet: refused.
  const early = await tech.put(`/api/tickets/${mainTag}/diagnosis`, DIAGNOSIS);
  assert.equal(early.status, 422, early.text);
  mainVersion = await toDiagnosis(mainTag, mainVersion);

  const before = await tableSnapshot(t.sequelize);
  const bad = await tech.put(`/api/tickets/${mainTag}/diagnosis`, { ...DIAGNOSIS, supplyAtRadioV: -3, decision: 'return_unrepaired' });
  assert.equal(bad.status, 400);
  assert.ok(bad.body.error.fields.supplyAtRadioV);
  assert.ok(bad.body.error.fields.returnReason, 'returning unrepaired needs a reason');
  assert.deepEqual(await tableSnapshot(t.sequelize), before, 'a refused save stores nothing');

  const saved = await tech.put(`/api/tickets/${mainTag}/diagnosis`, DIAGNOSIS);
  assert.equal(saved.status, 200, saved.text);
  assert.equal(saved.body.version, 1);
  assert.equal(saved.body.checks.poweredCableOut.result, 'still dark');
  assert.equal(saved.body.checks.idleCurrent.done, false);
  assert.equal(saved.body.transmitCurrentA, 19.5);
  assert.deepEqual(saved.body.lead, { lengthM: 2, gauge: 'awg:18', sourceV: 13.8 });
  assert.equal(saved.body.savedBy, 'Ivo Marsh');

  const stale = await tech.put(`/api/tickets/${mainTag}/diagnosis`, { ...DIAGNOSIS, version: 0 });
  assert.equal(stale.status, 409);
  const again = await tech.put(`/api/tickets/${mainTag}/diagnosis`, { ...DIAGNOSIS, version: 1, findings: 'Updated findings.' });
  assert.equal(again.body.version, 2);

  const detail = await tech.get(`/api/tickets/${mainTag}`).expect(200);
  const saves = detail.body.events.filter((e: { kind: string }) => e.kind === 'diagnosis_saved');
  assert.equal(saves.length, 2, 'each save is on the timeline');
  assert.equal(saves[0].ownerVisible, false);
  assert.match(saves[0].note, /5 of 7 first checks done; 11\.20 V at the radio/);

  const asOwner = await owner.get(`/api/tickets/${mainTag}`).expect(200);
  assert.ok(asOwner.body.events.every((e: { ownerVisible: boolean }) => e.ownerVisible), 'members get owner-visible events only');
  assert.ok(!asOwner.body.events.some((e: { kind: string }) => e.kind === 'diagnosis_saved'));
  await owner.get(`/api/tickets/${mainTag}/diagnosis`).expect(403);
});

test('notes: internal stays on the bench; owner notes reach the owner by mail; members see only their own owner notes', async () => {
  const internal = await tech.post(`/api/tickets/${mainTag}/notes`, { text: INTERNAL_NOTE });
  assert.equal(internal.status, 201, internal.text);
  assert.equal(internal.body.audience, 'internal', 'internal is the default');
  const forOwner = await tech.post(`/api/tickets/${mainTag}/notes`, { text: 'We found a corrupted display firmware; a reflash should cure it.', audience: 'owner' });
  assert.equal(forOwner.body.audience, 'owner');
  const bad = await tech.post(`/api/tickets/${mainTag}/notes`, { text: 'x', audience: 'everyone' });
  assert.equal(bad.status, 400);

  const benchNotes = await tech.get(`/api/tickets/${mainTag}/notes`).expect(200);
  assert.equal(benchNotes.body.total, 2);
  const ownerNotes = await owner.get(`/api/tickets/${mainTag}/notes`).expect(200);
  assert.deepEqual(ownerNotes.body.items.map((n: { audience: string }) => n.audience), ['owner']);
  const stranger = await other.get(`/api/tickets/${mainTag}/notes`);
  assert.equal(stranger.status, 404, 'another member cannot see the notes');
  await other.post(`/api/tickets/${mainTag}/notes`, { text: 'sneaky' }).expect(403);

  const outbox = await mails(mainTag);
  assert.deepEqual(outbox.map((m) => m.kind), ['ticket_opened', 'ticket_moved', 'owner_note']);
  assert.match(outbox[2]!.text_body, /corrupted display firmware/);
  for (const m of outbox) assert.ok(!m.text_body.includes('PA board'), `internal note text in the ${m.kind} mail`);
});

test('quote at or below the threshold needs no approval; above it holds the ticket and mails an approval link', async () => {
  const small = await tech.post(`/api/tickets/${mainTag}/quotes`, { lines: [{ description: 'Bench diagnosis', quantity: 1, unitPriceMinor: 5000 }] });
  assert.equal(small.status, 201, small.text);
  assert.equal(small.body.status, 'not_needed', '£50.00 is at the £50.00 threshold: no approval');
  assert.equal((await tech.get(`/api/tickets/${mainTag}`)).body.awaitingApproval, false);

  // Worked by hand: £15.00 + 1.5 h × £18.00 (£27.00) + 2 × £14.75 (£29.50) = £71.50 = 7150 pence.
  const big = await tech.post(`/api/tickets/${mainTag}/quotes`, {
    lines: [
      { description: 'Diagnosis', quantity: 1, unitPriceMinor: 1500 },
      { description: 'Labour (hours)', quantity: 1.5, unitPriceMinor: 1800 },
      { description: 'Final transistor', quantity: 2, unitPriceMinor: 1475 },
    ],
    note: 'Reflash of the display unit and new finals.',
  });
  assert.equal(big.status, 201, big.text);
  assert.equal(big.body.totalMinor, 7150);
  assert.deepEqual(big.body.lines.map((l: { lineTotalMinor: number }) => l.lineTotalMinor), [1500, 2700, 2950]);
  assert.equal(big.body.status, 'pending');
  const detail = await tech.get(`/api/tickets/${mainTag}`).expect(200);
  assert.equal(detail.body.awaitingApproval, true);

  // The hold: every move but Return is refused (workflow.ts).
  const blocked = await tech.post(`/api/tickets/${mainTag}/moves`, { to: 'repair', version: detail.body.version });
  assert.equal(blocked.status, 422);
  assert.match(blocked.body.error.message, /not approved the quote/);

  const mail = (await mails(mainTag)).find((m) => m.kind === 'quote_approval');
  assert.ok(mail, 'an approval mail is queued');
  assert.match(mail.text_body, /£71\.50/);
  assert.ok(!mail.text_body.includes('PA board'));
  const bad = await tech.post(`/api/tickets/${mainTag}/quotes`, { lines: [{ description: 'Labour', quantity: 1.005, unitPriceMinor: 10 }] });
  assert.equal(bad.status, 400);
  await owner.post(`/api/tickets/${mainTag}/quotes`, { lines: [{ description: 'Labour', quantity: 1, unitPriceMinor: 10 }] }).expect(403);
});

test('owner links cannot be forged, used for another ticket or for another purpose', async () => {
  const approve = linkIn((await mails(mainTag)).find((m) => m.kind === 'quote_approval')!.text_body, 'approve');
  const status = linkIn((await mails(mainTag)).find((m) => m.kind === 'ticket_opened')!.text_body, 'status');
  const anon = await anonymous(t.app);
  const flip = (s: string) => s.slice(0, 10) + (s[10] === 'A' ? 'B' : 'A') + s.slice(11);
  const other2 = await handIn(other, 'Q-Series VHF mobile');

  const before = await tableSnapshot(t.sequelize);
  for (const [what, path] of [
    ['one character changed', `/api/owner/approval/${approve.tag}/${flip(approve.token)}`],
    ['shortened', `/api/owner/approval/${approve.tag}/${approve.token.slice(0, 40)}`],
    ['another ticket', `/api/owner/approval/${other2.tag}/${approve.token}`],
    ['status token on the approval page', `/api/owner/approval/${status.tag}/${status.token}`],
    ['approval token on the status page', `/api/owner/status/${approve.tag}/${approve.token}`],
    ['status token, another ticket', `/api/owner/status/${other2.tag}/${status.token}`],
  ] as const) {
    const get = await anon.get(path);
    assert.equal(get.status, 404, `${what}: ${get.status}`);
    assert.match(get.body.error.message, /This link is not valid/, what);
    const post = await anon.post(path, { decision: 'approve' });
    assert.ok([404].includes(post.status), `${what} (POST): ${post.status}`);
  }
  assert.deepEqual(await tableSnapshot(t.sequelize), before, 'nothing changed');
});

test("the owner's status page shows owner-visible events only, what happens next, and takes reflash consent", async () => {
  const status = linkIn((await mails(mainTag)).find((m) => m.kind === 'ticket_opened')!.text_body, 'status');
  const anon = await anonymous(t.app);
  const page = await anon.get(status.path);
  assert.equal(page.status, 200, page.text);
  assert.equal(page.body.tag, mainTag);
  assert.equal(page.body.state, 'diagnosis');
  assert.match(page.body.nextStep, /answer to the quote/);
  assert.equal(page.body.pendingQuote.totalMinor, 7150);
  const text = JSON.stringify(page.body);
  assert.ok(!text.includes('PA board'), 'no internal note');
  assert.ok(!text.includes('Diagnosis saved'), 'no diagnosis record');
  assert.ok(page.body.timeline.some((e: { kind: string; note: string }) => e.kind === 'note' && /corrupted display/.test(e.note)));

  assert.equal(page.body.canGiveConsent, true);
  const consent = await anon.post(`${status.path}/consent`, {});
  assert.equal(consent.status, 200, consent.text);
  assert.equal(consent.body.reflashConsent, true);
  assert.equal(consent.body.canGiveConsent, false);
  await anon.post(`${status.path}/consent`, {}).expect(409);
  const record = await tech.get(`/api/tickets/${mainTag}/reflash-consent`).expect(200);
  assert.equal(record.body.records[0].method, 'owner_link');
});

test('approving clears the hold; the link is single use', async () => {
  const approve = linkIn((await mails(mainTag)).find((m) => m.kind === 'quote_approval')!.text_body, 'approve');
  const anon = await anonymous(t.app);
  const view = await anon.get(approve.path).expect(200);
  assert.equal(view.body.quote.totalMinor, 7150);
  assert.equal(view.body.quote.status, 'pending');
  assert.equal((await anon.post(approve.path, { decision: 'maybe' })).status, 400);

  const ok = await anon.post(approve.path, { decision: 'approve' });
  assert.equal(ok.status, 200, ok.text);
  assert.equal(ok.body.quote.status, 'approved');
  const detail = await tech.get(`/api/tickets/${mainTag}`).expect(200);
  assert.equal(detail.body.awaitingApproval, false);
  assert.ok(detail.body.events.some((e: { kind: string; ownerVisible: boolean }) => e.kind === 'quote_approved' && e.ownerVisible));

  const before = await tableSnapshot(t.sequelize);
  const reuse = await anon.post(approve.path, { decision: 'decline', reason: 'changed my mind' });
  assert.equal(reuse.status, 409);
  assert.match(reuse.body.error.message, /already answered/);
  assert.deepEqual(await tableSnapshot(t.sequelize), before);
  // The hold is gone: consent given, the reflash move is allowed now.
  await tech.post(`/api/tickets/${mainTag}/moves`, { to: 'reflash', version: detail.body.version }).expect(200);
});

test('declining sends the ticket to Return with the reason; a newer quote replaces an older link', async () => {
  const { tag, version } = await handIn(owner, 'Q-Series linear amplifier');
  await toDiagnosis(tag, version);
  const lines = [{ description: 'Replace output stage', quantity: 1, unitPriceMinor: 12000 }];
  await tech.post(`/api/tickets/${tag}/quotes`, { lines }).expect(201);
  const first = linkIn((await mails(tag)).find((m) => m.kind === 'quote_approval')!.text_body, 'approve');
  await tech.post(`/api/tickets/${tag}/quotes`, { lines: [{ ...lines[0], unitPriceMinor: 11000 }] }).expect(201);
  const second = linkIn((await mails(tag)).filter((m) => m.kind === 'quote_approval')[1]!.text_body, 'approve');
  const anon = await anonymous(t.app);
  const old = await anon.post(first.path, { decision: 'approve' });
  assert.equal(old.status, 410, old.text);
  assert.match(old.body.error.message, /newer one/);

  const declined = await anon.post(second.path, { decision: 'decline', reason: 'Too dear for an old amplifier' });
  assert.equal(declined.status, 200, declined.text);
  assert.equal(declined.body.quote.status, 'declined');
  assert.equal(declined.body.quote.declineReason, 'Too dear for an old amplifier');
  const detail = await tech.get(`/api/tickets/${tag}`).expect(200);
  assert.equal(detail.body.state, 'return');
  assert.equal(detail.body.awaitingApproval, false);
  const moved = detail.body.events.find((e: { kind: string; toState: string | null }) => e.kind === 'moved' && e.toState === 'return');
  assert.ok(moved);
  assert.equal(moved.fromState, 'diagnosis');
  assert.match(moved.note, /Too dear for an old amplifier/);
  assert.equal((await anon.post(second.path, { decision: 'approve' })).status, 409, 'reused after the decision');
});

test('links stop working once the ticket is closed (approval at once, status after 30 days)', async () => {
  const { tag, version } = await handIn(owner, 'Q-Series power supply');
  await toDiagnosis(tag, version);
  await tech.post(`/api/tickets/${tag}/quotes`, { lines: [{ description: 'New regulator board', quantity: 1, unitPriceMinor: 9000 }] }).expect(201);
  const approve = linkIn((await mails(tag)).find((m) => m.kind === 'quote_approval')!.text_body, 'approve');
  const status = linkIn((await mails(tag)).find((m) => m.kind === 'ticket_opened')!.text_body, 'status');
  // Closed by hand (the close guard's records arrive with other features of the issue).
  await t.sequelize.query("UPDATE tickets SET state = 'closed', state_since = :at WHERE id = :id", { replacements: { at: clock(), id: Number(tag.slice(3)) } });
  const anon = await anonymous(t.app);
  const a = await anon.post(approve.path, { decision: 'approve' });
  assert.equal(a.status, 410);
  assert.match(a.body.error.message, /closed/);
  clock.advance(29 * 24 * 3600_000);
  assert.equal((await anon.get(status.path)).status, 200, 'still readable 29 days after closing');
  clock.advance(2 * 24 * 3600_000);
  const late = await anon.get(status.path);
  assert.equal(late.status, 410);
  assert.match(late.body.error.message, /closed more than 30 days ago/);
});

test('technicians record consent given by phone, with who and how; the event is owner-visible', async () => {
  const { tag, version } = await handIn(owner, 'Q-Series handheld');
  await toDiagnosis(tag, version);
  const bad = await tech.post(`/api/tickets/${tag}/reflash-consent`, { method: 'carrier pigeon' });
  assert.equal(bad.status, 400);
  const res = await tech.post(`/api/tickets/${tag}/reflash-consent`, { method: 'phone', note: 'Spoke to the owner at 18:10' });
  assert.equal(res.status, 201, res.text);
  assert.equal(res.body.given, true);
  assert.equal(res.body.records[0].recordedBy, 'Ivo Marsh');
  assert.equal(res.body.records[0].method, 'phone');
  const detail = await owner.get(`/api/tickets/${tag}`).expect(200);
  assert.equal(detail.body.reflashConsent, true);
  const event = detail.body.events.find((e: { kind: string }) => e.kind === 'reflash_consent');
  assert.match(event.note, /by phone call: Spoke to the owner/);
  await tech.post(`/api/tickets/${tag}/reflash-consent`, { method: 'in_person' }).expect(409);
});

test('quote settings: admins set the currency and threshold; bad codes are refused', async () => {
  assert.equal((await admin.patch('/api/club/quote-settings', { currency: 'gbp' })).status, 400);
  assert.equal((await admin.patch('/api/club/quote-settings', { currency: 'XQQ' })).status, 400);
  assert.equal((await admin.patch('/api/club/quote-settings', { approvalThresholdMinor: 12.5 })).status, 400);
  await tech.patch('/api/club/quote-settings', { approvalThresholdMinor: 1 }).expect(403);
  const ok = await admin.patch('/api/club/quote-settings', { currency: 'EUR', approvalThresholdMinor: 7500 }).expect(200);
  assert.deepEqual(ok.body, { currency: 'EUR', approvalThresholdMinor: 7500 });
  assert.deepEqual((await owner.get('/api/club/quote-settings').expect(200)).body, ok.body);
});

test('the public owner routes are rate-limited per address', async () => {
  const limited = await setupTestApp({ RW_OWNER_LINK_MAX_PER_ADDRESS: '3' });
  try {
    const anon = await anonymous(limited.app);
    const path = `/api/owner/status/RW-0001/${'A'.repeat(43)}`;
    for (let i = 0; i < 3; i++) assert.equal((await anon.get(path)).status, 404);
    const res = await anon.get(path);
    assert.equal(res.status, 429);
    assert.match(res.body.error.message, /Too many requests/);
  } finally {
    await limited.close();
  }
});
