// The diagnosis record of a ticket (table ticket_diagnoses, db/migrations/035) and the consent
// records (reflash_consents). DECIMAL columns come back as strings; getters make them numbers.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { CheckResult, ConsentMethod, DiagnosisCheck, DiagnosisDecision } from '../../contracts/owner-records';
import type { User } from '../users/user.model';

export class Diagnosis extends Model<InferAttributes<Diagnosis>, InferCreationAttributes<Diagnosis>> {
  declare ticketId: number;
  declare checks: Partial<Record<DiagnosisCheck, CheckResult>>;
  declare supplyAtRadioV: number | null;
  declare idleCurrentA: number | null;
  declare transmitCurrentA: number | null;
  declare leadLengthM: number | null;
  declare leadGauge: string | null;
  declare sourceSupplyV: number | null;
  declare findings: string | null;
  declare decision: DiagnosisDecision | null;
  declare returnReason: string | null;
  declare updatedBy: number | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  declare editor?: NonAttribute<User | null>;
}

export class ReflashConsent extends Model<InferAttributes<ReflashConsent>, InferCreationAttributes<ReflashConsent>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare method: ConsentMethod;
  declare recordedBy: number | null;
  declare note: string | null;
  declare createdAt: Date;

  declare recorder?: NonAttribute<User | null>;
}

function decimal(column: string, precision: number, scale: number) {
  return {
    type: DataTypes.DECIMAL(precision, scale),
    allowNull: true,
    get(this: Model) {
      const raw = this.getDataValue(column as never) as unknown;
      return raw === null || raw === undefined ? null : Number(raw);
    },
  };
}

export function initDiagnosisModels(sequelize: Sequelize): void {
  Diagnosis.init(
    {
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      checks: {
        type: DataTypes.JSON,
        allowNull: false,
        get(this: Diagnosis) {
          const raw = this.getDataValue('checks') as unknown;
          if (typeof raw === 'string') {
            try {
              return JSON.parse(raw);
            } catch {
              return {};
            }
          }
          return (raw as object) ?? {};
        },
      },
      supplyAtRadioV: decimal('supplyAtRadioV', 6, 3),
      idleCurrentA: decimal('idleCurrentA', 7, 3),
      transmitCurrentA: decimal('transmitCurrentA', 7, 3),
      leadLengthM: decimal('leadLengthM', 6, 2),
      leadGauge: { type: DataTypes.STRING(12), allowNull: true },
      sourceSupplyV: decimal('sourceSupplyV', 6, 3),
      findings: { type: DataTypes.TEXT, allowNull: true },
      decision: { type: DataTypes.STRING(20), allowNull: true },
      returnReason: { type: DataTypes.STRING(500), allowNull: true },
      updatedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'ticket_diagnoses', modelName: 'Diagnosis', underscored: true, version: true },
  );
  ReflashConsent.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      method: { type: DataTypes.STRING(20), allowNull: false },
      recordedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      note: { type: DataTypes.STRING(500), allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'reflash_consents', modelName: 'ReflashConsent', underscored: true, updatedAt: false },
  );
}
