// Test fixtures for bench slots (used by the bookings tests and the access matrix): a bench, a
// one-off opening session on a date a few days ahead, and a booking of its first slot.
import type { Sequelize } from 'sequelize';
import { DateTime } from 'luxon';
import { localInstant } from '../src/domain/bench-slots';
import { Bench, OpeningRule } from '../src/modules/benches/bench.model';
import { Booking } from '../src/modules/bookings/booking.model';

export const FIXTURE_ZONE = 'Europe/London';

/** The club-local date `days` from today. */
export function localDateIn(days: number, zone = FIXTURE_ZONE): string {
  return DateTime.now().setZone(zone).plus({ days }).toISODate()!;
}

/** A bench, and a one-off 09:00-21:00 session `daysAhead` days from today (club zone, default settings). */
export async function benchWithSession(name = 'Bench A', daysAhead = 3) {
  const bench = await Bench.create({
    name,
    location: 'Clubhouse, back room',
    instruments: [{ kind: 'regulated_supply', name: 'Regulated supply 13.8 V', maxCurrentA: 30 }],
    outOfServiceReason: null,
    outOfServiceUntil: null,
  });
  const date = localDateIn(daysAhead);
  const rule = await OpeningRule.create({
    kind: 'one_off',
    weekday: null,
    startTime: '09:00',
    endTime: '21:00',
    validFrom: date,
    validUntil: date,
    note: null,
  });
  return { bench, rule, date, at: (time: string) => localInstant(date, time, FIXTURE_ZONE) };
}

/** A booking written directly (bypassing the rules), with its booked units. */
export async function insertBooking(sequelize: Sequelize, b: { benchId: number; userId: number; start: Date; minutes?: number }) {
  const end = new Date(b.start.getTime() + (b.minutes ?? 30) * 60_000);
  const booking = await Booking.create({
    benchId: b.benchId,
    userId: b.userId,
    startsAt: b.start,
    endsAt: end,
    slotCount: 1,
    purpose: 'self_service',
    ticketId: null,
    note: null,
  });
  for (let t = b.start.getTime(); t < end.getTime(); t += 5 * 60_000) {
    await sequelize.query('INSERT INTO booking_units (bench_id, unit_start, booking_id) VALUES (?, ?, ?)', {
      replacements: [b.benchId, new Date(t), booking.id],
    });
  }
  return booking;
}
