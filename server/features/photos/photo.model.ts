import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { PhotoSubjectType } from '../../../shared/schemas/photos.js';

export class PhotoModel extends Model<InferAttributes<PhotoModel>, InferCreationAttributes<PhotoModel>> {
  declare id: CreationOptional<number>;
  declare subjectType: PhotoSubjectType;
  declare subjectId: number;
  declare ownerId: number;
  declare caption: CreationOptional<string>;
  declare width: number;
  declare height: number;
  declare bytes: number;
  declare thumbWidth: number;
  declare thumbHeight: number;
  declare fileKey: string;
  declare createdAt: CreationOptional<Date>;
  /** The uploader, through the `owner` association wired in db/models.ts. */
  declare owner?: NonAttribute<{ name: string }>;

  static initModel(sequelize: Sequelize): void {
    PhotoModel.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        subjectType: { type: DataTypes.TEXT, allowNull: false },
        subjectId: { type: DataTypes.INTEGER, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: false },
        caption: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        width: { type: DataTypes.INTEGER, allowNull: false },
        height: { type: DataTypes.INTEGER, allowNull: false },
        bytes: { type: DataTypes.INTEGER, allowNull: false },
        thumbWidth: { type: DataTypes.INTEGER, allowNull: false },
        thumbHeight: { type: DataTypes.INTEGER, allowNull: false },
        fileKey: { type: DataTypes.TEXT, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      // A photo's image never changes and its caption edits need no timestamp: no updated_at column.
      { sequelize, tableName: 'photos', underscored: true, updatedAt: false },
    );
  }
}
