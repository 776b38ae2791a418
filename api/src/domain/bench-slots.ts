// Bench slots: opening sessions from the club's rules, the slots inside them, and the booked time
// units that keep two bookings of one bench apart.
//
// Sessions are wall-clock times in the club's IANA time zone ("Tuesdays 19:00-22:00 in
// Europe/London"): each session is turned into UTC instants for its own date through luxon, which
// reads the IANA time-zone database (through the runtime's Intl/ICU data), so a 19:00 session is at
// 19:00 local before and after a daylight-saving change, never a hand-written offset.
// Server-only (luxon is not in the client bundle); plain functions, no framework imports.
import { DateTime, IANAZone } from 'luxon';

/** Bookings are stored as 5-minute units; slot lengths and session times are whole units. */
export const UNIT_MINUTES = 5;
/** The day-before reminder goes out at this local time on the day before the booking. */
export const REMINDER_LOCAL_TIME = '10:00';

export const RULE_KINDS = ['weekly', 'one_off', 'closure'] as const;
export type RuleKind = (typeof RULE_KINDS)[number];

export interface OpeningRuleFacts {
  id: number;
  kind: RuleKind;
  /** ISO weekday, 1 Monday .. 7 Sunday (weekly rules). */
  weekday: number | null;
  /** 'HH:mm' local wall-clock time (weekly and one-off). */
  startTime: string | null;
  endTime: string | null;
  /** 'YYYY-MM-DD' local dates, both included. One-off: the day (validFrom = validUntil). Closure: the days closed. */
  validFrom: string | null;
  validUntil: string | null;
  note: string | null;
}

export interface Session {
  ruleId: number;
  date: string;
  startTime: string;
  endTime: string;
  start: Date;
  end: Date;
  note: string | null;
}

export interface Slot {
  start: Date;
  end: Date;
}

const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;
const TIME_RE = /^([01]\d|2[0-3]):[0-5]\d$/;

export function isValidTimeZone(zone: string): boolean {
  return IANAZone.isValidZone(zone);
}

export function isLocalDate(text: string): boolean {
  return DATE_RE.test(text) && DateTime.fromISO(text, { zone: 'UTC' }).isValid;
}

export function isWallClockTime(text: string, multipleOfMinutes = UNIT_MINUTES): boolean {
  return TIME_RE.test(text) && minutesOf(text) % multipleOfMinutes === 0;
}

export function minutesOf(time: string): number {
  const [h, m] = time.split(':').map(Number);
  return h! * 60 + m!;
}

/** The instant of a local date and wall-clock time in `zone` (a time skipped by a spring change moves forward, as luxon does). */
export function localInstant(date: string, time: string, zone: string): Date {
  const dt = DateTime.fromISO(`${date}T${time}`, { zone });
  if (!dt.isValid) throw new Error(`Not a local time: ${date} ${time} in ${zone}`);
  return dt.toJSDate();
}

/** The local calendar date ('YYYY-MM-DD') of an instant in `zone`. */
export function localDateOf(instant: Date, zone: string): string {
  return DateTime.fromJSDate(instant, { zone }).toISODate()!;
}

/** The local wall-clock time ('HH:mm') of an instant in `zone`. */
export function localTimeOf(instant: Date, zone: string): string {
  return DateTime.fromJSDate(instant, { zone }).toFormat('HH:mm');
}

/** First and last instant of a local day: [midnight, next midnight). 23 or 25 hours long on change days. */
export function dayBounds(date: string, zone: string): { start: Date; end: Date } {
  const start = DateTime.fromISO(date, { zone }).startOf('day');
  return { start: start.toJSDate(), end: start.plus({ days: 1 }).toJSDate() };
}

export function addDays(date: string, days: number): string {
  return DateTime.fromISO(date, { zone: 'UTC' }).plus({ days }).toISODate()!;
}

function within(date: string, from: string | null, until: string | null): boolean {
  return (!from || date >= from) && (!until || date <= until);
}

/**
 * The opening sessions of one local date: weekly rules for that weekday inside their date range,
 * and one-off sessions on that date, unless a closure covers the date (a closure closes the whole
 * day, one-offs included). Sorted by start; a session repeated by two rules appears once.
 */
export function sessionsOn(rules: readonly OpeningRuleFacts[], date: string, zone: string): Session[] {
  if (rules.some((r) => r.kind === 'closure' && within(date, r.validFrom, r.validUntil))) return [];
  const weekday = DateTime.fromISO(date, { zone: 'UTC' }).weekday;
  const out: Session[] = [];
  const seen = new Set<string>();
  for (const r of rules) {
    if (!r.startTime || !r.endTime) continue;
    const applies =
      (r.kind === 'weekly' && r.weekday === weekday && within(date, r.validFrom, r.validUntil)) ||
      (r.kind === 'one_off' && r.validFrom === date);
    if (!applies) continue;
    const key = `${r.startTime}-${r.endTime}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const start = localInstant(date, r.startTime, zone);
    const end = localInstant(date, r.endTime, zone);
    if (end <= start) continue;
    out.push({ ruleId: r.id, date, startTime: r.startTime, endTime: r.endTime, start, end, note: r.note });
  }
  return out.sort((a, b) => a.start.getTime() - b.start.getTime());
}

/** Sessions of every date from `fromDate` to `toDate` (both included). */
export function sessionsBetween(rules: readonly OpeningRuleFacts[], fromDate: string, toDate: string, zone: string): Session[] {
  const out: Session[] = [];
  for (let d = fromDate; d <= toDate; d = addDays(d, 1)) out.push(...sessionsOn(rules, d, zone));
  return out;
}

/**
 * The slots of a session: consecutive `slotMinutes` from its start, counted in elapsed time (so a
 * session spanning a change of offset still has slots of the real length); a last part shorter
 * than a slot is not offered.
 */
export function slotsOf(session: Pick<Session, 'start' | 'end'>, slotMinutes: number): Slot[] {
  const step = slotMinutes * 60_000;
  const out: Slot[] = [];
  for (let t = session.start.getTime(); t + step <= session.end.getTime(); t += step) {
    out.push({ start: new Date(t), end: new Date(t + step) });
  }
  return out;
}

/**
 * Where `count` consecutive slots from `start` fit inside one of the sessions, on the slot grid:
 * the session and the end instant, or null.
 */
export function fitSlots(sessions: readonly Session[], start: Date, count: number, slotMinutes: number): { session: Session; end: Date } | null {
  const step = slotMinutes * 60_000;
  for (const s of sessions) {
    const offset = start.getTime() - s.start.getTime();
    const end = new Date(start.getTime() + count * step);
    if (offset >= 0 && offset % step === 0 && end <= s.end) return { session: s, end };
  }
  return null;
}

/** The 5-minute units from `start` (inclusive) to `end` (exclusive): what a booking occupies. */
export function unitsOf(start: Date, end: Date): Date[] {
  const step = UNIT_MINUTES * 60_000;
  const out: Date[] = [];
  for (let t = start.getTime(); t < end.getTime(); t += step) out.push(new Date(t));
  return out;
}

/** When the day-before reminder of a booking starting at `start` is due (REMINDER_LOCAL_TIME, local, the day before). */
export function reminderDueAt(start: Date, zone: string): Date {
  return localInstant(addDays(localDateOf(start, zone), -1), REMINDER_LOCAL_TIME, zone);
}
