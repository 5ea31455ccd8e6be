import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export type BatchStatus = "ready" | "in_use" | "empty" | "discarded";

export class Batch extends Model<InferAttributes<Batch>, InferCreationAttributes<Batch>> {
  declare id: CreationOptional<number>;
  /** The code printed on every bottle (Code 128). */
  declare code: string;
  declare recipeVersionId: number;
  /** The recipe specification as it was when the batch was made. */
  declare specSnapshot: unknown;
  declare volumeMl: number;
  declare remainingMl: number;
  declare bottles: number;
  declare bottleSizeMl: number;
  declare temperatureC: CreationOptional<number>;
  declare measuredPh: number | null;
  declare preparedBy: number;
  declare preparedAt: Date;
  declare expiresAt: Date;
  declare status: CreationOptional<BatchStatus>;
  declare idempotencyKey: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPreparationModels(sequelize: Sequelize) {
  Batch.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
      recipeVersionId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      specSnapshot: { type: DataTypes.JSON, allowNull: false },
      volumeMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
      remainingMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
      bottles: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      bottleSizeMl: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      temperatureC: { type: DataTypes.DECIMAL(5, 2), allowNull: false, defaultValue: 25 },
      measuredPh: { type: DataTypes.DECIMAL(5, 3), allowNull: true },
      preparedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      preparedAt: { type: DataTypes.DATE(3), allowNull: false },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      status: { type: DataTypes.ENUM("ready", "in_use", "empty", "discarded"), allowNull: false, defaultValue: "ready" },
      idempotencyKey: { type: DataTypes.STRING(80), allowNull: true, unique: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "batches", modelName: "Batch" },
  );
}
