// Ticket rules: intake, lists, detail with its timeline, and moves between lanes.
// Services never see req/res: they take the signed-in person and parsed input, hold the
// transactions, throw typed errors and return plain objects (the API's DTOs).
import { Op, OptimisticLockError, type FindOptions, type InferAttributes, type Order, type Sequelize, type Transaction, type WhereOptions } from 'sequelize';
import type { AppDeps } from '../../deps';
import { ConflictError, ForbiddenError, NotFoundError, RuleError, ValidationError } from '../../errors';
import { checkMove, isState, moveRequirement, STATE_LABELS, STATES, type MoveFacts, type TicketState } from '../../domain/workflow';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { bumpBoardRevision } from '../board/board-revision';
import { readClubName } from '../club/club-settings.service';
import { User } from '../users/user.model';
import type { Page } from '../../contracts/lists';
import { SYMPTOM_LABELS, type MoveOption, type TicketDetail, type TicketEventDto, type TicketRow } from '../../contracts/tickets';
import { Ticket, TicketEvent } from './ticket.model';
import { formatTag, parseTag } from './tag';
import { ticketMovedMail, ticketOpenedMail } from './ticket-mails';
import { ticketSearchWhere } from './ticket-search';
import { hasVerifiedFlash } from '../firmware/flash-attempts.service';
import { testSheetFacts } from '../test-sheets/test-sheet-facts';
import { hasReturnedItemsChecked } from '../hand-back/hand-back-facts';
import { statusLinkFor } from '../owner-links/owner-link-tokens';
import { latestLaneEvent, previousStateOf, undoOfferOf } from '../moves/move-history';
import { queueMoveMail } from '../moves/move-mail';
import { balanceSettledOf } from '../payments/ledger.service';
import type { IntakeInput, ListQuery, MoveInput, OwnerInput } from './tickets.schemas';

export type TicketsDeps = Pick<AppDeps, 'sequelize' | 'config' | 'clock'>;

export const STALE_VERSION_MESSAGE = 'Someone else moved this ticket a moment ago; the board has been refreshed.';

/** Technicians, treasurers and admins see every ticket; anyone else only their own. */
export function seesAllTickets(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'treasurer', 'admin');
}

export function movesTickets(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'admin');
}

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

export function ticketLink(config: TicketsDeps['config'], tag: string): string {
  return `${config.RW_PUBLIC_URL.replace(/\/$/, '')}/tickets/${tag}`;
}

/**
 * Facts the guards need that features record in their own tables. Each feature adds its fact here,
 * read by its own service function; a fact whose feature has not landed yet stays false, so the
 * move that needs it is refused with the reason.
 */
export type RecordedFacts = Pick<
  MoveFacts,
  'hasVerifiedFlash' | 'hasPassedTestSheet' | 'hasFailedTestSheet' | 'returnedItemsChecked' | 'balanceSettled' | 'previousState'
>;

export async function recordedFactsOf(sequelize: Sequelize, ticketId: number, transaction?: Transaction): Promise<RecordedFacts> {
  const [verifiedFlash, sheets, handedBack, previousState, settled] = await Promise.all([
    hasVerifiedFlash(sequelize, ticketId, transaction),
    testSheetFacts(ticketId, transaction),
    hasReturnedItemsChecked(ticketId, transaction),
    previousStateOf(ticketId, transaction),
    balanceSettledOf(sequelize, ticketId, transaction),
  ]);
  return {
    previousState,
    hasVerifiedFlash: verifiedFlash,
    hasPassedTestSheet: sheets.hasPassedTestSheet,
    hasFailedTestSheet: sheets.hasFailedTestSheet,
    returnedItemsChecked: handedBack,
    balanceSettled: settled,
  };
}

/** The facts the workflow guards need: the ticket's own columns and the recorded facts. */
export function moveFactsOf(ticket: Pick<Ticket, 'state' | 'reflashConsent' | 'awaitingApproval'>, recorded: RecordedFacts): MoveFacts {
  return {
    state: ticket.state,
    reflashConsent: ticket.reflashConsent,
    ...recorded,
    awaitingApproval: ticket.awaitingApproval,
  };
}

/** Hand in equipment: the ticket, its 'opened' event and (if asked for) the mail, in one transaction. */
export async function openTicket(deps: TicketsDeps, user: SessionUser, input: IntakeInput): Promise<TicketDetail> {
  const { sequelize, clock } = deps;
  if (input.owner && !movesTickets(user)) {
    // A member's ticket is always their own; only the bench hands in for someone else.
    throw new ForbiddenError('Only technicians can hand equipment in for someone else.', 'owner_not_allowed');
  }
  const id = await sequelize.transaction(async (transaction) => {
    const owner = await ownerOf(user, input.owner, transaction);
    const now = clock();
    const ticket = await Ticket.create(
      {
        ...owner,
        equipmentKind: input.equipmentKind,
        makeModel: input.makeModel,
        serialNumber: input.serialNumber ?? null,
        units: input.units,
        faultReported: input.faultReported,
        symptoms: input.symptoms,
        accessories: input.accessories,
        accessoriesNote: input.accessoriesNote ?? null,
        firmwareVersions: input.firmwareVersions ?? null,
        reflashConsent: input.reflashConsent,
        updatesBy: input.updatesBy,
        // Mail goes only where the owner asked for it and has an address to send it to.
        notifyByEmail: input.updatesBy === 'email' && owner.ownerEmail !== null,
        state: 'intake',
        stateSince: now,
        technicianId: null,
        createdAt: now,
      },
      { transaction },
    );
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'opened', fromState: null, toState: 'intake', note: null, ownerVisible: true, createdAt: now },
      { transaction },
    );
    if (ticket.notifyByEmail && ticket.ownerEmail) {
      const tag = formatTag(ticket.id);
      const mail = ticketOpenedMail({
        clubName: await readClubName(transaction),
        ownerName: ticket.ownerName,
        makeModel: ticket.makeModel,
        tag,
        link: ticketLink(deps.config, tag),
        statusLink: await statusLinkFor(deps.config, transaction, ticket.id, tag, now),
        faultReported: ticket.faultReported,
        symptoms: ticket.symptoms.map((code) => SYMPTOM_LABELS[code]),
        serialNumber: ticket.serialNumber,
        units: ticket.units,
        accessories: ticket.accessories,
        accessoriesNote: ticket.accessoriesNote ?? null,
      });
      await enqueueMail(transaction, { kind: 'ticket_opened', to: ticket.ownerEmail, ticketId: ticket.id, ...mail }, now);
    }
    await bumpBoardRevision(sequelize, transaction);
    return ticket.id;
  });
  return getTicketDetail(deps, user, { tag: formatTag(id) });
}

type OwnerColumns = Pick<Ticket, 'ownerUserId' | 'ownerName' | 'ownerEmail' | 'ownerPhone' | 'ownerCallSign'>;

/** Who owns a new ticket: the person handing in, a member chosen by the bench, or someone at the bench. */
async function ownerOf(user: SessionUser, input: OwnerInput | undefined, transaction: Transaction): Promise<OwnerColumns> {
  if (!input) {
    return { ownerUserId: user.id, ownerName: user.displayName, ownerEmail: user.email, ownerPhone: null, ownerCallSign: user.callSign };
  }
  if (input.accountId !== undefined) {
    const account = await User.findOne({ where: { id: input.accountId, disabled: false }, attributes: ['id', 'displayName', 'email', 'callSign'], transaction });
    if (!account) throw new ValidationError('That member was not found: choose them again from the list.', { 'owner.accountId': 'Choose the member from the list.' });
    return { ownerUserId: account.id, ownerName: account.displayName, ownerEmail: account.email, ownerPhone: null, ownerCallSign: account.callSign };
  }
  // Someone handed in at the bench: link the ticket to their account if their e-mail has one.
  const account = input.email ? await User.findOne({ where: { email: input.email }, attributes: ['id'], transaction }) : null;
  return {
    ownerUserId: account?.id ?? null,
    ownerName: input.name!,
    ownerEmail: input.email ?? null,
    ownerPhone: input.phone ?? null,
    ownerCallSign: input.callSign ?? null,
  };
}

const SORT_ATTRIBUTES: Record<ListQuery['sort'], keyof InferAttributes<Ticket>> = {
  tag: 'id',
  createdAt: 'createdAt',
  state: 'state',
  stateSince: 'stateSince',
};

/** Paged, sorted, searchable list; members see only their own tickets. */
export async function listTickets(deps: TicketsDeps, user: SessionUser, query: ListQuery): Promise<Page<TicketRow>> {
  const where: WhereOptions<Ticket>[] = [];
  if (!seesAllTickets(user)) where.push({ ownerUserId: user.id });
  if (query.state) where.push({ state: query.state });
  if (query.q) where.push(ticketSearchWhere(query.q));
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const order: Order = [[SORT_ATTRIBUTES[query.sort], dir], ['id', dir]];
  const { rows, count } = await Ticket.findAndCountAll({
    attributes: ['id', 'equipmentKind', 'makeModel', 'ownerName', 'state', 'stateSince', 'createdAt'],
    where: { [Op.and]: where },
    order,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return {
    items: rows.map((r) => ({
      id: r.id,
      tag: formatTag(r.id),
      equipmentKind: r.equipmentKind,
      makeModel: r.makeModel,
      ownerName: r.ownerName,
      state: r.state,
      stateSince: iso(r.stateSince),
      createdAt: iso(r.createdAt),
    })),
    total: count,
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** Loads a ticket the person may see, or answers 404 (another member's ticket is "not found", not "forbidden"). */
export async function findVisibleTicket(user: SessionUser, tag: string, options: Pick<FindOptions<Ticket>, 'include' | 'order'> = {}): Promise<Ticket> {
  const id = parseTag(tag);
  const ticket = id ? await Ticket.findByPk(id, options) : null;
  if (!ticket || (!seesAllTickets(user) && ticket.ownerUserId !== user.id)) {
    throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  }
  return ticket;
}

export function moveOptions(user: SessionUser, ticket: Pick<Ticket, 'state' | 'reflashConsent' | 'awaitingApproval'>, recorded: RecordedFacts): MoveOption[] {
  const facts = moveFactsOf(ticket, recorded);
  const canMove = movesTickets(user);
  return STATES.map((to): MoveOption => {
    const need = moveRequirement(facts, to);
    if (!need.allowed) return { to, allowed: false, reason: need.reason };
    if (!canMove) return { to, allowed: false, reason: 'Only technicians move tickets on the Bench board.' };
    // Allowed once the mover writes a note: the client asks for one, saying what it must say.
    if (need.noteRequired) return { to, allowed: true, noteRequired: true, reason: need.reason };
    return { to, allowed: true };
  });
}

/** The ticket with its technician and its timeline (each event with who did it), through the model's associations. */
export async function getTicketDetail(deps: TicketsDeps, user: SessionUser, input: { tag: string }): Promise<TicketDetail> {
  const ticket = await findVisibleTicket(user, input.tag, {
    include: [
      { association: 'technician', attributes: ['id', 'displayName'] },
      { association: 'events', include: [{ association: 'actor', attributes: ['id', 'displayName'] }] },
    ],
    order: [
      ['events', 'createdAt', 'ASC'],
      ['events', 'id', 'ASC'],
    ],
  });
  const [recorded, latest] = await Promise.all([recordedFactsOf(deps.sequelize, ticket.id), latestLaneEvent(ticket.id)]);
  const undo = undoOfferOf(user, ticket.state, latest, deps.clock(), undoGraceMs(deps.config));
  // Members (owners) read only what the owner may read; internal bench records stay on the bench.
  const visible = seesAllTickets(user) ? (ticket.events ?? []) : (ticket.events ?? []).filter((e) => e.ownerVisible);
  const events = visible.map(
    (e): TicketEventDto => ({
      id: Number(e.id),
      at: iso(e.createdAt),
      actorName: e.actor?.displayName ?? null,
      kind: e.kind,
      fromState: e.fromState,
      toState: e.toState,
      note: e.note,
      ownerVisible: e.ownerVisible,
    }),
  );
  return {
    ...toDetail(ticket, ticket.technician?.displayName ?? null, events, moveOptions(user, ticket, recorded)),
    technicianId: ticket.technicianId,
    previousState: recorded.previousState,
    undo,
  };
}

function toDetail(ticket: Ticket, technicianName: string | null, events: TicketEventDto[], moves: MoveOption[]): Omit<TicketDetail, 'technicianId' | 'previousState' | 'undo'> {
  return {
    id: ticket.id,
    tag: formatTag(ticket.id),
    equipmentKind: ticket.equipmentKind,
    makeModel: ticket.makeModel,
    ownerName: ticket.ownerName,
    state: ticket.state,
    stateSince: iso(ticket.stateSince),
    createdAt: iso(ticket.createdAt),
    version: ticket.version,
    serialNumber: ticket.serialNumber,
    units: ticket.units,
    faultReported: ticket.faultReported,
    symptoms: ticket.symptoms,
    accessories: ticket.accessories,
    accessoriesNote: ticket.accessoriesNote ?? null,
    firmwareVersions: ticket.firmwareVersions,
    reflashConsent: ticket.reflashConsent,
    notifyByEmail: ticket.notifyByEmail,
    updatesBy: ticket.updatesBy,
    ownerEmail: ticket.ownerEmail,
    ownerPhone: ticket.ownerPhone,
    ownerCallSign: ticket.ownerCallSign,
    technicianName,
    awaitingApproval: ticket.awaitingApproval,
    partsOnOrder: ticket.partsOnOrder,
    events,
    moves,
  };
}

/** How long a move can be undone, and its owner mail waits (RW_UNDO_GRACE_SECONDS). */
export function undoGraceMs(config: TicketsDeps['config']): number {
  return config.RW_UNDO_GRACE_SECONDS * 1000;
}

/** What queueMoveMail needs to tell the owner that `ticket` (already in its new lane) left `from`. */
export function moveMailInput(deps: TicketsDeps, ticket: Ticket, from: TicketState, now: Date, transaction: Transaction) {
  return {
    ticketId: ticket.id,
    to: ticket.ownerEmail ?? '',
    // Owners handed in with a phone number only are told by phone, not by mail.
    notify: ticket.notifyByEmail && !!ticket.ownerEmail,
    from,
    current: ticket.state,
    now,
    graceMs: undoGraceMs(deps.config),
    compose: async (told: TicketState, current: TicketState) => {
      const tag = formatTag(ticket.id);
      return ticketMovedMail({
        clubName: await readClubName(transaction),
        ownerName: ticket.ownerName,
        makeModel: ticket.makeModel,
        tag,
        link: ticketLink(deps.config, tag),
        statusLink: await statusLinkFor(deps.config, transaction, ticket.id, tag, now),
        from: STATE_LABELS[told],
        to: STATE_LABELS[current],
      });
    },
  };
}

/**
 * Moves a ticket to another lane. Checked here, not only in the router: the role, that `to` is a
 * state, the version the mover saw (409 when stale) and the workflow guard (422 with the reason).
 * The state change, its 'moved' event, the owner's mail and the board revision commit together.
 */
export async function moveTicket(deps: TicketsDeps, user: SessionUser, input: { tag: string } & MoveInput): Promise<TicketDetail> {
  const { sequelize, clock } = deps;
  if (!movesTickets(user)) throw new ForbiddenError('Only technicians move tickets on the Bench board.');
  if (!isState(input.to)) throw new RuleError('move_not_allowed', 'That is not a lane of the Bench board.');
  const ticket = await findVisibleTicket(user, input.tag);

  await sequelize.transaction(async (transaction) => {
    const current = await Ticket.findByPk(ticket.id, { transaction });
    if (!current) throw new NotFoundError(`There is no ticket ${formatTag(ticket.id)}.`, 'ticket_not_found');
    if (current.version !== input.version) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);

    const check = checkMove(moveFactsOf(current, await recordedFactsOf(sequelize, current.id, transaction)), input.to, input.note);
    if (!check.allowed) throw new RuleError('move_not_allowed', check.reason);

    const from: TicketState = current.state;
    const priorStateSince = current.stateSince;
    const now = clock();
    current.state = input.to;
    current.stateSince = now;
    // The technician who takes a ticket out of intake becomes its technician.
    const tookTicket = current.technicianId === null && from === 'intake';
    if (tookTicket) current.technicianId = user.id;
    try {
      // The model has `version: true`: save() updates WHERE id AND version = the version read
      // above (and sets version + 1). Of two movers who saw one version, the second matches no
      // row and Sequelize throws OptimisticLockError.
      await current.save({ transaction });
    } catch (err) {
      if (err instanceof OptimisticLockError) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);
      throw err;
    }
    await TicketEvent.create(
      {
        ticketId: current.id,
        actorId: user.id,
        kind: 'moved',
        fromState: from,
        toState: input.to,
        note: input.note ?? null,
        ownerVisible: true,
        priorStateSince,
        tookTicket,
        createdAt: now,
      },
      { transaction },
    );
    // The owner's mail waits out the undo grace period, replacing a pending one (modules/moves).
    await queueMoveMail(transaction, moveMailInput(deps, current, from, now, transaction));
    await bumpBoardRevision(sequelize, transaction);
  });
  return getTicketDetail(deps, user, { tag: formatTag(ticket.id) });
}
