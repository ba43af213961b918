import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One per job: its version guards the whole set of lines and access tasks against lost updates. */
export class Estimate extends Model<InferAttributes<Estimate>, InferCreationAttributes<Estimate>> {
  declare id: CreationOptional<string>;
  declare workshopId: string;
  declare jobId: string;
  /** Findings are numbered F-1, F-2 … per job from this counter, which rolls back with a failed create. */
  declare lastFindingNumber: CreationOptional<number>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Estimate.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workshopId: { type: DataTypes.UUID, allowNull: false },
        jobId: { type: DataTypes.UUID, allowNull: false },
        lastFindingNumber: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'estimates' },
    );
  }
}
