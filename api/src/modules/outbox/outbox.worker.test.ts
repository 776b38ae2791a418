// The outbox worker against a real SMTP server (maildev, in-process on spare ports) and the real
// MariaDB: mail queued by a ticket move is delivered with its outbox Message-ID; during an SMTP
// outage the move still succeeds and the mail arrives once the server is back, exactly once.
// Time is a test clock shared by the app and the worker: the back-off is waited out by moving the
// clock, not by sleeping.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { MailDev } from 'maildev';
import { QueryTypes } from 'sequelize';
import { createTestClock, createUser, setClubName, setupTestApp, signIn, truncateAll, type TestApp, type TestClient, type TestClock } from '../../../test/helpers';
import { enqueueMail } from './outbox.service';
import { mailSender, outboxMessageId, retryDelayMs, startOutboxWorker, type OutboxWorkerOptions } from './outbox.worker';

// One above the browser suite's mail ports when those are set (so parallel checkouts each have their own).
const SMTP_PORT = Number(process.env.RW_E2E_SMTP_PORT ?? 1124) + 1;
const WEB_PORT = Number(process.env.RW_E2E_MAIL_WEB_PORT ?? 1179) + 1;
const PW = 'correct horse battery';

let t: TestApp;
let clock: TestClock;
let member: TestClient, tech: TestClient;
const mailDirs: string[] = [];

function newMailDev(): MailDev {
  const dir = mkdtempSync(path.join(tmpdir(), 'rw-maildev-'));
  mailDirs.push(dir);
  return new MailDev({ smtp: SMTP_PORT, web: WEB_PORT, ip: '127.0.0.1', webIp: '127.0.0.1', silent: true, mailDirectory: dir });
}

type Mail = { subject: string; from: { address: string; name: string }[]; to: { address: string }[]; headers: Record<string, string>; text: string };
async function inbox(): Promise<Mail[]> {
  const res = await fetch(`http://127.0.0.1:${WEB_PORT}/api/email`);
  assert.equal(res.status, 200);
  return (await res.json()) as Mail[];
}

function worker(options: OutboxWorkerOptions = {}, config: Partial<TestApp['config']> = {}) {
  return startOutboxWorker(
    {
      config: { ...t.config, RW_SMTP_HOST: '127.0.0.1', RW_SMTP_PORT: SMTP_PORT, RW_OUTBOX_INTERVAL_MS: 0, ...config },
      sequelize: t.sequelize,
      logger: t.logger,
      clock,
    },
    { baseDelayMs: 150, maxDelayMs: 1000, smtpTimeoutMs: 3000, ...options },
  );
}

async function outboxRows() {
  return t.sequelize.query<{ id: number; status: string; attempts: number; last_error: string | null; next_attempt_at: Date; locked_until: Date | null; sent_at: Date | null }>(
    'SELECT id, status, attempts, last_error, next_attempt_at, locked_until, sent_at FROM outbox ORDER BY id',
    { type: QueryTypes.SELECT },
  );
}

const intake = {
  equipmentKind: 'transceiver',
  makeModel: 'Fenwick Heron 100 HF transceiver',
  units: ['display head', 'main body'],
  faultReported: 'Display dark after a power cut.',
  accessories: ['DC lead'],
  reflashConsent: true,
  notifyByEmail: true,
};

before(async () => {
  clock = createTestClock();
  t = await setupTestApp({}, { clock });
});
after(async () => {
  await t.close();
  for (const d of mailDirs) rmSync(d, { recursive: true, force: true });
});
beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  [member, tech] = await Promise.all([signIn(t.app, 'perrin@kestrelfen.example', PW), signIn(t.app, 'tobin@kestrelfen.example', PW)]);
});

describe('retry back-off', () => {
  it('doubles from the base delay and stops at the cap', () => {
    assert.deepEqual([1, 2, 3, 4, 5, 8, 9, 20].map((n) => retryDelayMs(n, 2000, 300_000)), [2000, 4000, 8000, 16_000, 32_000, 256_000, 300_000, 300_000]);
  });
});

describe('mail sender', () => {
  const config = { RW_MAIL_FROM: undefined, RW_PUBLIC_URL: 'http://127.0.0.1:4300' };
  it('is RW_MAIL_FROM when that is set', () => {
    assert.equal(mailSender({ ...config, RW_MAIL_FROM: 'Bench <bench@club.example>' }, 'Saltmarsh Amateur Radio Group'), 'Bench <bench@club.example>');
  });
  it('is built from the club\'s name otherwise, at bench@ the public host (localhost for an address or a bare name)', () => {
    assert.deepEqual(mailSender(config, 'Saltmarsh Amateur Radio Group'), { name: 'Saltmarsh Amateur Radio Group repair bench', address: 'bench@localhost' });
    assert.deepEqual(mailSender({ ...config, RW_PUBLIC_URL: 'https://rigs.saltmarsh.example/' }, 'our club'), { name: 'our club repair bench', address: 'bench@rigs.saltmarsh.example' });
    assert.equal((mailSender({ ...config, RW_PUBLIC_URL: 'http://[::1]:4300' }, 'x') as { address: string }).address, 'bench@localhost');
    assert.equal((mailSender({ ...config, RW_PUBLIC_URL: 'http://bench:4300' }, 'x') as { address: string }).address, 'bench@localhost');
  });
});

describe('outbox worker', () => {
  it('sends from the club\'s name in the club settings when RW_MAIL_FROM is not set', async () => {
    const md = newMailDev();
    await md.start();
    const w = worker({}, { RW_MAIL_FROM: undefined, RW_PUBLIC_URL: 'http://127.0.0.1:4300' });
    try {
      await setClubName(t.sequelize, 'Saltmarsh Amateur Radio Group');
      await t.sequelize.transaction((transaction) =>
        enqueueMail(transaction, { kind: 'test', to: 'perrin@kestrelfen.example', subject: 'Hello', text: 'x' }, clock()),
      );
      assert.equal(await w.runOnce(), 1);
      const [mail] = await inbox();
      assert.deepEqual(mail.from, [{ address: 'bench@localhost', name: 'Saltmarsh Amateur Radio Group repair bench' }]);
    } finally {
      await w.stop();
      await md.stop();
    }
  });

  it('delivers queued ticket mail to the SMTP server, each with its outbox Message-ID, once', async () => {
    const md = newMailDev();
    await md.start();
    const w = worker();
    try {
      const ticket = (await member.post('/api/tickets', intake).expect(201)).body;
      await tech.post(`/api/tickets/${ticket.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200);
      assert.equal(await w.runOnce(), 1, 'the opened mail; the move mail waits out the undo grace period');
      clock.advance(t.config.RW_UNDO_GRACE_SECONDS * 1000);
      assert.equal(await w.runOnce(), 1);
      assert.equal(await w.runOnce(), 0, 'nothing left to send');
      const mails = await inbox();
      assert.deepEqual(mails.map((m) => m.subject).sort(), [
        `Ticket ${ticket.tag} opened`,
        `Your Fenwick Heron 100 HF transceiver (${ticket.tag}) has moved to Diagnosis`,
      ].sort());
      assert.ok(mails.every((m) => m.to[0].address === 'perrin@kestrelfen.example'));
      const rows = await outboxRows();
      assert.deepEqual(mails.map((m) => m.headers['message-id']).sort(), rows.map((r) => outboxMessageId(r.id)).sort());
      assert.ok(rows.every((r) => r.status === 'sent' && r.attempts === 1 && r.sent_at && !r.locked_until && !r.last_error));
      assert.ok(mails.find((m) => m.subject.startsWith('Ticket'))!.text.includes(ticket.tag));
    } finally {
      await w.stop();
      await md.stop();
    }
  });

  it('keeps mail through an SMTP outage and sends it exactly once when the server is back', async () => {
    const w = worker();
    let md: MailDev | undefined;
    try {
      const ticket = (await member.post('/api/tickets', { ...intake, notifyByEmail: false }).expect(201)).body;
      await t.sequelize.query('UPDATE tickets SET notify_by_email = true');
      // The mail server is down: the move still succeeds.
      const moved = await tech.post(`/api/tickets/${ticket.tag}/moves`, { to: 'diagnosis', version: 0 }).expect(200);
      assert.equal(moved.body.state, 'diagnosis');
      clock.advance(t.config.RW_UNDO_GRACE_SECONDS * 1000); // the move mail waits out the undo grace period

      assert.equal(await w.runOnce(), 0);
      let [row] = await outboxRows();
      assert.equal(row.status, 'pending');
      assert.equal(row.attempts, 1);
      assert.match(row.last_error ?? '', /ECONNREFUSED/);
      assert.equal(row.locked_until, null);
      assert.ok(row.next_attempt_at.getTime() > clock().getTime() - 50, 'the next try waits for the back-off');
      assert.equal(row.next_attempt_at.getTime(), clock().getTime() + 150, 'exactly the first back-off (150 ms) after now');
      assert.equal(await w.runOnce(), 0, 'not due yet');
      assert.equal((await outboxRows())[0].attempts, 1);

      clock.advance(200);
      assert.equal(await w.runOnce(), 0);
      [row] = await outboxRows();
      assert.equal(row.attempts, 2, 'second failed try');

      md = newMailDev();
      await md.start();
      clock.advance(350); // the back-off after two failures is 2 × 150 ms
      assert.equal(await w.runOnce(), 1);
      assert.equal(await w.runOnce(), 0);
      clock.advance(350);
      assert.equal(await w.runOnce(), 0, 'a sent mail is never sent again');
      const mails = await inbox();
      assert.equal(mails.length, 1);
      assert.equal(mails[0].subject, `Your Fenwick Heron 100 HF transceiver (${ticket.tag}) has moved to Diagnosis`);
      [row] = await outboxRows();
      assert.deepEqual({ status: row.status, attempts: row.attempts, lastError: row.last_error }, { status: 'sent', attempts: 3, lastError: null });
    } finally {
      await w.stop();
      await md?.stop();
    }
  });

  it('gives a mail up as failed after the last attempt, keeping the error', async () => {
    const w = worker({ maxAttempts: 2, baseDelayMs: 1 });
    try {
      await t.sequelize.transaction((transaction) =>
        enqueueMail(transaction, { kind: 'password_reset', to: 'perrin@kestrelfen.example', subject: 'Reset your password', text: 'x' }, clock()),
      );
      await w.runOnce();
      clock.advance(10);
      await w.runOnce();
      const [row] = await outboxRows();
      assert.equal(row.status, 'failed');
      assert.equal(row.attempts, 2);
      assert.match(row.last_error ?? '', /ECONNREFUSED/);
      clock.advance(10);
      assert.equal(await w.runOnce(), 0);
      assert.equal((await outboxRows())[0].attempts, 2, 'a failed mail is not retried');
    } finally {
      await w.stop();
    }
  });

  it('lets two workers (two replicas) sweep at once without sending any mail twice', async () => {
    const md = newMailDev();
    await md.start();
    const a = worker({ batchSize: 5 });
    const b = worker({ batchSize: 5 });
    try {
      await t.sequelize.transaction(async (transaction) => {
        for (let i = 0; i < 12; i++) {
          await enqueueMail(transaction, { kind: 'test', to: `owner${i}@fenmail.example`, subject: `Mail ${i}`, text: `Mail number ${i}` }, clock());
        }
      });
      let sent = 0;
      for (let round = 0; round < 4; round++) {
        const [x, y] = await Promise.all([a.runOnce(), b.runOnce()]);
        sent += x + y;
      }
      assert.equal(sent, 12);
      const mails = await inbox();
      assert.equal(mails.length, 12);
      assert.equal(new Set(mails.map((m) => m.subject)).size, 12);
    } finally {
      await a.stop();
      await b.stop();
      await md.stop();
    }
  });

  it('rolls the mail back with the change that caused it', async () => {
    await assert.rejects(
      t.sequelize.transaction(async (transaction) => {
        await enqueueMail(transaction, { kind: 'test', to: 'perrin@kestrelfen.example', subject: 'Never', text: 'x' }, clock());
        throw new Error('the change failed');
      }),
      /the change failed/,
    );
    assert.equal((await outboxRows()).length, 0);
  });
});
