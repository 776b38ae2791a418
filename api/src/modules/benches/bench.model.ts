// Benches, opening rules and the club's booking settings (tables from db/migrations/020-bench-slots.ts).
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Instrument, OpeningRuleKind } from '../../contracts/bookings';

export class Bench extends Model<InferAttributes<Bench>, InferCreationAttributes<Bench>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare location: string | null;
  declare instruments: Instrument[];
  declare outOfService: CreationOptional<boolean>;
  declare outOfServiceReason: string | null;
  declare outOfServiceUntil: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class OpeningRule extends Model<InferAttributes<OpeningRule>, InferCreationAttributes<OpeningRule>> {
  declare id: CreationOptional<number>;
  declare kind: OpeningRuleKind;
  declare weekday: number | null;
  declare startTime: string | null;
  declare endTime: string | null;
  declare validFrom: string | null;
  declare validUntil: string | null;
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initBenchModels(sequelize: Sequelize): void {
  Bench.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(60), allowNull: false },
      location: { type: DataTypes.STRING(120), allowNull: true },
      instruments: { type: DataTypes.JSON, allowNull: false },
      outOfService: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      outOfServiceReason: { type: DataTypes.STRING(200), allowNull: true },
      outOfServiceUntil: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'benches', modelName: 'Bench', underscored: true },
  );
  OpeningRule.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.ENUM('weekly', 'one_off', 'closure'), allowNull: false },
      weekday: { type: DataTypes.TINYINT.UNSIGNED, allowNull: true },
      startTime: { type: DataTypes.CHAR(5), allowNull: true },
      endTime: { type: DataTypes.CHAR(5), allowNull: true },
      validFrom: { type: DataTypes.CHAR(10), allowNull: true },
      validUntil: { type: DataTypes.CHAR(10), allowNull: true },
      note: { type: DataTypes.STRING(200), allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'opening_rules', modelName: 'OpeningRule', underscored: true },
  );
}
