import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { DepositOrigin, DepositRequestState } from '@wingstage/shared';

/** A deposit asked of the owner (db/migrations/0100-money.ts). State moves go through assertDepositRequestMove. */
export class DepositRequest extends Model<InferAttributes<DepositRequest>, InferCreationAttributes<DepositRequest>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare origin: DepositOrigin;
  declare approvalRequestId: CreationOptional<string | null>;
  declare reason: string;
  declare amount: string;
  declare currency: string;
  declare vatMix: CreationOptional<{ rate: string; gross: string }[]>;
  declare state: CreationOptional<DepositRequestState>;
  declare createdBy: CreationOptional<string | null>;
  declare paidAt: CreationOptional<Date | null>;
  declare cancelledAt: CreationOptional<Date | null>;
  declare cancelledBy: CreationOptional<string | null>;
  declare cancelReason: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    DepositRequest.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        origin: { type: DataTypes.TEXT, allowNull: false },
        approvalRequestId: { type: DataTypes.UUID, allowNull: true },
        reason: { type: DataTypes.TEXT, allowNull: false },
        amount: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        currency: { type: DataTypes.TEXT, allowNull: false },
        vatMix: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'waiting' },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        paidAt: { type: DataTypes.DATE, allowNull: true },
        cancelledAt: { type: DataTypes.DATE, allowNull: true },
        cancelledBy: { type: DataTypes.UUID, allowNull: true },
        cancelReason: { type: DataTypes.TEXT, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'deposit_requests', version: true },
    );
  }
}
