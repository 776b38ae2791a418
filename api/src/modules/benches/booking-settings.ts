// The club's booking settings: columns of the club_settings row (id 1), read on each request so
// every API replica sees a change at once.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { BookingSettings } from '../../contracts/bookings';
import type { PatchSettingsBody } from './benches.schemas';

export const DEFAULT_BOOKING_SETTINGS: BookingSettings = {
  timeZone: 'Europe/London',
  slotMinutes: 30,
  maxOpenBookings: 3,
  horizonDays: 28,
  cancelCutoffHours: 2,
};

const COLUMNS: Record<keyof BookingSettings, string> = {
  timeZone: 'time_zone',
  slotMinutes: 'slot_minutes',
  maxOpenBookings: 'max_open_bookings',
  horizonDays: 'booking_horizon_days',
  cancelCutoffHours: 'cancel_cutoff_hours',
};

export async function readBookingSettings(sequelize: Sequelize, transaction?: Transaction): Promise<BookingSettings> {
  const rows = await sequelize.query<Record<string, string | number>>(
    `SELECT ${Object.values(COLUMNS).join(', ')} FROM club_settings WHERE id = 1`,
    { type: QueryTypes.SELECT, transaction },
  );
  const row = rows[0];
  if (!row) return { ...DEFAULT_BOOKING_SETTINGS };
  return {
    timeZone: String(row.time_zone),
    slotMinutes: Number(row.slot_minutes),
    maxOpenBookings: Number(row.max_open_bookings),
    horizonDays: Number(row.booking_horizon_days),
    cancelCutoffHours: Number(row.cancel_cutoff_hours),
  };
}

export async function updateBookingSettings(sequelize: Sequelize, patch: PatchSettingsBody): Promise<BookingSettings> {
  const next = { ...(await readBookingSettings(sequelize)), ...patch };
  const cols = Object.values(COLUMNS);
  const values = Object.keys(COLUMNS).map((k) => `:${k}`);
  // An upsert, so it also works when the settings row was emptied (a test reset).
  await sequelize.query(
    `INSERT INTO club_settings (id, ${cols.join(', ')}) VALUES (1, ${values.join(', ')}) ` +
      `ON DUPLICATE KEY UPDATE ${cols.map((c) => `${c} = VALUES(${c})`).join(', ')}`,
    { replacements: next },
  );
  return next;
}
