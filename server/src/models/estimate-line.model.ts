import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { AgreedHow, EstimateStage, LineKind, VatRateCode } from '@wingstage/shared';

/** Keyed by (job, id): the client makes line ids, and a line can only point within its own job. */
export class EstimateLine extends Model<InferAttributes<EstimateLine>, InferCreationAttributes<EstimateLine>> {
  declare jobId: string;
  declare id: string;
  declare workshopId: string;
  declare stage: EstimateStage;
  declare kind: LineKind;
  declare description: string;
  declare quantity: string;
  declare labourRateCode: string | null;
  declare ratePerHour: string | null;
  declare partId: string | null;
  declare supplierId: string | null;
  declare unitCost: string | null;
  declare unitPrice: string | null;
  declare markupPercent: string | null;
  declare amount: string | null;
  declare vatRate: VatRateCode;
  declare findingId: string | null;
  declare accessTaskId: string | null;
  declare discountPercent: string | null;
  declare sortOrder: number;
  /** Inspection lines: when and how the owner agreed it (null while unagreed), who, and the request that carried it. */
  declare agreedAt: CreationOptional<Date | null>;
  declare agreedHow: CreationOptional<AgreedHow | null>;
  declare agreedBy: CreationOptional<string | null>;
  declare agreedRef: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize) {
    EstimateLine.init(
      {
        jobId: { type: DataTypes.UUID, primaryKey: true },
        id: { type: DataTypes.UUID, primaryKey: true },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        stage: { type: DataTypes.TEXT, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false },
        quantity: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        labourRateCode: { type: DataTypes.TEXT, allowNull: true },
        ratePerHour: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        partId: { type: DataTypes.UUID, allowNull: true },
        supplierId: { type: DataTypes.UUID, allowNull: true },
        unitCost: { type: DataTypes.DECIMAL(16, 4), allowNull: true },
        unitPrice: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        markupPercent: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        amount: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        vatRate: { type: DataTypes.TEXT, allowNull: false },
        findingId: { type: DataTypes.UUID, allowNull: true },
        accessTaskId: { type: DataTypes.UUID, allowNull: true },
        discountPercent: { type: DataTypes.DECIMAL(5, 2), allowNull: true },
        sortOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        agreedAt: { type: DataTypes.DATE, allowNull: true },
        agreedHow: { type: DataTypes.TEXT, allowNull: true },
        agreedBy: { type: DataTypes.TEXT, allowNull: true },
        agreedRef: { type: DataTypes.UUID, allowNull: true },
      },
      { sequelize, tableName: 'estimate_lines', timestamps: false },
    );
  }
}
