// The fact the Return → Closed guard reads (tickets.service recordedFactsOf): a hand-back record
// made since the ticket last came to its lane, so a record from an earlier visit to Return does not
// count once the ticket has been sent back and returned again. A leaf module (no service imports).
import { Op, type Transaction } from 'sequelize';
import { Ticket } from '../tickets/ticket.model';
import { HandBack } from './hand-back.model';

export async function currentHandBack(ticketId: number, transaction?: Transaction): Promise<HandBack | null> {
  const ticket = await Ticket.findByPk(ticketId, { attributes: ['id', 'stateSince'], transaction });
  if (!ticket) return null;
  return HandBack.findOne({
    where: { ticketId, createdAt: { [Op.gte]: ticket.stateSince } },
    include: [{ association: 'technician', attributes: ['id', 'displayName'] }],
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    transaction,
  });
}

export async function hasReturnedItemsChecked(ticketId: number, transaction?: Transaction): Promise<boolean> {
  return (await currentHandBack(ticketId, transaction)) !== null;
}
