import { QueryTypes, type Transaction } from "sequelize";
import { getSequelize } from "../db";

/** The id of the row just inserted on this transaction's connection. */
export async function lastInsertId(transaction: Transaction): Promise<number> {
  const [row] = await getSequelize().query<{ id: number | bigint }>("SELECT LAST_INSERT_ID() AS id", { type: QueryTypes.SELECT, transaction });
  return Number(row!.id);
}
