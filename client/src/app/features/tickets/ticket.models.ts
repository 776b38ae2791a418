import { TicketState } from '@domain/workflow';
import { EquipmentKind, Symptom, UpdateChannel } from '@contracts/tickets';
import { ListQuery } from '../../core/http/api-error';

// What the server sends is the API's own (api/src/contracts/tickets.ts); bodies and queries are the client's.
export type { TicketState };
export type { EquipmentKind, MoveOption, Symptom, TicketDetail, TicketEventDto, TicketRow, UpdateChannel } from '@contracts/tickets';
export type { Flag } from '@contracts/board';

/** The owner at intake: a member chosen from the accounts, or someone handed in at the bench. */
export type TicketOwnerBody = { accountId: number } | { name: string; email?: string; phone?: string; callSign?: string };

/** Body of `POST /api/tickets` (the intake stepper). */
export interface IntakeBody {
  equipmentKind: EquipmentKind;
  makeModel: string;
  serialNumber?: string;
  units: string[];
  symptoms: Symptom[];
  faultReported: string;
  accessories: string[];
  accessoriesNote?: string;
  firmwareVersions?: string;
  reflashConsent: boolean;
  updatesBy: UpdateChannel;
  owner?: TicketOwnerBody;
}

/** Body of `PATCH /api/tickets/:tag/intake`: the version seen and what changed. */
export interface IntakeEditBody {
  version: number;
  equipmentKind?: EquipmentKind;
  makeModel?: string;
  serialNumber?: string | null;
  units?: string[];
  symptoms?: Symptom[];
  faultReported?: string;
  accessories?: string[];
  accessoriesNote?: string | null;
  firmwareVersions?: string | null;
  updatesBy?: UpdateChannel;
}

/** One row of `GET /api/tickets/owners`. */
export interface OwnerSuggestion {
  id: number;
  displayName: string;
  callSign: string | null;
  email: string;
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
