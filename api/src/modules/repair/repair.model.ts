// The repair log of a ticket: work-log entries (what was done, minutes spent) and parts used
// (quantity, cost per item in integer minor units). Tables from db/migrations/050-bench-records.ts.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { User } from '../users/user.model';

export class RepairWork extends Model<InferAttributes<RepairWork>, InferCreationAttributes<RepairWork>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare description: string;
  declare minutes: number;
  declare technicianId: number | null;
  declare createdAt: Date;

  /** Loaded with `include: [{ association: 'technician' }]`. */
  declare technician?: NonAttribute<User | null>;
}

export class RepairPart extends Model<InferAttributes<RepairPart>, InferCreationAttributes<RepairPart>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare description: string;
  declare quantity: number;
  declare unitCostMinor: number;
  declare technicianId: number | null;
  declare createdAt: Date;

  declare technician?: NonAttribute<User | null>;
}

export function initRepairModels(sequelize: Sequelize): void {
  RepairWork.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      description: { type: DataTypes.STRING(1000), allowNull: false },
      minutes: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
      technicianId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'repair_work', modelName: 'RepairWork', underscored: true, updatedAt: false },
  );
  RepairPart.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      description: { type: DataTypes.STRING(200), allowNull: false },
      quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
      unitCostMinor: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      technicianId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'repair_parts', modelName: 'RepairPart', underscored: true, updatedAt: false },
  );
}
