// The API's data shapes shared with the client (imported there as `@contracts/tickets`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.
import type { TicketState } from '../domain/workflow';

/** `equipmentKind` of the intake body (`POST /api/tickets`) and of every ticket shape. */
export const EQUIPMENT_KINDS = ['transceiver', 'amplifier', 'tuner', 'power_supply', 'cable', 'accessory', 'other'] as const;
export type EquipmentKind = (typeof EQUIPMENT_KINDS)[number];
/** The words for each kind (the client's forms, the intake tag and the timeline say the same). */
export const EQUIPMENT_KIND_LABELS: Record<EquipmentKind, string> = {
  transceiver: 'Transceiver',
  amplifier: 'Amplifier',
  tuner: 'Antenna tuner',
  power_supply: 'Power supply',
  cable: 'Cable or lead',
  accessory: 'Accessory',
  other: 'Other',
};

/** Symptoms ticked at intake (`symptoms` of the intake body), in the order the form shows them. */
export const SYMPTOMS = ['no_power', 'display_dark', 'relay_clicks_no_display', 'no_transmit', 'no_receive', 'distorted_audio', 'control_cable', 'other'] as const;
export type Symptom = (typeof SYMPTOMS)[number];
/** The words for each symptom: the form, the intake tag and the mails say the same. */
export const SYMPTOM_LABELS: Record<Symptom, string> = {
  no_power: 'No power',
  display_dark: 'Powers on, display dark',
  relay_clicks_no_display: 'Relay clicks, no display',
  no_transmit: 'No transmit',
  no_receive: 'No receive',
  distorted_audio: 'Distorted audio',
  control_cable: 'Control-cable trouble',
  other: 'Other',
};

/** The intake form's accessory checklist; anything else is typed in (stored by these words). */
export const COMMON_ACCESSORIES = ['Power lead', 'Control cable', 'Microphone', 'Manual', 'Antenna', 'Battery', 'Charger', 'Carry case'] as const;

/** How the owner wants to hear about the ticket (`updatesBy`). Mail goes only with 'email' and an address. */
export const UPDATE_CHANNELS = ['email', 'phone', 'none'] as const;
export type UpdateChannel = (typeof UPDATE_CHANNELS)[number];

/** `kind` of a timeline event in `GET /api/tickets/:tag`. */
// Kinds of timeline events; stored as text (migration 025), so a new kind is one more line here.
export const EVENT_KINDS = [
  'opened',
  'moved',
  'note',
  'repair_work',
  'repair_part',
  'test_sheet',
  'hand_back',
  'diagnosis_saved',
  'reflash_consent',
  'quote_written',
  'quote_approved',
  'quote_declined',
  'move_undone',
  'parts_on_order_set',
  'parts_on_order_cleared',
  'technician_assigned',
  'technician_unassigned',
  'charge_added',
  'charge_waived',
  'payment_received',
  'payment_refunded',
  'intake_edited',
  'photo_added',
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
  /** Whether the owner may read it (status page, mails); members only ever get these. */
  ownerVisible: boolean;
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
  symptoms: Symptom[];
  accessories: string[];
  accessoriesNote: string | null;
  firmwareVersions: string | null;
  reflashConsent: boolean;
  /** True when updates go by e-mail (updatesBy 'email' and the owner has an address). */
  notifyByEmail: boolean;
  updatesBy: UpdateChannel;
  ownerEmail: string | null;
  ownerPhone: string | null;
  ownerCallSign: string | null;
  technicianName: string | null;
  awaitingApproval: boolean;
  partsOnOrder: boolean;
  events: TicketEventDto[];
  moves: MoveOption[];
  /** The technician's user id (null until taken), for the assignment menu. */
  technicianId: number | null;
  /** The lane it came from (its latest move that stands); a send-back goes there, with a note. */
  previousState: TicketState | null;
  /** The undo this person may still make (their own latest move, or any as admin), within the grace period. */
  undo: UndoOffer | null;
}

/** `undo` of `TicketDetail`: `POST /api/tickets/:tag/moves/:eventId/undo` puts the ticket back in `fromState` until `until`. */
export interface UndoOffer {
  eventId: number;
  fromState: TicketState;
  toState: TicketState;
  /** ISO instant; after it the undo answers 410. */
  until: string;
}
