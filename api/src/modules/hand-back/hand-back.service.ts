// Hand-back (Return lane): the returned-items checklist starts from the accessories handed in and
// must match them, or each difference is explained (a note for an item not returned, a note for
// an extra item); who collected the equipment and when. The record releases Return → Closed
// (returnedItemsChecked); fees are the other half of that guard and belong to the fees feature.
import type { AppDeps } from '../../deps';
import { RuleError, ValidationError } from '../../errors';
import type { HandBackRecord, HandBackView } from '../../contracts/bench-records';
import type { SessionUser } from '../auth/session-user';
import { bumpBoardRevision } from '../board/board-revision';
import { findBenchTicket } from '../repair/bench-ticket';
import { TicketEvent, type Ticket } from '../tickets/ticket.model';
import { formatTag } from '../tickets/tag';
import { currentHandBack } from './hand-back-facts';
import { HandBack } from './hand-back.model';
import type { HandBackInput } from './hand-back.schemas';

export type HandBackDeps = Pick<AppDeps, 'sequelize' | 'clock'>;

/** How far ahead of the server's clock a collection time may be (a laptop clock a little fast). */
const FUTURE_SLACK_MS = 5 * 60_000;

const iso = (d: Date | string) => (d instanceof Date ? d : new Date(d)).toISOString();
const key = (s: string) => s.trim().toLowerCase();

function recordRefusal(ticket: Pick<Ticket, 'state'>): string | null {
  return ticket.state === 'return' ? null : 'The hand-back is recorded while the ticket is in the Return lane. Move it to Return first.';
}

function toRecord(row: HandBack): HandBackRecord {
  return {
    id: row.id,
    items: row.items,
    extras: row.extras,
    collectedBy: row.collectedBy,
    collectedAt: iso(row.collectedAt),
    technicianName: row.technician?.displayName ?? null,
    at: iso(row.createdAt),
  };
}

export async function getHandBack(deps: HandBackDeps, user: SessionUser, tag: string): Promise<HandBackView> {
  const ticket = await findBenchTicket(user, tag);
  const current = ticket.state === 'return' || ticket.state === 'closed' ? await currentHandBack(ticket.id) : null;
  const refusal = recordRefusal(ticket);
  return { tag: formatTag(ticket.id), accessories: ticket.accessories, canRecord: !refusal, reason: refusal, current: current ? toRecord(current) : null };
}

/** Checks the list against what was handed in: every accessory once, and a note for each difference. */
function checkAgainstHandedIn(accessories: string[], input: HandBackInput): void {
  const fields: Record<string, string> = {};
  const expected = new Map<string, number>();
  for (const a of accessories) expected.set(key(a), (expected.get(key(a)) ?? 0) + 1);
  const listed = new Map<string, number>();
  input.items.forEach((it, i) => {
    const k = key(it.item);
    listed.set(k, (listed.get(k) ?? 0) + 1);
    if ((listed.get(k) ?? 0) > (expected.get(k) ?? 0)) {
      fields[`items.${i}.item`] = `"${it.item}" was not handed in (or is listed twice). List it under extra items, with a note.`;
    }
    if (!it.returned && (!it.note || it.note.trim().length < 3)) {
      fields[`items.${i}.note`] = `Say why "${it.item}" does not go back (at least 3 characters).`;
    }
  });
  const missing = accessories.filter((a) => (listed.get(key(a)) ?? 0) < (expected.get(key(a)) ?? 0));
  if (missing.length) fields.items = `The checklist must list everything handed in; missing: ${[...new Set(missing)].join(', ')}.`;
  const keys = Object.keys(fields);
  if (keys.length) {
    throw new ValidationError(keys.length === 1 ? fields[keys[0]!]! : 'The checklist does not match what was handed in: see the marked items.', fields);
  }
}

export async function recordHandBack(deps: HandBackDeps, user: SessionUser, tag: string, input: HandBackInput): Promise<HandBackView> {
  const { sequelize, clock } = deps;
  await sequelize.transaction(async (transaction) => {
    const ticket = await findBenchTicket(user, tag, transaction, true);
    const refusal = recordRefusal(ticket);
    if (refusal) throw new RuleError('not_in_return', refusal);
    checkAgainstHandedIn(ticket.accessories, input);
    const now = clock();
    const collectedAt = input.collectedAt ? new Date(input.collectedAt) : now;
    if (collectedAt.getTime() > now.getTime() + FUTURE_SLACK_MS) {
      throw new ValidationError('The collection time is in the future. Give the time the equipment was collected.', { collectedAt: 'In the future.' });
    }
    if (collectedAt.getTime() < ticket.createdAt.getTime()) {
      throw new ValidationError('The collection time is before the ticket was opened. Check the date.', { collectedAt: 'Before the ticket was opened.' });
    }
    await HandBack.create(
      {
        ticketId: ticket.id,
        items: input.items.map((i) => ({ item: i.item, returned: i.returned, note: i.note ?? null })),
        extras: input.extras,
        collectedBy: input.collectedBy,
        collectedAt,
        technicianId: user.id,
        createdAt: now,
      },
      { transaction },
    );
    const returned = input.items.filter((i) => i.returned).length;
    const differences = [
      ...input.items.filter((i) => !i.returned).map((i) => `${i.item} not returned (${i.note})`),
      ...input.extras.map((e) => `also returned: ${e.item} (${e.note})`),
    ];
    const note =
      `Handed back to ${input.collectedBy}; ${returned} of ${input.items.length} items handed in went back` +
      (differences.length ? `; ${differences.join('; ')}.` : ', the checklist matches.');
    await TicketEvent.create({ ticketId: ticket.id, actorId: user.id, kind: 'hand_back', fromState: null, toState: null, note, ownerVisible: true, createdAt: now }, { transaction });
    await bumpBoardRevision(sequelize, transaction);
  });
  return getHandBack(deps, user, tag);
}
