// Tickets (one piece of equipment from one owner), their audit events, the mail outbox, and the
// club settings row (wait limit, board revision).
// The tag number a person quotes (RW-0042) is derived from the id, so it is not stored.
import { DataTypes, type QueryInterface } from 'sequelize';

const STATES = ['intake', 'diagnosis', 'reflash', 'repair', 'bench_test', 'return', 'closed'];

export async function up(qi: QueryInterface): Promise<void> {
  await qi.createTable('tickets', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    owner_user_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    owner_name: { type: DataTypes.STRING(100), allowNull: false },
    owner_email: { type: DataTypes.STRING(254), allowNull: false },
    owner_phone: { type: DataTypes.STRING(40), allowNull: true },
    owner_call_sign: { type: DataTypes.STRING(12), allowNull: true },
    equipment_kind: {
      type: DataTypes.ENUM('transceiver', 'amplifier', 'tuner', 'power_supply', 'cable', 'accessory', 'other'),
      allowNull: false,
    },
    make_model: { type: DataTypes.STRING(120), allowNull: false },
    serial_number: { type: DataTypes.STRING(60), allowNull: true },
    units: { type: DataTypes.JSON, allowNull: false },
    fault_reported: { type: DataTypes.TEXT, allowNull: false },
    accessories: { type: DataTypes.JSON, allowNull: false },
    firmware_versions: { type: DataTypes.STRING(500), allowNull: true },
    reflash_consent: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    notify_by_email: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    state: { type: DataTypes.ENUM(...STATES), allowNull: false, defaultValue: 'intake' },
    state_since: { type: DataTypes.DATE(3), allowNull: false },
    technician_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    awaiting_approval: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    parts_on_order: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    // Optimistic locking: a move names the version it saw; a stale one gets 409.
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('tickets', ['state', 'state_since']);
  await qi.addIndex('tickets', ['owner_user_id', 'created_at']);

  await qi.createTable('ticket_events', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'tickets', key: 'id' },
      onDelete: 'CASCADE',
    },
    actor_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    kind: { type: DataTypes.ENUM('opened', 'moved', 'note'), allowNull: false },
    from_state: { type: DataTypes.ENUM(...STATES), allowNull: true },
    to_state: { type: DataTypes.ENUM(...STATES), allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('ticket_events', ['ticket_id', 'created_at']);

  await qi.createTable('outbox', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(200), allowNull: false },
    text_body: { type: DataTypes.TEXT, allowNull: false },
    ticket_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'tickets', key: 'id' },
      onDelete: 'SET NULL',
    },
    status: { type: DataTypes.ENUM('pending', 'sent', 'failed'), allowNull: false, defaultValue: 'pending' },
    attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    next_attempt_at: { type: DataTypes.DATE(3), allowNull: false },
    // Set while a worker holds the row, so two workers never send one mail twice.
    locked_until: { type: DataTypes.DATE(3), allowNull: true },
    last_error: { type: DataTypes.STRING(500), allowNull: true },
    sent_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('outbox', ['status', 'next_attempt_at']);

  // One row (id 1) of club-wide settings. board_revision is bumped in the same transaction as
  // every ticket write, so any API replica can tell with one tiny read whether its cached board
  // JSON is still current (no in-process state that a second replica would miss).
  await qi.createTable('club_settings', {
    id: { type: DataTypes.TINYINT.UNSIGNED, primaryKey: true },
    // Hours a ticket may wait in one lane before its card gets an amber edge.
    wait_limit_hours: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 72 },
    board_revision: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false, defaultValue: 0 },
  });
  await qi.bulkInsert('club_settings', [{ id: 1, wait_limit_hours: 72, board_revision: 0 }]);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.dropTable('club_settings');
  await qi.dropTable('outbox');
  await qi.dropTable('ticket_events');
  await qi.dropTable('tickets');
}
