// The repair log: work done and parts used on a ticket in the Repair lane. Each entry is an
// internal event on the ticket's timeline (owner_visible false), written in the same transaction.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AppDeps } from '../../deps';
import { RuleError } from '../../errors';
import type { RepairLogView, RepairPartEntry, RepairWorkEntry } from '../../contracts/bench-records';
import type { Page } from '../../contracts/lists';
import type { SessionUser } from '../auth/session-user';
import { TicketEvent, type Ticket } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { findBenchTicket, formatMinor } from './bench-ticket';
import { RepairPart, RepairWork } from './repair.model';
import type { PartInput, RepairLogQuery, WorkInput } from './repair.schemas';

export type RepairDeps = Pick<AppDeps, 'sequelize' | 'clock'>;

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();

/** Why work and parts cannot be recorded now, or null. */
function recordRefusal(ticket: Pick<Ticket, 'state'>): string | null {
  return ticket.state === 'repair' ? null : 'Work and parts are recorded while the ticket is in the Repair lane. Move it to Repair first.';
}

async function totalsOf(sequelize: Sequelize, ticketId: number): Promise<RepairLogView['totals']> {
  const [minutes, workEntries, parts, cost] = await Promise.all([
    RepairWork.sum('minutes', { where: { ticketId } }),
    RepairWork.count({ where: { ticketId } }),
    RepairPart.sum('quantity', { where: { ticketId } }),
    // Sum of quantity × unit cost: an expression the finders cannot say.
    sequelize.query<{ total: string | number | null }>('SELECT SUM(quantity * unit_cost_minor) AS total FROM repair_parts WHERE ticket_id = :ticketId', {
      replacements: { ticketId },
      type: QueryTypes.SELECT,
    }),
  ]);
  return { minutes: Number(minutes ?? 0), workEntries, parts: Number(parts ?? 0), partsCostMinor: Number(cost[0]?.total ?? 0) };
}

/** One page of work entries and/or parts (newest first by default) with the ticket's totals. Technicians, treasurers and admins. */
export async function listRepairLog(deps: RepairDeps, user: SessionUser, tag: string, query: RepairLogQuery): Promise<RepairLogView> {
  const ticket = await findBenchTicket(user, tag);
  const dir = query.dir === 'asc' ? 'ASC' : 'DESC';
  const paging = { limit: query.pageSize, offset: (query.page - 1) * query.pageSize };
  const include = [{ association: 'technician', attributes: ['id', 'displayName'] }];
  let work: Page<RepairWorkEntry> | null = null;
  let parts: Page<RepairPartEntry> | null = null;
  if (query.kind !== 'parts') {
    const { rows, count } = await RepairWork.findAndCountAll({
      where: { ticketId: ticket.id },
      include,
      order: [['createdAt', dir], ['id', dir]],
      ...paging,
    });
    work = {
      items: rows.map((r) => ({ id: r.id, description: r.description, minutes: r.minutes, technicianName: r.technician?.displayName ?? null, at: iso(r.createdAt) })),
      total: count,
      page: query.page,
      pageSize: query.pageSize,
    };
  }
  if (query.kind !== 'work') {
    const { rows, count } = await RepairPart.findAndCountAll({
      where: { ticketId: ticket.id },
      include,
      order: [['createdAt', dir], ['id', dir]],
      ...paging,
    });
    parts = {
      items: rows.map((r) => ({
        id: r.id,
        description: r.description,
        quantity: r.quantity,
        unitCostMinor: r.unitCostMinor,
        costMinor: r.quantity * r.unitCostMinor,
        technicianName: r.technician?.displayName ?? null,
        at: iso(r.createdAt),
      })),
      total: count,
      page: query.page,
      pageSize: query.pageSize,
    };
  }
  const refusal = recordRefusal(ticket);
  return { tag: formatTag(ticket.id), canRecord: !refusal, reason: refusal, totals: await totalsOf(deps.sequelize, ticket.id), work, parts };
}

/** Runs `write` in one transaction with the ticket locked, once the ticket is in Repair. */
async function record(deps: RepairDeps, user: SessionUser, tag: string, write: (ticket: Ticket, now: Date, transaction: Transaction) => Promise<void>): Promise<void> {
  const { sequelize, clock } = deps;
  await sequelize.transaction(async (transaction) => {
    const ticket = await findBenchTicket(user, tag, transaction, true);
    const refusal = recordRefusal(ticket);
    if (refusal) throw new RuleError('not_in_repair', refusal);
    await write(ticket, clock(), transaction);
  });
}

export async function addWork(deps: RepairDeps, user: SessionUser, tag: string, input: WorkInput): Promise<RepairWorkEntry> {
  let entry!: RepairWork;
  await record(deps, user, tag, async (ticket, now, transaction) => {
    entry = await RepairWork.create({ ticketId: ticket.id, description: input.description, minutes: input.minutes, technicianId: user.id, createdAt: now }, { transaction });
    await TicketEvent.create(
      { ticketId: ticket.id, actorId: user.id, kind: 'repair_work', fromState: null, toState: null, note: `Work (${input.minutes} min): ${input.description}`, ownerVisible: false, createdAt: now },
      { transaction },
    );
  });
  return { id: entry.id, description: entry.description, minutes: entry.minutes, technicianName: user.displayName, at: iso(entry.createdAt) };
}

export async function addPart(deps: RepairDeps, user: SessionUser, tag: string, input: PartInput): Promise<RepairPartEntry> {
  let entry!: RepairPart;
  await record(deps, user, tag, async (ticket, now, transaction) => {
    entry = await RepairPart.create(
      { ticketId: ticket.id, description: input.description, quantity: input.quantity, unitCostMinor: input.unitCostMinor, technicianId: user.id, createdAt: now },
      { transaction },
    );
    const note = `Part: ${input.quantity} × ${input.description} at ${formatMinor(input.unitCostMinor)} each (${formatMinor(input.quantity * input.unitCostMinor)})`;
    await TicketEvent.create({ ticketId: ticket.id, actorId: user.id, kind: 'repair_part', fromState: null, toState: null, note, ownerVisible: false, createdAt: now }, { transaction });
  });
  return {
    id: entry.id,
    description: entry.description,
    quantity: entry.quantity,
    unitCostMinor: entry.unitCostMinor,
    costMinor: entry.quantity * entry.unitCostMinor,
    technicianName: user.displayName,
    at: iso(entry.createdAt),
  };
}
