// Fees and payments as Sequelize models (tables from db/migrations/060-payments.ts). Amounts are
// integers in minor units of the club's currency.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { PAYMENT_METHODS, PAYMENT_STATUSES, FEE_UNITS, type FeeUnit, type PaymentMethod, type PaymentStatus } from '../../contracts/payments';

export class FeeItem extends Model<InferAttributes<FeeItem>, InferCreationAttributes<FeeItem>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare unit: FeeUnit;
  declare createdAt: CreationOptional<Date>;
}

export class FeePriceRow extends Model<InferAttributes<FeePriceRow>, InferCreationAttributes<FeePriceRow>> {
  declare id: CreationOptional<number>;
  declare feeItemId: number;
  declare effectiveFrom: string;
  declare memberPrice: number;
  declare nonMemberPrice: number;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class Charge extends Model<InferAttributes<Charge>, InferCreationAttributes<Charge>> {
  declare id: CreationOptional<number>;
  declare ticketId: number | null;
  declare bookingId: number | null;
  declare feeItemId: number | null;
  declare description: string;
  declare quantity: number;
  declare unitAmount: number;
  declare amount: number;
  declare memberRate: boolean;
  declare ledgerMonth: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class Waiver extends Model<InferAttributes<Waiver>, InferCreationAttributes<Waiver>> {
  declare id: CreationOptional<number>;
  declare chargeId: number;
  declare amount: number;
  declare reason: string;
  declare ledgerMonth: string;
  declare adjustment: boolean;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<number>;
  declare ticketId: number | null;
  declare method: PaymentMethod;
  declare status: PaymentStatus;
  declare amount: number;
  declare currency: string;
  declare reference: string | null;
  declare idempotencyKey: string | null;
  declare checkoutSessionId: string | null;
  declare checkoutUrl: string | null;
  declare paymentIntentId: string | null;
  declare providerChargeId: string | null;
  declare failureMessage: string | null;
  declare receiptNumber: string | null;
  declare paidAt: Date | null;
  declare ledgerMonth: string | null;
  declare recordedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PaymentAllocation extends Model<InferAttributes<PaymentAllocation>, InferCreationAttributes<PaymentAllocation>> {
  declare id: CreationOptional<number>;
  declare paymentId: number;
  declare chargeId: number;
  declare amount: number;
}

export class Refund extends Model<InferAttributes<Refund>, InferCreationAttributes<Refund>> {
  declare id: CreationOptional<number>;
  declare paymentId: number;
  declare amount: number;
  declare reason: string;
  declare providerRefundId: string | null;
  declare ledgerMonth: string;
  declare adjustment: boolean;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class WebhookEvent extends Model<InferAttributes<WebhookEvent>, InferCreationAttributes<WebhookEvent>> {
  declare eventId: string;
  declare type: string;
  declare objectId: string | null;
  declare outcome: string;
  declare receivedAt: Date;
}

export class MonthClose extends Model<InferAttributes<MonthClose>, InferCreationAttributes<MonthClose>> {
  declare month: string;
  declare closedBy: number | null;
  declare closedAt: Date;
  declare summary: unknown;
}

const amount = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });
const opts = (sequelize: Sequelize, tableName: string, modelName: string) => ({ sequelize, tableName, modelName, underscored: true, updatedAt: false as const });

export function initPaymentModels(sequelize: Sequelize): void {
  FeeItem.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      code: { type: DataTypes.STRING(40), allowNull: false },
      name: { type: DataTypes.STRING(100), allowNull: false },
      unit: { type: DataTypes.ENUM(...FEE_UNITS), allowNull: false },
      createdAt: { type: DataTypes.DATE(3) },
    },
    opts(sequelize, 'fee_items', 'FeeItem'),
  );
  FeePriceRow.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      feeItemId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      effectiveFrom: { type: DataTypes.CHAR(10), allowNull: false },
      memberPrice: amount(),
      nonMemberPrice: amount(),
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
    },
    opts(sequelize, 'fee_prices', 'FeePriceRow'),
  );
  Charge.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      bookingId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      feeItemId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      description: { type: DataTypes.STRING(200), allowNull: false },
      quantity: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false },
      unitAmount: amount(),
      amount: amount(),
      memberRate: { type: DataTypes.BOOLEAN, allowNull: false },
      ledgerMonth: { type: DataTypes.CHAR(7), allowNull: false },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
    },
    opts(sequelize, 'charges', 'Charge'),
  );
  Waiver.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      chargeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      amount: amount(),
      reason: { type: DataTypes.STRING(500), allowNull: false },
      ledgerMonth: { type: DataTypes.CHAR(7), allowNull: false },
      adjustment: { type: DataTypes.BOOLEAN, allowNull: false },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
    },
    opts(sequelize, 'waivers', 'Waiver'),
  );
  Payment.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      method: { type: DataTypes.ENUM(...PAYMENT_METHODS), allowNull: false },
      status: { type: DataTypes.ENUM(...PAYMENT_STATUSES), allowNull: false },
      amount: amount(),
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      reference: { type: DataTypes.STRING(100), allowNull: true },
      idempotencyKey: { type: DataTypes.STRING(100), allowNull: true },
      checkoutSessionId: { type: DataTypes.STRING(100), allowNull: true },
      checkoutUrl: { type: DataTypes.STRING(500), allowNull: true },
      paymentIntentId: { type: DataTypes.STRING(100), allowNull: true },
      providerChargeId: { type: DataTypes.STRING(100), allowNull: true },
      failureMessage: { type: DataTypes.STRING(200), allowNull: true },
      receiptNumber: { type: DataTypes.STRING(20), allowNull: true },
      paidAt: { type: DataTypes.DATE(3), allowNull: true },
      ledgerMonth: { type: DataTypes.CHAR(7), allowNull: true },
      recordedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'payments', modelName: 'Payment', underscored: true },
  );
  PaymentAllocation.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      paymentId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      chargeId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      amount: amount(),
    },
    { sequelize, tableName: 'payment_allocations', modelName: 'PaymentAllocation', underscored: true, timestamps: false },
  );
  Refund.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      paymentId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      amount: amount(),
      reason: { type: DataTypes.STRING(500), allowNull: false },
      providerRefundId: { type: DataTypes.STRING(100), allowNull: true },
      ledgerMonth: { type: DataTypes.CHAR(7), allowNull: false },
      adjustment: { type: DataTypes.BOOLEAN, allowNull: false },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
    },
    opts(sequelize, 'refunds', 'Refund'),
  );
  WebhookEvent.init(
    {
      eventId: { type: DataTypes.STRING(100), primaryKey: true },
      type: { type: DataTypes.STRING(60), allowNull: false },
      objectId: { type: DataTypes.STRING(100), allowNull: true },
      outcome: { type: DataTypes.STRING(40), allowNull: false },
      receivedAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'webhook_events', modelName: 'WebhookEvent', underscored: true, timestamps: false },
  );
  MonthClose.init(
    {
      month: { type: DataTypes.CHAR(7), primaryKey: true },
      closedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      closedAt: { type: DataTypes.DATE(3), allowNull: false },
      summary: { type: DataTypes.JSON, allowNull: false },
    },
    { sequelize, tableName: 'month_closes', modelName: 'MonthClose', underscored: true, timestamps: false },
  );
}
