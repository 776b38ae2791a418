// Undo of a move, the parts-on-order flag and technician assignment (issue 7). Each change is a
// ticket write: the ticket through its model instance (optimistic lock on `version`), its
// timeline event, the owner's mail where there is one and the board revision, in one transaction.
import { OptimisticLockError, type Transaction } from 'sequelize';
import { AppError, ConflictError, ForbiddenError, NotFoundError, RuleError, ValidationError } from '../../errors';
import { STATE_LABELS, type TicketState } from '../../domain/workflow';
import type { TechnicianOption } from '../../contracts/moves';
import type { TicketDetail } from '../../contracts/tickets';
import type { SessionUser } from '../auth/session-user';
import { bumpBoardRevision } from '../board/board-revision';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { formatTag, parseTag } from '../tickets/tag';
import { getTicketDetail, moveMailInput, movesTickets, STALE_VERSION_MESSAGE, undoGraceMs, type TicketsDeps } from '../tickets/tickets.service';
import { User, UserRole } from '../users/user.model';
import { latestLaneEvent, mayUndo } from './move-history';
import { queueMoveMail } from './move-mail';
import type { AssignInput, PartsOnOrderInput, UndoInput } from './moves.schemas';

export const NOT_YOUR_MOVE_MESSAGE = 'Only the technician who made a move, or an admin, can undo it.';

function requireBench(user: SessionUser): void {
  if (!movesTickets(user)) throw new ForbiddenError('Only technicians change tickets on the Bench board.');
}

/** The ticket row, locked for this transaction (technicians and admins see every ticket). */
async function lockedTicket(tag: string, transaction: Transaction): Promise<Ticket> {
  const id = parseTag(tag);
  const ticket = id ? await Ticket.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE }) : null;
  if (!ticket) throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  return ticket;
}

async function saveVersioned(ticket: Ticket, transaction: Transaction): Promise<void> {
  try {
    await ticket.save({ transaction });
  } catch (err) {
    if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);
    throw err;
  }
}

/**
 * Puts a ticket back where its latest move took it from. Allowed to the mover (or an admin),
 * within the grace period, while that move is still the ticket's latest and the version the
 * person saw is current. The forward move's guards are not asked in reverse: this restores the
 * lane, the time it had been there and (if the move took the ticket) its technician. The undone
 * move and the undo are kept on the timeline, hidden from the owner, and the owner's pending
 * mail about the move is withdrawn.
 */
export async function undoMove(deps: TicketsDeps, user: SessionUser, input: { tag: string } & UndoInput): Promise<TicketDetail> {
  requireBench(user);
  const { sequelize, clock } = deps;
  await sequelize.transaction(async (transaction) => {
    const ticket = await lockedTicket(input.tag, transaction);
    const move = await TicketEvent.findOne({ where: { id: input.eventId, ticketId: ticket.id }, transaction });
    if (!move || move.kind !== 'moved' || !move.fromState || !move.toState) {
      throw new NotFoundError(`Ticket ${formatTag(ticket.id)} has no move ${input.eventId}.`, 'move_not_found');
    }
    if (!mayUndo(user, move)) throw new ForbiddenError(NOT_YOUR_MOVE_MESSAGE, 'not_your_move');
    if (move.undoneByEventId) throw new ConflictError('already_undone', 'This move has already been undone.');
    const latest = await latestLaneEvent(ticket.id, transaction);
    if (latest?.id !== move.id || ticket.state !== move.toState) {
      throw new ConflictError(
        'not_latest_move',
        `The ticket has moved since (it is in ${STATE_LABELS[ticket.state as TicketState]} now); only its latest move can be undone. Move it from the board instead.`,
      );
    }
    const now = clock();
    const graceMs = undoGraceMs(deps.config);
    if (now.getTime() >= move.createdAt.getTime() + graceMs) {
      throw new AppError(
        410,
        'undo_expired',
        `The time to undo this move has passed (${deps.config.RW_UNDO_GRACE_SECONDS} seconds). Move the ticket back from the board instead; a note says why.`,
      );
    }
    if (ticket.version !== input.version) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);

    const undoneFrom = ticket.state;
    ticket.state = move.fromState;
    ticket.stateSince = move.priorStateSince ?? now;
    if (move.tookTicket && ticket.technicianId === move.actorId) ticket.technicianId = null;
    await saveVersioned(ticket, transaction);
    const undo = await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'move_undone', fromState: undoneFrom, toState: move.fromState, note: null, ownerVisible: false, createdAt: now },
      { transaction },
    );
    // The owner never heard of the move (its mail was still waiting): it leaves their timeline too.
    move.undoneByEventId = Number(undo.id);
    move.ownerVisible = false;
    await move.save({ transaction });
    await queueMoveMail(transaction, moveMailInput(deps, ticket, undoneFrom, now, transaction));
    await bumpBoardRevision(sequelize, transaction);
  });
  return getTicketDetail(deps, user, { tag: input.tag });
}

/** Sets or clears "Parts on order"; a change is a timeline event (internal), no change is no event. */
export async function setPartsOnOrder(deps: TicketsDeps, user: SessionUser, input: { tag: string } & PartsOnOrderInput): Promise<TicketDetail> {
  requireBench(user);
  const { sequelize, clock } = deps;
  await sequelize.transaction(async (transaction) => {
    const ticket = await lockedTicket(input.tag, transaction);
    if (ticket.state === 'closed') throw new RuleError('ticket_closed', 'The ticket is closed; its flags stay as they were.');
    if (ticket.partsOnOrder === input.partsOnOrder) return;
    ticket.partsOnOrder = input.partsOnOrder;
    await saveVersioned(ticket, transaction);
    await TicketEvent.create(
      {
        ticketId: ticket.id,
        actorId: user.id,
        kind: input.partsOnOrder ? 'parts_on_order_set' : 'parts_on_order_cleared',
        fromState: null,
        toState: null,
        note: input.note ?? null,
        ownerVisible: false,
        createdAt: clock(),
      },
      { transaction },
    );
    await bumpBoardRevision(sequelize, transaction);
  });
  return getTicketDetail(deps, user, { tag: input.tag });
}

/** Technicians who can take tickets: active accounts with the technician role, by name. */
export async function listTechnicians(user: SessionUser): Promise<TechnicianOption[]> {
  requireBench(user);
  const rows = await User.findAll({
    attributes: ['id', 'displayName', 'callSign'],
    where: { disabled: false },
    include: [{ model: UserRole, as: 'roleRows', attributes: [], where: { role: 'technician' }, required: true }],
    order: [['displayName', 'ASC'], ['id', 'ASC']],
  });
  return rows.map((u) => ({ id: u.id, displayName: u.displayName, callSign: u.callSign }));
}

/**
 * Gives the ticket to a technician (oneself or another), or to nobody. Any technician or admin
 * may do so on an open ticket: volunteers hand work over to each other at the bench. The person
 * given the ticket must be an active technician. The event's note names them.
 */
export async function assignTechnician(deps: TicketsDeps, user: SessionUser, input: { tag: string } & AssignInput): Promise<TicketDetail> {
  requireBench(user);
  const { sequelize, clock } = deps;
  await sequelize.transaction(async (transaction) => {
    const ticket = await lockedTicket(input.tag, transaction);
    if (ticket.state === 'closed') throw new RuleError('ticket_closed', 'The ticket is closed; it keeps the technician who handed it back.');
    let name: string | null = null;
    if (input.technicianId !== null) {
      const tech = await User.findOne({
        attributes: ['id', 'displayName'],
        where: { id: input.technicianId, disabled: false },
        include: [{ model: UserRole, as: 'roleRows', attributes: [], where: { role: 'technician' }, required: true }],
        transaction,
      });
      if (!tech) {
        throw new ValidationError('Choose a technician of the bench.', { technicianId: 'Choose an active technician of the bench.' });
      }
      name = tech.displayName;
    }
    if (ticket.technicianId === input.technicianId) return;
    ticket.technicianId = input.technicianId;
    await saveVersioned(ticket, transaction);
    await TicketEvent.create(
      {
        ticketId: ticket.id,
        actorId: user.id,
        kind: name === null ? 'technician_unassigned' : 'technician_assigned',
        fromState: null,
        toState: null,
        note: name,
        ownerVisible: false,
        createdAt: clock(),
      },
      { transaction },
    );
    await bumpBoardRevision(sequelize, transaction);
  });
  return getTicketDetail(deps, user, { tag: input.tag });
}
