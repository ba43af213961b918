import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ApprovalRequestState, ApprovalSnapshot } from '@wingstage/shared';

export class ApprovalRequest extends Model<InferAttributes<ApprovalRequest>, InferCreationAttributes<ApprovalRequest>> {
  declare id: string;
  declare workshopId: string;
  declare jobId: string;
  declare state: CreationOptional<ApprovalRequestState>;
  declare snapshot: ApprovalSnapshot;
  declare snapshotHash: string;
  declare linkNonce: string;
  declare tokenHash: string;
  /** Gross of the whole request as sent. */
  declare gross: string;
  declare sentAt: Date;
  declare expiresAt: Date;
  declare decidedAt: CreationOptional<Date | null>;
  declare decidedByName: CreationOptional<string | null>;
  declare decidedIp: CreationOptional<string | null>;
  declare decidedUserAgent: CreationOptional<string | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare replacedById: CreationOptional<string | null>;
  declare lastRemindedAt: CreationOptional<Date | null>;
  declare sentByUserId: string | null;
  /** The request holds the quote (item "quote"). */
  declare includesQuote: CreationOptional<boolean>;
  /** When a member of staff marked the owner's decision seen, and who. */
  declare seenAt: CreationOptional<Date | null>;
  declare seenBy: CreationOptional<string | null>;
  /** A snapshot converted to version 3 by migration 0050 keeps here the document the owner saw (`snapshotHash` is its hash). */
  declare snapshotAsSent: CreationOptional<unknown | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ApprovalRequest.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'sent' },
        snapshot: { type: DataTypes.JSONB, allowNull: false },
        snapshotHash: { type: DataTypes.TEXT, allowNull: false },
        linkNonce: { type: DataTypes.TEXT, allowNull: false },
        tokenHash: { type: DataTypes.TEXT, allowNull: false },
        gross: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        sentAt: { type: DataTypes.DATE, allowNull: false },
        expiresAt: { type: DataTypes.DATE, allowNull: false },
        decidedAt: { type: DataTypes.DATE, allowNull: true },
        decidedByName: { type: DataTypes.TEXT, allowNull: true },
        decidedIp: { type: DataTypes.TEXT, allowNull: true },
        decidedUserAgent: { type: DataTypes.TEXT, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        replacedById: { type: DataTypes.UUID, allowNull: true },
        lastRemindedAt: { type: DataTypes.DATE, allowNull: true },
        sentByUserId: { type: DataTypes.UUID, allowNull: true },
        includesQuote: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        seenAt: { type: DataTypes.DATE, allowNull: true },
        seenBy: { type: DataTypes.UUID, allowNull: true },
        snapshotAsSent: { type: DataTypes.JSONB, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'approval_requests', version: true },
    );
  }
}
