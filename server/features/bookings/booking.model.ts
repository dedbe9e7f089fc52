import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { BookingKind, BookingStatus } from '../../../shared/schemas/bookings.js';

/**
 * A booking or maintenance block. Its instruments live in booking_instruments, whose exclusion constraint
 * is what keeps bookings apart; the service writes both with SQL in one transaction.
 */
export class BookingModel extends Model<InferAttributes<BookingModel>, InferCreationAttributes<BookingModel>> {
  declare id: CreationOptional<number>;
  declare kind: BookingKind;
  declare status: CreationOptional<BookingStatus>;
  declare ownerId: number;
  declare startsAt: Date;
  declare endsAt: Date;
  declare purpose: string;
  declare projectCode: string;
  declare notes: string;
  declare handoverNote: CreationOptional<string | null>;
  declare leftConnected: CreationOptional<string | null>;
  declare cancelReason: CreationOptional<string | null>;
  declare calibrationOverrideBy: CreationOptional<number | null>;
  declare checkedInAt: CreationOptional<Date | null>;
  declare checkedOutAt: CreationOptional<Date | null>;
  declare cancelledAt: CreationOptional<Date | null>;
  declare cancelledBy: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    BookingModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        kind: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'confirmed' },
        ownerId: { type: DataTypes.INTEGER, allowNull: false },
        startsAt: { type: DataTypes.DATE, allowNull: false },
        endsAt: { type: DataTypes.DATE, allowNull: false },
        purpose: { type: DataTypes.TEXT, allowNull: false },
        projectCode: { type: DataTypes.TEXT, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        handoverNote: { type: DataTypes.TEXT, allowNull: true },
        leftConnected: { type: DataTypes.TEXT, allowNull: true },
        cancelReason: { type: DataTypes.TEXT, allowNull: true },
        calibrationOverrideBy: { type: DataTypes.INTEGER, allowNull: true },
        checkedInAt: { type: DataTypes.DATE, allowNull: true },
        checkedOutAt: { type: DataTypes.DATE, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        cancelledBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'bookings', underscored: true },
    );
  }
}
