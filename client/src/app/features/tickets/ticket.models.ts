import { TicketState } from '@domain/workflow';
import { EquipmentKind } from '@contracts/tickets';
import { ListQuery } from '../../core/http/api-error';

// What the server sends is the API's own (api/src/contracts/tickets.ts); bodies and queries are the client's.
export type { TicketState };
export type { EquipmentKind, MoveOption, TicketDetail, TicketEventDto, TicketRow } from '@contracts/tickets';
export type { Flag } from '@contracts/board';

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
