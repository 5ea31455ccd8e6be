import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { CONTAINER_STATUSES, LOCATION_KINDS } from "../../schemas/waste";
import type { ContainerStatus, LocationKind } from "../../waste/types";

export class WasteStream extends Model<InferAttributes<WasteStream>, InferCreationAttributes<WasteStream>> {
  declare id: string;
  declare name: string;
  declare description: string | null;
  /** Higher is more restrictive: a mix goes to the most restrictive stream it reaches. */
  declare restrictiveness: number;
  /** Share of a mix from which it reaches this stream; null: the common-practice default. */
  declare minSharePercent: number | null;
  /** Other streams a container of this stream may take; null: the common-practice default. */
  declare alsoAccepts: string[] | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class WasteContainer extends Model<InferAttributes<WasteContainer>, InferCreationAttributes<WasteContainer>> {
  declare id: CreationOptional<number>;
  /** Decant's own container code, printed as Code 128 on the container label. */
  declare code: string;
  declare streamId: string;
  declare capacityMl: number;
  /** Cached estimate; the live figure is derived from readings and the ledger (services/waste/containers.ts). */
  declare estimatedVolumeMl: CreationOptional<number>;
  declare room: string;
  declare locationKind: CreationOptional<LocationKind>;
  declare locationNote: string | null;
  declare status: CreationOptional<ContainerStatus>;
  declare accumulationStartedAt: Date | null;
  declare fullAt: Date | null;
  declare collectedAt: Date | null;
  declare pickupId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class WasteReading extends Model<InferAttributes<WasteReading>, InferCreationAttributes<WasteReading>> {
  declare id: CreationOptional<number>;
  declare containerId: number;
  declare readAt: Date;
  /** The level read off the container. */
  declare levelMl: number;
  /** Decant's estimate just before the reading: the difference is kept, not hidden. */
  declare estimatedBeforeMl: number;
  declare readerId: number | null;
  declare note: string | null;
  declare createdAt: CreationOptional<Date>;
}

export class Pickup extends Model<InferAttributes<Pickup>, InferCreationAttributes<Pickup>> {
  declare id: CreationOptional<number>;
  declare reference: string | null;
  declare status: CreationOptional<"requested" | "collected" | "cancelled">;
  declare requestedAt: Date;
  declare requestedBy: number | null;
  declare collectedAt: Date | null;
  /** The waste manifest or consignment number given by the collector. */
  declare manifestRef: string | null;
  declare note: string | null;
  declare recordedBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initWasteModels(sequelize: Sequelize) {
  const created = { createdAt: DataTypes.DATE(3) };
  const timestamps = { createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) };
  WasteStream.init(
    {
      id: { type: DataTypes.STRING(40), primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      description: { type: DataTypes.TEXT, allowNull: true },
      restrictiveness: { type: DataTypes.INTEGER, allowNull: false },
      minSharePercent: { type: DataTypes.DECIMAL(6, 3), allowNull: true },
      alsoAccepts: { type: DataTypes.JSON, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: "waste_streams", modelName: "WasteStream" },
  );
  WasteContainer.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
      streamId: { type: DataTypes.STRING(40), allowNull: false },
      capacityMl: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      estimatedVolumeMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false, defaultValue: 0 },
      room: { type: DataTypes.STRING(40), allowNull: false },
      locationKind: { type: DataTypes.ENUM(...LOCATION_KINDS), allowNull: false, defaultValue: "instrument" },
      locationNote: { type: DataTypes.STRING(120), allowNull: true },
      status: { type: DataTypes.ENUM(...CONTAINER_STATUSES), allowNull: false, defaultValue: "in_use" },
      accumulationStartedAt: { type: DataTypes.DATE(3), allowNull: true },
      fullAt: { type: DataTypes.DATE(3), allowNull: true },
      collectedAt: { type: DataTypes.DATE(3), allowNull: true },
      pickupId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: "waste_containers", modelName: "WasteContainer" },
  );
  WasteReading.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      containerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      readAt: { type: DataTypes.DATE(3), allowNull: false },
      levelMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
      estimatedBeforeMl: { type: DataTypes.DECIMAL(14, 4), allowNull: false },
      readerId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      note: { type: DataTypes.STRING(255), allowNull: true },
      ...created,
    },
    { sequelize, tableName: "waste_readings", modelName: "WasteReading", updatedAt: false },
  );
  Pickup.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      reference: { type: DataTypes.STRING(64), allowNull: true },
      status: { type: DataTypes.ENUM("requested", "collected", "cancelled"), allowNull: false, defaultValue: "requested" },
      requestedAt: { type: DataTypes.DATE(3), allowNull: false },
      requestedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      collectedAt: { type: DataTypes.DATE(3), allowNull: true },
      manifestRef: { type: DataTypes.STRING(64), allowNull: true },
      note: { type: DataTypes.STRING(255), allowNull: true },
      recordedBy: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: "pickups", modelName: "Pickup" },
  );
  WasteContainer.belongsTo(WasteStream, { foreignKey: "streamId" });
  WasteContainer.hasMany(WasteReading, { foreignKey: "containerId" });
  WasteContainer.belongsTo(Pickup, { foreignKey: "pickupId" });
  Pickup.hasMany(WasteContainer, { foreignKey: "pickupId" });
}
