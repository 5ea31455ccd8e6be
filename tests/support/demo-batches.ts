import { QueryTypes, type Sequelize } from "sequelize";

/** The seeded batches' codes by id: a code is its preparation day, so it changes with the day the demo was loaded. */
export async function demoBatchCodes(sequelize: Sequelize): Promise<Record<number, string>> {
  const rows = await sequelize.query<{ id: number; code: string }>("SELECT id, code FROM batches WHERE id <= 6", {
    type: QueryTypes.SELECT,
  });
  return Object.fromEntries(rows.map((r) => [Number(r.id), r.code]));
}
