// Slot derivation against the IANA time-zone database.
//
// Source of the check values: the IANA tz database (tzdata), file `europe`: Zone Europe/London
// "0:00 EU GMT/BST" since 1996, with "Rule EU 1981 max - Mar lastSun 1:00u 1:00 S" and
// "Rule EU 1996 max - Oct lastSun 1:00u 0 -": in 2026 the clocks go forward at 01:00 UTC on
// Sunday 29 March (GMT+0 → BST+1) and back at 01:00 UTC on Sunday 25 October. The offsets are
// read through luxon 3.7.2, which takes them from the runtime's ICU copy of that database
// (process.versions.tz names its release); nothing here writes an offset by hand except the
// expected UTC instants, worked out from the rules above.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { DateTime } from 'luxon';
import {
  dayBounds,
  fitSlots,
  isValidTimeZone,
  localDateOf,
  reminderDueAt,
  sessionsBetween,
  sessionsOn,
  slotsOf,
  unitsOf,
  type OpeningRuleFacts,
} from './bench-slots';

const ZONE = 'Europe/London';

function rule(r: Partial<OpeningRuleFacts> & Pick<OpeningRuleFacts, 'id' | 'kind'>): OpeningRuleFacts {
  return { weekday: null, startTime: null, endTime: null, validFrom: null, validUntil: null, note: null, ...r };
}

const tuesdayEvening = rule({ id: 1, kind: 'weekly', weekday: 2, startTime: '19:00', endTime: '22:00' });
const thursdayEvening = rule({ id: 2, kind: 'weekly', weekday: 4, startTime: '19:00', endTime: '22:00' });
const saturdayMorning = rule({ id: 3, kind: 'weekly', weekday: 6, startTime: '09:30', endTime: '12:30' });
const sundayEvening = rule({ id: 4, kind: 'weekly', weekday: 7, startTime: '19:00', endTime: '21:00' });
const CLUB = [tuesdayEvening, thursdayEvening, saturdayMorning, sundayEvening];

const iso = (d: Date) => d.toISOString();

test('the IANA data in use has the 2026 changes of Europe/London where tzdata puts them', () => {
  assert.match(process.versions.tz ?? '', /^20\d\d[a-z]$/, 'the runtime names its tzdata release');
  const offsetAt = (utc: string) => DateTime.fromISO(utc, { zone: 'utc' }).setZone(ZONE).offset;
  // EU rule: last Sunday of March, 01:00u.
  assert.equal(offsetAt('2026-03-29T00:59:59Z'), 0);
  assert.equal(offsetAt('2026-03-29T01:00:00Z'), 60);
  // EU rule: last Sunday of October, 01:00u.
  assert.equal(offsetAt('2026-10-25T00:59:59Z'), 60);
  assert.equal(offsetAt('2026-10-25T01:00:00Z'), 0);
  // The two change days are 23 and 25 hours long locally.
  const hours = (date: string) => {
    const b = dayBounds(date, ZONE);
    return (b.end.getTime() - b.start.getTime()) / 3_600_000;
  };
  assert.deepEqual([hours('2026-03-28'), hours('2026-03-29'), hours('2026-10-25'), hours('2026-10-26')], [24, 23, 25, 24]);
  assert.equal(isValidTimeZone(ZONE), true);
  assert.equal(isValidTimeZone('Europe/Kestrel_Fen'), false);
});

test('a 19:00 session stays at 19:00 local on both sides of each change (UTC instant moves by the offset)', () => {
  const at = (date: string) => sessionsOn(CLUB, date, ZONE).map((s) => `${iso(s.start)}/${iso(s.end)}`);
  // Spring: Sunday before the change week (GMT), the change day itself (BST from 01:00u), Tuesday after.
  assert.deepEqual(at('2026-03-22'), ['2026-03-22T19:00:00.000Z/2026-03-22T21:00:00.000Z']);
  assert.deepEqual(at('2026-03-24'), ['2026-03-24T19:00:00.000Z/2026-03-24T22:00:00.000Z']);
  assert.deepEqual(at('2026-03-28'), ['2026-03-28T09:30:00.000Z/2026-03-28T12:30:00.000Z']);
  assert.deepEqual(at('2026-03-29'), ['2026-03-29T18:00:00.000Z/2026-03-29T20:00:00.000Z']);
  assert.deepEqual(at('2026-03-31'), ['2026-03-31T18:00:00.000Z/2026-03-31T21:00:00.000Z']);
  // Autumn: Saturday before (BST), the change day (GMT again from 01:00u), Tuesday after.
  assert.deepEqual(at('2026-10-24'), ['2026-10-24T08:30:00.000Z/2026-10-24T11:30:00.000Z']);
  assert.deepEqual(at('2026-10-25'), ['2026-10-25T19:00:00.000Z/2026-10-25T21:00:00.000Z']);
  assert.deepEqual(at('2026-10-27'), ['2026-10-27T19:00:00.000Z/2026-10-27T22:00:00.000Z']);
  // Days without a rule have no session.
  assert.deepEqual(at('2026-03-30'), []);
});

test('a session across the change itself has its real length, and slots keep their real length', () => {
  const night = rule({ id: 9, kind: 'one_off', startTime: '00:30', endTime: '02:30', validFrom: '2026-03-29', validUntil: '2026-03-29' });
  const [spring] = sessionsOn([night], '2026-03-29', ZONE);
  // 00:30 GMT = 00:30Z; 02:30 BST = 01:30Z: one hour of real time, two 30-minute slots.
  assert.deepEqual([iso(spring!.start), iso(spring!.end)], ['2026-03-29T00:30:00.000Z', '2026-03-29T01:30:00.000Z']);
  assert.equal(slotsOf(spring!, 30).length, 2);

  const autumnNight = { ...night, validFrom: '2026-10-25', validUntil: '2026-10-25' };
  const [autumn] = sessionsOn([autumnNight], '2026-10-25', ZONE);
  // 00:30 BST = 23:30Z the day before; 02:30 GMT = 02:30Z: three hours, six slots.
  assert.deepEqual([iso(autumn!.start), iso(autumn!.end)], ['2026-10-24T23:30:00.000Z', '2026-10-25T02:30:00.000Z']);
  assert.equal(slotsOf(autumn!, 30).length, 6);
  assert.equal(localDateOf(autumn!.start, ZONE), '2026-10-25', 'the session belongs to its local date');
});

test('closures remove every session of the days they cover (one-offs too); rule date ranges hold', () => {
  const rules = [
    ...CLUB,
    rule({ id: 5, kind: 'closure', validFrom: '2026-12-24', validUntil: '2027-01-01', note: 'Winter break' }),
    rule({ id: 6, kind: 'one_off', startTime: '13:00', endTime: '16:00', validFrom: '2026-12-30', validUntil: '2026-12-30' }),
    rule({ id: 7, kind: 'one_off', startTime: '13:00', endTime: '16:00', validFrom: '2027-01-03', validUntil: '2027-01-03', note: 'New year repair afternoon' }),
    rule({ id: 8, kind: 'weekly', weekday: 1, startTime: '19:00', endTime: '21:00', validFrom: '2027-01-11', validUntil: '2027-02-01' }),
  ];
  const dates = sessionsBetween(rules, '2026-12-20', '2027-02-10', ZONE).map((s) => `${s.date} ${s.startTime}`);
  assert.ok(dates.includes('2026-12-22 19:00'), 'Tuesday before the break');
  assert.ok(!dates.some((d) => d >= '2026-12-24' && d < '2027-01-02'), 'nothing during the break');
  assert.ok(dates.includes('2027-01-02 09:30'), 'Saturday after the break');
  assert.ok(dates.includes('2027-01-03 13:00') && dates.includes('2027-01-03 19:00'), 'one-off beside the weekly Sunday');
  const mondays = dates.filter((d) => DateTime.fromISO(d.slice(0, 10)).weekday === 1);
  assert.deepEqual(mondays, ['2027-01-11 19:00', '2027-01-18 19:00', '2027-01-25 19:00', '2027-02-01 19:00']);
  // Two rules giving the same session on one date give one session.
  assert.equal(sessionsOn([tuesdayEvening, { ...tuesdayEvening, id: 10 }], '2026-12-22', ZONE).length, 1);
});

test('slots, consecutive runs and booked units (worked by hand)', () => {
  const [tue] = sessionsOn(CLUB, '2026-06-02', ZONE); // 19:00-22:00 BST = 18:00Z-21:00Z
  assert.deepEqual(slotsOf(tue!, 30).map((s) => iso(s.start).slice(11, 16)), ['18:00', '18:30', '19:00', '19:30', '20:00', '20:30']);
  assert.equal(slotsOf(tue!, 45).length, 4, '180 min / 45 min: exactly four slots');
  assert.equal(slotsOf(tue!, 40).length, 4, '180 min / 40 min: four slots; the 20-minute remainder is not offered');
  const at = (hhmm: string) => new Date(`2026-06-02T${hhmm}:00Z`);
  assert.equal(iso(fitSlots([tue!], at('20:00'), 2, 30)!.end), '2026-06-02T21:00:00.000Z');
  assert.equal(fitSlots([tue!], at('20:30'), 2, 30), null, 'runs past the end of the session');
  assert.equal(fitSlots([tue!], at('18:15'), 1, 30), null, 'off the slot grid');
  assert.equal(fitSlots([tue!], at('17:30'), 1, 30), null, 'before the session');
  assert.equal(unitsOf(at('18:00'), at('19:00')).length, 12);
  assert.equal(iso(unitsOf(at('18:00'), at('19:00'))[11]!), '2026-06-02T18:55:00.000Z');
});

test('the reminder is due at 10:00 local on the day before, across a change', () => {
  // Tuesday 31 March 2026, 19:00 BST: reminder Monday 30 March 10:00 BST = 09:00Z.
  assert.equal(iso(reminderDueAt(new Date('2026-03-31T18:00:00Z'), ZONE)), '2026-03-30T09:00:00.000Z');
  // Monday 30 March 19:00 BST: the day before is the change day, 10:00 BST = 09:00Z.
  assert.equal(iso(reminderDueAt(new Date('2026-03-30T18:00:00Z'), ZONE)), '2026-03-29T09:00:00.000Z');
  // Sunday 29 March 19:00 BST: Saturday 28 March 10:00 GMT = 10:00Z.
  assert.equal(iso(reminderDueAt(new Date('2026-03-29T18:00:00Z'), ZONE)), '2026-03-28T10:00:00.000Z');
});
