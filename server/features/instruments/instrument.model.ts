import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { InstrumentKind, InstrumentStatus } from '../../../shared/schemas/instruments.js';

export class InstrumentModel extends Model<InferAttributes<InstrumentModel>, InferCreationAttributes<InstrumentModel>> {
  declare id: CreationOptional<number>;
  declare tag: string;
  declare name: string;
  declare kind: InstrumentKind;
  declare location: string;
  declare status: InstrumentStatus;
  declare calibrationDueOn: string | null;
  declare minFrequencyHz: number | null;
  declare maxFrequencyHz: number | null;
  declare maxSafeInputDbm: number | null;
  declare qualificationRequired: boolean;
  declare maxBookingHours: number | null;
  declare minGapMinutes: number;
  declare advanceDays: number;
  declare notes: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    InstrumentModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        tag: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        location: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false },
        calibrationDueOn: { type: DataTypes.DATEONLY, allowNull: true },
        minFrequencyHz: { type: DataTypes.DOUBLE, allowNull: true },
        maxFrequencyHz: { type: DataTypes.DOUBLE, allowNull: true },
        maxSafeInputDbm: { type: DataTypes.DOUBLE, allowNull: true },
        qualificationRequired: { type: DataTypes.BOOLEAN, allowNull: false },
        maxBookingHours: { type: DataTypes.DOUBLE, allowNull: true },
        minGapMinutes: { type: DataTypes.INTEGER, allowNull: false },
        advanceDays: { type: DataTypes.INTEGER, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'instruments', underscored: true },
    );
  }
}

export class QualificationModel extends Model<InferAttributes<QualificationModel>, InferCreationAttributes<QualificationModel>> {
  declare instrumentId: number;
  declare userId: number;
  declare grantedBy: number | null;
  declare grantedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    QualificationModel.init(
      {
        instrumentId: { type: DataTypes.INTEGER, primaryKey: true },
        userId: { type: DataTypes.INTEGER, primaryKey: true },
        grantedBy: { type: DataTypes.INTEGER, allowNull: true },
        grantedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      },
      { sequelize, tableName: 'instrument_qualifications', underscored: true, timestamps: false },
    );
  }
}
