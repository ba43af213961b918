import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { ChecklistLimit, FindingCategory, FindingState, remedySchema } from '@wingstage/shared';
import type { z } from 'zod';
import type { User } from './user.model.js';

export type Remedy = z.output<typeof remedySchema>;

export class Finding extends Model<InferAttributes<Finding>, InferCreationAttributes<Finding>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  /** Shown as F-<seq>; gap-free within the job. */
  declare seq: number;
  declare title: string;
  declare location: string;
  declare category: FindingCategory;
  declare seen: string;
  declare checklistItemId: string | null;
  declare measuredValue: string | null;
  declare limit: ChecklistLimit | null;
  declare state: FindingState;
  declare remedy: Remedy;
  declare raisedBy: string | null;
  declare raisedAt: CreationOptional<Date>;
  declare rectifiedAt: CreationOptional<Date | null>;
  declare rectifiedBy: CreationOptional<string | null>;
  /** Set when approved on the owner's behalf: the price incl. VAT taken from the pre-authorised limit. */
  declare withinLimitGross: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare raiser?: NonAttribute<User | null>;
  declare rectifier?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    Finding.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        seq: { type: DataTypes.INTEGER, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        location: { type: DataTypes.TEXT, allowNull: false },
        category: { type: DataTypes.TEXT, allowNull: false },
        seen: { type: DataTypes.TEXT, allowNull: false },
        checklistItemId: { type: DataTypes.UUID, allowNull: true },
        measuredValue: { type: DataTypes.DECIMAL(12, 4), allowNull: true },
        limit: { type: DataTypes.JSONB, allowNull: true },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
        remedy: { type: DataTypes.JSONB, allowNull: false },
        raisedBy: { type: DataTypes.UUID, allowNull: true },
        raisedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        rectifiedAt: { type: DataTypes.DATE, allowNull: true },
        rectifiedBy: { type: DataTypes.UUID, allowNull: true },
        withinLimitGross: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'findings', version: true },
    );
  }
}
