// The iCalendar feeds, read back with an independent parser (node-ical 0.26.1), and booking mail
// through the real outbox worker into maildev: the reminder waits in the outbox until its time,
// and a cancelled booking's reminder is never sent.
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { MailDev } from 'maildev';
import ical from 'node-ical';
import { QueryTypes } from 'sequelize';
import { anonymous, createUser, setupTestApp, signIn, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { benchWithSession } from '../../../test/bench-fixtures';
import { startOutboxWorker } from '../outbox/outbox.worker';

// The browser suite's mail ports when set (the test command runs the suites one after another),
// else spare ports beside the outbox worker test's.
const SMTP_PORT = Number(process.env.RW_E2E_SMTP_PORT ?? 1127);
const WEB_PORT = Number(process.env.RW_E2E_MAIL_WEB_PORT ?? 1182);
const PW = 'bittern booming at dusk';

let t: TestApp;
let member: TestClient, other: TestClient;

before(async () => {
  t = await setupTestApp();
});
after(() => t.close());
beforeEach(async () => {
  await truncateAll(t.sequelize);
  await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow' });
  await createUser(t.sequelize, { email: 'wren@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Wren Alder' });
  [member, other] = await Promise.all([signIn(t.app, 'perrin@kestrelfen.example', PW), signIn(t.app, 'wren@kestrelfen.example', PW)]);
});

type VEvent = { type: string; uid: string; start: Date; end: Date; summary: string; location?: string; description?: string };
const events = (text: string) => Object.values(ical.sync.parseICS(text)).filter((c) => (c as { type: string }).type === 'VEVENT') as unknown as VEvent[];

describe('calendar feeds', () => {
  it('private feed: the token is required, lists the member\'s bookings at the right UTC times, and can be reset', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const mine = (await member.post('/api/bookings', { benchId: bench.id, start: at('19:00').toISOString(), slotCount: 2, purpose: 'drop_off', note: 'Bring the DC lead' }).expect(201)).body;
    await other.post('/api/bookings', { benchId: bench.id, start: at('10:00').toISOString(), purpose: 'self_service' }).expect(201);

    assert.equal((await member.get('/api/bookings/calendar').expect(200)).body.url, null, 'no feed until asked for');
    const link = (await member.post('/api/bookings/calendar/reset').expect(200)).body;
    assert.match(link.url, /\/api\/bookings\/calendar\/member\.ics\?token=[A-Za-z0-9_-]{43}$/);
    assert.equal((await member.get('/api/bookings/calendar').expect(200)).body.url, link.url, 'shown again later');
    const feedPath = new URL(link.url).pathname + new URL(link.url).search;

    const anon = await anonymous(t.app);
    const res = await anon.get(feedPath).expect(200);
    assert.match(res.headers['content-type']!, /^text\/calendar/);
    const [ev, ...rest] = events(res.text);
    assert.equal(rest.length, 0, 'only this member\'s booking');
    assert.equal(ev!.uid, `booking-${mine.id}@rigwright.local`);
    assert.equal(ev!.start.toISOString(), at('19:00').toISOString());
    assert.equal(ev!.end.toISOString(), at('20:00').toISOString());
    assert.match(ev!.summary, /Bench A \(Drop-off\)/);
    assert.match(ev!.description ?? '', /Bring the DC lead/);
    // Written in UTC form (RFC 5545 §3.3.5, form #2), so no time-zone definition is needed.
    const z = at('19:00').toISOString().replace(/[-:]/g, '').replace(/\.\d{3}/, '');
    assert.ok(res.text.includes(`DTSTART:${z}`), `DTSTART:${z} in the feed`);

    const missing = await anon.get('/api/bookings/calendar/member.ics').expect(400);
    assert.ok(missing.body.error.fields.token);
    await anon.get('/api/bookings/calendar/member.ics?token=' + 'x'.repeat(43)).expect(404);

    const next = (await member.post('/api/bookings/calendar/reset').expect(200)).body;
    assert.notEqual(next.url, link.url);
    await anon.get(feedPath).expect(404);
    await anon.get(new URL(next.url).pathname + new URL(next.url).search).expect(200);

    await member.post(`/api/bookings/${mine.id}/cancel`).expect(200);
    assert.equal(events((await anon.get(new URL(next.url).pathname + new URL(next.url).search).expect(200)).text).length, 0, 'cancelled bookings leave the feed');
  });

  it('public feed of opening sessions: anyone, right UTC times', async () => {
    const { date, at } = await benchWithSession('Bench A', 3);
    const anon = await anonymous(t.app);
    const res = await anon.get('/api/bookings/calendar/sessions.ics').expect(200);
    const evs = events(res.text);
    assert.equal(evs.length, 1);
    assert.equal(evs[0]!.start.toISOString(), at('09:00').toISOString());
    assert.equal(evs[0]!.end.toISOString(), at('21:00').toISOString());
    assert.equal(evs[0]!.uid, `session-${date}-0900@rigwright.local`);
  });
});

describe('booking mail through the outbox worker', () => {
  it('sends the confirmation at once, holds the reminder until its time, and never sends a cancelled booking\'s reminder', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'rw-maildev-'));
    const md = new MailDev({ smtp: SMTP_PORT, web: WEB_PORT, ip: '127.0.0.1', webIp: '127.0.0.1', silent: true, mailDirectory: dir });
    await md.start();
    const w = startOutboxWorker({
      config: { ...t.config, RW_SMTP_HOST: '127.0.0.1', RW_SMTP_PORT: SMTP_PORT, RW_OUTBOX_INTERVAL_MS: 0 },
      sequelize: t.sequelize,
      logger: t.logger,
      clock: () => new Date(),
    }, { smtpTimeoutMs: 3000 });
    try {
      const { bench, at } = await benchWithSession('Bench A', 3);
      const kept = (await member.post('/api/bookings', { benchId: bench.id, start: at('19:00').toISOString(), purpose: 'self_service' }).expect(201)).body;
      const dropped = (await member.post('/api/bookings', { benchId: bench.id, start: at('10:00').toISOString(), purpose: 'self_service' }).expect(201)).body;
      assert.equal(await w.runOnce(), 2, 'two confirmations now; the reminders wait');
      assert.equal(await w.runOnce(), 0);

      await member.post(`/api/bookings/${dropped.id}/cancel`).expect(200);
      // Time passes: every held mail's time has come.
      await t.sequelize.query('UPDATE outbox SET send_after = :past, next_attempt_at = :past WHERE send_after IS NOT NULL', {
        replacements: { past: new Date(Date.now() - 1000) },
      });
      assert.equal(await w.runOnce(), 1, 'only the reminder of the booking still standing');
      assert.equal(await w.runOnce(), 0);

      const mails = (await (await fetch(`http://127.0.0.1:${WEB_PORT}/api/email`)).json()) as { subject: string; text: string }[];
      const subjects = mails.map((m) => m.subject).sort();
      assert.equal(subjects.filter((s) => s.startsWith('Bench slot booked')).length, 2);
      const reminders = mails.filter((m) => m.subject.startsWith('Reminder'));
      assert.equal(reminders.length, 1);
      assert.match(reminders[0]!.subject, /Bench A at 19:00/);
      assert.match(reminders[0]!.text, /Europe\/London/);
      const rows = await t.sequelize.query<{ booking_id: number; kind: string; status: string }>('SELECT booking_id, kind, status FROM outbox ORDER BY id', { type: QueryTypes.SELECT });
      assert.deepEqual(
        rows.filter((r) => r.kind === 'booking_reminder').map((r) => [r.booking_id, r.status]),
        [[kept.id, 'sent']],
      );
    } finally {
      await w.stop();
      await md.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
