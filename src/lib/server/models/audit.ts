import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<number>;
  declare actorId: number | null;
  declare action: string;
  declare entity: string;
  declare entityId: string | null;
  declare ip: string | null;
  declare before: unknown;
  declare after: unknown;
  declare createdAt: CreationOptional<Date>;
}

export class Setting extends Model<InferAttributes<Setting>, InferCreationAttributes<Setting>> {
  declare key: string;
  declare value: unknown;
  declare updatedBy: number | null;
  declare updatedAt: CreationOptional<Date>;
}

export function initAuditModels(sequelize: Sequelize) {
  AuditEntry.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      actorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      action: { type: DataTypes.STRING(60), allowNull: false },
      entity: { type: DataTypes.STRING(60), allowNull: false },
      entityId: { type: DataTypes.STRING(64), allowNull: true },
      ip: { type: DataTypes.STRING(45), allowNull: true },
      before: { type: DataTypes.JSON, allowNull: true },
      after: { type: DataTypes.JSON, allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "audit_log", modelName: "AuditEntry", updatedAt: false },
  );
  Setting.init(
    {
      key: { type: DataTypes.STRING(80), primaryKey: true },
      value: { type: DataTypes.JSON, allowNull: false },
      updatedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "settings", modelName: "Setting", createdAt: false },
  );
}
