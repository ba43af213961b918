import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { InvoiceDocument, InvoiceState } from '@wingstage/shared';

/** An issued VAT invoice: immutable; `document` holds every particular as issued (db/migrations/0100-money.ts). State moves go through assertInvoiceMove. */
export class Invoice extends Model<InferAttributes<Invoice>, InferCreationAttributes<Invoice>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  declare seq: number;
  declare number: string;
  declare state: CreationOptional<InvoiceState>;
  declare issuedAt: CreationOptional<Date>;
  declare taxPoint: string;
  declare dueOn: string;
  declare currency: string;
  declare rounding: string;
  declare net: string;
  declare vat: string;
  declare gross: string;
  declare depositsGross: CreationOptional<string>;
  declare balanceDue: string;
  declare document: InvoiceDocument;
  declare issuedBy: CreationOptional<string | null>;
  declare paidAt: CreationOptional<Date | null>;
  /** When the owner's e-mail with the invoice was queued (set by the document-mail task only). */
  declare mailedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;

  static initModel(sequelize: Sequelize) {
    Invoice.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        seq: { type: DataTypes.INTEGER, allowNull: false },
        number: { type: DataTypes.TEXT, allowNull: false },
        state: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'issued' },
        issuedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
        taxPoint: { type: DataTypes.DATEONLY, allowNull: false },
        dueOn: { type: DataTypes.DATEONLY, allowNull: false },
        currency: { type: DataTypes.TEXT, allowNull: false },
        rounding: { type: DataTypes.TEXT, allowNull: false },
        net: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        vat: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        gross: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        depositsGross: { type: DataTypes.DECIMAL(14, 2), allowNull: false, defaultValue: '0' },
        balanceDue: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        document: { type: DataTypes.JSONB, allowNull: false },
        issuedBy: { type: DataTypes.UUID, allowNull: true },
        paidAt: { type: DataTypes.DATE, allowNull: true },
        mailedAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      },
      { sequelize, tableName: 'invoices', timestamps: false, version: true },
    );
  }
}
