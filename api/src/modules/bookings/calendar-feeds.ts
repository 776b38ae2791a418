// iCalendar feeds through ical-generator: a member's private feed of their bookings (behind a
// secret token in the URL, which they can reset) and the club's public feed of opening sessions.
// Events are written in UTC (DTSTART:...Z), so a calendar shows them in its own zone correctly.
import { randomBytes } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import ical from 'ical-generator';
import type { Config } from '../../config';
import { NotFoundError } from '../../errors';
import { BOOKING_PURPOSE_LABELS, type BookingPurpose, type CalendarFeedLink } from '../../contracts/bookings';
import { addDays, localDateOf, sessionsBetween } from '../../domain/bench-slots';
import type { SessionUser } from '../auth/session-user';
import { formatTag } from '../tickets/tag';
import { listRules } from '../benches/benches.service';
import { readBookingSettings } from '../benches/booking-settings';

export interface FeedDeps {
  sequelize: Sequelize;
  config: Pick<Config, 'RW_PUBLIC_URL'>;
}

const PROD_ID = { company: 'Rigwright', product: 'Bench slots', language: 'EN' };
/** How far back the member feed reaches; the sessions feed shows a week back and the booking horizon ahead. */
const MEMBER_FEED_DAYS_BACK = 90;

const base = (config: FeedDeps['config']) => config.RW_PUBLIC_URL.replace(/\/$/, '');
const memberUrl = (config: FeedDeps['config'], token: string) => `${base(config)}/api/bookings/calendar/member.ics?token=${token}`;
const publicUrl = (config: FeedDeps['config']) => `${base(config)}/api/bookings/calendar/sessions.ics`;

export async function feedLink(deps: FeedDeps, user: SessionUser): Promise<CalendarFeedLink> {
  const rows = await deps.sequelize.query<{ token: string }>('SELECT token FROM calendar_feeds WHERE user_id = :id', {
    replacements: { id: user.id },
    type: QueryTypes.SELECT,
  });
  return { url: rows[0] ? memberUrl(deps.config, rows[0].token) : null, publicUrl: publicUrl(deps.config) };
}

/** Makes a new secret for the person's feed; the old address stops working at once. */
export async function resetFeed(deps: FeedDeps, user: SessionUser): Promise<CalendarFeedLink> {
  const token = randomBytes(32).toString('base64url');
  await deps.sequelize.query(
    'INSERT INTO calendar_feeds (user_id, token, created_at) VALUES (:id, :token, :now) ON DUPLICATE KEY UPDATE token = VALUES(token), created_at = VALUES(created_at)',
    { replacements: { id: user.id, token, now: new Date() } },
  );
  return { url: memberUrl(deps.config, token), publicUrl: publicUrl(deps.config) };
}

export async function memberFeed(deps: FeedDeps, token: string): Promise<string> {
  const { sequelize } = deps;
  const owners = await sequelize.query<{ user_id: number; display_name: string }>(
    'SELECT f.user_id, u.display_name FROM calendar_feeds f JOIN users u ON u.id = f.user_id WHERE f.token = :token AND u.disabled = false',
    { replacements: { token }, type: QueryTypes.SELECT },
  );
  const owner = owners[0];
  if (!owner) throw new NotFoundError('This calendar link is not valid (it may have been reset). Copy the current link from My bench slots.', 'feed_not_found');
  const rows = await sequelize.query<{ id: number; starts_at: Date; ends_at: Date; purpose: BookingPurpose; ticket_id: number | null; note: string | null; bench_name: string; location: string | null; updated_at: Date }>(
    "SELECT b.id, b.starts_at, b.ends_at, b.purpose, b.ticket_id, b.note, b.updated_at, be.name AS bench_name, be.location FROM bookings b JOIN benches be ON be.id = b.bench_id " +
      "WHERE b.user_id = :id AND b.status = 'booked' AND b.ends_at > :since ORDER BY b.starts_at",
    { replacements: { id: owner.user_id, since: new Date(Date.now() - MEMBER_FEED_DAYS_BACK * 86_400_000) }, type: QueryTypes.SELECT },
  );
  const cal = ical({ name: `Bench slots of ${owner.display_name}`, prodId: PROD_ID, ttl: 3600 });
  for (const r of rows) {
    cal.createEvent({
      id: `booking-${r.id}@rigwright.local`,
      start: r.starts_at,
      end: r.ends_at,
      stamp: r.updated_at,
      summary: `Bench slot: ${r.bench_name} (${BOOKING_PURPOSE_LABELS[r.purpose]})`,
      location: r.location ?? r.bench_name,
      description: [r.ticket_id ? `Ticket ${formatTag(r.ticket_id)}` : null, r.note].filter(Boolean).join('\n') || null,
    });
  }
  return cal.toString();
}

export async function sessionsFeed(deps: FeedDeps): Promise<string> {
  const settings = await readBookingSettings(deps.sequelize);
  const today = localDateOf(new Date(), settings.timeZone);
  const sessions = sessionsBetween(await listRules(), addDays(today, -7), addDays(today, settings.horizonDays), settings.timeZone);
  const cal = ical({ name: 'Bench opening sessions', prodId: PROD_ID, ttl: 3600 });
  for (const s of sessions) {
    cal.createEvent({
      id: `session-${s.date}-${s.startTime.replace(':', '')}@rigwright.local`,
      start: s.start,
      end: s.end,
      summary: s.note ? `Bench open: ${s.note}` : 'Bench open',
    });
  }
  return cal.toString();
}
