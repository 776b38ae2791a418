// The API's data shapes shared with the client (imported there as `@contracts/tickets`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.
import type { TicketState } from '../domain/workflow';

/** `equipmentKind` of the intake body (`POST /api/tickets`) and of every ticket shape. */
export const EQUIPMENT_KINDS = ['transceiver', 'amplifier', 'tuner', 'power_supply', 'cable', 'accessory', 'other'] as const;
export type EquipmentKind = (typeof EQUIPMENT_KINDS)[number];

/** `kind` of a timeline event in `GET /api/tickets/:tag`. */
// Kinds of timeline events; stored as text (migration 025), so a new kind is one more line here.
export const EVENT_KINDS = [
  'opened',
  'moved',
  'note',
  'charge_added',
  'charge_waived',
  'payment_received',
  'payment_refunded',
] as const;
export type EventKind = (typeof EVENT_KINDS)[number];

/** A row of `GET /api/tickets`. */
export interface TicketRow {
  id: number;
  tag: string;
  equipmentKind: EquipmentKind;
  makeModel: string;
  ownerName: string;
  state: TicketState;
  stateSince: string;
  createdAt: string;
}

/** One entry of `events` in `GET /api/tickets/:tag` (oldest first; `actorName` null when the account is gone). */
export interface TicketEventDto {
  id: number;
  at: string;
  actorName: string | null;
  kind: EventKind;
  fromState: TicketState | null;
  toState: TicketState | null;
  note: string | null;
}

/** One entry of `moves` in `GET /api/tickets/:tag`: one per state, in workflow order. */
export interface MoveOption {
  to: TicketState;
  allowed: boolean;
  /** Why not; or, with noteRequired, what the note must say. */
  reason?: string;
  /** The move is allowed once the mover writes a note (e.g. why it goes back unrepaired). */
  noteRequired?: true;
}

/** `GET /api/tickets/:tag`; also the answer of `POST /api/tickets` and `POST /api/tickets/:tag/moves`. */
export interface TicketDetail extends TicketRow {
  version: number;
  serialNumber: string | null;
  units: string[];
  faultReported: string;
  accessories: string[];
  firmwareVersions: string | null;
  reflashConsent: boolean;
  notifyByEmail: boolean;
  ownerEmail: string;
  ownerPhone: string | null;
  ownerCallSign: string | null;
  technicianName: string | null;
  awaitingApproval: boolean;
  partsOnOrder: boolean;
  events: TicketEventDto[];
  moves: MoveOption[];
}
