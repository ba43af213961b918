import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type VatRates = { standard: string; reduced: string; zero: string };
export type LabourRate = { code: string; name: string; ratePerHour: string };

export class Workshop extends Model<InferAttributes<Workshop>, InferCreationAttributes<Workshop>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare addressLines: CreationOptional<string>;
  declare postcode: CreationOptional<string>;
  declare vatNumber: CreationOptional<string>;
  declare currency: CreationOptional<string>;
  declare vatRates: VatRates;
  declare labourRates: CreationOptional<LabourRate[]>;
  declare settings: CreationOptional<Record<string, unknown>>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Workshop.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        name: { type: DataTypes.TEXT, allowNull: false },
        addressLines: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        postcode: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        vatNumber: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'GBP' },
        vatRates: { type: DataTypes.JSONB, allowNull: false },
        labourRates: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'workshops', version: true },
    );
  }
}
