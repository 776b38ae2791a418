// Intake, complete (issue 7): an owner handed in at the bench may give a phone number instead of
// an e-mail address; the fault as reported gets its ticked symptoms (codes); accessories get a free
// text beside the checklist; the owner says how they want updates (e-mail, phone or none); and
// condition and repair photos get their table (bytes in the blob store, by SHA-256).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.changeColumn('tickets', 'owner_email', { type: DataTypes.STRING(254), allowNull: true });
  await qi.addColumn('tickets', 'symptoms', { type: DataTypes.JSON, allowNull: true });
  await qi.sequelize.query("UPDATE tickets SET symptoms = '[]'");
  await qi.addColumn('tickets', 'accessories_note', { type: DataTypes.STRING(500), allowNull: true });
  await qi.addColumn('tickets', 'updates_by', { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'email' });
  await qi.sequelize.query("UPDATE tickets SET updates_by = IF(notify_by_email, 'email', 'none')");

  await qi.createTable('ticket_photos', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    ticket_id: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: false,
      references: { model: 'tickets', key: 'id' },
      onDelete: 'CASCADE',
    },
    stage: { type: DataTypes.ENUM('intake', 'repair'), allowNull: false },
    // Keys in the blob store (SHA-256 of the bytes): the only names the files have on disk.
    blob_key: { type: DataTypes.CHAR(64), allowNull: false },
    thumb_key: { type: DataTypes.CHAR(64), allowNull: false },
    mime: { type: DataTypes.STRING(20), allowNull: false },
    size: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    // The name the file had on the uploader's computer, sanitised; shown, never used as a path.
    original_name: { type: DataTypes.STRING(120), allowNull: false },
    uploaded_by: {
      type: DataTypes.INTEGER.UNSIGNED,
      allowNull: true,
      references: { model: 'users', key: 'id' },
      onDelete: 'SET NULL',
    },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('ticket_photos', ['ticket_id', 'stage', 'id']);
}

export async function down(qi: QueryInterface): Promise<void> {
  await qi.dropTable('ticket_photos');
  // Not qi.removeColumn: see 004-club-name.
  await qi.sequelize.query('ALTER TABLE tickets DROP COLUMN updates_by, DROP COLUMN accessories_note, DROP COLUMN symptoms');
  await qi.sequelize.query("UPDATE tickets SET owner_email = '' WHERE owner_email IS NULL");
  await qi.changeColumn('tickets', 'owner_email', { type: DataTypes.STRING(254), allowNull: false });
}
