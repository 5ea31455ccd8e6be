import { UniqueConstraintError, type Sequelize, type Transaction } from "sequelize";

/** True when MariaDB rolled the transaction back to break a deadlock (error 1213, SQLSTATE 40001). */
export function isDeadlock(error: unknown): boolean {
  const e = error as { errno?: number; parent?: { errno?: number } } | null;
  return (e?.parent?.errno ?? e?.errno) === 1213;
}

/**
 * A managed transaction that is run again, up to `attempts` times in all, when MariaDB rolls it
 * back to break a deadlock: two requests writing the same rows (the ledger's daily sums, a batch,
 * an invoice) at the same moment can each wait on the other, and trying again is the remedy the
 * database documents. `work` must leave nothing outside the database that a second attempt would
 * repeat, or do it idempotently (the payments provider calls carry idempotency keys).
 */
export async function inTransaction<T>(sequelize: Sequelize, work: (transaction: Transaction) => Promise<T>, attempts = 3): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(work);
    } catch (error) {
      if (attempt >= attempts || !isDeadlock(error)) throw error;
      // A short random pause, so that the two do not meet again at once.
      await new Promise((resolve) => setTimeout(resolve, Math.random() * 20 * attempt));
    }
  }
}

/** "INSERT INTO t (a,b) VALUES (?,?),(?,?)" for `rows` rows, the values to go with it as placeholders. */
export function multiRowInsert(table: string, columns: readonly string[], rows: number): string {
  const tuple = `(${columns.map(() => "?").join(",")})`;
  return `INSERT INTO ${table} (${columns.join(",")}) VALUES ${Array.from({ length: rows }, () => tuple).join(",")}`;
}

/** The driver connection a Sequelize transaction runs on (the `mariadb` package's promise API). */
interface DriverConnection {
  query(sql: string, values: unknown[]): Promise<unknown>;
}

/** "2026-12-02 09:30:00.000": the UTC wall-clock time, as Decant stores every moment. */
const utcDateTime = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");

/**
 * A write with `?` placeholders sent straight to the driver on the transaction's connection. The
 * driver writes each value into the packet as it goes; Sequelize would first build the whole
 * statement as one escaped string (and format every date through moment), which for the
 * thousands of rows of an import costs several times the CPU and as much again in garbage.
 * Dates go as UTC text: the driver itself would write them in the process's local time zone.
 * A duplicate key answers Sequelize's UniqueConstraintError, as `sequelize.query` would.
 */
async function driverQuery(transaction: Transaction, sql: string, values: readonly unknown[]): Promise<void> {
  const connection = (transaction as unknown as { connection: DriverConnection }).connection;
  try {
    await connection.query(
      sql,
      values.map((v) => (v instanceof Date ? utcDateTime(v) : v)),
    );
  } catch (error) {
    const driverError = error as Error & { code?: string; sql?: string };
    if (driverError.code === "ER_DUP_ENTRY")
      throw new UniqueConstraintError({ message: driverError.message, parent: { ...driverError, sql: driverError.sql ?? sql } });
    throw error;
  }
}

/** Sends one write through `pipelinedWrites`. */
export type SendWrite = (sql: string, values: readonly unknown[]) => Promise<void>;

/**
 * Runs `write`, whose writes go out on the transaction's connection while earlier ones still run,
 * so that the next statement is prepared while the database executes the last (two cores, both
 * busy); at most `depth` statements are in flight. Resolves once every write has finished, and
 * throws the first failure; nothing is still running when the caller's transaction rolls back.
 */
export async function pipelinedWrites(transaction: Transaction, write: (send: SendWrite) => Promise<void>, depth = 2): Promise<void> {
  const inFlight: Promise<void>[] = [];
  const send: SendWrite = async (sql, values) => {
    inFlight.push(driverQuery(transaction, sql, values));
    if (inFlight.length >= depth) await inFlight.shift();
  };
  try {
    await write(send);
  } catch (error) {
    await Promise.allSettled(inFlight);
    throw error;
  }
  const failed = (await Promise.allSettled(inFlight)).find((r): r is PromiseRejectedResult => r.status === "rejected");
  if (failed) throw failed.reason;
}
