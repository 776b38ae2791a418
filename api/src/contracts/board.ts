// The API's data shapes shared with the client (imported there as `@contracts/board`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.
import type { TicketState } from '../domain/workflow';
import type { EquipmentKind } from './tickets';

/** Flags on a card of `GET /api/board` (`balance_due` arrives with fees; `test_failed`: the latest test sheet failed). */
export const FLAGS = ['awaiting_approval', 'parts_on_order', 'balance_due', 'test_failed'] as const;
export type Flag = (typeof FLAGS)[number];

/** A card of `GET /api/board`: one open ticket (cards come oldest in lane first). */
export interface Card {
  id: number;
  tag: string;
  equipmentKind: EquipmentKind;
  makeModel: string;
  ownerName: string;
  ownerCallSign: string | null;
  state: TicketState;
  stateSince: string;
  version: number;
  /** The technician who took the ticket (user id), for filtering by person; null until taken. */
  technicianId: number | null;
  technicianName: string | null;
  /** The lane the ticket came from (its latest move that stands): the card offers "Send back" there. */
  previousState: TicketState | null;
  flags: Flag[];
}

/** A lane summary of `GET /api/board` (the six board lanes in workflow order, always all six). */
export interface Lane {
  state: TicketState;
  count: number;
  oldestSince: string | null;
}

/** `GET /api/board`. */
export interface Board {
  lanes: Lane[];
  cards: Card[];
  /** Hours a card may wait in a lane before it gets an amber edge (twice that: a stronger one). */
  waitLimitHours: number;
}
