import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize';
import type { VatRateCode } from '@wingstage/shared';
import type { Supplier } from './supplier.model.js';

/** NUMERIC columns stay decimal strings end to end. */
export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare partNumber: string;
  declare description: string;
  declare unitCost: string;
  declare unitPrice: string | null;
  declare markupPercent: string | null;
  declare vatRate: CreationOptional<VatRateCode>;
  declare supplierId: string | null;
  declare leadTimeDays: CreationOptional<number>;
  declare active: CreationOptional<boolean>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare supplier?: NonAttribute<Supplier | null>;

  static initModel(sequelize: Sequelize) {
    Part.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        partNumber: { type: DataTypes.TEXT, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        unitCost: { type: DataTypes.DECIMAL(16, 4), allowNull: false },
        unitPrice: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        markupPercent: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        vatRate: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'standard' },
        supplierId: { type: DataTypes.UUID, allowNull: true },
        leadTimeDays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'parts', version: true },
    );
  }
}
