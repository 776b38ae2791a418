import { TicketState } from '@domain/workflow';
import { EquipmentKind, Flag } from '../../shared/labels';

/** A card on the Bench board (`GET /api/board`). */
export interface Card {
  id: number | string;
  tag: string;
  equipmentKind: EquipmentKind;
  makeModel: string;
  ownerName: string;
  ownerCallSign: string | null;
  state: TicketState;
  stateSince: string;
  version: number;
  technicianName: string | null;
  flags: Flag[];
}

export interface Lane {
  state: TicketState;
  count: number;
  oldestSince: string | null;
}

export interface Board {
  lanes: Lane[];
  cards: Card[];
  /** Hours a card may wait in a lane before it gets an amber edge (twice that: a stronger one). */
  waitLimitHours: number;
}

export interface BoardFilter {
  technician?: string;
  q?: string;
}
