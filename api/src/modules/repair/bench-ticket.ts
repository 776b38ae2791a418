// The ticket a bench record belongs to, as the signed-in person may see it: shared by the repair
// log, test sheets and hand-back. Another member's ticket answers 404, like GET /api/tickets/:tag.
import type { Transaction } from 'sequelize';
import { NotFoundError } from '../../errors';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { Ticket } from '../tickets/ticket.model';
import { parseTag } from '../tickets/tag';

/** Technicians, treasurers and admins see every ticket; anyone else only their own. */
export function seesAllTickets(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'treasurer', 'admin');
}

/** Loads the ticket (locked for update inside `transaction` when `lock`), or 404 when the person may not see it. */
export async function findBenchTicket(user: SessionUser, tag: string, transaction?: Transaction, lock = false): Promise<Ticket> {
  const id = parseTag(tag);
  const ticket = id ? await Ticket.findByPk(id, { transaction, lock: lock && transaction ? transaction.LOCK.UPDATE : undefined }) : null;
  if (!ticket || (!seesAllTickets(user) && ticket.ownerUserId !== user.id)) {
    throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  }
  return ticket;
}

/** Plain digits of a money amount in minor units, shown with two decimals ("1250" → "12.50"); integer arithmetic only. */
export function formatMinor(minor: number): string {
  const sign = minor < 0 ? '-' : '';
  const abs = Math.abs(Math.trunc(minor));
  return `${sign}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}
