// Ticket photos (intake condition photos, repair photos): one row per photo; the bytes and the
// thumbnail live in the blob store under their SHA-256, never under a name the uploader chose.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import { PHOTO_STAGES, type PhotoStage, type TicketPhoto } from '../../contracts/photos';
import type { User } from '../users/user.model';

export class Photo extends Model<InferAttributes<Photo>, InferCreationAttributes<Photo>> {
  declare id: CreationOptional<number>;
  declare ticketId: number;
  declare stage: PhotoStage;
  declare blobKey: string;
  declare thumbKey: string;
  declare mime: TicketPhoto['mime'];
  declare size: number;
  declare width: number;
  declare height: number;
  declare originalName: string;
  declare uploadedBy: number | null;
  declare createdAt: Date;

  /** Loaded with `include: [{ association: 'uploader' }]`. */
  declare uploader?: NonAttribute<User | null>;
}

export function initPhotoModel(sequelize: Sequelize): void {
  Photo.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      stage: { type: DataTypes.ENUM(...PHOTO_STAGES), allowNull: false },
      blobKey: { type: DataTypes.CHAR(64), allowNull: false },
      thumbKey: { type: DataTypes.CHAR(64), allowNull: false },
      mime: { type: DataTypes.STRING(20), allowNull: false },
      size: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      width: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      height: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      originalName: { type: DataTypes.STRING(120), allowNull: false },
      uploadedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      createdAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'ticket_photos', modelName: 'Photo', underscored: true, updatedAt: false },
  );
}
