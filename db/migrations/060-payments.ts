// Fees and payments (issue 11): the fee schedule (items and their dated prices), charges on
// tickets and bookings (each copies its price, so a later price never alters it), waivers,
// payments (card through the provider, cash, bank transfer) with their allocation to charges,
// refunds, the provider's webhook events seen (idempotency by event id), and closed months.
// Every amount is an integer in minor units of the club's currency (club_settings.currency).
import { DataTypes, type QueryInterface } from 'sequelize';

const amount = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });
const userRef = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' });
const month = () => ({ type: DataTypes.CHAR(7), allowNull: false });

export async function up(qi: QueryInterface): Promise<void> {
  await qi.addColumn('club_settings', 'currency', { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'GBP' });

  await qi.createTable('fee_items', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    code: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(100), allowNull: false },
    unit: { type: DataTypes.ENUM('each', 'hour'), allowNull: false, defaultValue: 'each' },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.createTable('fee_prices', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    fee_item_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'fee_items', key: 'id' }, onDelete: 'CASCADE' },
    // The club's local date the price applies from (YYYY-MM-DD), as text: a date, not an instant.
    effective_from: { type: DataTypes.CHAR(10), allowNull: false },
    member_price: amount(),
    non_member_price: amount(),
    created_by: userRef(),
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('fee_prices', ['fee_item_id', 'effective_from'], { unique: true, name: 'fee_prices_item_date_unique' });

  await qi.createTable('charges', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'tickets', key: 'id' }, onDelete: 'RESTRICT' },
    booking_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'bookings', key: 'id' }, onDelete: 'RESTRICT' },
    fee_item_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'fee_items', key: 'id' }, onDelete: 'RESTRICT' },
    description: { type: DataTypes.STRING(200), allowNull: false },
    quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    unit_amount: amount(),
    amount: amount(),
    member_rate: { type: DataTypes.BOOLEAN, allowNull: false },
    ledger_month: month(),
    created_by: userRef(),
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('charges', ['ticket_id']);
  await qi.addIndex('charges', ['booking_id']);
  await qi.addIndex('charges', ['ledger_month']);

  await qi.createTable('waivers', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    charge_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'charges', key: 'id' }, onDelete: 'RESTRICT' },
    amount: amount(),
    reason: { type: DataTypes.STRING(500), allowNull: false },
    ledger_month: month(),
    adjustment: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_by: userRef(),
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('waivers', ['charge_id']);
  await qi.addIndex('waivers', ['ledger_month']);

  await qi.createTable('payments', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'tickets', key: 'id' }, onDelete: 'RESTRICT' },
    method: { type: DataTypes.ENUM('card', 'cash', 'bank_transfer'), allowNull: false },
    status: { type: DataTypes.ENUM('pending', 'succeeded', 'failed'), allowNull: false },
    amount: amount(),
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    reference: { type: DataTypes.STRING(100), allowNull: true },
    // One checkout per balance state: the same key answers a retried or repeated request.
    idempotency_key: { type: DataTypes.STRING(100), allowNull: true, unique: true },
    checkout_session_id: { type: DataTypes.STRING(100), allowNull: true, unique: true },
    checkout_url: { type: DataTypes.STRING(500), allowNull: true },
    payment_intent_id: { type: DataTypes.STRING(100), allowNull: true, unique: true },
    provider_charge_id: { type: DataTypes.STRING(100), allowNull: true, unique: true },
    failure_message: { type: DataTypes.STRING(200), allowNull: true },
    receipt_number: { type: DataTypes.STRING(20), allowNull: true, unique: true },
    paid_at: { type: DataTypes.DATE(3), allowNull: true },
    ledger_month: { type: DataTypes.CHAR(7), allowNull: true },
    recorded_by: userRef(),
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('payments', ['ticket_id', 'status']);
  await qi.addIndex('payments', ['ledger_month']);

  await qi.createTable('payment_allocations', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    payment_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'payments', key: 'id' }, onDelete: 'RESTRICT' },
    charge_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'charges', key: 'id' }, onDelete: 'RESTRICT' },
    amount: amount(),
  });
  await qi.addIndex('payment_allocations', ['payment_id', 'charge_id'], { unique: true, name: 'payment_allocations_pair_unique' });

  await qi.createTable('refunds', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    payment_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'payments', key: 'id' }, onDelete: 'RESTRICT' },
    amount: amount(),
    reason: { type: DataTypes.STRING(500), allowNull: false },
    provider_refund_id: { type: DataTypes.STRING(100), allowNull: true, unique: true },
    ledger_month: month(),
    adjustment: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    created_by: userRef(),
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('refunds', ['payment_id']);
  await qi.addIndex('refunds', ['ledger_month']);

  // Each provider event once: the primary key refuses a second insert of the same event id.
  await qi.createTable('webhook_events', {
    event_id: { type: DataTypes.STRING(100), primaryKey: true },
    type: { type: DataTypes.STRING(60), allowNull: false },
    object_id: { type: DataTypes.STRING(100), allowNull: true },
    outcome: { type: DataTypes.STRING(40), allowNull: false },
    received_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  await qi.createTable('month_closes', {
    month: { type: DataTypes.CHAR(7), primaryKey: true },
    closed_by: userRef(),
    closed_at: { type: DataTypes.DATE(3), allowNull: false },
    summary: { type: DataTypes.JSON, allowNull: false },
  });
}

export async function down(qi: QueryInterface): Promise<void> {
  for (const t of ['month_closes', 'webhook_events', 'refunds', 'payment_allocations', 'payments', 'waivers', 'charges', 'fee_prices', 'fee_items']) {
    await qi.dropTable(t);
  }
  await qi.sequelize.query('ALTER TABLE club_settings DROP COLUMN currency');
}
