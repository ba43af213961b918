import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { Customer } from './customer.model.js';

export class Aircraft extends Model<InferAttributes<Aircraft>, InferCreationAttributes<Aircraft>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare customerId: string;
  declare registration: string;
  declare type: string;
  declare serial: CreationOptional<string>;
  /** NUMERIC: a decimal string, never a float. */
  declare airframeHours: CreationOptional<string>;
  declare engine: CreationOptional<string>;
  declare engineHours: CreationOptional<string>;
  declare notes: CreationOptional<string>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare customer?: NonAttribute<Customer>;

  static initModel(sequelize: Sequelize) {
    Aircraft.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        customerId: { type: DataTypes.UUID, allowNull: false },
        registration: { type: DataTypes.TEXT, allowNull: false },
        type: { type: DataTypes.TEXT, allowNull: false },
        serial: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        airframeHours: { type: DataTypes.DECIMAL(13, 1), allowNull: false, defaultValue: '0' },
        engine: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        engineHours: { type: DataTypes.DECIMAL(13, 1), allowNull: false, defaultValue: '0' },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'aircraft', version: true },
    );
  }
}
