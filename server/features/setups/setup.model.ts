import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A setup record; its content lives in immutable rows of setup_revisions, written by the service with SQL. */
export class SetupModel extends Model<InferAttributes<SetupModel>, InferCreationAttributes<SetupModel>> {
  declare id: CreationOptional<number>;
  declare bookingId: number;
  declare ownerId: number;
  declare title: string;
  declare reloadedFromRevisionId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    SetupModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        bookingId: { type: DataTypes.INTEGER, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        reloadedFromRevisionId: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'setups', underscored: true },
    );
  }
}
