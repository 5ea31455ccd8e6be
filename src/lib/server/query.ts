import { QueryTypes, type Sequelize, type Transaction } from "sequelize";
import { getSequelize } from "./db";

/**
 * The one edge between services and SQL. Every raw statement goes through these three functions, so
 * each query names its type (the mariadb dialect mishandles untyped raw SELECTs) and passes its
 * transaction when it has one. DECIMAL columns arrive as numbers: the connection is opened with the
 * driver's `decimalAsNumber` (db.ts), for model reads and raw reads alike, so no caller converts.
 */
export interface QueryOptions {
  /** Named (`:name`) or positional (`?`) values; never build values into the SQL text. */
  replacements?: Record<string, unknown> | readonly unknown[];
  /** The caller's transaction, when the statement belongs to one. */
  transaction?: Transaction | null;
  /** The database when it is not the process's own: migrations and seeders run on the one umzug was given. */
  sequelize?: Sequelize;
}

function queryOptions(options: QueryOptions) {
  return {
    ...(options.replacements ? { replacements: options.replacements as Record<string, unknown> | unknown[] } : {}),
    ...(options.transaction ? { transaction: options.transaction } : {}),
  };
}

/** Every row of a SELECT, typed as the caller says the columns are. */
export async function select<Row extends object>(sql: string, options: QueryOptions = {}): Promise<Row[]> {
  return (options.sequelize ?? getSequelize()).query<Row>(sql, { type: QueryTypes.SELECT, ...queryOptions(options) });
}

/** The first row of a SELECT, or undefined when there is none. */
export async function selectOne<Row extends object>(sql: string, options: QueryOptions = {}): Promise<Row | undefined> {
  const [row] = await select<Row>(sql, options);
  return row;
}

/** What a write did: the rows it touched and, for an INSERT into a table with an auto-increment key, the first new id. */
export interface WriteResult {
  affectedRows: number;
  insertId: number;
}

/**
 * An INSERT, UPDATE, DELETE or DDL statement. The dialect shapes its answer by the query type, so
 * the type follows the statement's first word and the answer is always a WriteResult.
 */
export async function execute(sql: string, options: QueryOptions = {}): Promise<WriteResult> {
  const verb = /^\s*(\w+)/.exec(sql)?.[1]?.toUpperCase();
  const sequelize = options.sequelize ?? getSequelize();
  if (verb === "INSERT" || verb === "REPLACE") {
    const [insertId, affectedRows] = await sequelize.query(sql, { type: QueryTypes.INSERT, ...queryOptions(options) });
    return { affectedRows: Number(affectedRows), insertId: Number(insertId ?? 0) };
  }
  if (verb === "UPDATE") {
    const [, affectedRows] = await sequelize.query(sql, { type: QueryTypes.UPDATE, ...queryOptions(options) });
    return { affectedRows: Number(affectedRows), insertId: 0 };
  }
  if (verb === "DELETE") {
    const affectedRows = await sequelize.query(sql, { type: QueryTypes.BULKDELETE, ...queryOptions(options) });
    return { affectedRows: Number(affectedRows), insertId: 0 };
  }
  await sequelize.query(sql, { type: QueryTypes.RAW, ...queryOptions(options) });
  return { affectedRows: 0, insertId: 0 };
}

/**
 * A JSON column's value. MariaDB keeps JSON as text, and whether the driver hands it over parsed
 * depends on the type metadata the server sends, so both arrive here.
 */
export function jsonColumn<T>(value: unknown): T {
  return (typeof value === "string" ? JSON.parse(value) : value) as T;
}
