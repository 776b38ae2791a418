// The club settings row (id 1, table from db/migrations/002-tickets.ts and 004-club-name.ts):
// the club's name, the board's wait limit and the board revision. The board reads and bumps the
// revision with its own SQL (board/board-revision.ts); everything else goes through this model.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class ClubSettings extends Model<InferAttributes<ClubSettings>, InferCreationAttributes<ClubSettings>> {
  declare id: number;
  declare clubName: CreationOptional<string>;
  declare waitLimitHours: CreationOptional<number>;
  declare boardRevision: CreationOptional<number>;
}

export function initClubSettingsModel(sequelize: Sequelize): void {
  ClubSettings.init(
    {
      id: { type: DataTypes.TINYINT.UNSIGNED, primaryKey: true },
      clubName: { type: DataTypes.STRING(100), allowNull: false },
      waitLimitHours: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      boardRevision: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    },
    { sequelize, tableName: 'club_settings', modelName: 'ClubSettings', underscored: true, timestamps: false },
  );
}
