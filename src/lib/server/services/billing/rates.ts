/**
 * The rates screen (/rates, /api/rates): the price lists as they stand today, and new prices.
 * Which rate is in force is pure (src/lib/billing/rates.ts); this file reads and writes them.
 */
import type { Transaction } from "sequelize";
import { rateStates, type PriceList, type Rate } from "../../../billing/rates";
import { nextDay } from "../../../billing/statement";
import type { RateReagent, RateView } from "../../../billing/types";
import type { RateInput } from "../../../schemas/billing";
import { recordAudit } from "../../audit";
import { getSequelize } from "../../db";
import type { SignedInUser } from "../../guard";
import { HttpError } from "../../http";
import { RateRow } from "../../models/billing";
import { select, selectOne } from "../../query";
import { inTransaction } from "../sql";

const today = (now = new Date()) => now.toISOString().slice(0, 10);

const toRate = (row: RateRow): Rate => ({
  id: row.id,
  kind: row.kind,
  reagentId: row.reagentId,
  grade: row.grade,
  priceList: row.priceList,
  unit: row.unit,
  amount_minor: row.amountMinor,
  currency: row.currency,
  effectiveFrom: String(row.effectiveFrom),
});

/** A price list's rates in one currency, oldest first: what a statement is costed with. */
export async function loadRates(priceList: PriceList, currency: string, transaction?: Transaction): Promise<Rate[]> {
  const rows = await RateRow.findAll({
    where: { priceList, currency },
    order: [
      ["effectiveFrom", "ASC"],
      ["id", "ASC"],
    ],
    transaction,
  });
  return rows.map(toRate);
}

export async function listRates(now = new Date()): Promise<RateView[]> {
  const rows = await RateRow.findAll({
    order: [
      ["priceList", "ASC"],
      ["kind", "ASC"],
      ["reagentId", "ASC"],
      ["grade", "ASC"],
      ["effectiveFrom", "DESC"],
      ["id", "DESC"],
    ],
  });
  const names = new Map((await select<{ id: string; name: string }>("SELECT id, name FROM reagents")).map((r) => [r.id, r.name]));
  const rates = rows.map(toRate);
  const states = rateStates(rates, today(now));
  return rows.map((row, index) => ({
    ...rates[index]!,
    reagentName: row.reagentId ? (names.get(row.reagentId) ?? row.reagentId) : null,
    createdAt: row.createdAt.toISOString(),
    state: states.get(row.id)!,
  }));
}

/** The catalogue keeps a reagent's grades as a JSON array, which the driver may hand over as text. */
interface ReagentRow {
  id: string;
  name: string;
  unit: "mL" | "g";
  grades: string[] | string;
}
const gradesOf = (row: Pick<ReagentRow, "grades">): string[] => (typeof row.grades === "string" ? JSON.parse(row.grades) : row.grades);

/** Reagents a rate can be set for, with their unit and grades. */
export async function rateReagents(): Promise<RateReagent[]> {
  const rows = await select<ReagentRow>("SELECT id, name, unit, grades FROM reagents WHERE active = 1 ORDER BY name");
  return rows.map((r) => ({ id: r.id, name: r.name, unit: r.unit, grades: gradesOf(r) }));
}

/** Adds a rate. Rates are never edited: a new effective-from supersedes the old price from that day. */
export async function addRate(input: RateInput, actor: SignedInUser, ip: string | null = null): Promise<RateView> {
  return inTransaction(getSequelize(), async (transaction) => {
    if (input.kind === "reagent") {
      const reagent = await selectOne<Pick<ReagentRow, "unit" | "grades">>("SELECT unit, grades FROM reagents WHERE id = :id", {
        replacements: { id: input.reagentId },
        transaction,
      });
      if (!reagent) throw new HttpError(400, `reagentId: no reagent "${input.reagentId}" in the catalogue`);
      const grades = gradesOf(reagent);
      if (input.grade && !grades.includes(input.grade)) throw new HttpError(400, `grade: ${input.reagentId} comes in ${grades.join(", ")}`);
      const expected = reagent.unit === "g" ? "g" : "L";
      if (input.unit !== expected) throw new HttpError(400, `unit: ${input.reagentId} is priced per ${expected}`);
    }
    // A price may not reach back into a period that has been issued: that period's figures are final.
    const lock = await selectOne<{ last: string | null }>(
      `SELECT DATE_FORMAT(MAX(l.period_end), '%Y-%m-%d') AS last FROM period_locks l JOIN clients c ON c.id = l.client_id
        WHERE c.kind = :kind AND c.currency = :currency`,
      { replacements: { kind: input.priceList, currency: input.currency }, transaction },
    );
    const lastLocked = lock?.last ?? null;
    if (lastLocked && input.effectiveFrom <= lastLocked) {
      throw new HttpError(
        400,
        `effectiveFrom: ${input.priceList} statements up to ${lastLocked} are issued; a new price can start on ${nextDay(lastLocked)} at the earliest`,
      );
    }
    const row = await RateRow.create(
      {
        kind: input.kind,
        reagentId: input.kind === "reagent" ? input.reagentId! : null,
        grade: input.kind === "reagent" ? (input.grade ?? null) : null,
        priceList: input.priceList,
        unit: input.unit,
        amountMinor: input.amount_minor,
        currency: input.currency,
        effectiveFrom: input.effectiveFrom,
        createdBy: actor.id,
      },
      { transaction },
    );
    await recordAudit({ actorId: actor.id, action: "rate.add", entity: "rate", entityId: row.id, ip, after: toRate(row) }, transaction);
    return {
      ...toRate(row),
      reagentName: input.reagentId ?? null,
      createdAt: row.createdAt.toISOString(),
      state: input.effectiveFrom <= today() ? "current" : "scheduled",
    };
  });
}
