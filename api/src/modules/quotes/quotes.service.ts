// Quotes: a technician writes one in Diagnosis (lines, total in integer minor units of the club's
// currency). Above the club's approval threshold the ticket is held (tickets.awaiting_approval)
// and the owner gets an approval link by e-mail; at or below it the quote needs no approval.
// A newer quote replaces a pending one (its approval link stops working).
import { Op, OptimisticLockError, type Transaction } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ConflictError, RuleError } from '../../errors';
import { formatMoney, lineTotalMinor, needsOwnerApproval, quantityToHundredths, quoteTotalMinor } from '../../domain/quote';
import type { Quote as QuoteDto, QuotesView } from '../../contracts/owner-records';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { bumpBoardRevision } from '../board/board-revision';
import { readClubName } from '../club/club-settings.service';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findVisibleTicket, seesAllTickets, STALE_VERSION_MESSAGE } from '../tickets/tickets.service';
import { APPROVAL_LINK_DAYS, issueOwnerLink, ownerLinkUrl, statusLinkFor } from '../owner-links/owner-link-tokens';
import { quoteApprovalMail } from '../owner-links/owner-mails';
import { Quote, QuoteLineRow } from './quote.model';
import { readQuoteSettings } from './quote-settings';
import type { WriteQuoteInput } from './quotes.schemas';

export type QuotesDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

export function toQuoteDto(q: Quote): QuoteDto {
  return {
    id: q.id,
    status: q.status,
    currency: q.currency,
    lines: [...(q.lines ?? [])]
      .sort((a, b) => a.position - b.position)
      .map((l) => ({ description: l.description, quantity: l.quantityHundredths / 100, unitPriceMinor: l.unitPriceMinor, lineTotalMinor: l.lineTotalMinor })),
    totalMinor: q.totalMinor,
    thresholdMinor: q.thresholdMinor,
    note: q.note,
    writtenBy: q.author?.displayName ?? null,
    at: iso(q.createdAt),
    decidedAt: q.decidedAt ? iso(q.decidedAt) : null,
    declineReason: q.declineReason,
  };
}

export const QUOTE_INCLUDE = [
  { association: 'lines' },
  { association: 'author', attributes: ['id', 'displayName'] },
];

function writeRefusal(ticket: Ticket): string | null {
  if (ticket.state !== 'diagnosis') return 'Quotes are written while the ticket is in Diagnosis.';
  return null;
}

/** The ticket's quotes, newest first; members see the quotes of their own tickets. */
export async function listQuotes(deps: QuotesDeps, user: SessionUser, input: { tag: string }): Promise<QuotesView> {
  const ticket = await findVisibleTicket(user, input.tag);
  const [quotes, settings] = await Promise.all([
    Quote.findAll({ where: { ticketId: ticket.id }, include: QUOTE_INCLUDE, order: [['id', 'DESC']] }),
    readQuoteSettings(deps.sequelize),
  ]);
  const reason = seesAllTickets(user) ? writeRefusal(ticket) : 'Only the bench writes quotes.';
  return { quotes: quotes.map(toQuoteDto), settings, canWrite: reason === null, reason };
}

/** The latest quote waiting for the owner, if any. */
export async function pendingQuoteOf(ticketId: number, transaction?: Transaction): Promise<Quote | null> {
  return Quote.findOne({ where: { ticketId, status: 'pending' }, include: QUOTE_INCLUDE, order: [['id', 'DESC']], transaction });
}

/** Writes a quote; above the threshold the ticket is held and the owner is mailed an approval link, all in one transaction. */
export async function writeQuote(deps: QuotesDeps, user: SessionUser, input: { tag: string } & WriteQuoteInput): Promise<QuoteDto> {
  const { sequelize, clock } = deps;
  const seen = await findVisibleTicket(user, input.tag);
  const id = await sequelize.transaction(async (transaction) => {
    const ticket = await Ticket.findByPk(seen.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!ticket) throw new RuleError('ticket_gone', 'The ticket is no longer there.');
    const refusal = writeRefusal(ticket);
    if (refusal) throw new RuleError('quote_not_allowed', refusal);
    const settings = await readQuoteSettings(sequelize, transaction);
    const lines = input.lines.map((l, i) => {
      const quantityHundredths = quantityToHundredths(l.quantity);
      return { position: i + 1, description: l.description, quantityHundredths, unitPriceMinor: l.unitPriceMinor, lineTotalMinor: lineTotalMinor({ quantityHundredths, unitPriceMinor: l.unitPriceMinor }) };
    });
    const totalMinor = quoteTotalMinor(lines);
    const needsApproval = needsOwnerApproval(totalMinor, settings.approvalThresholdMinor);
    const now = clock();

    // A pending quote is replaced: its approval link stops working (checked when opened).
    await Quote.update({ status: 'superseded' }, { where: { ticketId: ticket.id, status: 'pending' }, transaction });
    const quote = await Quote.create(
      {
        ticketId: ticket.id,
        status: needsApproval ? 'pending' : 'not_needed',
        currency: settings.currency,
        totalMinor,
        thresholdMinor: settings.approvalThresholdMinor,
        note: input.note,
        createdBy: user.id,
        decidedAt: null,
        declineReason: null,
        createdAt: now,
      },
      { transaction },
    );
    await QuoteLineRow.bulkCreate(lines.map((l) => ({ ...l, quoteId: quote.id })), { transaction });

    const total = formatMoney(totalMinor, settings.currency);
    const threshold = formatMoney(settings.approvalThresholdMinor, settings.currency);
    await TicketEvent.create(
      {
        ticketId: ticket.id,
        actorId: user.id,
        kind: 'quote_written',
        fromState: null,
        toState: null,
        note: needsApproval
          ? `Quote of ${total} (above the club's ${threshold}): waiting for the owner's approval.`
          : `Quote of ${total} (at or below the club's ${threshold}): no approval needed.`,
        ownerVisible: true,
        createdAt: now,
      },
      { transaction },
    );

    if (ticket.awaitingApproval !== needsApproval) {
      ticket.awaitingApproval = needsApproval;
      try {
        await ticket.save({ transaction });
      } catch (err) {
        if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);
        throw err;
      }
      await bumpBoardRevision(sequelize, transaction);
    }

    if (needsApproval) {
      // The approval mail goes out whatever the owner chose for status mails: without it the
      // owner cannot approve, and the ticket would wait for ever.
      const tag = formatTag(ticket.id);
      const token = await issueOwnerLink(transaction, { purpose: 'approve', ticketId: ticket.id, quoteId: quote.id }, now);
      const mail = quoteApprovalMail({
        clubName: await readClubName(transaction),
        ownerName: ticket.ownerName,
        makeModel: ticket.makeModel,
        tag,
        total,
        lines: lines.map((l) => `${l.description}: ${l.quantityHundredths / 100} × ${formatMoney(l.unitPriceMinor, settings.currency)} = ${formatMoney(l.lineTotalMinor, settings.currency)}`),
        note: input.note,
        approvalLink: ownerLinkUrl(deps.config, 'approve', tag, token),
        expiresDays: APPROVAL_LINK_DAYS,
        statusLink: await statusLinkFor(deps.config, transaction, ticket.id, tag, now),
      });
      if (ticket.ownerEmail) await enqueueMail(transaction, { kind: 'quote_approval', to: ticket.ownerEmail, ticketId: ticket.id, ...mail }, now);
    }
    return quote.id;
  });
  const quote = await Quote.findByPk(id, { include: QUOTE_INCLUDE });
  return toQuoteDto(quote!);
}

/** Whether any quote of the ticket still waits (after one is decided). */
export async function hasPendingQuote(ticketId: number, transaction: Transaction, exceptId: number): Promise<boolean> {
  return (await Quote.count({ where: { ticketId, status: 'pending', id: { [Op.ne]: exceptId } }, transaction })) > 0;
}
