// Bench slot bookings: the day's slots, booking, changing, cancelling, no-shows, and the day's list
// for technicians. Services never see req/res; they throw typed errors and return the API's DTOs.
//
// No double booking: a booking writes one booking_units row per 5-minute unit it covers, and the
// unique index (bench_id, unit_start) lets only one of two overlapping bookings commit; the loser's
// insert fails with a duplicate key (or InnoDB picks it as a deadlock victim) and gets 409.
import { QueryTypes, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import { DateTime } from 'luxon';
import type { Config } from '../../config';
import { ConflictError, NotFoundError, RuleError, ValidationError } from '../../errors';
import {
  addDays,
  dayBounds,
  sessionsBetween,
  fitSlots,
  localDateOf,
  reminderDueAt,
  sessionsOn,
  slotsOf,
  unitsOf,
  type Session,
} from '../../domain/bench-slots';
import {
  BOOKING_PURPOSE_LABELS,
  type BookingRow,
  type BookingSettings,
  type DaySchedule,
  type DaySlots,
  type ScheduleEntry,
  type SlotStatus,
} from '../../contracts/bookings';
import type { Page } from '../../contracts/lists';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { formatTag, parseTag } from '../tickets/tag';
import { Bench } from '../benches/bench.model';
import { benchDto, listBenches, listRules, outOfServiceAt } from '../benches/benches.service';
import { readBookingSettings } from '../benches/booking-settings';
import { Booking } from './booking.model';
import type { CreateBookingBody, ListBookingsQuery, PatchBookingBody } from './bookings.schemas';

export interface BookingsDeps {
  sequelize: Sequelize;
  config: Pick<Config, 'RW_PUBLIC_URL'>;
}

export const SLOT_TAKEN_MESSAGE = 'Someone has just taken that slot. Pick another free slot.';

type RowSql = {
  id: number;
  bench_id: number;
  bench_name: string;
  user_id: number;
  display_name: string;
  call_sign: string | null;
  starts_at: Date;
  ends_at: Date;
  slot_count: number;
  purpose: BookingRow['purpose'];
  ticket_id: number | null;
  note: string | null;
  status: BookingRow['status'];
  no_show: number | boolean;
  created_at: Date;
};

const ROW_SELECT =
  'SELECT b.id, b.bench_id, be.name AS bench_name, b.user_id, u.display_name, u.call_sign, b.starts_at, b.ends_at, ' +
  'b.slot_count, b.purpose, b.ticket_id, b.note, b.status, b.no_show, b.created_at ' +
  'FROM bookings b JOIN benches be ON be.id = b.bench_id JOIN users u ON u.id = b.user_id';

function canCancelBy(r: RowSql, settings: BookingSettings, now: Date): boolean {
  return r.status === 'booked' && r.starts_at.getTime() - now.getTime() >= settings.cancelCutoffHours * 3_600_000;
}

function toRow(r: RowSql, settings: BookingSettings, now: Date): BookingRow {
  return {
    id: r.id,
    benchId: r.bench_id,
    benchName: r.bench_name,
    startsAt: r.starts_at.toISOString(),
    endsAt: r.ends_at.toISOString(),
    slotCount: r.slot_count,
    purpose: r.purpose,
    ticketTag: r.ticket_id ? formatTag(r.ticket_id) : null,
    note: r.note,
    status: r.status,
    noShow: !!r.no_show,
    cancellable: canCancelBy(r, settings, now),
    createdAt: r.created_at.toISOString(),
  };
}

function toEntry(r: RowSql, settings: BookingSettings, now: Date): ScheduleEntry {
  return { ...toRow(r, settings, now), memberName: r.display_name, memberCallSign: r.call_sign };
}

async function loadRow(sequelize: Sequelize, id: number, transaction?: Transaction): Promise<RowSql | undefined> {
  const rows = await sequelize.query<RowSql>(`${ROW_SELECT} WHERE b.id = :id`, {
    replacements: { id },
    type: QueryTypes.SELECT,
    transaction,
  });
  return rows[0];
}

const notFound = () => new NotFoundError('No booking of yours has that number.', 'booking_not_found');

/** A booking the person may see: their own, or any for technicians, treasurers and admins. Others: 404. */
async function visibleRow(sequelize: Sequelize, user: SessionUser, id: number): Promise<RowSql> {
  const row = await loadRow(sequelize, id);
  if (!row || (row.user_id !== user.id && !hasRole(user, 'technician', 'treasurer', 'admin'))) throw notFound();
  return row;
}

/** The local wall-clock words of an instant, e.g. "Tuesday 2 June 2026, 19:00". */
export function localWords(at: Date, zone: string, format = 'cccc d LLLL yyyy, HH:mm'): string {
  return DateTime.fromJSDate(at, { zone }).setLocale('en-GB').toFormat(format);
}

function sessionsDto(sessions: Session[]) {
  return sessions.map((s) => ({ start: s.start.toISOString(), end: s.end.toISOString(), note: s.note }));
}

export async function daySlots(deps: BookingsDeps, user: SessionUser, date: string): Promise<DaySlots> {
  const { sequelize } = deps;
  const settings = await readBookingSettings(sequelize);
  const zone = settings.timeZone;
  const rules = await listRules();
  const sessions = sessionsOn(rules, date, zone);
  const nextSession = sessionsBetween(rules, addDays(date, 1), addDays(localDateOf(new Date(), zone), settings.horizonDays), zone)[0];
  const benches = await listBenches();
  const { start, end } = dayBounds(date, zone);
  const units = await sequelize.query<{ bench_id: number; unit_start: Date; user_id: number; booking_id: number }>(
    'SELECT bu.bench_id, bu.unit_start, b.user_id, bu.booking_id FROM booking_units bu JOIN bookings b ON b.id = bu.booking_id ' +
      'WHERE bu.unit_start >= :start AND bu.unit_start < :end',
    { replacements: { start, end }, type: QueryTypes.SELECT },
  );
  const occupied = new Map<string, { userId: number; bookingId: number }>();
  for (const u of units) occupied.set(`${u.bench_id}|${u.unit_start.getTime()}`, { userId: u.user_id, bookingId: u.booking_id });
  const now = new Date();
  return {
    date,
    timeZone: zone,
    slotMinutes: settings.slotMinutes,
    sessions: sessionsDto(sessions),
    nextSessionDate: nextSession?.date ?? null,
    benches: benches.map((bench) => ({
      bench,
      slots: sessions.flatMap((s) =>
        slotsOf(s, settings.slotMinutes).map((slot) => {
          let status: SlotStatus = 'free';
          let bookingId: number | undefined;
          const holders = unitsOf(slot.start, slot.end)
            .map((u) => occupied.get(`${bench.id}|${u.getTime()}`))
            .filter((h): h is { userId: number; bookingId: number } => !!h);
          const mine = holders.find((h) => h.userId === user.id);
          if (mine) {
            status = 'yours';
            bookingId = mine.bookingId;
          } else if (holders.length) status = 'taken';
          else if (slot.start <= now) status = 'past';
          else if (outOfServiceAt(bench, slot.start)) status = 'out_of_service';
          return { start: slot.start.toISOString(), end: slot.end.toISOString(), status, ...(bookingId ? { bookingId } : {}) };
        }),
      ),
    })),
  };
}

async function ticketIdFor(sequelize: Sequelize, user: SessionUser, tag: string | null | undefined): Promise<number | null> {
  if (!tag) return null;
  const id = parseTag(tag);
  const rows = id
    ? await sequelize.query<{ owner_user_id: number | null; state: string }>('SELECT owner_user_id, state FROM tickets WHERE id = :id', {
        replacements: { id },
        type: QueryTypes.SELECT,
      })
    : [];
  const t = rows[0];
  if (!t || t.owner_user_id !== user.id || t.state === 'closed') {
    throw new ValidationError('No open ticket of yours has that tag.', { ticketTag: 'No open ticket of yours has that tag (e.g. RW-0042).' });
  }
  return id;
}

function isDeadlock(err: unknown): boolean {
  return (err as { parent?: { errno?: number } }).parent?.errno === 1213;
}

export async function createBooking(deps: BookingsDeps, user: SessionUser, input: CreateBookingBody): Promise<BookingRow> {
  const { sequelize, config } = deps;
  const settings = await readBookingSettings(sequelize);
  const zone = settings.timeZone;
  const benchModel = await Bench.findByPk(input.benchId);
  if (!benchModel) throw new ValidationError('There is no such bench.', { benchId: 'Pick one of the club benches.' });
  const bench = benchDto(benchModel);
  const start = new Date(input.start);
  const now = new Date();

  if (start <= now) throw new RuleError('slot_in_past', 'That slot has already started or passed. Pick a later slot.');
  const fit = fitSlots(sessionsOn(await listRules(), localDateOf(start, zone), zone), start, input.slotCount, settings.slotMinutes);
  if (!fit) {
    throw new RuleError(
      'outside_session',
      `That is not a run of ${input.slotCount} bench slot${input.slotCount > 1 ? 's' : ''} inside one opening session. Pick free slots shown for the day.`,
    );
  }
  if (start.getTime() - now.getTime() > settings.horizonDays * 86_400_000) {
    throw new RuleError('too_far_ahead', `Bench slots can be booked up to ${settings.horizonDays} days ahead. Pick an earlier date.`);
  }
  if (outOfServiceAt(bench, start) || outOfServiceAt(bench, new Date(fit.end.getTime() - 1))) {
    const until = bench.outOfServiceUntil ? ` until ${localWords(new Date(bench.outOfServiceUntil), zone)}` : '';
    throw new RuleError('bench_out_of_service', `${bench.name} is out of service${until}: ${bench.outOfServiceReason}. Pick another bench.`);
  }
  const ticketId = await ticketIdFor(sequelize, user, input.ticketTag);

  let bookingId: number;
  try {
    bookingId = await sequelize.transaction(async (transaction) => {
      // One member's bookings are made one at a time (the limit below is then exact).
      await sequelize.query('SELECT id FROM users WHERE id = :id FOR UPDATE', { replacements: { id: user.id }, type: QueryTypes.SELECT, transaction });
      const [open] = await sequelize.query<{ n: number }>(
        "SELECT COUNT(*) AS n FROM bookings WHERE user_id = :id AND status = 'booked' AND ends_at > :now",
        { replacements: { id: user.id, now }, type: QueryTypes.SELECT, transaction },
      );
      if (Number(open!.n) >= settings.maxOpenBookings) {
        throw new RuleError(
          'booking_limit',
          `You already have ${Number(open!.n)} open bookings, the club's limit of ${settings.maxOpenBookings}. Cancel one, or book again after one has passed.`,
        );
      }
      const booking = await Booking.create(
        {
          benchId: bench.id,
          userId: user.id,
          startsAt: start,
          endsAt: fit.end,
          slotCount: input.slotCount,
          purpose: input.purpose,
          ticketId,
          note: input.note ?? null,
        },
        { transaction },
      );
      const units = unitsOf(start, fit.end);
      await sequelize.query(`INSERT INTO booking_units (bench_id, unit_start, booking_id) VALUES ${units.map(() => '(?, ?, ?)').join(', ')}`, {
        replacements: units.flatMap((u) => [bench.id, u, booking.id]),
        transaction,
      });
      const when = `${localWords(start, zone)}–${localWords(fit.end, zone, 'HH:mm')}`;
      const link = `${config.RW_PUBLIC_URL.replace(/\/$/, '')}/bookings`;
      const what = BOOKING_PURPOSE_LABELS[input.purpose];
      const ticketLine = ticketId ? `Ticket: ${formatTag(ticketId)}\n` : '';
      await enqueueMail(transaction, {
        kind: 'booking_confirmed',
        to: user.email,
        subject: `Bench slot booked: ${bench.name}, ${localWords(start, zone, 'ccc d LLL HH:mm')}`,
        text:
          `Hello ${user.displayName},\n\nYour bench slot is booked.\n\nBench: ${bench.name}${bench.location ? ` (${bench.location})` : ''}\n` +
          `When: ${when} (${zone})\nFor: ${what}\n${ticketLine}\n` +
          `You can cancel up to ${settings.cancelCutoffHours} hours before the start: ${link}\n`,
        bookingId: booking.id,
        ticketId,
      });
      const due = reminderDueAt(start, zone);
      // Booked after the reminder's time (e.g. for tomorrow evening): the confirmation is enough.
      if (due > now) {
        await enqueueMail(transaction, {
          kind: 'booking_reminder',
          to: user.email,
          subject: `Reminder: bench slot tomorrow, ${bench.name} at ${localWords(start, zone, 'HH:mm')}`,
          text:
            `Hello ${user.displayName},\n\nA reminder of your bench slot tomorrow.\n\nBench: ${bench.name}\nWhen: ${when} (${zone})\nFor: ${what}\n${ticketLine}\n` +
            `If you cannot come, cancel it so someone else can use the bench: ${link}\n`,
          bookingId: booking.id,
          ticketId,
          sendAfter: due,
        });
      }
      return booking.id;
    });
  } catch (err) {
    if (err instanceof UniqueConstraintError || isDeadlock(err)) throw new ConflictError('slot_taken', SLOT_TAKEN_MESSAGE);
    throw err;
  }
  return toRow((await loadRow(sequelize, bookingId))!, settings, new Date());
}

const SORT_SQL: Record<ListBookingsQuery['sort'], string> = {
  startsAt: 'b.starts_at',
  createdAt: 'b.created_at',
  bench: 'be.name',
};

/** "My bench slots": the person's own bookings, paged and sorted. */
export async function listMyBookings(deps: BookingsDeps, user: SessionUser, q: ListBookingsQuery): Promise<Page<BookingRow>> {
  const { sequelize } = deps;
  const settings = await readBookingSettings(sequelize);
  const now = new Date();
  const when = {
    upcoming: "AND b.status = 'booked' AND b.ends_at > :now",
    past: "AND (b.status = 'cancelled' OR b.ends_at <= :now)",
    all: '',
  }[q.when];
  const where = `WHERE b.user_id = :userId ${when}`;
  const replacements = { userId: user.id, now, limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
  const [count] = await sequelize.query<{ n: number }>(`SELECT COUNT(*) AS n FROM bookings b ${where}`, { replacements, type: QueryTypes.SELECT });
  const rows = await sequelize.query<RowSql>(
    `${ROW_SELECT} ${where} ORDER BY ${SORT_SQL[q.sort]} ${q.dir === 'desc' ? 'DESC' : 'ASC'}, b.id ${q.dir === 'desc' ? 'DESC' : 'ASC'} LIMIT :limit OFFSET :offset`,
    { replacements, type: QueryTypes.SELECT },
  );
  return { items: rows.map((r) => toRow(r, settings, now)), total: Number(count!.n), page: q.page, pageSize: q.pageSize };
}

export async function getBooking(deps: BookingsDeps, user: SessionUser, id: number): Promise<BookingRow> {
  const row = await visibleRow(deps.sequelize, user, id);
  return toRow(row, await readBookingSettings(deps.sequelize), new Date());
}

/** 404 unless the booking is the person's own (checked before the body, so a stranger learns nothing from a 400). */
export async function assertOwnBooking(deps: BookingsDeps, user: SessionUser, id: number): Promise<void> {
  const row = await loadRow(deps.sequelize, id);
  if (!row || row.user_id !== user.id) throw notFound();
}

/** The member changes what the booking is for, its ticket or its note (times: cancel and book again). */
export async function changeBooking(deps: BookingsDeps, user: SessionUser, id: number, input: PatchBookingBody): Promise<BookingRow> {
  const { sequelize } = deps;
  const row = await loadRow(sequelize, id);
  if (!row || row.user_id !== user.id) throw notFound();
  if (row.status !== 'booked') throw new RuleError('booking_cancelled', 'This booking was cancelled; book a new slot instead.');
  if (row.starts_at <= new Date()) throw new RuleError('booking_started', 'This booking has already started; tell a technician at the bench instead.');
  const patch: Partial<Booking> = {};
  if (input.purpose !== undefined) patch.purpose = input.purpose;
  if (input.note !== undefined) patch.note = input.note;
  if (input.ticketTag !== undefined) patch.ticketId = await ticketIdFor(sequelize, user, input.ticketTag);
  await Booking.update(patch, { where: { id } });
  return getBooking(deps, user, id);
}

/**
 * Cancels a booking: its owner up to the cut-off, an admin at any time before it starts. Frees the
 * units and withdraws the pending reminder in the same transaction, so it is never sent.
 */
export async function cancelBooking(deps: BookingsDeps, user: SessionUser, id: number): Promise<BookingRow> {
  const { sequelize } = deps;
  const settings = await readBookingSettings(sequelize);
  const isAdmin = hasRole(user, 'admin');
  await sequelize.transaction(async (transaction) => {
    const row = await loadRow(sequelize, id, transaction);
    if (!row || (row.user_id !== user.id && !isAdmin)) throw notFound();
    await sequelize.query('SELECT id FROM bookings WHERE id = :id FOR UPDATE', { replacements: { id }, type: QueryTypes.SELECT, transaction });
    const fresh = (await loadRow(sequelize, id, transaction))!;
    const now = new Date();
    if (fresh.status === 'cancelled') throw new RuleError('booking_cancelled', 'This booking is already cancelled.');
    if (fresh.starts_at <= now) throw new RuleError('booking_started', 'This booking has already started or passed, so it cannot be cancelled.');
    if (!isAdmin && !canCancelBy(fresh, settings, now)) {
      throw new RuleError(
        'past_cutoff',
        `Bookings can be cancelled up to ${settings.cancelCutoffHours} hours before the start. Tell a technician at the bench if you cannot come.`,
      );
    }
    await sequelize.query("UPDATE bookings SET status = 'cancelled', cancelled_at = :now, updated_at = :now WHERE id = :id", {
      replacements: { id, now },
      transaction,
    });
    await sequelize.query('DELETE FROM booking_units WHERE booking_id = :id', { replacements: { id }, transaction });
    await sequelize.query("DELETE FROM outbox WHERE booking_id = :id AND kind = 'booking_reminder' AND status = 'pending'", {
      replacements: { id },
      transaction,
    });
  });
  return toRow((await loadRow(sequelize, id))!, settings, new Date());
}

/** Technicians mark (or unmark) a no-show once the booking has started. */
export async function markNoShow(deps: BookingsDeps, id: number, noShow: boolean): Promise<ScheduleEntry> {
  const { sequelize } = deps;
  const row = await loadRow(sequelize, id);
  if (!row) throw notFound();
  if (row.status !== 'booked') throw new RuleError('booking_cancelled', 'This booking was cancelled; there is no one to mark.');
  if (noShow && row.starts_at > new Date()) throw new RuleError('not_started', 'The booking has not started yet; mark a no-show once its time has come.');
  await Booking.update({ noShow }, { where: { id } });
  return toEntry((await loadRow(sequelize, id))!, await readBookingSettings(sequelize), new Date());
}

/** "Tonight at the bench": the day's open bookings, in start and bench order. */
export async function daySchedule(deps: BookingsDeps, date: string | undefined): Promise<DaySchedule> {
  const { sequelize } = deps;
  const settings = await readBookingSettings(sequelize);
  const zone = settings.timeZone;
  const day = date ?? localDateOf(new Date(), zone);
  const { start, end } = dayBounds(day, zone);
  const rows = await sequelize.query<RowSql>(
    `${ROW_SELECT} WHERE b.status = 'booked' AND b.starts_at >= :start AND b.starts_at < :end ORDER BY b.starts_at, be.name, b.id`,
    { replacements: { start, end }, type: QueryTypes.SELECT },
  );
  const now = new Date();
  return {
    date: day,
    timeZone: zone,
    sessions: sessionsDto(sessionsOn(await listRules(), day, zone)),
    entries: rows.map((r) => toEntry(r, settings, now)),
  };
}

