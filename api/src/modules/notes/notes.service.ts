// Notes on a ticket, each for a stated audience: 'internal' (Bench only) or 'owner' (Owner can
// read). A note is a 'note' event on the timeline with owner_visible set from its audience, so
// the one flag decides what the owner's status page, mails and member views may show. A note for
// the owner is mailed to them (when they asked for status mails) through the outbox, in the same
// transaction; an internal note never queues a mail.
import type { AppDeps } from '../../deps';
import type { Page } from '../../contracts/lists';
import type { TicketNote } from '../../contracts/owner-records';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { readClubName } from '../club/club-settings.service';
import { TicketEvent } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findVisibleTicket, seesAllTickets } from '../tickets/tickets.service';
import { statusLinkFor } from '../owner-links/owner-link-tokens';
import { ownerNoteMail } from '../owner-links/owner-mails';
import type { NoteInput, NoteListQuery } from './notes.schemas';

export type NotesDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

function toNote(e: TicketEvent): TicketNote {
  return {
    id: Number(e.id),
    at: new Date(e.createdAt).toISOString(),
    authorName: e.actor?.displayName ?? null,
    audience: e.ownerVisible ? 'owner' : 'internal',
    text: e.note ?? '',
  };
}

/** Notes newest first, paged; a member sees only the owner-visible notes of their own ticket. */
export async function listNotes(_deps: NotesDeps, user: SessionUser, input: { tag: string } & NoteListQuery): Promise<Page<TicketNote>> {
  const ticket = await findVisibleTicket(user, input.tag);
  const where = { ticketId: ticket.id, kind: 'note', ...(seesAllTickets(user) ? {} : { ownerVisible: true }) };
  const { rows, count } = await TicketEvent.findAndCountAll({
    where,
    include: [{ association: 'actor', attributes: ['id', 'displayName'] }],
    order: [
      ['createdAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: input.pageSize,
    offset: (input.page - 1) * input.pageSize,
  });
  return { items: rows.map(toNote), total: count, page: input.page, pageSize: input.pageSize };
}

export async function addNote(deps: NotesDeps, user: SessionUser, input: { tag: string } & NoteInput): Promise<TicketNote> {
  const { sequelize, clock } = deps;
  const ticket = await findVisibleTicket(user, input.tag);
  const id = await sequelize.transaction(async (transaction) => {
    const now = clock();
    const forOwner = input.audience === 'owner';
    const event = await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'note', fromState: null, toState: null, note: input.text, ownerVisible: forOwner, createdAt: now },
      { transaction },
    );
    if (forOwner && ticket.notifyByEmail) {
      const tag = formatTag(ticket.id);
      const mail = ownerNoteMail({
        clubName: await readClubName(transaction),
        ownerName: ticket.ownerName,
        makeModel: ticket.makeModel,
        tag,
        text: input.text,
        statusLink: await statusLinkFor(deps.config, transaction, ticket.id, tag, now),
      });
      if (ticket.ownerEmail) await enqueueMail(transaction, { kind: 'owner_note', to: ticket.ownerEmail, ticketId: ticket.id, ...mail }, now);
    }
    return event.id;
  });
  const saved = await TicketEvent.findByPk(id, { include: [{ association: 'actor', attributes: ['id', 'displayName'] }] });
  return toNote(saved!);
}
