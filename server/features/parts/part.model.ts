import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Dielectric } from '../../../shared/domain/cable.js';
import type { Connector, Gender, PartKind, PartStatus } from '../../../shared/schemas/parts.js';

export class PartModel extends Model<InferAttributes<PartModel>, InferCreationAttributes<PartModel>> {
  declare id: CreationOptional<number>;
  declare tag: string;
  declare kind: PartKind;
  declare description: string;
  declare connectorA: Connector;
  declare genderA: Gender;
  declare connectorB: Connector;
  declare genderB: Gender;
  declare status: PartStatus;
  declare notes: string;
  declare lengthMm: number | null;
  declare dielectric: Dielectric | null;
  /** The datasheet velocity factor as entered (null when derived from the dielectric). */
  declare velocityFactor: number | null;
  declare lossDbPerM: number | null;
  declare lossRefHz: number | null;
  declare measuredDelayPs: number | null;
  declare measuredOn: string | null;
  declare measuredHow: string | null;
  declare lossDb: number | null;
  /** Entered delay of an adapter, DC block or other part (cables compute theirs). */
  declare delayPs: number | null;
  declare maxInputDbm: number | null;
  declare minFrequencyHz: number | null;
  declare maxFrequencyHz: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    // A fresh object per attribute: Sequelize writes each attribute's column name into its definition.
    const number = () => ({ type: DataTypes.DOUBLE, allowNull: true });
    PartModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        tag: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        connectorA: { type: DataTypes.TEXT, allowNull: false },
        genderA: { type: DataTypes.TEXT, allowNull: false },
        connectorB: { type: DataTypes.TEXT, allowNull: false },
        genderB: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        lengthMm: number(),
        dielectric: { type: DataTypes.TEXT, allowNull: true },
        velocityFactor: number(),
        lossDbPerM: { ...number(), field: 'loss_db_per_m' },
        lossRefHz: number(),
        measuredDelayPs: number(),
        measuredOn: { type: DataTypes.DATEONLY, allowNull: true },
        measuredHow: { type: DataTypes.TEXT, allowNull: true },
        lossDb: number(),
        delayPs: number(),
        maxInputDbm: number(),
        minFrequencyHz: number(),
        maxFrequencyHz: number(),
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'parts', underscored: true },
    );
  }
}
