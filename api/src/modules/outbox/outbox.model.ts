// The mail outbox: a row written in the same transaction as the change that caused the mail,
// sent later by the outbox worker with retries (so a mail-server outage loses nothing).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export const OUTBOX_STATUSES = ['pending', 'sent', 'failed'] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

export class Outbox extends Model<InferAttributes<Outbox>, InferCreationAttributes<Outbox>> {
  declare id: CreationOptional<number>;
  declare kind: string;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare ticketId: number | null;
  /** Not sent before this instant (e.g. a booking's day-before reminder); null: as soon as possible. */
  declare sendAfter: CreationOptional<Date | null>;
  declare bookingId: CreationOptional<number | null>;
  /** One attached file (db/migrations/050-bench-records.ts), or null. */
  declare attachmentName: CreationOptional<string | null>;
  declare attachmentType: CreationOptional<string | null>;
  declare attachmentContent: CreationOptional<Buffer | null>;
  /** Pending mails with one key replace each other (e.g. one owner mail for several quick moves). */
  declare coalesceKey: CreationOptional<string | null>;
  /** What the recipient was last told before this pending mail (a change back to it sends nothing). */
  declare coalesceBase: CreationOptional<string | null>;
  declare status: CreationOptional<OutboxStatus>;
  declare attempts: CreationOptional<number>;
  declare nextAttemptAt: Date;
  declare lockedUntil: Date | null;
  declare lastError: string | null;
  declare sentAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

export function initOutboxModel(sequelize: Sequelize): void {
  Outbox.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(200), allowNull: false },
      textBody: { type: DataTypes.TEXT, allowNull: false },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      sendAfter: { type: DataTypes.DATE(3), allowNull: true },
      bookingId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      attachmentName: { type: DataTypes.STRING(200), allowNull: true },
      attachmentType: { type: DataTypes.STRING(100), allowNull: true },
      attachmentContent: { type: DataTypes.BLOB('medium'), allowNull: true },
      coalesceKey: { type: DataTypes.STRING(80), allowNull: true },
      coalesceBase: { type: DataTypes.STRING(40), allowNull: true },
      status: { type: DataTypes.ENUM(...OUTBOX_STATUSES), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      nextAttemptAt: { type: DataTypes.DATE(3), allowNull: false },
      lockedUntil: { type: DataTypes.DATE(3), allowNull: true },
      lastError: { type: DataTypes.STRING(500), allowNull: true },
      sentAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'outbox', modelName: 'Outbox', underscored: true, updatedAt: false },
  );
}
