// The hand-back record of a ticket: the returned-items checklist, who collected it and when
// (db/migrations/050-bench-records.ts).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { HandBackExtra, HandBackItem } from '../../contracts/bench-records';
import { jsonColumn } from '../test-sheets/test-sheet.model';
import type { User } from '../users/user.model';

export class HandBack extends Model<InferAttributes<HandBack>, InferCreationAttributes<HandBack>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare items: HandBackItem[];
  declare extras: HandBackExtra[];
  declare collectedBy: string;
  declare collectedAt: Date;
  declare technicianId: number | null;
  declare createdAt: Date;

  declare technician?: NonAttribute<User | null>;
}

export function initHandBackModel(sequelize: Sequelize): void {
  HandBack.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      items: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: HandBack) {
          return jsonColumn.call(this, 'items', [] as HandBackItem[]);
        },
      },
      extras: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: HandBack) {
          return jsonColumn.call(this, 'extras', [] as HandBackExtra[]);
        },
      },
      collectedBy: { type: DataTypes.STRING(100), allowNull: false },
      collectedAt: { type: DataTypes.DATE(3), allowNull: false },
      technicianId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'hand_backs', modelName: 'HandBack', underscored: true, updatedAt: false },
  );
}
