import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { ProgramPoint } from "../../chem";
import type { LedgerKind, LedgerSource } from "../../ledger/types";

export class Instrument extends Model<InferAttributes<Instrument>, InferCreationAttributes<Instrument>> {
  declare id: CreationOptional<number>;
  declare name: string;
  /** e.g. "UHPLC, binary pump, diode-array detector". */
  declare kind: string;
  declare room: string;
  /** Pump channels, e.g. ["A", "B"]. */
  declare channels: string[];
  /** The waste container the system drains to now; run entries go there. */
  declare wasteContainerId: number | null;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Method extends Model<InferAttributes<Method>, InferCreationAttributes<Method>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare description: string | null;
  /** The pump program: flow and composition change linearly between points. */
  declare program: ProgramPoint[];
  declare reEquilibrationMin: CreationOptional<number>;
  declare runTimeMin: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** One append-only ledger line. The database refuses UPDATE and DELETE on the table. */
export class LedgerEntry extends Model<InferAttributes<LedgerEntry>, InferCreationAttributes<LedgerEntry>> {
  declare id: CreationOptional<number>;
  declare occurredAt: Date;
  declare projectId: number | null;
  declare kind: LedgerKind;
  declare batchId: number | null;
  declare reagentId: string;
  /** mL of the reagent (negative in a correction); 0 for a solid. */
  declare volumeMl: number;
  /** g of a solid reagent; null for liquids. */
  declare massG: number | null;
  declare channel: string | null;
  declare wasteStreamId: string | null;
  declare wasteContainerId: number | null;
  declare sourceKind: LedgerSource;
  /** "run:<id>", "import:<id>", "draw:<key>" … */
  declare sourceId: string | null;
  declare authorId: number | null;
  /** For a correction: the entry it reverses. */
  declare reversesId: number | null;
  declare reason: string | null;
  declare createdAt: CreationOptional<Date>;
}

export function initLedgerModels(sequelize: Sequelize) {
  Instrument.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(80), allowNull: false, unique: true },
      kind: { type: DataTypes.STRING(80), allowNull: false },
      room: { type: DataTypes.STRING(40), allowNull: false },
      channels: { type: DataTypes.JSON, allowNull: false },
      wasteContainerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "instruments", modelName: "Instrument" },
  );
  Method.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
      description: { type: DataTypes.TEXT, allowNull: true },
      program: { type: DataTypes.JSON, allowNull: false },
      reEquilibrationMin: { type: DataTypes.DECIMAL(8, 3), allowNull: false, defaultValue: 0 },
      runTimeMin: { type: DataTypes.DECIMAL(8, 3), allowNull: false },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "methods", modelName: "Method" },
  );
  LedgerEntry.init(
    {
      id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
      occurredAt: { type: DataTypes.DATE(3), allowNull: false },
      projectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      kind: { type: DataTypes.ENUM("run", "draw", "preparation", "discard", "correction"), allowNull: false },
      batchId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      reagentId: { type: DataTypes.STRING(64), allowNull: false },
      volumeMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
      massG: { type: DataTypes.DECIMAL(14, 5), allowNull: true },
      channel: { type: DataTypes.STRING(4), allowNull: true },
      wasteStreamId: { type: DataTypes.STRING(40), allowNull: true },
      wasteContainerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      sourceKind: { type: DataTypes.ENUM("manual", "import", "run", "seed"), allowNull: false },
      sourceId: { type: DataTypes.STRING(64), allowNull: true },
      authorId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      reversesId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true, unique: true },
      reason: { type: DataTypes.STRING(255), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "ledger_entries", modelName: "LedgerEntry", updatedAt: false },
  );
}
