// What a ticket's timeline says about its moves: the lane it came from (for sending it back) and
// its latest move (for undo). Read from ticket_events (index ticket_id, kind, id; migration 055).
import { Op, type Transaction } from 'sequelize';
import type { TicketState } from '../../domain/workflow';
import { TicketEvent } from '../tickets/ticket.model';
import type { UndoOffer } from '../../contracts/tickets';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';

/** Event kinds that change a ticket's lane. */
export const LANE_EVENT_KINDS = ['moved', 'move_undone'] as const;

/** The from-state of the ticket's latest move that was not undone; null before its first move. */
export async function previousStateOf(ticketId: number, transaction?: Transaction): Promise<TicketState | null> {
  const event = await TicketEvent.findOne({
    attributes: ['id', 'fromState'],
    where: { ticketId, kind: 'moved', undoneByEventId: null },
    order: [['id', 'DESC']],
    transaction,
  });
  return event?.fromState ?? null;
}

/** The ticket's latest lane change (a move or an undo), or null. */
export async function latestLaneEvent(ticketId: number, transaction?: Transaction): Promise<TicketEvent | null> {
  return TicketEvent.findOne({
    where: { ticketId, kind: { [Op.in]: [...LANE_EVENT_KINDS] } },
    order: [['id', 'DESC']],
    transaction,
  });
}

/** Who may undo a move: the technician who made it, or an admin (within the grace period). */
export function mayUndo(user: SessionUser, event: Pick<TicketEvent, 'actorId'>): boolean {
  return event.actorId === user.id || hasRole(user, 'admin');
}

/**
 * The undo the person can still make on this ticket, or null: its latest lane change is a move
 * that stands, the ticket is still where it put it, they may undo it, and the grace period runs.
 */
export function undoOfferOf(
  user: SessionUser,
  ticketState: TicketState,
  latest: TicketEvent | null,
  now: Date,
  graceMs: number,
): UndoOffer | null {
  if (!latest || latest.kind !== 'moved' || latest.undoneByEventId || latest.toState !== ticketState || !latest.fromState) return null;
  if (!mayUndo(user, latest)) return null;
  const until = new Date(latest.createdAt.getTime() + graceMs);
  if (now.getTime() >= until.getTime()) return null;
  return { eventId: Number(latest.id), fromState: latest.fromState, toState: ticketState, until: until.toISOString() };
}
