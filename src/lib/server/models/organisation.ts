import type { TaxTreatment } from "../../billing/invoice";
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class Client extends Model<InferAttributes<Client>, InferCreationAttributes<Client>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare kind: "internal" | "external";
  /** Internal clients are charged back to a cost centre. */
  declare costCentre: string | null;
  /** External clients are invoiced at this address. */
  declare billingEmail: string | null;
  declare paymentsCustomerId: string | null;
  /** Printed on invoices: postal address (lines), tax id, the client's purchase order. */
  declare billingAddress: CreationOptional<string | null>;
  declare taxId: CreationOptional<string | null>;
  declare purchaseOrder: CreationOptional<string | null>;
  /** How invoices to this client are taxed; the rate applies to "standard" only. */
  declare taxTreatment: CreationOptional<TaxTreatment>;
  declare taxRatePercent: CreationOptional<number | null>;
  /** "VAT", "GST", "Sales tax". */
  declare taxLabel: CreationOptional<string | null>;
  declare currency: CreationOptional<string>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Project extends Model<InferAttributes<Project>, InferCreationAttributes<Project>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare clientId: number;
  declare contactName: string | null;
  declare contactEmail: string | null;
  declare status: CreationOptional<"active" | "paused" | "closed">;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initOrganisationModels(sequelize: Sequelize) {
  Client.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(160), allowNull: false, unique: true },
      kind: { type: DataTypes.ENUM("internal", "external"), allowNull: false },
      costCentre: { type: DataTypes.STRING(40), allowNull: true },
      billingEmail: { type: DataTypes.STRING(254), allowNull: true },
      paymentsCustomerId: { type: DataTypes.STRING(64), allowNull: true },
      billingAddress: { type: DataTypes.TEXT, allowNull: true },
      taxId: { type: DataTypes.STRING(40), allowNull: true },
      purchaseOrder: { type: DataTypes.STRING(60), allowNull: true },
      taxTreatment: { type: DataTypes.ENUM("none", "standard", "zero_rated", "reverse_charge"), allowNull: false, defaultValue: "none" },
      taxRatePercent: { type: DataTypes.DECIMAL(7, 4), allowNull: true },
      taxLabel: { type: DataTypes.STRING(20), allowNull: true },
      currency: { type: DataTypes.CHAR(3), allowNull: false, defaultValue: "EUR" },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "clients", modelName: "Client" },
  );
  Project.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      code: { type: DataTypes.STRING(32), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(200), allowNull: false },
      clientId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
      contactName: { type: DataTypes.STRING(120), allowNull: true },
      contactEmail: { type: DataTypes.STRING(254), allowNull: true },
      status: { type: DataTypes.ENUM("active", "paused", "closed"), allowNull: false, defaultValue: "active" },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "projects", modelName: "Project" },
  );
  Client.hasMany(Project, { foreignKey: "clientId" });
  Project.belongsTo(Client, { foreignKey: "clientId" });
}
