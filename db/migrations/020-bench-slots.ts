// Bench slots: benches with their instruments, opening rules (weekly sessions, one-off sessions,
// closures) in the club's time zone, bookings, the per-bench booked time units that make double
// booking impossible, members' private calendar feeds, and the booking settings of the club.
// The outbox gains `send_after` (a mail may wait until its time, e.g. the day-before reminder)
// and `booking_id` (so cancelling a booking can withdraw its reminder in the same transaction).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.createTable('benches', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    name: { type: DataTypes.STRING(60), allowNull: false, unique: true },
    location: { type: DataTypes.STRING(120), allowNull: true },
    // [{ kind, name, maxCurrentA?, powerRatingW?, note? }] edited as a whole list by admins.
    instruments: { type: DataTypes.JSON, allowNull: false },
    out_of_service: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    out_of_service_reason: { type: DataTypes.STRING(200), allowNull: true },
    // null while out of service: until further notice.
    out_of_service_until: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  // Local dates ('YYYY-MM-DD') and wall-clock times ('HH:mm') in the club's time zone, kept as text:
  // they are not instants, and no driver or session time zone may shift them.
  await qi.createTable('opening_rules', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    kind: { type: DataTypes.ENUM('weekly', 'one_off', 'closure'), allowNull: false },
    weekday: { type: DataTypes.TINYINT.UNSIGNED, allowNull: true }, // ISO 8601: 1 Monday .. 7 Sunday
    start_time: { type: DataTypes.CHAR(5), allowNull: true },
    end_time: { type: DataTypes.CHAR(5), allowNull: true },
    valid_from: { type: DataTypes.CHAR(10), allowNull: true },
    valid_until: { type: DataTypes.CHAR(10), allowNull: true },
    note: { type: DataTypes.STRING(200), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await qi.createTable('bookings', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    bench_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'benches', key: 'id' }, onDelete: 'CASCADE' },
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    starts_at: { type: DataTypes.DATE(3), allowNull: false },
    ends_at: { type: DataTypes.DATE(3), allowNull: false },
    slot_count: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
    purpose: { type: DataTypes.ENUM('self_service', 'drop_off', 'collection'), allowNull: false },
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'tickets', key: 'id' }, onDelete: 'SET NULL' },
    note: { type: DataTypes.STRING(500), allowNull: true },
    status: { type: DataTypes.ENUM('booked', 'cancelled'), allowNull: false, defaultValue: 'booked' },
    no_show: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    cancelled_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('bookings', ['user_id', 'status', 'starts_at']);
  await qi.addIndex('bookings', ['starts_at']);

  // One row per booked 5-minute unit of a bench. The unique index is what refuses a double
  // booking: two transactions inserting the same (bench, unit) cannot both commit, whatever the
  // slot length or how many slots a booking spans. A cancelled booking's rows are deleted.
  await qi.createTable('booking_units', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    bench_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'benches', key: 'id' }, onDelete: 'CASCADE' },
    unit_start: { type: DataTypes.DATE, allowNull: false },
    booking_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'bookings', key: 'id' }, onDelete: 'CASCADE' },
  });
  await qi.addIndex('booking_units', ['bench_id', 'unit_start'], { unique: true, name: 'booking_units_bench_unit_unique' });
  await qi.addIndex('booking_units', ['booking_id']);

  // A member's private iCalendar feed: the secret is in the URL a calendar app polls, so it is kept
  // to show again; resetting replaces it (the old URL stops working at once).
  await qi.createTable('calendar_feeds', {
    user_id: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    token: { type: DataTypes.CHAR(43), allowNull: false, unique: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await qi.addColumn('club_settings', 'time_zone', { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' });
  await qi.addColumn('club_settings', 'slot_minutes', { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false, defaultValue: 30 });
  await qi.addColumn('club_settings', 'max_open_bookings', { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false, defaultValue: 3 });
  await qi.addColumn('club_settings', 'booking_horizon_days', { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false, defaultValue: 28 });
  await qi.addColumn('club_settings', 'cancel_cutoff_hours', { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false, defaultValue: 2 });

  await qi.addColumn('outbox', 'send_after', { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn('outbox', 'booking_id', {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: 'bookings', key: 'id' },
    onDelete: 'SET NULL',
  });
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.removeConstraint('outbox', 'outbox_booking_id_foreign_idx').catch(() => undefined);
  await qi.removeColumn('outbox', 'booking_id');
  await qi.removeColumn('outbox', 'send_after');
  for (const c of ['cancel_cutoff_hours', 'booking_horizon_days', 'max_open_bookings', 'slot_minutes', 'time_zone']) {
    await qi.removeColumn('club_settings', c);
  }
  await qi.dropTable('calendar_feeds');
  await qi.dropTable('booking_units');
  await qi.dropTable('bookings');
  await qi.dropTable('opening_rules');
  await qi.dropTable('benches');
}
