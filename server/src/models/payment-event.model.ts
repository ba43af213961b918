import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export const PAYMENT_EVENT_OUTCOMES = ['processed', 'recorded', 'ignored'] as const;
export type PaymentEventOutcome = (typeof PAYMENT_EVENT_OUTCOMES)[number];

/** One accepted card-processor event (see db/migrations/0080-payment-events.ts). */
export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare id: CreationOptional<string>;
  declare stripeEventId: string;
  declare type: string;
  declare livemode: boolean;
  declare apiVersion: string | null;
  declare objectId: string | null;
  declare workshopId: string | null;
  declare outcome: PaymentEventOutcome;
  declare stripeCreatedAt: Date;
  declare receivedAt: CreationOptional<Date>;
  declare payload: Record<string, unknown>;

  static initModel(sequelize: Sequelize) {
    PaymentEvent.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        stripeEventId: { type: DataTypes.TEXT, allowNull: false, unique: true },
        type: { type: DataTypes.TEXT, allowNull: false },
        livemode: { type: DataTypes.BOOLEAN, allowNull: false },
        apiVersion: { type: DataTypes.TEXT, allowNull: true },
        objectId: { type: DataTypes.TEXT, allowNull: true },
        workshopId: { type: DataTypes.UUID, allowNull: true },
        outcome: { type: DataTypes.TEXT, allowNull: false },
        stripeCreatedAt: { type: DataTypes.DATE, allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        payload: { type: DataTypes.JSONB, allowNull: false },
      },
      { sequelize, tableName: 'payment_events', timestamps: false },
    );
  }
}
