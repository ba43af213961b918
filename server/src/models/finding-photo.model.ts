import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './user.model.js';

/** One picture of a finding: the store keeps the files, this row their keys and pixel sizes. */
export class FindingPhoto extends Model<InferAttributes<FindingPhoto>, InferCreationAttributes<FindingPhoto>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare findingId: string;
  declare storageKey: string;
  declare thumbKey: string;
  declare width: number;
  declare height: number;
  declare thumbWidth: number;
  declare thumbHeight: number;
  /** Bytes of the stored full-size file. */
  declare bytes: number;
  declare uploadedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare removedAt: CreationOptional<Date | null>;
  declare removedBy: CreationOptional<string | null>;
  declare uploader?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    FindingPhoto.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        findingId: { type: DataTypes.UUID, allowNull: false },
        storageKey: { type: DataTypes.TEXT, allowNull: false },
        thumbKey: { type: DataTypes.TEXT, allowNull: false },
        width: { type: DataTypes.INTEGER, allowNull: false },
        height: { type: DataTypes.INTEGER, allowNull: false },
        thumbWidth: { type: DataTypes.INTEGER, allowNull: false },
        thumbHeight: { type: DataTypes.INTEGER, allowNull: false },
        bytes: { type: DataTypes.INTEGER, allowNull: false },
        uploadedBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        removedAt: { type: DataTypes.DATE, allowNull: true },
        removedBy: { type: DataTypes.UUID, allowNull: true },
      },
      { sequelize, tableName: 'finding_photos', updatedAt: false },
    );
  }
}
