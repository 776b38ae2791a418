// Owner links (table owner_links, db/migrations/035): a random token the owner opens without an
// account. Only its SHA-256 is stored; the token itself exists in the e-mail alone.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export const OWNER_LINK_PURPOSES = ['approve', 'status'] as const;
export type OwnerLinkPurpose = (typeof OWNER_LINK_PURPOSES)[number];

export class OwnerLink extends Model<InferAttributes<OwnerLink>, InferCreationAttributes<OwnerLink>> {
  declare id: CreationOptional<number>;
  declare tokenHash: string;
  declare purpose: OwnerLinkPurpose;
  declare ticketId: number;
  declare quoteId: number | null;
  declare expiresAt: Date | null;
  declare usedAt: Date | null;
  declare createdAt: Date;
}

export function initOwnerLinkModel(sequelize: Sequelize): void {
  OwnerLink.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      purpose: { type: DataTypes.STRING(10), allowNull: false },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      quoteId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      expiresAt: { type: DataTypes.DATE(3), allowNull: true },
      usedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'owner_links', modelName: 'OwnerLink', underscored: true, updatedAt: false },
  );
}
