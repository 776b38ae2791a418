// Tickets (one piece of equipment from one owner) and their audit events, as Sequelize models.
// Sequelize 6 TypeScript style: `declare` fields, CreationOptional for what the database fills in.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import { EQUIPMENT_KINDS, EVENT_KINDS, type EquipmentKind, type EventKind, type Symptom, type UpdateChannel } from '../../contracts/tickets';
import { STATES, type TicketState } from '../../domain/workflow';
import type { User } from '../users/user.model';

export class Ticket extends Model<InferAttributes<Ticket>, InferCreationAttributes<Ticket>> {
  declare id: CreationOptional<number>;
  declare ownerUserId: number | null;
  declare ownerName: string;
  /** Null for an owner handed in at the bench with a phone number only: no mail is ever sent. */
  declare ownerEmail: string | null;
  declare ownerPhone: string | null;
  declare ownerCallSign: string | null;
  declare equipmentKind: EquipmentKind;
  declare makeModel: string;
  declare serialNumber: string | null;
  declare units: string[];
  declare faultReported: string;
  declare symptoms: CreationOptional<Symptom[]>;
  declare accessories: string[];
  declare accessoriesNote: CreationOptional<string | null>;
  declare firmwareVersions: string | null;
  declare reflashConsent: boolean;
  declare notifyByEmail: boolean;
  declare updatesBy: CreationOptional<UpdateChannel>;
  declare state: CreationOptional<TicketState>;
  declare stateSince: Date;
  declare technicianId: number | null;
  declare awaitingApproval: CreationOptional<boolean>;
  declare partsOnOrder: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  /** Loaded with `include: [{ association: 'technician' }]` (associations: api/src/models.ts). */
  declare technician?: NonAttribute<User | null>;
  /** Loaded with `include: [{ association: 'events' }]`. */
  declare events?: NonAttribute<TicketEvent[]>;
}

export class TicketEvent extends Model<InferAttributes<TicketEvent>, InferCreationAttributes<TicketEvent>> {
  declare id: CreationOptional<number>;
  declare ticketId: ForeignKey<number>;
  declare actorId: number | null;
  declare kind: EventKind;
  declare fromState: TicketState | null;
  declare toState: TicketState | null;
  declare note: string | null;
  /** Whether the owner may read this event (status page, mails); internal bench records are not. */
  declare ownerVisible: CreationOptional<boolean>;
  /** On a 'moved' event: the 'move_undone' event that put the ticket back (null while it stands). */
  declare undoneByEventId: CreationOptional<number | null>;
  /** On a 'moved' event: when the ticket had entered the lane it left (an undo restores it). */
  declare priorStateSince: CreationOptional<Date | null>;
  /** On a 'moved' event: the move made the mover the ticket's technician (an undo hands it back). */
  declare tookTicket: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;

  /** Loaded with `include: [{ association: 'actor' }]`. */
  declare actor?: NonAttribute<User | null>;
}

/** JSON columns come back as text from MariaDB (it stores JSON as LONGTEXT); parse them once here. */
function jsonArray(this: Model, column: string): string[] {
  const raw = this.getDataValue(column as never) as unknown;
  if (Array.isArray(raw)) return raw as string[];
  if (typeof raw === 'string') {
    try {
      const parsed = JSON.parse(raw);
      return Array.isArray(parsed) ? parsed : [];
    } catch {
      return [];
    }
  }
  return [];
}

export function initTicketModels(sequelize: Sequelize): void {
  Ticket.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ownerUserId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      ownerName: { type: DataTypes.STRING(100), allowNull: false },
      ownerEmail: { type: DataTypes.STRING(254), allowNull: true },
      ownerPhone: { type: DataTypes.STRING(40), allowNull: true },
      ownerCallSign: { type: DataTypes.STRING(12), allowNull: true },
      equipmentKind: { type: DataTypes.ENUM(...EQUIPMENT_KINDS), allowNull: false },
      makeModel: { type: DataTypes.STRING(120), allowNull: false },
      serialNumber: { type: DataTypes.STRING(60), allowNull: true },
      units: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: Ticket) {
          return jsonArray.call(this, 'units');
        },
      },
      faultReported: { type: DataTypes.TEXT, allowNull: false },
      symptoms: {
        type: DataTypes.JSON,
        allowNull: true,
        defaultValue: [],
        get(this: Ticket) {
          return jsonArray.call(this, 'symptoms') as Symptom[];
        },
      },
      accessories: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: Ticket) {
          return jsonArray.call(this, 'accessories');
        },
      },
      accessoriesNote: { type: DataTypes.STRING(500), allowNull: true, defaultValue: null },
      firmwareVersions: { type: DataTypes.STRING(500), allowNull: true },
      reflashConsent: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      notifyByEmail: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      updatesBy: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'email' },
      state: { type: DataTypes.ENUM(...STATES), allowNull: false, defaultValue: 'intake' },
      stateSince: { type: DataTypes.DATE(3), allowNull: false },
      technicianId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      awaitingApproval: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      partsOnOrder: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'tickets', modelName: 'Ticket', underscored: true, version: true },
  );

  TicketEvent.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      kind: { type: DataTypes.STRING(40), allowNull: false, validate: { isIn: [EVENT_KINDS as unknown as string[]] } },
      fromState: { type: DataTypes.ENUM(...STATES), allowNull: true },
      toState: { type: DataTypes.ENUM(...STATES), allowNull: true },
      note: { type: DataTypes.TEXT, allowNull: true },
      ownerVisible: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      undoneByEventId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
      priorStateSince: { type: DataTypes.DATE(3), allowNull: true },
      tookTicket: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'ticket_events', modelName: 'TicketEvent', underscored: true, updatedAt: false },
  );
}
