// Ticket rules: intake, lists, detail with its timeline, and moves between lanes.
// Services never see req/res: they take the signed-in person and parsed input, hold the
// transactions, throw typed errors and return plain objects (the API's DTOs).
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Config } from '../../config';
import { ConflictError, ForbiddenError, NotFoundError, RuleError } from '../../errors';
import { checkMove, isState, moveRequirement, STATE_LABELS, STATES, type MoveFacts, type TicketState } from '../../domain/workflow';
import { hasRole } from '../auth/guards';
import type { SessionUser } from '../auth/session-user';
import { enqueueMail } from '../outbox/outbox.service';
import { bumpBoardRevision } from '../board/board-revision';
import type { Page } from '../../contracts/lists';
import type { EquipmentKind, EventKind, MoveOption, TicketDetail, TicketEventDto, TicketRow } from '../../contracts/tickets';
import { Ticket, TicketEvent } from './ticket.model';
import { formatTag, parseTag } from './tag';
import { ticketSearchSql } from './ticket-search';
import type { IntakeInput, ListQuery, MoveInput } from './tickets.schemas';

export interface TicketsDeps {
  sequelize: Sequelize;
  config: Pick<Config, 'RW_PUBLIC_URL'>;
}

export const STALE_VERSION_MESSAGE = 'Someone else moved this ticket a moment ago; the board has been refreshed.';

/** Technicians, treasurers and admins see every ticket; anyone else only their own. */
export function seesAllTickets(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'treasurer', 'admin');
}

export function movesTickets(user: SessionUser): boolean {
  return hasRole(user, 'technician', 'admin');
}

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

function ticketLink(config: TicketsDeps['config'], tag: string): string {
  return `${config.RW_PUBLIC_URL.replace(/\/$/, '')}/tickets/${tag}`;
}

/**
 * The facts the workflow guards need. Flash attempts, test sheets and fees arrive with later
 * features; until then they are false, so the moves that need them are refused with the reason.
 */
export function moveFactsOf(ticket: Pick<Ticket, 'state' | 'reflashConsent' | 'awaitingApproval'>): MoveFacts {
  return {
    state: ticket.state,
    reflashConsent: ticket.reflashConsent,
    hasVerifiedFlash: false,
    hasPassedTestSheet: false,
    hasFailedTestSheet: false,
    readyToClose: false,
    awaitingApproval: ticket.awaitingApproval,
  };
}

/** Hand in equipment: the ticket, its 'opened' event and (if asked for) the mail, in one transaction. */
export async function openTicket(deps: TicketsDeps, user: SessionUser, input: IntakeInput): Promise<TicketDetail> {
  const { sequelize } = deps;
  if (input.owner && !movesTickets(user)) {
    // A member's ticket is always their own; only the bench hands in for someone else.
    throw new ForbiddenError('Only technicians can hand equipment in for someone else.', 'owner_not_allowed');
  }
  const id = await sequelize.transaction(async (transaction) => {
    let owner: Pick<Ticket, 'ownerUserId' | 'ownerName' | 'ownerEmail' | 'ownerPhone' | 'ownerCallSign'>;
    if (input.owner) {
      // Someone handed in at the bench: link the ticket to their account if they have one.
      const accounts = await sequelize.query<{ id: number }>('SELECT id FROM users WHERE email = :email LIMIT 1', {
        replacements: { email: input.owner.email },
        type: QueryTypes.SELECT,
        transaction,
      });
      owner = {
        ownerUserId: accounts[0]?.id ?? null,
        ownerName: input.owner.name,
        ownerEmail: input.owner.email,
        ownerPhone: input.owner.phone ?? null,
        ownerCallSign: input.owner.callSign ?? null,
      };
    } else {
      owner = {
        ownerUserId: user.id,
        ownerName: user.displayName,
        ownerEmail: user.email,
        ownerPhone: null,
        ownerCallSign: user.callSign,
      };
    }
    const now = new Date();
    const ticket = await Ticket.create(
      {
        ...owner,
        equipmentKind: input.equipmentKind,
        makeModel: input.makeModel,
        serialNumber: input.serialNumber ?? null,
        units: input.units,
        faultReported: input.faultReported,
        accessories: input.accessories,
        firmwareVersions: input.firmwareVersions ?? null,
        reflashConsent: input.reflashConsent,
        notifyByEmail: input.notifyByEmail,
        state: 'intake',
        stateSince: now,
        technicianId: null,
      },
      { transaction },
    );
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'opened', fromState: null, toState: 'intake', note: null },
      { transaction },
    );
    if (ticket.notifyByEmail) {
      const tag = formatTag(ticket.id);
      await enqueueMail(transaction, {
        kind: 'ticket_opened',
        to: ticket.ownerEmail,
        ticketId: ticket.id,
        subject: `Ticket ${tag} opened`,
        text: [
          `Hello ${ticket.ownerName},`,
          '',
          `Your ${ticket.makeModel} has been handed in at the bench as ticket ${tag}.`,
          `Fault as reported: ${ticket.faultReported}`,
          '',
          `Quote ${tag} when you ask about it. You will get an e-mail each time it moves on.`,
          `Follow it here: ${ticketLink(deps.config, tag)}`,
          '',
          'Rigwright, the repair bench of Kestrel Fen Radio Society',
        ].join('\n'),
      });
    }
    await bumpBoardRevision(sequelize, transaction);
    return ticket.id;
  });
  return getTicketDetail(deps, user, formatTag(id));
}

const SORT_COLUMNS: Record<ListQuery['sort'], string> = {
  tag: 't.id',
  createdAt: 't.created_at',
  state: 't.state',
  stateSince: 't.state_since',
};

type RowRecord = {
  id: number;
  equipment_kind: EquipmentKind;
  make_model: string;
  owner_name: string;
  state: TicketState;
  state_since: Date;
  created_at: Date;
};

/** Paged, sorted, searchable list; members see only their own tickets. */
export async function listTickets(deps: TicketsDeps, user: SessionUser, query: ListQuery): Promise<Page<TicketRow>> {
  const where: string[] = [];
  const replacements: Record<string, unknown> = {};
  if (!seesAllTickets(user)) {
    where.push('t.owner_user_id = :ownerId');
    replacements.ownerId = user.id;
  }
  if (query.state) {
    where.push('t.state = :state');
    replacements.state = query.state;
  }
  if (query.q) {
    const search = ticketSearchSql(query.q);
    where.push(search.sql);
    Object.assign(replacements, search.replacements);
  }
  const whereSql = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const order = `${SORT_COLUMNS[query.sort]} ${dir}, t.id ${dir}`;
  const [countRows, rows] = await Promise.all([
    deps.sequelize.query<{ total: number | bigint }>(`SELECT COUNT(*) AS total FROM tickets t ${whereSql}`, {
      replacements,
      type: QueryTypes.SELECT,
    }),
    deps.sequelize.query<RowRecord>(
      'SELECT t.id, t.equipment_kind, t.make_model, t.owner_name, t.state, t.state_since, t.created_at ' +
        `FROM tickets t ${whereSql} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
      {
        replacements: { ...replacements, limit: query.pageSize, offset: (query.page - 1) * query.pageSize },
        type: QueryTypes.SELECT,
      },
    ),
  ]);
  return {
    items: rows.map((r) => ({
      id: r.id,
      tag: formatTag(r.id),
      equipmentKind: r.equipment_kind,
      makeModel: r.make_model,
      ownerName: r.owner_name,
      state: r.state,
      stateSince: iso(r.state_since),
      createdAt: iso(r.created_at),
    })),
    total: Number(countRows[0]?.total ?? 0),
    page: query.page,
    pageSize: query.pageSize,
  };
}

/** Loads a ticket the person may see, or answers 404 (another member's ticket is "not found", not "forbidden"). */
async function findVisibleTicket(deps: TicketsDeps, user: SessionUser, tag: string): Promise<Ticket> {
  const id = parseTag(tag);
  const ticket = id ? await Ticket.findByPk(id) : null;
  if (!ticket || (!seesAllTickets(user) && ticket.ownerUserId !== user.id)) {
    throw new NotFoundError(`There is no ticket ${tag.slice(0, 20)} that you can see.`, 'ticket_not_found');
  }
  return ticket;
}

export function moveOptions(user: SessionUser, ticket: Pick<Ticket, 'state' | 'reflashConsent' | 'awaitingApproval'>): MoveOption[] {
  const facts = moveFactsOf(ticket);
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

export async function getTicketDetail(deps: TicketsDeps, user: SessionUser, tag: string): Promise<TicketDetail> {
  const ticket = await findVisibleTicket(deps, user, tag);
  const [events, technician] = await Promise.all([
    deps.sequelize.query<{
      id: number | string;
      created_at: Date;
      actor_name: string | null;
      kind: EventKind;
      from_state: TicketState | null;
      to_state: TicketState | null;
      note: string | null;
    }>(
      'SELECT e.id, e.created_at, u.display_name AS actor_name, e.kind, e.from_state, e.to_state, e.note ' +
        'FROM ticket_events e LEFT JOIN users u ON u.id = e.actor_id WHERE e.ticket_id = :id ORDER BY e.created_at, e.id',
      { replacements: { id: ticket.id }, type: QueryTypes.SELECT },
    ),
    ticket.technicianId
      ? deps.sequelize.query<{ display_name: string }>('SELECT display_name FROM users WHERE id = :id', {
          replacements: { id: ticket.technicianId },
          type: QueryTypes.SELECT,
        })
      : Promise.resolve([]),
  ]);
  return toDetail(ticket, technician[0]?.display_name ?? null, events.map((e) => ({
    id: Number(e.id),
    at: iso(e.created_at),
    actorName: e.actor_name,
    kind: e.kind,
    fromState: e.from_state,
    toState: e.to_state,
    note: e.note,
  })), moveOptions(user, ticket));
}

function toDetail(ticket: Ticket, technicianName: string | null, events: TicketEventDto[], moves: MoveOption[]): TicketDetail {
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
    accessories: ticket.accessories,
    firmwareVersions: ticket.firmwareVersions,
    reflashConsent: ticket.reflashConsent,
    notifyByEmail: ticket.notifyByEmail,
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

/**
 * Moves a ticket to another lane. Checked here, not only in the router: the role, that `to` is a
 * state, the version the mover saw (409 when stale) and the workflow guard (422 with the reason).
 * The state change, its 'moved' event, the owner's mail and the board revision commit together.
 */
export async function moveTicket(deps: TicketsDeps, user: SessionUser, tag: string, input: MoveInput): Promise<TicketDetail> {
  const { sequelize } = deps;
  if (!movesTickets(user)) throw new ForbiddenError('Only technicians move tickets on the Bench board.');
  if (!isState(input.to)) throw new RuleError('move_not_allowed', 'That is not a lane of the Bench board.');
  const ticket = await findVisibleTicket(deps, user, tag);

  await sequelize.transaction(async (transaction) => {
    const current = await Ticket.findByPk(ticket.id, { transaction });
    if (!current) throw new NotFoundError(`There is no ticket ${formatTag(ticket.id)}.`, 'ticket_not_found');
    if (current.version !== input.version) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);

    const check = checkMove(moveFactsOf(current), input.to, input.note);
    if (!check.allowed) throw new RuleError('move_not_allowed', check.reason);

    const from: TicketState = current.state;
    const now = new Date();
    // A static Model.update does not check the version, so the UPDATE names it and the affected
    // row count decides: of two movers who saw one version, the second matches no row.
    const [, affected] = await sequelize.query(
      'UPDATE tickets SET state = :to, state_since = :now, updated_at = :now, version = version + 1, ' +
        'technician_id = CASE WHEN technician_id IS NULL AND :fromIntake THEN :moverId ELSE technician_id END ' +
        'WHERE id = :id AND version = :version',
      {
        replacements: { to: input.to, now, fromIntake: from === 'intake', moverId: user.id, id: current.id, version: input.version },
        type: QueryTypes.UPDATE,
        transaction,
      },
    );
    if (Number(affected) !== 1) throw new ConflictError('stale_version', STALE_VERSION_MESSAGE);

    await TicketEvent.create(
      { ticketId: current.id, actorId: user.id, kind: 'moved', fromState: from, toState: input.to, note: input.note ?? null },
      { transaction },
    );
    if (current.notifyByEmail) {
      const tagText = formatTag(current.id);
      const lane = STATE_LABELS[input.to];
      await enqueueMail(transaction, {
        kind: 'ticket_moved',
        to: current.ownerEmail,
        ticketId: current.id,
        subject: `Your ${current.makeModel} (${tagText}) has moved to ${lane}`,
        text: [
          `Hello ${current.ownerName},`,
          '',
          `Your ${current.makeModel} (ticket ${tagText}) has moved from ${STATE_LABELS[from]} to ${lane}.`,
          `Follow it here: ${ticketLink(deps.config, tagText)}`,
          '',
          'Rigwright, the repair bench of Kestrel Fen Radio Society',
        ].join('\n'),
      });
    }
    await bumpBoardRevision(sequelize, transaction);
  });
  return getTicketDetail(deps, user, formatTag(ticket.id));
}
