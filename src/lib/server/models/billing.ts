import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { PriceList, RateKind, RateUnit } from "../../billing/rates";
import type { StatementLine } from "../../billing/statement";
import type { InvoiceDetails } from "../../billing/invoice";
import type { InvoiceStatus, StatementStatus } from "../../billing/types";

/** A price; never edited in place: a later effective-from supersedes it. */
export class RateRow extends Model<InferAttributes<RateRow>, InferCreationAttributes<RateRow>> {
  declare id: CreationOptional<number>;
  declare kind: RateKind;
  declare reagentId: string | null;
  /** Grade-specific price (e.g. "LC-MS"); null for the reagent's general price. */
  declare grade: string | null;
  declare priceList: PriceList;
  declare unit: RateUnit;
  /** Price per unit in integer minor units. */
  declare amountMinor: number;
  declare currency: string;
  /** First UTC day the price applies (YYYY-MM-DD). */
  declare effectiveFrom: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

/** A client's period: lines costed at the rates in force then. Issued lines never change. */
export class Statement extends Model<InferAttributes<Statement>, InferCreationAttributes<Statement>> {
  declare id: CreationOptional<number>;
  declare clientId: number;
  declare periodStart: string;
  declare periodEnd: string;
  declare status: CreationOptional<StatementStatus>;
  declare lines: StatementLine[];
  declare totalMinor: number;
  declare currency: string;
  declare issuedAt: Date | null;
  declare issuedBy: number | null;
  declare voidedAt: Date | null;
  /** Part of the provider idempotency keys; bumped if a statement is ever re-billed. */
  declare revision: CreationOptional<number>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The payment provider's invoice for an external client's statement, mirrored. */
export class Invoice extends Model<InferAttributes<Invoice>, InferCreationAttributes<Invoice>> {
  declare id: CreationOptional<number>;
  declare statementId: number;
  declare clientId: number;
  declare providerInvoiceId: string | null;
  declare providerCustomerId: string | null;
  declare number: string | null;
  declare hostedUrl: string | null;
  declare status: CreationOptional<InvoiceStatus>;
  declare amountMinor: number;
  declare currency: string;
  declare dueOn: string | null;
  declare finalizedAt: Date | null;
  declare sentAt: Date | null;
  declare paidAt: Date | null;
  declare voidedAt: Date | null;
  declare uncollectibleAt: Date | null;
  declare paymentFailedAt: Date | null;
  declare lastPaymentError: string | null;
  /** Before tax, the tax, both in minor units; amountMinor is their sum. */
  declare subtotalMinor: CreationOptional<number | null>;
  declare taxMinor: CreationOptional<number | null>;
  declare issuedOn: CreationOptional<string | null>;
  /** Both parties' details and the lines as printed, frozen when the invoice is sent. */
  declare details: CreationOptional<InvoiceDetails | null>;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Once a client's period is issued, its ledger entries are closed for that client. */
export class PeriodLock extends Model<InferAttributes<PeriodLock>, InferCreationAttributes<PeriodLock>> {
  declare id: CreationOptional<number>;
  declare clientId: number;
  declare periodStart: string;
  declare periodEnd: string;
  declare statementId: number | null;
  declare createdAt: CreationOptional<Date>;
}

/** Each provider event id once: a replayed webhook finds its id here and changes nothing. */
export class ProcessedEvent extends Model<InferAttributes<ProcessedEvent>, InferCreationAttributes<ProcessedEvent>> {
  declare id: string;
  declare type: string;
  declare createdAt: CreationOptional<Date>;
}

const uint = DataTypes.INTEGER.UNSIGNED;

export function initBillingModels(sequelize: Sequelize) {
  RateRow.init(
    {
      id: { type: uint, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.ENUM("reagent", "preparation_fee", "injection_fee"), allowNull: false },
      reagentId: { type: DataTypes.STRING(64), allowNull: true },
      grade: { type: DataTypes.STRING(40), allowNull: true },
      priceList: { type: DataTypes.ENUM("internal", "external"), allowNull: false },
      unit: { type: DataTypes.ENUM("L", "g", "batch", "injection"), allowNull: false },
      amountMinor: { type: DataTypes.INTEGER, allowNull: false },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      effectiveFrom: { type: DataTypes.DATEONLY, allowNull: false },
      createdBy: { type: uint, allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "rates", modelName: "RateRow", updatedAt: false },
  );
  Statement.init(
    {
      id: { type: uint, autoIncrement: true, primaryKey: true },
      clientId: { type: uint, allowNull: false },
      periodStart: { type: DataTypes.DATEONLY, allowNull: false },
      periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
      status: { type: DataTypes.ENUM("draft", "issued", "void"), allowNull: false, defaultValue: "draft" },
      lines: { type: DataTypes.JSON, allowNull: false },
      totalMinor: { type: DataTypes.INTEGER, allowNull: false },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      issuedAt: { type: DataTypes.DATE(3), allowNull: true },
      issuedBy: { type: uint, allowNull: true },
      voidedAt: { type: DataTypes.DATE(3), allowNull: true },
      revision: { type: uint, allowNull: false, defaultValue: 0 },
      createdBy: { type: uint, allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "statements", modelName: "Statement" },
  );
  Invoice.init(
    {
      id: { type: uint, autoIncrement: true, primaryKey: true },
      statementId: { type: uint, allowNull: false, unique: true },
      clientId: { type: uint, allowNull: false },
      providerInvoiceId: { type: DataTypes.STRING(64), allowNull: true, unique: true },
      providerCustomerId: { type: DataTypes.STRING(64), allowNull: true },
      number: { type: DataTypes.STRING(64), allowNull: true },
      hostedUrl: { type: DataTypes.STRING(500), allowNull: true },
      status: { type: DataTypes.ENUM("draft", "open", "paid", "void", "uncollectible"), allowNull: false, defaultValue: "draft" },
      amountMinor: { type: DataTypes.INTEGER, allowNull: false },
      currency: { type: DataTypes.CHAR(3), allowNull: false },
      dueOn: { type: DataTypes.DATEONLY, allowNull: true },
      finalizedAt: { type: DataTypes.DATE(3), allowNull: true },
      sentAt: { type: DataTypes.DATE(3), allowNull: true },
      paidAt: { type: DataTypes.DATE(3), allowNull: true },
      voidedAt: { type: DataTypes.DATE(3), allowNull: true },
      uncollectibleAt: { type: DataTypes.DATE(3), allowNull: true },
      paymentFailedAt: { type: DataTypes.DATE(3), allowNull: true },
      lastPaymentError: { type: DataTypes.STRING(255), allowNull: true },
      subtotalMinor: { type: DataTypes.INTEGER, allowNull: true },
      taxMinor: { type: DataTypes.INTEGER, allowNull: true },
      issuedOn: { type: DataTypes.DATEONLY, allowNull: true },
      details: { type: DataTypes.JSON, allowNull: true },
      createdBy: { type: uint, allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "invoices", modelName: "Invoice" },
  );
  PeriodLock.init(
    {
      id: { type: uint, autoIncrement: true, primaryKey: true },
      clientId: { type: uint, allowNull: false },
      periodStart: { type: DataTypes.DATEONLY, allowNull: false },
      periodEnd: { type: DataTypes.DATEONLY, allowNull: false },
      statementId: { type: uint, allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "period_locks", modelName: "PeriodLock", updatedAt: false },
  );
  ProcessedEvent.init(
    {
      id: { type: DataTypes.STRING(80), primaryKey: true },
      type: { type: DataTypes.STRING(80), allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: "processed_events", modelName: "ProcessedEvent", updatedAt: false },
  );
}
