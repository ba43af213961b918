import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { CreditNoteDocument } from '@wingstage/shared';

/** A credit note against an invoice, with its own number (db/migrations/0100-money.ts). */
export class CreditNote extends Model<InferAttributes<CreditNote>, InferCreationAttributes<CreditNote>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare invoiceId: string;
  declare seq: number;
  declare number: string;
  declare issuedAt: CreationOptional<Date>;
  declare taxPoint: string;
  declare reason: string;
  declare net: string;
  declare vat: string;
  declare gross: string;
  declare document: CreditNoteDocument;
  declare issuedBy: CreationOptional<string | null>;
  /** When the owner's e-mail with the credit note was queued (set by the document-mail task only). */
  declare mailedAt: CreationOptional<Date | null>;

  static initModel(sequelize: Sequelize) {
    CreditNote.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        invoiceId: { type: DataTypes.UUID, allowNull: false },
        seq: { type: DataTypes.INTEGER, allowNull: false },
        number: { type: DataTypes.TEXT, allowNull: false },
        issuedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        taxPoint: { type: DataTypes.DATEONLY, allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: false },
        net: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        vat: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        gross: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        document: { type: DataTypes.JSONB, allowNull: false },
        issuedBy: { type: DataTypes.UUID, allowNull: true },
        mailedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'credit_notes', timestamps: false },
    );
  }
}
