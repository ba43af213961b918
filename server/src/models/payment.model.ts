import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { PaymentKind, PaymentMethod, PaymentState } from '@wingstage/shared';

/** Money received or being taken for a job: a card payment through a Checkout Session, or an offline one (db/migrations/0100-money.ts). State moves go through assertPaymentMove. */
export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare kind: PaymentKind;
  declare method: PaymentMethod;
  declare depositRequestId: CreationOptional<string | null>;
  declare invoiceId: CreationOptional<string | null>;
  declare state: CreationOptional<PaymentState>;
  declare currency: string;
  declare expectedAmount: string;
  declare amount: CreationOptional<string | null>;
  declare fee: CreationOptional<string | null>;
  declare net: CreationOptional<string | null>;
  declare refunded: CreationOptional<string>;
  declare amountMismatch: CreationOptional<boolean>;
  declare stripeCheckoutSessionId: CreationOptional<string | null>;
  declare stripePaymentIntentId: CreationOptional<string | null>;
  declare stripeChargeId: CreationOptional<string | null>;
  declare stripeBalanceTransactionId: CreationOptional<string | null>;
  declare stripePayoutId: CreationOptional<string | null>;
  declare failureCode: CreationOptional<string | null>;
  declare failureMessage: CreationOptional<string | null>;
  declare outcomeNote: CreationOptional<string | null>;
  declare receivedAt: CreationOptional<Date | null>;
  declare reference: CreationOptional<string | null>;
  declare recordedBy: CreationOptional<string | null>;
  /** When the card payment's receipt e-mail was queued (db/migrations/0160-payment-receipt-mailed.ts). */
  declare receiptMailedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Payment.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        method: { type: DataTypes.TEXT, allowNull: false },
        depositRequestId: { type: DataTypes.UUID, allowNull: true },
        invoiceId: { type: DataTypes.UUID, allowNull: true },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'pending' },
        currency: { type: DataTypes.TEXT, allowNull: false },
        expectedAmount: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        amount: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        fee: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        net: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        refunded: { type: DataTypes.DECIMAL(14, 2), allowNull: false, defaultValue: '0' },
        amountMismatch: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        stripeCheckoutSessionId: { type: DataTypes.TEXT, allowNull: true },
        stripePaymentIntentId: { type: DataTypes.TEXT, allowNull: true },
        stripeChargeId: { type: DataTypes.TEXT, allowNull: true },
        stripeBalanceTransactionId: { type: DataTypes.TEXT, allowNull: true },
        stripePayoutId: { type: DataTypes.TEXT, allowNull: true },
        failureCode: { type: DataTypes.TEXT, allowNull: true },
        failureMessage: { type: DataTypes.TEXT, allowNull: true },
        outcomeNote: { type: DataTypes.TEXT, allowNull: true },
        receivedAt: { type: DataTypes.DATE, allowNull: true },
        reference: { type: DataTypes.TEXT, allowNull: true },
        recordedBy: { type: DataTypes.UUID, allowNull: true },
        receiptMailedAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'payments', version: true },
    );
  }
}
