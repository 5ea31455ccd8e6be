/**
 * The one way Decant makes a repeated submission (a double click, a retry after a lost answer,
 * twenty requests at once) record once: a row per (scope, key) in `idempotency_keys`, inserted as
 * the first statement of the work's transaction and committed with the work's effect and its
 * answer.
 *
 * - While the first submission works, the others wait on that row's lock in MariaDB, so it holds
 *   across app instances. Once it commits they find its answer and return it again.
 * - If the first fails, its row goes with its rollback: a waiting or later submission runs the
 *   work itself, so a failure never blocks a retry. A crashed instance's connection is rolled
 *   back too.
 * - A waiter holds a pooled connection while it waits, so `work` must run every query of its own
 *   on the transaction it is given; a second connection could be the one the waiters hold.
 */
import { UniqueConstraintError, type Transaction } from "sequelize";
import { getSequelize } from "./db";
import { HttpError } from "./http";
import { execute, jsonColumn, selectOne } from "./query";
import { inTransaction } from "./services/sql";

export interface IdempotentOutcome<T> {
  /** What `work` returned, the first time or (after a JSON round trip) again. */
  value: T;
  /** True when an earlier submission with this key did the work. */
  replayed: boolean;
}

/** The key's row exists already: another submission did the work (or is doing it and committed meanwhile). */
class KeyTaken extends Error {}

/** The answer stored with the key, wrapped so that any JSON value, a bare string too, reads back unambiguously. */
async function storedAnswer<T>(scope: string, key: string): Promise<{ value: T } | null> {
  const row = await selectOne<{ response: unknown }>("SELECT response FROM idempotency_keys WHERE scope = ? AND `key` = ?", {
    replacements: [scope, key],
  });
  return row?.response == null ? null : jsonColumn<{ value: T }>(row.response);
}

/**
 * Runs `work` once per (scope, key) and answers every submission with what it returned. `value`
 * must be plain JSON data (a replay reads it back from the database: dates come back as text).
 * `scope` keeps kinds of submission apart ("batch", "run", "draw", "invoice").
 */
export async function withIdempotencyKey<T>(
  scope: string,
  key: string,
  work: (transaction: Transaction) => Promise<T>,
): Promise<IdempotentOutcome<T>> {
  // A key found taken is normally answered on the next read; the bound only guards against a row that vanished.
  for (let attempt = 0; attempt < 3; attempt++) {
    const earlier = await storedAnswer<T>(scope, key);
    if (earlier) return { value: earlier.value, replayed: true };
    try {
      const value = await inTransaction(getSequelize(), async (transaction) => {
        try {
          await execute("INSERT INTO idempotency_keys (scope, `key`, created_at) VALUES (?, ?, NOW(3))", {
            replacements: [scope, key],
            transaction,
          });
        } catch (error) {
          if (error instanceof UniqueConstraintError) throw new KeyTaken();
          throw error;
        }
        const value = await work(transaction);
        await execute("UPDATE idempotency_keys SET response = ? WHERE scope = ? AND `key` = ?", {
          replacements: [JSON.stringify({ value }), scope, key],
          transaction,
        });
        return value;
      });
      return { value, replayed: false };
    } catch (error) {
      if (!(error instanceof KeyTaken)) throw error;
    }
  }
  throw new HttpError(409, "idempotencyKey: this form was sent again while the first one was being recorded; reload in a moment");
}
