/**
 * The facility-wide view: every method with the solvent its runs used over the last 12 months
 * (from the ledger), most first, and the saved variant that would have saved the most.
 */
import { getReagent } from "../../../chem/reagents";
import type { OrganicModifier } from "../../../chem/substitution";
import { variantSaving } from "../../../planning/savings";
import type { FacilityMethodRow, GreennessSummary, MethodVariantSummary, MethodVersionSummary } from "../../../planning/types";
import { greennessOf } from "../../../planning/variant";
import { select, selectOne } from "../../query";
import type { MethodSummary } from "../../../ledger/types";
import { getMethod, listMethods } from "../methods";
import { listVariants } from "./variants";
import { mainSolvents, methodLedgerUse } from "./ledger-use";
import { evaluationContext, savingPeriod } from "./evaluate";
import { listVersions } from "./versions";

export async function facilityMethods(now = new Date()): Promise<FacilityMethodRow[]> {
  const { from, to } = savingPeriod(now);
  const methods = await listMethods();
  const rows: FacilityMethodRow[] = [];
  for (const m of methods) {
    const [use, variants] = await Promise.all([methodLedgerUse(m.id, from, to), listVariants(m.id, now)]);
    let best: FacilityMethodRow["best"] = null;
    for (const v of variants) {
      const saved = v.evaluation?.saving.saved;
      if (!saved || v.stale) continue;
      const better = !best || (saved.cost && best.saved ? saved.cost.amount > best.saved.amount : saved.total_mL > best.saved_mL);
      if (better) best = { variantId: v.id, name: v.name, saved_mL: saved.total_mL, saved: saved.cost };
    }
    rows.push({
      methodId: m.id,
      name: m.name,
      runs: use.runs,
      injections: use.injections,
      solvent_mL: use.total_mL,
      byReagent_mL: use.byReagent_mL,
      best,
    });
  }
  return rows.sort((a, b) => b.solvent_mL - a.solvent_mL || a.name.localeCompare(b.name));
}

export interface PlanningNames {
  reagents: Record<string, string>;
  streams: Record<string, string>;
}

/** Display names of reagents (catalogue, else the reagents table) and waste streams, for the islands. */
export async function planningNames(): Promise<PlanningNames> {
  const [reagents, streams] = await Promise.all([
    select<{ id: string; name: string }>("SELECT id, name FROM reagents"),
    select<{ id: string; name: string }>("SELECT id, name FROM waste_streams"),
  ]);
  const names: Record<string, string> = Object.fromEntries(reagents.map((r) => [r.id, getReagent(r.id)?.name ?? r.name]));
  for (const id of ["water", "acetonitrile", "methanol", "tetrahydrofuran"]) names[id] ??= getReagent(id)?.name ?? id;
  return { reagents: names, streams: { ...Object.fromEntries(streams.map((s) => [s.id, s.name])), unassigned: "Not named" } };
}

export interface MethodPlanningView {
  method: MethodSummary;
  names: PlanningNames;
  /** The solvent on each channel, as the ledger shows it (empty for a method never run). */
  solvents: Record<string, string>;
  organic: OrganicModifier;
  current: GreennessSummary;
  ledger: { runs: number; injections: number; from: string; to: string };
  /** The detection wavelength written on the recipes of the batches the method ran on (most runs first), if any. */
  detection_nm: number | null;
  variants: MethodVariantSummary[];
  versions: MethodVersionSummary[];
}

/** Everything the method's planning page shows. */
export async function methodPlanningView(methodId: number, now = new Date()): Promise<MethodPlanningView | null> {
  const method = await getMethod(methodId);
  if (!method) return null;
  const context = await evaluationContext(methodId, now);
  const [names, variants, versions, detection] = await Promise.all([
    planningNames(),
    listVariants(methodId, now),
    listVersions(methodId),
    selectOne<{ detection_nm: number }>(
      `SELECT rv.detection_nm, COUNT(DISTINCT r.id) AS runs
         FROM runs r JOIN ledger_entries le ON le.source_id = CONCAT('run:', r.id)
         JOIN batches b ON b.id = le.batch_id JOIN recipe_versions rv ON rv.id = b.recipe_version_id
        WHERE r.method_id = :methodId AND r.started_at >= :from AND r.started_at < :to AND rv.detection_nm IS NOT NULL
        GROUP BY rv.detection_nm ORDER BY runs DESC, rv.detection_nm LIMIT 1`,
      { replacements: { methodId, from: context.period.from, to: context.period.to } },
    ),
  ]);
  const solvents = mainSolvents(context.use.contents);
  const b = solvents.B;
  const organic: OrganicModifier = b === "methanol" || b === "tetrahydrofuran" ? b : "acetonitrile";
  const shown = Object.keys(solvents).length ? solvents : { A: "water", B: organic };
  const g = greennessOf(method.program, 100, shown, null);
  const one = greennessOf(method.program, 1, shown, null);
  const ledger100 = variantSaving({
    current: method.program,
    variant: method.program,
    injections: 100,
    contents: Object.keys(context.use.contents).length
      ? context.use.contents
      : Object.fromEntries(Object.entries(shown).map(([ch, r]) => [ch, { mL_per_mL: { [r]: 1 }, g_per_mL: {} }])),
    rates: context.rates,
    streams: context.use.streams,
  }).current;
  return {
    method,
    names,
    solvents: shown,
    organic,
    current: {
      perInjection_mL: one.solvents_mL,
      per100_mL: g.solvents_mL,
      waste100_mL: ledger100.byStream_mL,
      cost100: ledger100.cost,
      score: one.score,
      warnings: one.warnings,
    },
    ledger: {
      runs: context.use.runs,
      injections: context.use.injections,
      from: context.period.from.toISOString().slice(0, 10),
      to: context.period.to.toISOString().slice(0, 10),
    },
    detection_nm: detection ? Number(detection.detection_nm) : null,
    variants,
    versions,
  };
}
