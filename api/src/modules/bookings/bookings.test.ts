// Bench slot bookings through the API against the real MariaDB: the day's slots, no double booking
// under 50 concurrent requests (reliability.md test 11), every limit and bad input (nothing stored),
// ownership, cancelling, no-shows and "Tonight at the bench".
import { after, before, beforeEach, describe, it } from 'node:test';
import assert from 'node:assert/strict';
import { QueryTypes } from 'sequelize';
import { createUser, setupTestApp, signIn, tableSnapshot, truncateAll, type TestApp, type TestClient } from '../../../test/helpers';
import { benchWithSession, insertBooking, localDateIn } from '../../../test/bench-fixtures';
import { localDateOf, localInstant, reminderDueAt } from '../../domain/bench-slots';
import { SLOT_TAKEN_MESSAGE } from './bookings.service';

const PW = 'marsh harrier over reeds';
const ZONE = 'Europe/London';
let t: TestApp;
let member: TestClient, other: TestClient, tech: TestClient, admin: TestClient;
let memberId = 0;

before(async () => {
  t = await setupTestApp({ RW_SIGNIN_MAX_PER_ADDRESS: '100000', RW_SIGNIN_MAX_PER_ACCOUNT_ADDRESS: '100000' });
});
after(() => t.close());

beforeEach(async () => {
  await truncateAll(t.sequelize);
  memberId = (await createUser(t.sequelize, { email: 'perrin@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Perrin Sallow', callSign: 'Q1PS' })).id;
  await createUser(t.sequelize, { email: 'wren@kestrelfen.example', password: PW, roles: ['member'], displayName: 'Wren Alder' });
  await createUser(t.sequelize, { email: 'tobin@kestrelfen.example', password: PW, roles: ['technician'], displayName: 'Tobin Marsh' });
  await createUser(t.sequelize, { email: 'bryony@kestrelfen.example', password: PW, roles: ['admin'], displayName: 'Bryony Keel' });
  [member, other, tech, admin] = await Promise.all(
    ['perrin', 'wren', 'tobin', 'bryony'].map((n) => signIn(t.app, `${n}@kestrelfen.example`, PW)),
  );
});

const iso = (d: Date) => d.toISOString();
const count = async (table: string) =>
  Number((await t.sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM ${table}`, { type: QueryTypes.SELECT }))[0]!.n);

async function refusedWithoutChange(
  request: () => Promise<{ status: number; body: { error?: { code: string; message: string; fields?: Record<string, string> } } }>,
  status: number,
  code: string,
) {
  const before = await tableSnapshot(t.sequelize);
  const res = await request();
  assert.equal(res.status, status, JSON.stringify(res.body));
  assert.equal(res.body.error?.code, code);
  assert.ok((res.body.error?.message ?? '').length > 10, 'the refusal says why');
  assert.deepEqual(await tableSnapshot(t.sequelize), before, `${code}: nothing stored`);
  return res;
}

describe('benches, opening rules and settings (admin)', () => {
  it('creates and changes a bench with its instruments; validates what an instrument needs', async () => {
    const bad = await admin.post('/api/benches', { name: 'Bench A', instruments: [{ kind: 'regulated_supply', name: 'PSU' }] }).expect(400);
    assert.match(bad.body.error.fields['instruments.0.maxCurrentA'], /maximum current/);
    const created = await admin
      .post('/api/benches', {
        name: 'Bench A',
        location: 'Back room',
        instruments: [
          { kind: 'regulated_supply', name: 'Regulated supply', maxCurrentA: 30 },
          { kind: 'dummy_load', name: 'Dummy load', powerRatingW: 150 },
        ],
      })
      .expect(201);
    assert.equal(created.body.instruments.length, 2);
    await admin.post('/api/benches', { name: 'Bench A' }).expect(409);
    const noReason = await admin.patch(`/api/benches/${created.body.id}`, { outOfService: true }).expect(400);
    assert.ok(noReason.body.error.fields.outOfServiceReason);
    const oos = await admin
      .patch(`/api/benches/${created.body.id}`, { outOfService: true, outOfServiceReason: 'Supply being recalibrated', outOfServiceUntil: '2030-01-01T00:00:00Z' })
      .expect(200);
    assert.equal(oos.body.outOfServiceUntil, '2030-01-01T00:00:00.000Z');
    const list = await member.get('/api/benches').expect(200);
    assert.equal(list.body[0].outOfServiceReason, 'Supply being recalibrated');
    await member.post('/api/benches', { name: 'Mine' }).expect(403);
  });

  it('opening rules: weekly, one-off and closure, with their checks; settings with an IANA zone', async () => {
    await admin.post('/api/benches/opening-rules', { kind: 'weekly', weekday: 2, startTime: '19:00', endTime: '22:00' }).expect(201);
    const bad = await admin.post('/api/benches/opening-rules', { kind: 'weekly', weekday: 2, startTime: '22:00', endTime: '19:00' }).expect(400);
    assert.ok(bad.body.error.fields.endTime);
    await admin.post('/api/benches/opening-rules', { kind: 'weekly', weekday: 8, startTime: '19:00', endTime: '22:00' }).expect(400);
    await admin.post('/api/benches/opening-rules', { kind: 'one_off', startTime: '19:07', endTime: '22:00', validFrom: '2026-12-01' }).expect(400);
    await admin.post('/api/benches/opening-rules', { kind: 'closure', validFrom: '2026-12-24' }).expect(400);
    const closure = await admin.post('/api/benches/opening-rules', { kind: 'closure', validFrom: '2026-12-24', validUntil: '2027-01-01', note: 'Winter break' }).expect(201);
    assert.equal((await admin.get('/api/benches/opening-rules').expect(200)).body.length, 2);
    await admin.delete(`/api/benches/opening-rules/${closure.body.id}`).expect(204);
    await admin.delete(`/api/benches/opening-rules/${closure.body.id}`).expect(404);

    assert.equal((await member.get('/api/benches/settings').expect(200)).body.timeZone, 'Europe/London');
    const tz = await admin.patch('/api/benches/settings', { timeZone: 'Europe/Fenland' }).expect(400);
    assert.ok(tz.body.error.fields.timeZone);
    await admin.patch('/api/benches/settings', { slotMinutes: 32 }).expect(400);
    const ok = await admin.patch('/api/benches/settings', { timeZone: 'America/St_Johns', slotMinutes: 45, maxOpenBookings: 2 }).expect(200);
    assert.deepEqual(ok.body, { timeZone: 'America/St_Johns', slotMinutes: 45, maxOpenBookings: 2, horizonDays: 28, cancelCutoffHours: 2 });
    await member.patch('/api/benches/settings', { slotMinutes: 60 }).expect(403);
  });
});

describe('the day\'s slots', () => {
  it('shows free, yours and taken per bench; past sessions are past', async () => {
    const { bench, date, at } = await benchWithSession('Bench A', 3);
    await member.post('/api/bookings', { benchId: bench.id, start: iso(at('19:00')), slotCount: 2, purpose: 'self_service' }).expect(201);
    const mine = (await member.get(`/api/bookings/slots?date=${date}`).expect(200)).body;
    assert.equal(mine.timeZone, ZONE);
    assert.equal(mine.benches[0].slots.length, 24, '09:00-21:00 in 30-minute slots');
    const byTime = (body: typeof mine) => Object.fromEntries(body.benches[0].slots.map((s: { start: string; status: string }) => [s.start, s.status]));
    assert.equal(byTime(mine)[iso(at('19:00'))], 'yours');
    assert.equal(byTime(mine)[iso(at('19:30'))], 'yours');
    assert.equal(byTime(mine)[iso(at('20:00'))], 'free');
    const theirs = (await other.get(`/api/bookings/slots?date=${date}`).expect(200)).body;
    assert.equal(byTime(theirs)[iso(at('19:00'))], 'taken');
    assert.equal(theirs.benches[0].slots.find((s: { bookingId?: number }) => s.bookingId), undefined, 'no booking ids of others');

    const yesterday = localDateIn(-1);
    await admin.post('/api/benches/opening-rules', { kind: 'one_off', startTime: '09:00', endTime: '10:00', validFrom: yesterday }).expect(201);
    const past = (await member.get(`/api/bookings/slots?date=${yesterday}`).expect(200)).body;
    assert.deepEqual(past.benches[0].slots.map((s: { status: string }) => s.status), ['past', 'past']);
    await member.get('/api/bookings/slots?date=2026-02-30').expect(400);
  });
});

describe('no double booking', () => {
  it('50 concurrent bookings of one slot: exactly one 201, the rest 409 "just taken", one row', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const clients: TestClient[] = [];
    for (let i = 0; i < 50; i++) {
      await createUser(t.sequelize, { email: `q${i}@crowd.example`, password: PW, roles: ['member'] });
    }
    for (let i = 0; i < 50; i += 10) {
      clients.push(...(await Promise.all(Array.from({ length: 10 }, (_, j) => signIn(t.app, `q${i + j}@crowd.example`, PW)))));
    }
    const body = { benchId: bench.id, start: iso(at('19:00')), slotCount: 1, purpose: 'self_service' };
    const results = await Promise.all(clients.map((c) => c.post('/api/bookings', body)));
    const statuses = results.map((r) => r.status);
    assert.equal(statuses.filter((s) => s === 201).length, 1, `statuses: ${statuses.join(',')}`);
    assert.equal(statuses.filter((s) => s === 409).length, 49);
    for (const r of results.filter((x) => x.status === 409)) {
      assert.deepEqual(r.body.error, { code: 'slot_taken', message: SLOT_TAKEN_MESSAGE });
    }
    assert.equal(await count('bookings'), 1);
    assert.equal(await count('booking_units'), 6, 'one 30-minute slot = six 5-minute units');
    assert.equal(await count("outbox WHERE kind = 'booking_confirmed'"), 1, 'one confirmation mail');
  });

  it('overlapping runs of slots collide too; a cancelled slot can be booked again', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const first = await member.post('/api/bookings', { benchId: bench.id, start: iso(at('10:00')), slotCount: 3, purpose: 'drop_off' }).expect(201);
    assert.equal(first.body.endsAt, iso(at('11:30')));
    await refusedWithoutChange(() => other.post('/api/bookings', { benchId: bench.id, start: iso(at('11:00')), slotCount: 2, purpose: 'self_service' }), 409, 'slot_taken');
    await other.post('/api/bookings', { benchId: bench.id, start: iso(at('11:30')), slotCount: 2, purpose: 'self_service' }).expect(201);
    await member.post(`/api/bookings/${first.body.id}/cancel`).expect(200);
    await other.post('/api/bookings', { benchId: bench.id, start: iso(at('11:00')), slotCount: 1, purpose: 'self_service' }).expect(201);
  });
});

describe('limits and bad input: a 4xx with the reason, nothing stored', () => {
  it('refuses slots outside sessions, in the past, too far ahead, on an out-of-service bench, over the limit', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const book = (c: TestClient, start: Date, extra: object = {}) =>
      c.post('/api/bookings', { benchId: bench.id, start: iso(start), slotCount: 1, purpose: 'self_service', ...extra });

    await refusedWithoutChange(() => book(member, at('08:30')), 422, 'outside_session');
    await refusedWithoutChange(() => book(member, at('10:10')), 422, 'outside_session'); // off the slot grid
    await refusedWithoutChange(() => book(member, at('20:00'), { slotCount: 3 }), 422, 'outside_session'); // runs past 21:00
    await refusedWithoutChange(() => book(member, at('10:00'), { slotCount: 9 }), 400, 'validation_failed');
    await refusedWithoutChange(() => book(member, at('10:00'), { purpose: 'party' }), 400, 'validation_failed');
    await refusedWithoutChange(() => book(member, at('10:00'), { userId: 1 }), 400, 'validation_failed');
    await refusedWithoutChange(() => book(member, at('10:00'), { status: 'cancelled' }), 400, 'validation_failed');
    await refusedWithoutChange(() => book(member, at('10:00'), { benchId: 9999 }), 400, 'validation_failed');

    const yesterday = localDateIn(-1);
    await admin.post('/api/benches/opening-rules', { kind: 'one_off', startTime: '09:00', endTime: '10:00', validFrom: yesterday }).expect(201);
    await refusedWithoutChange(() => book(member, localInstant(yesterday, '09:00', ZONE)), 422, 'slot_in_past');

    await admin.patch('/api/benches/settings', { horizonDays: 2 }).expect(200);
    await refusedWithoutChange(() => book(member, at('10:00')), 422, 'too_far_ahead');
    await admin.patch('/api/benches/settings', { horizonDays: 28 }).expect(200);

    await admin.patch(`/api/benches/${bench.id}`, { outOfService: true, outOfServiceReason: 'Scope away for repair' }).expect(200);
    const oos = await refusedWithoutChange(() => book(member, at('10:00')), 422, 'bench_out_of_service');
    assert.match(oos.body.error!.message, /Scope away for repair/);
    await admin.patch(`/api/benches/${bench.id}`, { outOfService: true, outOfServiceUntil: iso(at('12:00')) }).expect(200);
    await refusedWithoutChange(() => book(member, at('11:30')), 422, 'bench_out_of_service');
    await book(member, at('12:00')).expect(201); // back in service from 12:00
    await admin.patch(`/api/benches/${bench.id}`, { outOfService: false }).expect(200);

    await admin.patch('/api/benches/settings', { maxOpenBookings: 2 }).expect(200);
    await book(member, at('13:00')).expect(201);
    const limit = await refusedWithoutChange(() => book(member, at('14:00')), 422, 'booking_limit');
    assert.match(limit.body.error!.message, /limit of 2/);
    await book(other, at('14:00')).expect(201); // the limit is per member
  });

  it('links only an open ticket of the member\'s own', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const ticket = (
      await other
        .post('/api/tickets', { equipmentKind: 'tuner', makeModel: 'Reedbed AT-2 tuner', units: [], faultReported: 'Relay chatters on 40 m.', accessories: [], reflashConsent: false, notifyByEmail: false })
        .expect(201)
    ).body;
    const res = await refusedWithoutChange(
      () => member.post('/api/bookings', { benchId: bench.id, start: iso(at('10:00')), purpose: 'drop_off', ticketTag: ticket.tag }),
      400,
      'validation_failed',
    );
    assert.ok(res.body.error?.fields?.ticketTag);
    const ok = await other.post('/api/bookings', { benchId: bench.id, start: iso(at('10:00')), purpose: 'drop_off', ticketTag: ticket.tag }).expect(201);
    assert.equal(ok.body.ticketTag, ticket.tag);
  });

  it('cancellation cut-off: the member is refused after it, an admin may still cancel', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    await admin.patch('/api/benches/settings', { cancelCutoffHours: 168 }).expect(200);
    const b = (await member.post('/api/bookings', { benchId: bench.id, start: iso(at('10:00')), purpose: 'self_service' }).expect(201)).body;
    assert.equal(b.cancellable, false);
    await refusedWithoutChange(() => member.post(`/api/bookings/${b.id}/cancel`), 422, 'past_cutoff');
    const cancelled = await admin.post(`/api/bookings/${b.id}/cancel`).expect(200);
    assert.equal(cancelled.body.status, 'cancelled');
    await refusedWithoutChange(() => admin.post(`/api/bookings/${b.id}/cancel`), 422, 'booking_cancelled');
  });
});

describe('ownership', () => {
  it('a member never sees, changes or cancels another member\'s booking (404); lists hold only their own', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const b = (await member.post('/api/bookings', { benchId: bench.id, start: iso(at('10:00')), purpose: 'self_service', note: 'Bring the scope probe' }).expect(201)).body;
    for (const res of [
      await other.get(`/api/bookings/${b.id}`),
      await other.patch(`/api/bookings/${b.id}`, { note: 'mine now' }),
      await other.post(`/api/bookings/${b.id}/cancel`),
      await tech.post(`/api/bookings/${b.id}/cancel`),
      await tech.patch(`/api/bookings/${b.id}`, { note: 'x' }),
    ]) {
      assert.equal(res.status, 404, res.text);
      assert.equal(res.body.error.code, 'booking_not_found');
    }
    assert.equal((await other.get('/api/bookings').expect(200)).body.total, 0);
    assert.equal((await member.get('/api/bookings').expect(200)).body.items[0].note, 'Bring the scope probe');
    assert.equal((await tech.get(`/api/bookings/${b.id}`).expect(200)).body.id, b.id);
    const changed = await member.patch(`/api/bookings/${b.id}`, { purpose: 'collection', note: '' }).expect(200);
    assert.deepEqual([changed.body.purpose, changed.body.note], ['collection', null]);
    assert.equal((await member.get(`/api/bookings/${b.id}`).expect(200)).body.status, 'booked');
  });

  it('"My bench slots" pages and sorts; upcoming, past and all', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    await admin.patch('/api/benches/settings', { maxOpenBookings: 10 }).expect(200);
    const ids: number[] = [];
    for (const time of ['12:00', '10:00', '14:00']) {
      ids.push((await member.post('/api/bookings', { benchId: bench.id, start: iso(at(time)), purpose: 'self_service' }).expect(201)).body.id);
    }
    await member.post(`/api/bookings/${ids[2]}/cancel`).expect(200);
    const page1 = (await member.get('/api/bookings?pageSize=1&sort=startsAt&dir=asc').expect(200)).body;
    assert.deepEqual([page1.total, page1.items[0].id], [2, ids[1]]);
    const desc = (await member.get('/api/bookings?when=all&sort=startsAt&dir=desc').expect(200)).body;
    assert.deepEqual(desc.items.map((i: { id: number }) => i.id), [ids[2], ids[0], ids[1]]);
    const past = (await member.get('/api/bookings?when=past').expect(200)).body;
    assert.deepEqual(past.items.map((i: { status: string }) => i.status), ['cancelled']);
    await member.get('/api/bookings?sort=userId').expect(400);
  });
});

describe('mail and the technicians\' day', () => {
  it('queues a confirmation now and a reminder held until 10:00 local the day before; cancelling withdraws the reminder', async () => {
    const { bench, at } = await benchWithSession('Bench A', 3);
    const b = (await member.post('/api/bookings', { benchId: bench.id, start: iso(at('19:00')), slotCount: 2, purpose: 'self_service' }).expect(201)).body;
    const rows = await t.sequelize.query<{ kind: string; send_after: Date | null; booking_id: number; to_address: string; subject: string }>(
      'SELECT kind, send_after, booking_id, to_address, subject FROM outbox ORDER BY id',
      { type: QueryTypes.SELECT },
    );
    assert.deepEqual(rows.map((r) => r.kind), ['booking_confirmed', 'booking_reminder']);
    assert.equal(rows[0]!.send_after, null);
    assert.equal(iso(rows[1]!.send_after!), iso(reminderDueAt(at('19:00'), ZONE)));
    assert.ok(rows.every((r) => r.booking_id === b.id && r.to_address === 'perrin@kestrelfen.example'));
    assert.match(rows[0]!.subject, /Bench A/);
    await member.post(`/api/bookings/${b.id}/cancel`).expect(200);
    assert.deepEqual(
      (await t.sequelize.query<{ kind: string }>('SELECT kind FROM outbox', { type: QueryTypes.SELECT })).map((r) => r.kind),
      ['booking_confirmed'],
    );
  });

  it('"Tonight at the bench": technicians see the day\'s list and mark no-shows once a booking has started', async () => {
    const { bench, date, at } = await benchWithSession('Bench A', 3);
    const b = (await member.post('/api/bookings', { benchId: bench.id, start: iso(at('19:00')), purpose: 'drop_off' }).expect(201)).body;
    await other.post('/api/bookings', { benchId: bench.id, start: iso(at('18:00')), purpose: 'self_service' }).expect(201);
    const day = (await tech.get(`/api/bookings/schedule?date=${date}`).expect(200)).body;
    assert.deepEqual(day.entries.map((e: { memberName: string }) => e.memberName), ['Wren Alder', 'Perrin Sallow']);
    assert.equal(day.entries[1].memberCallSign, 'Q1PS');
    assert.equal(day.sessions.length, 1);
    await member.get(`/api/bookings/schedule?date=${date}`).expect(403);
    await refusedWithoutChange(() => tech.post(`/api/bookings/${b.id}/no-show`, { noShow: true }), 422, 'not_started');
    await member.post(`/api/bookings/${b.id}/no-show`, { noShow: true }).expect(403);

    // Today's list: a booking that started an hour ago (written directly; the API refuses the past).
    const started = await insertBooking(t.sequelize, { benchId: bench.id, userId: memberId, start: new Date(Math.floor(Date.now() / 300_000) * 300_000 - 3_600_000) });
    const marked = await tech.post(`/api/bookings/${started.id}/no-show`, { noShow: true }).expect(200);
    assert.equal(marked.body.noShow, true);
    await tech.post(`/api/bookings/${started.id}/no-show`, { noShow: false }).expect(200);
    const todays = (await tech.get('/api/bookings/schedule').expect(200)).body;
    assert.equal(todays.date, localDateIn(0), 'today (club zone) by default');
    // Just after local midnight the hour-old booking belongs to yesterday's list.
    assert.equal(todays.entries.some((e: { id: number }) => e.id === started.id), localDateOf(started.startsAt, ZONE) === todays.date);
    await tech.post(`/api/bookings/${started.id}/no-show`, { noShow: 'yes' }).expect(400);
  });
});
