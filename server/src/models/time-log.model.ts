import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { User } from './user.model.js';

export class TimeLog extends Model<InferAttributes<TimeLog>, InferCreationAttributes<TimeLog>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare userId: string | null;
  declare hours: string;
  declare workedOn: string;
  declare note: CreationOptional<string>;
  declare findingId: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare user?: NonAttribute<User | null>;

  static initModel(sequelize: Sequelize) {
    TimeLog.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        userId: { type: DataTypes.UUID, allowNull: true },
        hours: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        workedOn: { type: DataTypes.DATEONLY, allowNull: false },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        findingId: { type: DataTypes.UUID, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'time_logs', version: true },
    );
  }
}
