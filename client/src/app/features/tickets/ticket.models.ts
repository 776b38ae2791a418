import { TicketState } from '@domain/workflow';
import { ListQuery } from '../../core/http/api-error';
import { EquipmentKind, Flag } from '../../shared/labels';

export type { TicketState, EquipmentKind, Flag };

/** A row of `GET /api/tickets`. */
export interface TicketRow {
  id: number | string;
  tag: string;
  equipmentKind: EquipmentKind;
  makeModel: string;
  ownerName: string;
  state: TicketState;
  stateSince: string;
  createdAt: string;
}

export interface TicketEvent {
  id: number | string;
  at: string;
  actorName: string | null;
  kind: 'opened' | 'moved' | 'note';
  fromState: TicketState | null;
  toState: TicketState | null;
  note: string | null;
}

export interface TicketMoveOption {
  to: TicketState;
  allowed: boolean;
  /** Allowed once a note for the timeline is given (the reason then says what to write). */
  noteRequired?: boolean;
  reason?: string;
}

/** `GET /api/tickets/:tag`. */
export interface TicketDetail extends TicketRow {
  version: number;
  serialNumber: string | null;
  units: string[];
  faultReported: string;
  accessories: string[];
  firmwareVersions: string | null;
  reflashConsent: boolean;
  notifyByEmail: boolean;
  ownerEmail: string | null;
  ownerPhone: string | null;
  ownerCallSign: string | null;
  technicianName: string | null;
  events: TicketEvent[];
  moves: TicketMoveOption[];
}

export interface TicketOwnerBody {
  name: string;
  email: string;
  phone?: string;
  callSign?: string;
}

/** Body of `POST /api/tickets` (the intake form). */
export interface IntakeBody {
  equipmentKind: EquipmentKind;
  makeModel: string;
  serialNumber?: string;
  units: string[];
  faultReported: string;
  accessories: string[];
  firmwareVersions?: string;
  reflashConsent: boolean;
  notifyByEmail: boolean;
  owner?: TicketOwnerBody;
}

export type TicketSort = 'tag' | 'createdAt' | 'state' | 'stateSince';

export interface TicketQuery extends ListQuery {
  sort?: TicketSort;
  state?: TicketState | '';
}

export interface MoveBody {
  to: TicketState;
  version: number;
  note?: string;
}
