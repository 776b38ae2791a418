// The owner's mail about moves waits out the undo grace period (issue 7).
//
// Each move (and each undo) hands the ticket's new state here. The mail is queued with
// send_after = now + grace under one coalescing key per ticket, so:
//  - a pending move mail of the same ticket is replaced: several moves within the grace period
//    send one mail, with the latest state;
//  - the owner is told "from" what they were last told (the pending mail's base), and when the
//    ticket is back where they were last told it was (an undo, or a move and its way back) no
//    mail is sent at all.
// A mail the worker has already claimed (locked_until in the future) is on its way: it counts as
// told, and the next move starts from there. Everything happens in the caller's transaction, and
// takes no lock but on the pending row it withdraws (so concurrent moves cannot deadlock here).
import { Op, type Transaction } from 'sequelize';
import type { TicketState } from '../../domain/workflow';
import { isState } from '../../domain/workflow';
import { Outbox } from '../outbox/outbox.model';
import { enqueueMail, type MailContent } from '../outbox/outbox.service';

export const MOVE_MAIL_KIND = 'ticket_moved';

export function moveMailKey(ticketId: number): string {
  return `${MOVE_MAIL_KIND}:${ticketId}`;
}

export interface MoveMailInput {
  ticketId: number;
  /** The owner's address, and whether they asked for mail at all. */
  to: string;
  notify: boolean;
  /** The lane the ticket was in before this change (what the owner knows if nothing is pending). */
  from: TicketState;
  /** The lane the ticket is in now. */
  current: TicketState;
  now: Date;
  graceMs: number;
  /** Writes the mail "moved from `told` to `current`". */
  compose(told: TicketState, current: TicketState): Promise<MailContent>;
}

/** What happened to the owner's mail: queued (its outbox id), or nothing to tell. */
export type MoveMailOutcome = { queued: number; replaced: number } | { queued: null; replaced: number };

export async function queueMoveMail(transaction: Transaction, input: MoveMailInput): Promise<MoveMailOutcome> {
  const key = moveMailKey(input.ticketId);
  // A plain read (no FOR UPDATE): a locking read of a key with no row takes a gap lock, and two
  // moves of different tickets inserting into that gap would deadlock. The pending row is then
  // deleted by primary key, re-checking that no worker has claimed it meanwhile.
  const unclaimed = { status: 'pending' as const, [Op.or]: [{ lockedUntil: null }, { lockedUntil: { [Op.lt]: input.now } }] };
  const pending = await Outbox.findAll({ where: { coalesceKey: key, ...unclaimed }, order: [['id', 'ASC']], transaction });
  let told: TicketState = input.from;
  let replaced = 0;
  if (pending.length) {
    replaced = await Outbox.destroy({ where: { id: pending.map((row) => row.id), ...unclaimed }, transaction });
    // All withdrawn: the owner still knows what the first pending mail started from. Otherwise a
    // worker has claimed it and it is on its way: the owner is being told the state before this change.
    const base = pending.find((row) => isState(row.coalesceBase))?.coalesceBase;
    if (replaced === pending.length && isState(base)) told = base;
  }
  if (!input.notify || told === input.current) return { queued: null, replaced };
  const mail = await input.compose(told, input.current);
  const id = await enqueueMail(
    transaction,
    {
      kind: MOVE_MAIL_KIND,
      to: input.to,
      ticketId: input.ticketId,
      ...mail,
      sendAfter: new Date(input.now.getTime() + input.graceMs),
      coalesceKey: key,
      coalesceBase: told,
    },
    input.now,
  );
  return { queued: id, replaced };
}
