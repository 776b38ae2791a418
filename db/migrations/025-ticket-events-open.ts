// Ticket events: the kind becomes text checked by the application (new kinds arrive with every
// workflow record: diagnosis, quotes, repair log, test sheets, hand-back), and each event says
// whether the owner may read it (the owner's status page and mails show only those).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.changeColumn('ticket_events', 'kind', { type: DataTypes.STRING(40), allowNull: false });
  await qi.addColumn('ticket_events', 'owner_visible', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
  // Hand-in and moves were always told to the owner by mail; their events are theirs to read.
  await qi.sequelize.query("UPDATE ticket_events SET owner_visible = 1 WHERE kind IN ('opened', 'moved')");
}

export async function down(qi: QueryInterface): Promise<void> {
  // Not qi.removeColumn: see 004-club-name.
  await qi.sequelize.query('ALTER TABLE ticket_events DROP COLUMN owner_visible');
  await qi.sequelize.query("DELETE FROM ticket_events WHERE kind NOT IN ('opened', 'moved', 'note')");
  await qi.changeColumn('ticket_events', 'kind', { type: DataTypes.ENUM('opened', 'moved', 'note'), allowNull: false });
}
