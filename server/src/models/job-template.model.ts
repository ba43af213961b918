import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { JobType, TemplateChecklistItemDto, TemplateLineDto } from '@wingstage/shared';

export class JobTemplate extends Model<InferAttributes<JobTemplate>, InferCreationAttributes<JobTemplate>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare name: string;
  declare jobType: JobType;
  declare description: CreationOptional<string>;
  /** Kept in order as jsonb arrays: a template is always read and saved whole. */
  declare lines: TemplateLineDto[];
  declare checklist: TemplateChecklistItemDto[];
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    JobTemplate.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        jobType: { type: DataTypes.TEXT, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        lines: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        checklist: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'job_templates', version: true },
    );
  }
}
