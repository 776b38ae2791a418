// Bookings of bench slots (table from db/migrations/020-bench-slots.ts). The booked 5-minute units
// (table booking_units, unique per bench and unit) are written with plain SQL in the service.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { BookingPurpose, BookingStatus } from '../../contracts/bookings';

export class Booking extends Model<InferAttributes<Booking>, InferCreationAttributes<Booking>> {
  declare id: CreationOptional<number>;
  declare benchId: number;
  declare userId: number;
  declare startsAt: Date;
  declare endsAt: Date;
  declare slotCount: number;
  declare purpose: BookingPurpose;
  declare ticketId: number | null;
  declare note: string | null;
  declare status: CreationOptional<BookingStatus>;
  declare noShow: CreationOptional<boolean>;
  declare cancelledAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initBookingModels(sequelize: Sequelize): void {
  Booking.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      benchId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      startsAt: { type: DataTypes.DATE(3), allowNull: false },
      endsAt: { type: DataTypes.DATE(3), allowNull: false },
      slotCount: { type: DataTypes.TINYINT.UNSIGNED, allowNull: false },
      purpose: { type: DataTypes.ENUM('self_service', 'drop_off', 'collection'), allowNull: false },
      ticketId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      note: { type: DataTypes.STRING(500), allowNull: true },
      status: { type: DataTypes.ENUM('booked', 'cancelled'), allowNull: false, defaultValue: 'booked' },
      noShow: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      cancelledAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: { type: DataTypes.DATE(3) },
      updatedAt: { type: DataTypes.DATE(3) },
    },
    { sequelize, tableName: 'bookings', modelName: 'Booking', underscored: true },
  );
}
