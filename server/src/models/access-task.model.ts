import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { VatRateCode } from '@wingstage/shared';

export class AccessTask extends Model<InferAttributes<AccessTask>, InferCreationAttributes<AccessTask>> {
  declare jobId: string;
  declare id: string;
  declare workshopId: string;
  declare name: string;
  declare hours: string;
  declare labourRateCode: string | null;
  declare ratePerHour: string;
  declare vatRate: VatRateCode;
  declare sortOrder: number;

  static initModel(sequelize: Sequelize) {
    AccessTask.init(
      {
        jobId: { type: DataTypes.UUID, primaryKey: true },
        id: { type: DataTypes.UUID, primaryKey: true },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        hours: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        labourRateCode: { type: DataTypes.TEXT, allowNull: true },
        ratePerHour: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        vatRate: { type: DataTypes.TEXT, allowNull: false },
        sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      },
      { sequelize, tableName: 'access_tasks', timestamps: false },
    );
  }
}
