// The owner's pages behind a signed link (no account): the status page (state, owner-visible
// timeline, what happens next, reflash consent) and the quote approval page (approve, or decline
// with a reason: the ticket goes to Return). Nothing internal is ever read here: events are
// filtered on owner_visible, and the diagnosis record and internal notes are not loaded at all.
import { OptimisticLockError } from 'sequelize';
import type { AppDeps } from '../../deps';
import { AppError, ConflictError, RuleError } from '../../errors';
import { checkMove, STATE_LABELS, type TicketState } from '../../domain/workflow';
import type { OwnerApprovalView, OwnerStatusView } from '../../contracts/owner-records';
import type { CheckoutDto } from '../../contracts/payments';
import { clubMoney, ticketBalance } from '../payments/ledger.service';
import { startTicketCheckout } from '../payments/checkout.service';
import { bumpBoardRevision } from '../board/board-revision';
import { readClubName } from '../club/club-settings.service';
import { TicketEvent } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { moveFactsOf, recordedFactsOf, STALE_VERSION_MESSAGE } from '../tickets/tickets.service';
import { Quote } from '../quotes/quote.model';
import { hasPendingQuote, pendingQuoteOf, QUOTE_INCLUDE, toQuoteDto } from '../quotes/quotes.service';
import { recordConsentIn } from '../diagnosis/reflash-consent.service';
import { Diagnosis } from '../diagnosis/diagnosis.model';
import { openOwnerLink } from './owner-link-tokens';
import type { DecisionInput } from './owner-links.schemas';

export type OwnerLinksDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

/** What happens next, one sentence per state (shown to the owner). */
export const NEXT_STEPS: Record<TicketState, string> = {
  intake: 'Your equipment is booked in and waits for a technician to look at it.',
  diagnosis: 'A technician is finding out what is wrong; you will hear if a quote needs your approval.',
  reflash: "The unit's firmware is being reloaded; afterwards it goes on the test bench.",
  repair: 'The repair is under way; afterwards it goes on the test bench.',
  bench_test: 'The bench is testing the repaired equipment against the club’s limits.',
  return: 'Your equipment is ready to hand back (or goes back unrepaired); arrange collection with the bench.',
  closed: 'The equipment has been handed back and this ticket is closed.',
};

/** GET /api/owner/status/:tag/:token */
export async function ownerStatus(deps: OwnerLinksDeps, input: { tag: string; token: string }): Promise<OwnerStatusView> {
  const { ticket } = await openOwnerLink({ ...input, purpose: 'status' }, deps.clock());
  const [events, pending, clubName, balance, money] = await Promise.all([
    TicketEvent.findAll({ where: { ticketId: ticket.id, ownerVisible: true }, order: [['createdAt', 'ASC'], ['id', 'ASC']] }),
    pendingQuoteOf(ticket.id),
    readClubName(),
    ticketBalance(ticket.id),
    clubMoney(deps.sequelize),
  ]);
  return {
    tag: formatTag(ticket.id),
    clubName,
    makeModel: ticket.makeModel,
    state: ticket.state,
    stateSince: new Date(ticket.stateSince).toISOString(),
    nextStep: ticket.awaitingApproval ? 'Work waits for your answer to the quote: use the approval link in the quote e-mail.' : NEXT_STEPS[ticket.state as TicketState],
    reflashConsent: ticket.reflashConsent,
    canGiveConsent: !ticket.reflashConsent && ticket.state !== 'closed' && ticket.state !== 'return',
    pendingQuote: pending ? toQuoteDto(pending) : null,
    balanceDueMinor: Math.max(0, balance),
    currency: money.currency,
    timeline: events.map((e) => ({ at: new Date(e.createdAt).toISOString(), kind: e.kind, fromState: e.fromState, toState: e.toState, note: e.note })),
  };
}

/** POST /api/owner/status/:tag/:token/consent: the owner consents to a reflash through their status link. */
export async function ownerGivesConsent(deps: OwnerLinksDeps, input: { tag: string; token: string }): Promise<OwnerStatusView> {
  await deps.sequelize.transaction(async (transaction) => {
    const now = deps.clock();
    const { ticket } = await openOwnerLink({ ...input, purpose: 'status' }, now, transaction);
    if (ticket.reflashConsent) throw new ConflictError('consent_already_given', 'Your consent to a reflash is already recorded. Nothing more to do.');
    if (ticket.state === 'closed' || ticket.state === 'return') {
      throw new RuleError('consent_not_needed', 'This ticket is past the point where a reflash could happen, so no consent is needed.');
    }
    await recordConsentIn(deps, transaction, ticket, { method: 'owner_link', recordedBy: null, note: null }, now);
  });
  return ownerStatus(deps, input);
}

/**
 * POST /api/owner/status/:tag/:token/checkout: the owner pays the ticket's balance online through
 * their status link (no account), on the payment provider's checkout page; back to the same page.
 */
export async function ownerCheckout(deps: OwnerLinksDeps, input: { tag: string; token: string }): Promise<CheckoutDto> {
  const { ticket } = await openOwnerLink({ ...input, purpose: 'status' }, deps.clock());
  const page = `${deps.config.RW_PUBLIC_URL.replace(/\/$/, '')}/owner/status/${formatTag(ticket.id)}/${input.token}`;
  return startTicketCheckout(deps, ticket.id, {
    successUrl: `${page}?payment=done`,
    cancelUrl: `${page}?payment=cancelled`,
    customerEmail: ticket.ownerEmail ?? undefined,
  });
}

/** GET /api/owner/approval/:tag/:token */
export async function ownerApproval(deps: OwnerLinksDeps, input: { tag: string; token: string }): Promise<OwnerApprovalView> {
  const { link, ticket } = await openOwnerLink({ ...input, purpose: 'approve' }, deps.clock());
  const quote = await Quote.findByPk(link.quoteId ?? 0, { include: QUOTE_INCLUDE });
  if (!quote || quote.ticketId !== ticket.id) throw new AppError(410, 'quote_gone', 'This quote is no longer on the ticket. Ask the bench for the current one.');
  const diagnosis = await Diagnosis.findByPk(ticket.id, { attributes: ['decision'] });
  return {
    tag: formatTag(ticket.id),
    clubName: await readClubName(),
    makeModel: ticket.makeModel,
    state: ticket.state,
    reflashConsent: ticket.reflashConsent,
    quote: toQuoteDto(quote),
    decision: diagnosis?.decision ?? null,
  };
}

/**
 * POST /api/owner/approval/:tag/:token: approve (the hold clears) or decline (the quote is marked
 * declined and the ticket goes to Return with the reason). The link works once: it is locked,
 * checked unused and marked used in the same transaction as the decision.
 */
export async function ownerDecides(deps: OwnerLinksDeps, input: { tag: string; token: string } & DecisionInput): Promise<OwnerApprovalView> {
  const { sequelize } = deps;
  await sequelize.transaction(async (transaction) => {
    const now = deps.clock();
    const { link, ticket } = await openOwnerLink({ tag: input.tag, token: input.token, purpose: 'approve' }, now, transaction);
    const quote = await Quote.findByPk(link.quoteId ?? 0, { transaction, lock: transaction.LOCK.UPDATE });
    if (link.usedAt || (quote && (quote.status === 'approved' || quote.status === 'declined'))) {
      throw new ConflictError('already_decided', 'You have already answered this quote. If you changed your mind, call the bench.');
    }
    if (!quote || quote.ticketId !== ticket.id || quote.status !== 'pending') {
      throw new AppError(410, 'quote_replaced', 'The bench has replaced this quote with a newer one. Use the link in the latest quote e-mail.');
    }
    link.usedAt = now;
    await link.save({ transaction });
    quote.status = input.decision === 'approve' ? 'approved' : 'declined';
    quote.decidedAt = now;
    quote.declineReason = input.decision === 'decline' ? input.reason : null;
    await quote.save({ transaction });

    const from = ticket.state;
    ticket.awaitingApproval = await hasPendingQuote(ticket.id, transaction, quote.id);
    let moved = false;
    if (input.decision === 'decline' && from !== 'return' && from !== 'closed') {
      const note = `Owner declined the quote${input.reason ? `: ${input.reason}` : ' (no reason given)'}.`;
      const check = checkMove(moveFactsOf(ticket, await recordedFactsOf(sequelize, ticket.id, transaction)), 'return', note);
      if (!check.allowed) throw new RuleError('move_not_allowed', `The bench has to move this ticket by hand: ${check.reason}`);
      ticket.state = 'return';
      ticket.stateSince = now;
      moved = true;
    }
    try {
      await ticket.save({ transaction });
    } catch (err) {
      if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);
      throw err;
    }
    await TicketEvent.create(
      {
        ticketId: ticket.id,
        actorId: null,
        kind: input.decision === 'approve' ? 'quote_approved' : 'quote_declined',
        fromState: null,
        toState: null,
        note: input.decision === 'approve' ? 'The owner approved the quote through the approval link.' : `The owner declined the quote${input.reason ? `: ${input.reason}` : '.'}`,
        ownerVisible: true,
        createdAt: now,
      },
      { transaction },
    );
    if (moved) {
      await TicketEvent.create(
        {
          ticketId: ticket.id,
          actorId: null,
          kind: 'moved',
          fromState: from,
          toState: 'return',
          note: `Owner declined the quote${input.reason ? `: ${input.reason}` : ' (no reason given)'}. Goes back to ${STATE_LABELS.return} unrepaired.`,
          ownerVisible: true,
          createdAt: now,
        },
        { transaction },
      );
    }
    await bumpBoardRevision(sequelize, transaction);
  });
  return ownerApproval(deps, input);
}
