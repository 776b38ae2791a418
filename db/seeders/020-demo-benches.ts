// Seeder: the demo club's benches and their instruments, its opening sessions (two club evenings a
// week and a Saturday morning, in Europe/London) and a few bookings in the coming sessions.
// Invented names throughout; bookings are written directly (no mail is queued for demo data).
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Instrument } from '../../api/src/contracts/bookings';
import { addDays, localDateOf, sessionsBetween, slotsOf, unitsOf, type OpeningRuleFacts } from '../../api/src/domain/bench-slots';

const BENCHES: { name: string; location: string; instruments: Instrument[] }[] = [
  {
    name: 'Heron bench',
    location: 'Clubhouse, workshop by the window',
    instruments: [
      { kind: 'regulated_supply', name: 'Regulated supply 13.8 V', maxCurrentA: 30 },
      { kind: 'dummy_load', name: 'Oil-cooled dummy load', powerRatingW: 1000 },
      { kind: 'wattmeter', name: 'Through-line wattmeter, 1.8-54 MHz' },
      { kind: 'oscilloscope', name: 'Two-channel oscilloscope, 100 MHz' },
      { kind: 'soldering_station', name: 'Temperature-controlled soldering station' },
    ],
  },
  {
    name: 'Bittern bench',
    location: 'Clubhouse, back room',
    instruments: [
      { kind: 'regulated_supply', name: 'Regulated supply 13.8 V', maxCurrentA: 25 },
      { kind: 'dummy_load', name: 'Dry dummy load', powerRatingW: 150 },
      { kind: 'spectrum_analyser', name: 'Spectrum analyser with tracking generator, 1.5 GHz' },
      { kind: 'multimeter', name: 'Bench multimeter' },
      { kind: 'hot_air_station', name: 'Hot-air rework station', note: 'Ask a technician before use' },
    ],
  },
];

const RULES: Omit<OpeningRuleFacts, 'id'>[] = [
  { kind: 'weekly', weekday: 2, startTime: '19:00', endTime: '22:00', validFrom: null, validUntil: null, note: 'Club evening' },
  { kind: 'weekly', weekday: 4, startTime: '19:00', endTime: '22:00', validFrom: null, validUntil: null, note: 'Club evening' },
  { kind: 'weekly', weekday: 6, startTime: '09:30', endTime: '12:30', validFrom: null, validUntil: null, note: 'Saturday morning bench' },
];

/** Bookings in the next sessions: [session index, bench index, first slot, slot count, member e-mail, purpose]. */
const BOOKINGS: [number, number, number, number, string, 'self_service' | 'drop_off' | 'collection'][] = [
  [0, 0, 0, 2, 'member@kestrelfen.example', 'self_service'],
  [0, 1, 1, 1, 'morwenna.tulk@kestrelfen.example', 'drop_off'],
  [0, 0, 3, 2, 'idris.pennock@kestrelfen.example', 'self_service'],
  [1, 1, 0, 1, 'aurelie.dunmore@kestrelfen.example', 'collection'],
  [1, 0, 2, 3, 'cassian.fell@kestrelfen.example', 'self_service'],
  [2, 0, 1, 2, 'nell.rookwood@kestrelfen.example', 'drop_off'],
];

export async function up({ context: sequelize }: { context: Sequelize }): Promise<void> {
  const now = new Date();
  const benchIds: number[] = [];
  for (const b of BENCHES) {
    const [id] = await sequelize.query(
      'INSERT INTO benches (name, location, instruments, out_of_service, created_at, updated_at) VALUES (:name, :location, :instruments, false, :now, :now)',
      { replacements: { ...b, instruments: JSON.stringify(b.instruments), now }, type: QueryTypes.INSERT },
    );
    benchIds.push(Number(id));
  }
  for (const r of RULES) {
    await sequelize.query(
      'INSERT INTO opening_rules (kind, weekday, start_time, end_time, valid_from, valid_until, note, created_at, updated_at) ' +
        'VALUES (:kind, :weekday, :startTime, :endTime, :validFrom, :validUntil, :note, :now, :now)',
      { replacements: { ...r, now }, type: QueryTypes.INSERT },
    );
  }
  const [settings] = await sequelize.query<{ time_zone: string; slot_minutes: number }>('SELECT time_zone, slot_minutes FROM club_settings WHERE id = 1', {
    type: QueryTypes.SELECT,
  });
  const zone = settings?.time_zone ?? 'Europe/London';
  const slotMinutes = Number(settings?.slot_minutes ?? 30);
  const today = localDateOf(now, zone);
  const sessions = sessionsBetween(RULES.map((r, i) => ({ ...r, id: i + 1 })), today, addDays(today, 14), zone).filter((s) => s.end > now);
  for (const [si, bi, first, count, email, purpose] of BOOKINGS) {
    const session = sessions[si];
    if (!session) continue;
    const slots = slotsOf(session, slotMinutes).slice(first, first + count);
    if (slots.length < count || slots[0]!.start <= now) continue;
    const [user] = await sequelize.query<{ id: number }>('SELECT id FROM users WHERE email = :email', { replacements: { email }, type: QueryTypes.SELECT });
    if (!user) continue;
    const start = slots[0]!.start;
    const end = slots[slots.length - 1]!.end;
    const [bookingId] = await sequelize.query(
      'INSERT INTO bookings (bench_id, user_id, starts_at, ends_at, slot_count, purpose, status, no_show, created_at, updated_at) ' +
        "VALUES (:bench, :user, :start, :end, :count, :purpose, 'booked', false, :now, :now)",
      { replacements: { bench: benchIds[bi], user: user.id, start, end, count, purpose, now }, type: QueryTypes.INSERT },
    );
    for (const unit of unitsOf(start, end)) {
      await sequelize.query('INSERT INTO booking_units (bench_id, unit_start, booking_id) VALUES (?, ?, ?)', { replacements: [benchIds[bi], unit, bookingId] });
    }
  }
}

export async function down({ context: sequelize }: { context: Sequelize }): Promise<void> {
  await sequelize.query('DELETE FROM benches WHERE name IN (:names)', { replacements: { names: BENCHES.map((b) => b.name) } });
  await sequelize.query('DELETE FROM opening_rules');
}
