// The Bench board read: open tickets as cards, and one summary per lane.
//
// It is the technicians' home screen and is polled, so it is built for speed: one raw SQL query
// of only the card columns (no model instances), lanes built in one pass, and the serialised JSON
// cached per (board revision, wait limit, filters). The revision is read from the database on
// every request, so a cached board is never older than the last committed ticket write, on any
// replica.
import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { BOARD_LANES, type TicketState } from '../../domain/workflow';
import type { Board, Card, Flag, Lane } from '../../contracts/board';
import type { EquipmentKind } from '../../contracts/tickets';
import { formatTag } from '../tickets/tag';
import { ticketSearchSql } from '../tickets/ticket-search';
import { readBoardSettings } from './board-revision';

export interface BoardFilters {
  /** A technician's user id, or 'none' for cards nobody has taken yet. */
  technician?: number | 'none';
  q?: string;
}

type CardRecord = {
  id: number;
  equipment_kind: EquipmentKind;
  make_model: string;
  owner_name: string;
  owner_call_sign: string | null;
  state: TicketState;
  state_since: Date;
  version: number;
  technician_id: number | null;
  technician_name: string | null;
  awaiting_approval: number | boolean;
  parts_on_order: number | boolean;
  test_failed: number | boolean | null;
  previous_state: TicketState | null;
};

/** Builds the board from the database (no cache). Cards come oldest-in-lane first. */
export async function loadBoard(sequelize: Sequelize, filters: BoardFilters, waitLimitHours: number): Promise<Board> {
  const where = ["t.state <> 'closed'"];
  const replacements: Record<string, unknown> = {};
  if (filters.technician === 'none') where.push('t.technician_id IS NULL');
  else if (filters.technician !== undefined) {
    where.push('t.technician_id = :technicianId');
    replacements.technicianId = filters.technician;
  }
  if (filters.q) {
    const search = ticketSearchSql(filters.q);
    where.push(search.sql);
    Object.assign(replacements, search.replacements);
  }
  const rows = await sequelize.query<CardRecord>(
    'SELECT t.id, t.equipment_kind, t.make_model, t.owner_name, t.owner_call_sign, t.state, t.state_since, ' +
      't.version, t.technician_id, u.display_name AS technician_name, t.awaiting_approval, t.parts_on_order, ' +
      // The latest test sheet failed (null: no sheet); the board flag "Test failed" follows it.
      '(SELECT NOT s.passed FROM test_sheets s WHERE s.ticket_id = t.id ORDER BY s.number DESC LIMIT 1) AS test_failed, ' +
      // The lane a card came from (its latest move that stands), so the card can offer "Send back".
      "(SELECT e.from_state FROM ticket_events e WHERE e.ticket_id = t.id AND e.kind = 'moved' AND e.undone_by_event_id IS NULL " +
      'ORDER BY e.id DESC LIMIT 1) AS previous_state ' +
      'FROM tickets t LEFT JOIN users u ON u.id = t.technician_id ' +
      `WHERE ${where.join(' AND ')} ORDER BY t.state_since ASC, t.id ASC`,
    { replacements, type: QueryTypes.SELECT, raw: true },
  );

  const lanes = new Map<TicketState, Lane>(BOARD_LANES.map((state) => [state, { state, count: 0, oldestSince: null }]));
  const cards: Card[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    const stateSince = r.state_since.toISOString();
    const flags: Flag[] = [];
    if (r.awaiting_approval) flags.push('awaiting_approval');
    if (r.parts_on_order) flags.push('parts_on_order');
    if (r.test_failed) flags.push('test_failed');
    // Further flags come here, each from its feature ('balance_due' from fees). The card shows
    // them as labelled chips in the order they are pushed.
    cards[i] = {
      id: r.id,
      tag: formatTag(r.id),
      equipmentKind: r.equipment_kind,
      makeModel: r.make_model,
      ownerName: r.owner_name,
      ownerCallSign: r.owner_call_sign,
      state: r.state,
      stateSince,
      version: r.version,
      technicianId: r.technician_id,
      technicianName: r.technician_name,
      previousState: r.previous_state,
      flags,
    };
    const lane = lanes.get(r.state);
    if (lane) {
      lane.count++;
      // Rows come oldest first, so the first card of a lane is its oldest.
      if (lane.oldestSince === null) lane.oldestSince = stateSince;
    }
  }
  return { lanes: [...lanes.values()], cards, waitLimitHours };
}

interface CacheEntry {
  body: Buffer;
  etag: string;
  at: number;
}

/** A serialised board, ready to send: the JSON bytes and a validator for conditional requests. */
export interface BoardBody {
  body: Buffer;
  etag: string;
  /** The board revision read before the board was built (null while the settings row is missing). */
  revision: string | null;
}

/**
 * A per-process cache of serialised boards keyed on the database's board revision. It is only an
 * optimisation: correctness comes from reading the revision per request. Entries also expire
 * after `ttlMs`, which bounds staleness from writes that do not bump the revision (e.g. a
 * technician renaming themselves, until the accounts module bumps it).
 */
export function createBoardReader(sequelize: Sequelize, options: { ttlMs?: number; maxEntries?: number } = {}) {
  const ttlMs = options.ttlMs ?? 60_000;
  const maxEntries = options.maxEntries ?? 64;
  const cache = new Map<string, CacheEntry>();
  let cachedRevision: string | null = null;

  const build = async (filters: BoardFilters, waitLimitHours: number): Promise<CacheEntry> => {
    const body = Buffer.from(JSON.stringify(await loadBoard(sequelize, filters, waitLimitHours)));
    // Hashed once per build (not per request); the same board gives the same ETag on every replica.
    const hash = createHash('sha1').update(body).digest('base64url');
    return { body, etag: `W/"board-${hash}"`, at: Date.now() };
  };

  return async function readBoard(filters: BoardFilters): Promise<BoardBody> {
    const settings = await readBoardSettings(sequelize);
    if (settings.revision === null) return { ...(await build(filters, settings.waitLimitHours)), revision: null };
    if (settings.revision !== cachedRevision) {
      cache.clear();
      cachedRevision = settings.revision;
    }
    const key = `${settings.waitLimitHours}|${filters.technician ?? ''}|${filters.q ?? ''}`;
    const hit = cache.get(key);
    const now = Date.now();
    if (hit && now - hit.at < ttlMs) return { ...hit, revision: settings.revision };
    const entry = await build(filters, settings.waitLimitHours);
    // A write may have committed while we read; the next request sees the new revision and
    // rebuilds. Only cache under the revision we read before the board itself.
    if (cachedRevision === settings.revision) {
      if (cache.size >= maxEntries) cache.delete(cache.keys().next().value as string);
      cache.set(key, entry);
    }
    return { ...entry, revision: settings.revision };
  };
}
