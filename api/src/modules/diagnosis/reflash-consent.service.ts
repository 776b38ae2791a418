// The owner's consent to a reflash, recorded after intake: by a technician (phone call, in person;
// who recorded it, how, when) or by the owner through their status link. Sets
// tickets.reflash_consent, which the Diagnosis → Reflash guard reads; the event is owner-visible.
import { OptimisticLockError, type Transaction } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ConflictError, RuleError } from '../../errors';
import { CONSENT_METHOD_LABELS, type ConsentMethod, type ReflashConsentView } from '../../contracts/owner-records';
import type { SessionUser } from '../auth/session-user';
import { bumpBoardRevision } from '../board/board-revision';
import { Ticket, TicketEvent } from '../tickets/ticket.model';
import { findVisibleTicket, STALE_VERSION_MESSAGE } from '../tickets/tickets.service';
import { ReflashConsent } from './diagnosis.model';
import type { ConsentInput } from './diagnosis.schemas';

export type ConsentDeps = Pick<AppDeps, 'sequelize' | 'clock'>;

export async function getConsent(_deps: ConsentDeps, user: SessionUser, input: { tag: string }): Promise<ReflashConsentView> {
  const ticket = await findVisibleTicket(user, input.tag);
  const records = await ReflashConsent.findAll({
    where: { ticketId: ticket.id },
    include: [{ association: 'recorder', attributes: ['id', 'displayName'] }],
    order: [['id', 'ASC']],
  });
  return {
    given: ticket.reflashConsent,
    records: records.map((r) => ({ method: r.method, recordedBy: r.recorder?.displayName ?? null, note: r.note, at: new Date(r.createdAt).toISOString() })),
  };
}

/** Records consent inside the caller's transaction on a ticket row it has locked. */
export async function recordConsentIn(
  deps: Pick<AppDeps, 'sequelize'>,
  transaction: Transaction,
  ticket: Ticket,
  record: { method: ConsentMethod; recordedBy: number | null; recordedByName?: string; note: string | null },
  now: Date,
): Promise<void> {
  await ReflashConsent.create({ ticketId: ticket.id, method: record.method, recordedBy: record.recordedBy, note: record.note, createdAt: now }, { transaction });
  ticket.reflashConsent = true;
  try {
    await ticket.save({ transaction });
  } catch (err) {
    if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);
    throw err;
  }
  const how = CONSENT_METHOD_LABELS[record.method];
  await TicketEvent.create(
    {
      ticketId: ticket.id,
      actorId: record.recordedBy,
      kind: 'reflash_consent',
      fromState: null,
      toState: null,
      note:
        record.method === 'owner_link'
          ? 'The owner consented to a reflash through their status link (settings and memories may be lost).'
          : `Consent to a reflash recorded ${how}${record.note ? `: ${record.note}` : ''} (settings and memories may be lost).`,
      ownerVisible: true,
      createdAt: now,
    },
    { transaction },
  );
  // The board's cards do not show consent, but the ticket's version changed.
  await bumpBoardRevision(deps.sequelize, transaction);
}

export async function recordConsent(deps: ConsentDeps, user: SessionUser, input: { tag: string } & ConsentInput): Promise<ReflashConsentView> {
  const seen = await findVisibleTicket(user, input.tag);
  await deps.sequelize.transaction(async (transaction) => {
    const ticket = await Ticket.findByPk(seen.id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!ticket) throw new RuleError('ticket_gone', 'The ticket is no longer there.');
    if (ticket.reflashConsent) throw new ConflictError('consent_already_given', 'Consent to a reflash is already recorded on this ticket.');
    if (ticket.state === 'closed') throw new RuleError('ticket_closed', 'This ticket is closed.');
    await recordConsentIn(deps, transaction, ticket, { method: input.method, recordedBy: user.id, note: input.note }, deps.clock());
  });
  return getConsent(deps, user, input);
}
