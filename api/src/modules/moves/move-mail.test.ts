// The owner's mail about moves waits out the undo grace period (issue 7): an undone move sends
// nothing, several quick moves send one mail with the latest state, a move and its way back send
// nothing. Driven end to end: HTTP moves, the real outbox worker on the app's test clock, and a
// real SMTP catcher (maildev, in-process on spare ports), as outbox.worker.test.ts does.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { MailDev } from 'maildev';
import { QueryTypes } from 'sequelize';
import { createTestClock, createUser, setupTestApp, signIn, truncateAll, type TestApp, type TestClient, type TestClock } from '../../../test/helpers';
import { startOutboxWorker, type OutboxWorker } from '../outbox/outbox.worker';

// One above the browser suite's mail ports when those are set, as outbox.worker.test.ts (test files run one at a time).
const SMTP_PORT = Number(process.env.RW_E2E_SMTP_PORT ?? 1124) + 1;
const WEB_PORT = Number(process.env.RW_E2E_MAIL_WEB_PORT ?? 1179) + 1;
const PW = 'correct horse battery';
const GRACE_MS = 10_000; // RW_UNDO_GRACE_SECONDS' default

let t: TestApp;
let clock: TestClock;
let tech: TestClient, member: TestClient;
let md: MailDev;
let worker: OutboxWorker;
const mailDir = mkdtempSync(path.join(tmpdir(), 'rw-maildev-'));

type Mail = { subject: string; text: string; to: { address: string }[] };
async function inbox(): Promise<Mail[]> {
  const res = await fetch(`http://127.0.0.1:${WEB_PORT}/api/email`);
  assert.equal(res.status, 200);
  return (await res.json()) as Mail[];
}
async function movedMails(): Promise<Mail[]> {
  return (await inbox()).filter((m) => m.subject.includes('has moved to'));
}
async function pendingMoveRows() {
  return t.sequelize.query<{ subject: string; send_after: Date; coalesce_base: string }>(
    "SELECT subject, send_after, coalesce_base FROM outbox WHERE kind = 'ticket_moved' AND status = 'pending' ORDER BY id",
    { type: QueryTypes.SELECT },
  );
}

before(async () => {
  clock = createTestClock(new Date('2026-05-09T19:00:00.000Z'));
  t = await setupTestApp({}, { clock });
  md = new MailDev({ smtp: SMTP_PORT, web: WEB_PORT, ip: '127.0.0.1', webIp: '127.0.0.1', silent: true, mailDirectory: mailDir });
  await md.start();
  worker = startOutboxWorker(
    { config: { ...t.config, RW_SMTP_HOST: '127.0.0.1', RW_SMTP_PORT: SMTP_PORT, RW_OUTBOX_INTERVAL_MS: 0 }, sequelize: t.sequelize, logger: t.logger, clock },
    { smtpTimeoutMs: 3000 },
  );
});
after(async () => {
  await worker.stop();
  await md.stop();
  await t.close();
  rmSync(mailDir, { recursive: true, force: true });
});
beforeEach(async () => {
  await truncateAll(t.sequelize);
  await fetch(`http://127.0.0.1:${WEB_PORT}/api/email/all`, { method: 'DELETE' });
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  [member, tech] = await Promise.all([signIn(t.app, 'perrin@kestrelfen.example', PW), signIn(t.app, 'tobin@kestrelfen.example', PW)]);
});

/** A ticket whose owner asked for mail; its "opened" mail is sent at once, so later counts are moves only. */
async function handIn(): Promise<string> {
  const res = await member
    .post('/api/tickets', {
      equipmentKind: 'transceiver',
      makeModel: 'Fenwick Heron 100 HF transceiver',
      units: ['main body'],
      faultReported: 'Display dark after a power cut.',
      accessories: ['DC lead'],
      reflashConsent: true,
      notifyByEmail: true,
    })
    .expect(201);
  assert.equal(await worker.runOnce(), 1, 'the opened mail');
  return res.body.tag;
}

const move = async (tag: string, to: string, version: number, note?: string) =>
  (await tech.post(`/api/tickets/${tag}/moves`, { to, version, ...(note ? { note } : {}) }).expect(200)).body;

describe('owner mail and the undo grace period', () => {
  it('an undo within the grace period sends nothing', async () => {
    const tag = await handIn();
    const moved = await move(tag, 'diagnosis', 0);
    assert.equal((await pendingMoveRows()).length, 1, 'the mail waits');
    assert.equal(await worker.runOnce(), 0, 'not before the grace period is over');
    clock.advance(4_000);
    await tech.post(`/api/tickets/${tag}/moves/${moved.undo.eventId}/undo`, { version: moved.version }).expect(200);
    assert.equal((await pendingMoveRows()).length, 0, 'the undo withdrew it');
    clock.advance(10 * GRACE_MS);
    assert.equal(await worker.runOnce(), 0);
    assert.deepEqual(await movedMails(), []);
  });

  it('three quick moves send one mail, with the latest state, once the last one’s grace period is over', async () => {
    const tag = await handIn();
    const start = clock().getTime();
    let v = (await move(tag, 'diagnosis', 0)).version;
    clock.advance(3_000);
    v = (await move(tag, 'repair', v)).version;
    clock.advance(3_000);
    await move(tag, 'bench_test', v);
    const rows = await pendingMoveRows();
    assert.equal(rows.length, 1, 'each move replaced the pending mail');
    assert.equal(rows[0].coalesce_base, 'intake', 'what the owner was last told');
    assert.equal(rows[0].send_after.getTime(), start + 16_000, 'the last move (6 s) plus the 10 s grace');
    clock.advance(GRACE_MS - 1);
    assert.equal(await worker.runOnce(), 0, 'the grace period counts from the last move');
    clock.advance(1);
    assert.equal(await worker.runOnce(), 1);
    const mails = await movedMails();
    assert.equal(mails.length, 1);
    assert.equal(mails[0].subject, `Your Fenwick Heron 100 HF transceiver (${tag}) has moved to Bench test`);
    assert.match(mails[0].text, new RegExp(`\\(ticket ${tag}\\) has moved from Intake to Bench test\\.`));
    assert.equal(mails[0].to[0].address, 'perrin@kestrelfen.example');
    clock.advance(10 * GRACE_MS);
    assert.equal(await worker.runOnce(), 0, 'sent once');
  });

  it('a move and its way back within the grace period send nothing; the next mail starts from what the owner was told', async () => {
    const tag = await handIn();
    let v = (await move(tag, 'diagnosis', 0)).version;
    clock.advance(GRACE_MS);
    assert.equal(await worker.runOnce(), 1);
    v = (await move(tag, 'repair', v)).version;
    clock.advance(2_000);
    v = (await move(tag, 'diagnosis', v, 'Supply ripple found: diagnose again.')).version; // sent back
    assert.equal((await pendingMoveRows()).length, 0, 'the owner already knows it is in Diagnosis');
    clock.advance(GRACE_MS);
    assert.equal(await worker.runOnce(), 0);
    await move(tag, 'reflash', v);
    clock.advance(GRACE_MS);
    assert.equal(await worker.runOnce(), 1);
    assert.deepEqual((await movedMails()).map((m) => m.subject).sort(), [
      `Your Fenwick Heron 100 HF transceiver (${tag}) has moved to Diagnosis`,
      `Your Fenwick Heron 100 HF transceiver (${tag}) has moved to Reflash`,
    ]);
    assert.match((await movedMails()).find((m) => m.subject.endsWith('Reflash'))!.text, /from Diagnosis to Reflash\./);
  });

  it('a mail already claimed by the worker counts as told: the next move is mailed on its own', async () => {
    const tag = await handIn();
    const v = (await move(tag, 'diagnosis', 0)).version;
    clock.advance(GRACE_MS);
    // A worker has claimed the row (lease set) but not yet sent it.
    await t.sequelize.query("UPDATE outbox SET locked_until = :until WHERE kind = 'ticket_moved'", { replacements: { until: new Date(clock().getTime() + 60_000) } });
    await move(tag, 'repair', v);
    const rows = await t.sequelize.query<{ subject: string; coalesce_base: string }>(
      "SELECT subject, coalesce_base FROM outbox WHERE kind = 'ticket_moved' ORDER BY id",
      { type: QueryTypes.SELECT },
    );
    assert.deepEqual(rows.map((r) => [r.subject.replace(/^.*has moved to /, ''), r.coalesce_base]), [['Diagnosis', 'intake'], ['Repair', 'diagnosis']]);
  });

  it('an owner who asked for no mail gets none, and nothing is left waiting', async () => {
    const res = await member
      .post('/api/tickets', { equipmentKind: 'tuner', makeModel: 'Reedling AT-2', units: [], faultReported: 'Relay chatter.', accessories: [], reflashConsent: false, notifyByEmail: false })
      .expect(201);
    await move(res.body.tag, 'diagnosis', 0);
    assert.equal((await pendingMoveRows()).length, 0);
  });
});
