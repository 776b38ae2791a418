// Diagnosis records, reflash consent recorded after intake, quotes with their lines, and the
// owner's signed links (approval and status), plus the club's currency and approval threshold.
// Issue 7 (diagnosis, notes, quote and owner approval, owner's status page).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  // One diagnosis record per ticket, saved as a whole while the ticket is in Diagnosis.
  await qi.createTable('ticket_diagnoses', {
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true, references: { model: 'tickets', key: 'id' }, onDelete: 'CASCADE' },
    // { [checkKey]: { done, result } } for the first checks (diagnosis.schemas.ts lists the keys).
    checks: { type: DataTypes.JSON, allowNull: false },
    // Measurements in their units; null when not measured.
    supply_at_radio_v: { type: DataTypes.DECIMAL(6, 3), allowNull: true },
    idle_current_a: { type: DataTypes.DECIMAL(7, 3), allowNull: true },
    transmit_current_a: { type: DataTypes.DECIMAL(7, 3), allowNull: true },
    // The DC lead as found (for the lead calculator): one-way length and gauge ("awg:12", "mm2:2.5").
    lead_length_m: { type: DataTypes.DECIMAL(6, 2), allowNull: true },
    lead_gauge: { type: DataTypes.STRING(12), allowNull: true },
    source_supply_v: { type: DataTypes.DECIMAL(6, 3), allowNull: true },
    findings: { type: DataTypes.TEXT, allowNull: true },
    decision: { type: DataTypes.STRING(20), allowNull: true },
    return_reason: { type: DataTypes.STRING(500), allowNull: true },
    updated_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  // Who recorded the owner's consent to a reflash, how and when (the flag stays tickets.reflash_consent).
  await qi.createTable('reflash_consents', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'tickets', key: 'id' }, onDelete: 'CASCADE' },
    method: { type: DataTypes.STRING(20), allowNull: false }, // phone | in_person | owner_link
    recorded_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    note: { type: DataTypes.STRING(500), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('reflash_consents', ['ticket_id']);

  await qi.createTable('quotes', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'tickets', key: 'id' }, onDelete: 'CASCADE' },
    // pending (waits for the owner) | approved | declined | not_needed (at or below the threshold) | superseded
    status: { type: DataTypes.STRING(20), allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    total_minor: { type: DataTypes.BIGINT, allowNull: false },
    threshold_minor: { type: DataTypes.BIGINT, allowNull: false },
    note: { type: DataTypes.STRING(500), allowNull: true },
    created_by: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    decided_at: { type: DataTypes.DATE(3), allowNull: true },
    decline_reason: { type: DataTypes.STRING(500), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('quotes', ['ticket_id', 'status']);

  await qi.createTable('quote_lines', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    quote_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'quotes', key: 'id' }, onDelete: 'CASCADE' },
    position: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false },
    // Quantity in hundredths (1.5 hours = 150), so it stays an integer.
    quantity_hundredths: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    unit_price_minor: { type: DataTypes.BIGINT, allowNull: false },
    line_total_minor: { type: DataTypes.BIGINT, allowNull: false },
  });

  // Links the owner opens without an account. Only the SHA-256 of the random token is stored.
  await qi.createTable('owner_links', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    purpose: { type: DataTypes.STRING(10), allowNull: false }, // approve | status
    ticket_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'tickets', key: 'id' }, onDelete: 'CASCADE' },
    quote_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'quotes', key: 'id' }, onDelete: 'CASCADE' },
    expires_at: { type: DataTypes.DATE(3), allowNull: true },
    used_at: { type: DataTypes.DATE(3), allowNull: true },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });

  // The club's currency (ISO 4217 code) and the quote total above which the owner must approve.
  await qi.addColumn('club_settings', 'currency_code', { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'GBP' });
  await qi.addColumn('club_settings', 'approval_threshold_minor', { type: DataTypes.BIGINT, allowNull: false, defaultValue: 5000 });
}

export async function down(qi: QueryInterface): Promise<void> {
  // Not qi.removeColumn: see 004-club-name.
  await qi.sequelize.query('ALTER TABLE club_settings DROP COLUMN approval_threshold_minor');
  await qi.sequelize.query('ALTER TABLE club_settings DROP COLUMN currency_code');
  await qi.dropTable('owner_links');
  await qi.dropTable('quote_lines');
  await qi.dropTable('quotes');
  await qi.dropTable('reflash_consents');
  await qi.dropTable('ticket_diagnoses');
}
