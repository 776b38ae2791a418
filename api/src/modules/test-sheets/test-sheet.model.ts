// Test sheets of a ticket and the club's test limits (db/migrations/050-bench-records.ts).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { BandInput, TestLimits } from '../../domain/test-sheet';
import type { User } from '../users/user.model';

export class TestSheetRow extends Model<InferAttributes<TestSheetRow>, InferCreationAttributes<TestSheetRow>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare number: number;
  declare supplyVoltageV: number;
  declare receiveCurrentA: number;
  declare bands: BandInput[];
  declare limits: TestLimits;
  declare reference: string | null;
  declare notes: string | null;
  declare passed: boolean;
  declare technicianId: number | null;
  declare createdAt: Date;

  declare technician?: NonAttribute<User | null>;
}

export class TestLimitRow extends Model<InferAttributes<TestLimitRow>, InferCreationAttributes<TestLimitRow>> {
  declare limitKey: string;
  declare value: number;
  declare source: string;
  declare updatedBy: number | null;
  declare updatedAt: Date;
}

/** JSON columns come back as text from MariaDB (it stores JSON as LONGTEXT); parse them once here. */
export function jsonColumn<T>(this: Model, column: string, fallback: T): T {
  const raw = this.getDataValue(column as never) as unknown;
  if (typeof raw === 'string') {
    try {
      return JSON.parse(raw) as T;
    } catch {
      return fallback;
    }
  }
  return (raw as T) ?? fallback;
}

export function initTestSheetModels(sequelize: Sequelize): void {
  TestSheetRow.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      number: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
      supplyVoltageV: { type: DataTypes.DOUBLE, allowNull: false },
      receiveCurrentA: { type: DataTypes.DOUBLE, allowNull: false },
      bands: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: TestSheetRow) {
          return jsonColumn.call(this, 'bands', [] as BandInput[]);
        },
      },
      limits: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: TestSheetRow) {
          return jsonColumn.call(this, 'limits', {} as TestLimits);
        },
      },
      reference: { type: DataTypes.STRING(200), allowNull: true },
      notes: { type: DataTypes.STRING(2000), allowNull: true },
      passed: { type: DataTypes.BOOLEAN, allowNull: false },
      technicianId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'test_sheets', modelName: 'TestSheet', underscored: true, updatedAt: false },
  );
  TestLimitRow.init(
    {
      limitKey: { type: DataTypes.STRING(40), primaryKey: true },
      value: { type: DataTypes.DOUBLE, allowNull: false },
      source: { type: DataTypes.STRING(300), allowNull: false },
      updatedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      updatedAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'test_limits', modelName: 'TestLimit', underscored: true, createdAt: false },
  );
}
