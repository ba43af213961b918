import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { JobState, JobType, ScopeCaution } from '@wingstage/shared';
import type { Aircraft } from './aircraft.model.js';

export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare number: string;
  declare aircraftId: string;
  declare title: string;
  declare type: JobType;
  declare state: CreationOptional<JobState>;
  declare bookedInOn: string;
  declare dueOn: string | null;
  declare notes: CreationOptional<string>;
  /** The cautions of the template's scope lines, copied at booking in. */
  declare scopeCautions: CreationOptional<ScopeCaution[]>;
  /** The owner's pre-authorised limit, incl. VAT; null means none of that kind. */
  declare preAuthPerFinding: CreationOptional<string | null>;
  declare preAuthPerJob: CreationOptional<string | null>;
  declare preAuthAgreedHow: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare aircraft?: NonAttribute<Aircraft>;

  static initModel(sequelize: Sequelize) {
    Job.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        number: { type: DataTypes.TEXT, allowNull: false },
        aircraftId: { type: DataTypes.UUID, allowNull: false },
        title: { type: DataTypes.TEXT, allowNull: false },
        type: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'booked_in' },
        bookedInOn: { type: DataTypes.DATEONLY, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        scopeCautions: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        preAuthPerFinding: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        preAuthPerJob: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        preAuthAgreedHow: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'jobs', version: true },
    );
  }
}
