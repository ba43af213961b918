import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { ChecklistLimit, ChecklistResult } from '@wingstage/shared';
import type { User } from './user.model.js';

export class JobChecklistItem extends Model<InferAttributes<JobChecklistItem>, InferCreationAttributes<JobChecklistItem>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare sortOrder: number;
  declare section: CreationOptional<string>;
  declare text: string;
  declare limit: ChecklistLimit | null;
  declare caution: CreationOptional<string>;
  declare result: CreationOptional<ChecklistResult | null>;
  declare measuredValue: CreationOptional<string | null>;
  declare note: CreationOptional<string>;
  declare recordedBy: CreationOptional<string | null>;
  declare recordedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare recorder?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    JobChecklistItem.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        sortOrder: { type: DataTypes.INTEGER, allowNull: false },
        section: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        text: { type: DataTypes.TEXT, allowNull: false },
        limit: { type: DataTypes.JSONB, allowNull: true },
        caution: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        result: { type: DataTypes.TEXT, allowNull: true },
        measuredValue: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        recordedBy: { type: DataTypes.UUID, allowNull: true },
        recordedAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'job_checklist_items', version: true },
    );
  }
}
