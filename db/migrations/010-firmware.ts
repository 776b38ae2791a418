// The Firmware library (images are stored by SHA-256 outside the database; rows hold what they
// are for and their checksums), flash attempts on tickets, and the firmware now on each unit of a
// ticket (set by an attempt verified running).
import { DataTypes, type QueryInterface } from 'sequelize';

const UNITS = ['display_head', 'main_board', 'dsp', 'other'];

export async function up(qi: QueryInterface): Promise<void> {
  await qi.createTable('firmware_images', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    model: { type: DataTypes.STRING(120), allowNull: false },
    // Lower case with single spaces: how a ticket's make/model is matched to its images.
    model_key: { type: DataTypes.STRING(120), allowNull: false },
    unit: { type: DataTypes.ENUM(...UNITS), allowNull: false },
    version: { type: DataTypes.STRING(40), allowNull: false },
    release_notes: { type: DataTypes.TEXT, allowNull: true },
    source: { type: DataTypes.STRING(300), allowNull: true },
    original_name: { type: DataTypes.STRING(255), allowNull: true },
    size: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    crc32: { type: DataTypes.CHAR(8), allowNull: false },
    crc16_xmodem: { type: DataTypes.CHAR(4), allowNull: false },
    maker_checksum_kind: { type: DataTypes.ENUM('sha256', 'crc32', 'crc16Xmodem'), allowNull: true },
    known_good: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    withdrawn_at: { type: DataTypes.DATE(3), allowNull: true },
    withdrawn_reason: { type: DataTypes.STRING(500), allowNull: true },
    uploaded_by: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  // Identical bytes for the same model and unit are one entry (a second upload is refused).
  await qi.addIndex('firmware_images', ['model_key', 'unit', 'sha256'], { unique: true, name: 'firmware_images_identity' });
  await qi.addIndex('firmware_images', ['created_at']);

  await qi.createTable('flash_attempts', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'tickets', key: 'id' },
      onDelete: 'CASCADE',
    },
    number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    unit: { type: DataTypes.ENUM(...UNITS), allowNull: false },
    firmware_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'firmware_images', key: 'id' },
      onDelete: 'RESTRICT',
    },
    serial_port: { type: DataTypes.STRING(60), allowNull: false },
    baud: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    data_bits: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
    parity: { type: DataTypes.ENUM('none', 'even', 'odd', 'mark', 'space'), allowNull: false },
    stop_bits: { type: DataTypes.ENUM('1', '1.5', '2'), allowNull: false },
    xmodem_block: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
    xmodem_check: { type: DataTypes.ENUM('crc', 'sum'), allowNull: false },
    outcome: {
      type: DataTypes.ENUM('bootloader_not_entered', 'transfer_failed', 'transfer_completed', 'verified_running'),
      allowNull: false,
    },
    failed_at_block: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    serial_log: { type: DataTypes.TEXT('medium'), allowNull: true },
    serial_log_name: { type: DataTypes.STRING(255), allowNull: true },
    serial_log_bytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    technician_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  // Attempts are numbered per ticket; two technicians saving at once cannot take one number.
  await qi.addIndex('flash_attempts', ['ticket_id', 'number'], { unique: true, name: 'flash_attempts_number' });
  await qi.addIndex('flash_attempts', ['firmware_id', 'outcome']);

  await qi.createTable('ticket_unit_firmware', {
    ticket_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      primaryKey: true,
      references: { model: 'tickets', key: 'id' },
      onDelete: 'CASCADE',
    },
    unit: { type: DataTypes.ENUM(...UNITS), allowNull: false, primaryKey: true },
    version: { type: DataTypes.STRING(40), allowNull: false },
    firmware_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'firmware_images', key: 'id' },
      onDelete: 'RESTRICT',
    },
    attempt_number: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    updated_at: { type: DataTypes.DATE(3), allowNull: false },
  });
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.dropTable('ticket_unit_firmware');
  await qi.dropTable('flash_attempts');
  await qi.dropTable('firmware_images');
}
