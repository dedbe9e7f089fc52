import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { FeedScope } from '../../../shared/schemas/feeds.js';

export class FeedModel extends Model<InferAttributes<FeedModel>, InferCreationAttributes<FeedModel>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare scope: FeedScope;
  declare instrumentId: number | null;
  /** SHA-256 of the URL's token, hex; the token itself is never stored. */
  declare tokenHash: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    FeedModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        userId: { type: DataTypes.INTEGER, allowNull: false },
        scope: { type: DataTypes.TEXT, allowNull: false },
        instrumentId: { type: DataTypes.INTEGER, allowNull: true },
        tokenHash: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      // Regenerating replaces the token and its created_at; nothing else ever changes: no updated_at column.
      { sequelize, tableName: 'calendar_feeds', underscored: true, updatedAt: false },
    );
  }
}
