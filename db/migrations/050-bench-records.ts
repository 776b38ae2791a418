// Repair log, test sheets and hand-back (issue 7): work-log entries and parts used on a ticket,
// the club's test limits (one row per limit an admin has set; the code's defaults stand for the
// rest), test sheets with the limits they were judged by, the hand-back record, and mail
// attachments on the outbox (the test report goes to the owner as a PDF).
import { DataTypes, type QueryInterface } from 'sequelize';

const ticketRef = {
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: false,
  references: { model: 'tickets', key: 'id' },
  onDelete: 'CASCADE',
} as const;
const userRef = {
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: true,
  references: { model: 'users', key: 'id' },
  onDelete: 'SET NULL',
} as const;

export async function up(qi: QueryInterface): Promise<void> {
  await qi.createTable('repair_work', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: ticketRef,
    description: { type: DataTypes.STRING(1000), allowNull: false },
    minutes: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    technician_id: userRef,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('repair_work', ['ticket_id', 'created_at']);

  await qi.createTable('repair_parts', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: ticketRef,
    description: { type: DataTypes.STRING(200), allowNull: false },
    quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    // Integer minor units of the club's currency (pence, cents), per item.
    unit_cost_minor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    technician_id: userRef,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('repair_parts', ['ticket_id', 'created_at']);

  await qi.createTable('test_limits', {
    limit_key: { type: DataTypes.STRING(40), primaryKey: true },
    value: { type: DataTypes.DOUBLE, allowNull: false },
    source: { type: DataTypes.STRING(300), allowNull: false },
    updated_by: userRef,
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await qi.createTable('test_sheets', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: ticketRef,
    number: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    supply_voltage_v: { type: DataTypes.DOUBLE, allowNull: false },
    receive_current_a: { type: DataTypes.DOUBLE, allowNull: false },
    // [{ band, ratedW, forwardW, reflectedW, nominalHz?, measuredHz? }]: the readings as taken.
    bands: { type: DataTypes.JSON, allowNull: false },
    // The club's limits with their sources when the sheet was saved: a later change of the limits
    // does not change an old sheet's verdict.
    limits: { type: DataTypes.JSON, allowNull: false },
    reference: { type: DataTypes.STRING(200), allowNull: true },
    notes: { type: DataTypes.STRING(2000), allowNull: true },
    passed: { type: DataTypes.BOOLEAN, allowNull: false },
    technician_id: userRef,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('test_sheets', ['ticket_id', 'number'], { unique: true, name: 'test_sheets_ticket_number_unique' });

  await qi.createTable('hand_backs', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: ticketRef,
    // [{ item, returned, note }] for each accessory handed in; [{ item, note }] for anything extra.
    items: { type: DataTypes.JSON, allowNull: false },
    extras: { type: DataTypes.JSON, allowNull: false },
    collected_by: { type: DataTypes.STRING(100), allowNull: false },
    collected_at: { type: DataTypes.DATE(3), allowNull: false },
    technician_id: userRef,
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('hand_backs', ['ticket_id', 'created_at']);

  await qi.addColumn('outbox', 'attachment_name', { type: DataTypes.STRING(200), allowNull: true });
  await qi.addColumn('outbox', 'attachment_type', { type: DataTypes.STRING(100), allowNull: true });
  // A test report is a few tens of kB; MEDIUMBLOB holds up to 16 MB.
  await qi.sequelize.query('ALTER TABLE outbox ADD COLUMN attachment_content MEDIUMBLOB NULL');
}

export async function down(qi: QueryInterface): Promise<void> {
  // Not qi.removeColumn: see 004-club-name.
  await qi.sequelize.query('ALTER TABLE outbox DROP COLUMN attachment_content, DROP COLUMN attachment_type, DROP COLUMN attachment_name');
  await qi.dropTable('hand_backs');
  await qi.dropTable('test_sheets');
  await qi.dropTable('test_limits');
  await qi.dropTable('repair_parts');
  await qi.dropTable('repair_work');
}
