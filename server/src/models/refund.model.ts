import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** Money handed back against a payment (db/migrations/0100-money.ts). */
export class Refund extends Model<InferAttributes<Refund>, InferCreationAttributes<Refund>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare paymentId: string;
  declare creditNoteId: CreationOptional<string | null>;
  declare amount: string;
  declare currency: string;
  declare state: CreationOptional<'pending' | 'succeeded' | 'failed'>;
  declare reason: string;
  declare stripeRefundId: CreationOptional<string | null>;
  declare stripeBalanceTransactionId: CreationOptional<string | null>;
  declare stripePayoutId: CreationOptional<string | null>;
  declare createdBy: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Refund.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        paymentId: { type: DataTypes.UUID, allowNull: false },
        creditNoteId: { type: DataTypes.UUID, allowNull: true },
        amount: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        currency: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        reason: { type: DataTypes.TEXT, allowNull: false },
        stripeRefundId: { type: DataTypes.TEXT, allowNull: true },
        stripeBalanceTransactionId: { type: DataTypes.TEXT, allowNull: true },
        stripePayoutId: { type: DataTypes.TEXT, allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'refunds' },
    );
  }
}
