// Quotes and their lines (tables quotes, quote_lines: db/migrations/035). Amounts in integer
// minor units of the currency the quote was written in.
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
import type { QuoteStatus } from '../../contracts/owner-records';
import type { User } from '../users/user.model';

export class Quote extends Model<InferAttributes<Quote>, InferCreationAttributes<Quote>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare status: QuoteStatus;
  declare currency: string;
  declare totalMinor: number;
  declare thresholdMinor: number;
  declare note: string | null;
  declare createdBy: number | null;
  declare decidedAt: Date | null;
  declare declineReason: string | null;
  declare createdAt: Date;

  declare lines?: NonAttribute<QuoteLineRow[]>;
  declare author?: NonAttribute<User | null>;
}

export class QuoteLineRow extends Model<InferAttributes<QuoteLineRow>, InferCreationAttributes<QuoteLineRow>> {
  declare id: CreationOptional<number>;
  declare quoteId: ForeignKey<number>;
  declare position: number;
  declare description: string;
  declare quantityHundredths: number;
  declare unitPriceMinor: number;
  declare lineTotalMinor: number;
}

/** BIGINT comes back as a string from the mariadb driver; amounts here fit a double exactly. */
const bigint = (column: string) => ({
  type: DataTypes.BIGINT,
  allowNull: false,
  get(this: Model) {
    return Number(this.getDataValue(column as never));
  },
});

export function initQuoteModels(sequelize: Sequelize): void {
  Quote.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      totalMinor: bigint('totalMinor'),
      thresholdMinor: bigint('thresholdMinor'),
      note: { type: DataTypes.STRING(500), allowNull: true },
      createdBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      decidedAt: { type: DataTypes.DATE(3), allowNull: true },
      declineReason: { type: DataTypes.STRING(500), allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'quotes', modelName: 'Quote', underscored: true, updatedAt: false },
  );
  QuoteLineRow.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      position: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
      description: { type: DataTypes.STRING(200), allowNull: false },
      quantityHundredths: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      unitPriceMinor: bigint('unitPriceMinor'),
      lineTotalMinor: bigint('lineTotalMinor'),
    },
    { sequelize, tableName: 'quote_lines', modelName: 'QuoteLine', underscored: true, timestamps: false },
  );
}
