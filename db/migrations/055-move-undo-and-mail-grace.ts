// Moves that can be undone for a short grace period, and owner mail that waits it out (issue 7).
//
// ticket_events: a 'moved' event remembers what the move replaced, so an undo can put the ticket
// back exactly (the time it had been in its lane, and whether the move made the mover its
// technician), and is marked when it has been undone (undone_by_event_id: the 'move_undone' event).
// outbox: mails with the same coalesce_key replace each other while still pending (several moves
// within the grace period send one mail); coalesce_base keeps what the owner was last told
// before the pending mail (a later change back to it sends nothing at all).
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up(qi: QueryInterface): Promise<void> {
  await qi.addColumn('ticket_events', 'undone_by_event_id', { type: DataTypes.BIGINT.UNSIGNED, allowNull: true });
  await qi.addColumn('ticket_events', 'prior_state_since', { type: DataTypes.DATE(3), allowNull: true });
  await qi.addColumn('ticket_events', 'took_ticket', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false });
  // "The latest move of a ticket" is asked on every move, undo and board read.
  await qi.addIndex('ticket_events', ['ticket_id', 'kind', 'id'], { name: 'ticket_events_ticket_kind_id' });

  await qi.addColumn('outbox', 'coalesce_key', { type: DataTypes.STRING(80), allowNull: true });
  await qi.addColumn('outbox', 'coalesce_base', { type: DataTypes.STRING(40), allowNull: true });
  await qi.addIndex('outbox', ['coalesce_key', 'status'], { name: 'outbox_coalesce_key_status' });
}

export async function down(qi: QueryInterface): Promise<void> {
  // Not qi.removeColumn: see 004-club-name.
  await qi.sequelize.query('ALTER TABLE outbox DROP INDEX outbox_coalesce_key_status, DROP COLUMN coalesce_base, DROP COLUMN coalesce_key');
  await qi.sequelize.query(
    'ALTER TABLE ticket_events DROP INDEX ticket_events_ticket_kind_id, DROP COLUMN took_ticket, DROP COLUMN prior_state_since, DROP COLUMN undone_by_event_id',
  );
}
