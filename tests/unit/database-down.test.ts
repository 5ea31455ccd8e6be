// Which errors mean "the database is unreachable" (503 with Retry-After) rather than a bug (500).
// The rows are the errors Sequelize and the mariadb driver raised in tests/integration/faults.test.ts
// when the server was killed or shut down under a query, plus the ones that must stay 500s.
import { ConnectionRefusedError, DatabaseError, UniqueConstraintError } from "sequelize";
import { describe, expect, it } from "vitest";
import { errorResponse, isDatabaseDown } from "../../src/lib/server/http";

/** A driver error as the mariadb connector builds it. */
function sqlError(message: string, fields: { code: string; sqlState: string; errno: number; fatal: boolean }) {
  return Object.assign(new Error(message), { name: "SqlError", sqlMessage: message, sql: "SELECT 1", ...fields });
}
const wrapped = (cause: Error) => new DatabaseError(cause as never);

describe("isDatabaseDown", () => {
  it.each([
    // mariadbd killed (SIGKILL) while a query waited: the socket closes under it.
    [
      "socket closed under a query",
      wrapped(
        sqlError("(conn:8, no: 45009, SQLState: 08S01) socket has unexpectedly been closed", {
          code: "ER_SOCKET_UNEXPECTED_CLOSE",
          sqlState: "08S01",
          errno: 45009,
          fatal: true,
        }),
      ),
    ],
    // The next command on that connection (e.g. Sequelize's ROLLBACK).
    [
      "command on a closed connection",
      wrapped(
        sqlError("(conn:8, no: 45013, SQLState: 08S01) Cannot execute new commands: connection closed", {
          code: "ER_CMD_CONNECTION_CLOSED",
          sqlState: "08S01",
          errno: 45013,
          fatal: true,
        }),
      ),
    ],
    // mariadbd shut down (SIGTERM): the server kills its client connections.
    [
      "connection killed by a shutdown",
      wrapped(
        sqlError("(conn:5, no: 1927, SQLState: 70100) Connection was killed", {
          code: "ER_CONNECTION_KILLED",
          sqlState: "70100",
          errno: 1927,
          fatal: true,
        }),
      ),
    ],
    [
      "server shutting down",
      wrapped(
        sqlError("(conn:5, no: 1053, SQLState: 08S01) Server shutdown in progress", {
          code: "ER_SERVER_SHUTDOWN",
          sqlState: "08S01",
          errno: 1053,
          fatal: true,
        }),
      ),
    ],
    ["connection reset", wrapped(sqlError("read ECONNRESET", { code: "ECONNRESET", sqlState: "HY000", errno: -104, fatal: true }))],
    // Nothing listens on the port while it is down.
    [
      "connection refused",
      new ConnectionRefusedError(Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:3307"), { code: "ECONNREFUSED" }) as never),
    ],
  ])("%s → 503", (_name, error) => {
    expect(isDatabaseDown(error)).toBe(true);
    const response = errorResponse(error);
    expect(response.status).toBe(503);
    expect(response.headers.get("retry-after")).toBe("5");
  });

  it.each([
    [
      "a syntax error",
      wrapped(sqlError("You have an error in your SQL syntax", { code: "ER_PARSE_ERROR", sqlState: "42000", errno: 1064, fatal: false })),
    ],
    ["a unique key", new UniqueConstraintError({ message: "Validation error" })],
    [
      "the append-only trigger",
      wrapped(
        sqlError("ledger_entries is append-only: add a correction instead", {
          code: "ER_SIGNAL_EXCEPTION",
          sqlState: "45000",
          errno: 1644,
          fatal: false,
        }),
      ),
    ],
    // Another service's outage is not the database's: the payments SDK and mail raise these.
    ["the payments service resetting", Object.assign(new Error("read ECONNRESET"), { name: "StripeConnectionError", code: "ECONNRESET" })],
    ["a plain bug", new TypeError("Cannot read properties of undefined (reading 'id')")],
  ])("%s → not the database being down", (_name, error) => {
    expect(isDatabaseDown(error)).toBe(false);
  });
});
