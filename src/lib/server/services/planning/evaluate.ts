/**
 * A variant evaluated against the facility's own ledger: the variant's program and warnings, the
 * greenness of the method and of the variant side by side, and what the variant would have saved
 * over the last 12 months at the injections the ledger records for the method.
 */
import { ChemInputError } from "../../../chem/warnings";
import { buildVariant, greennessOf } from "../../../planning/variant";
import { variantSaving, type SavingInput } from "../../../planning/savings";
import type { GreennessSummary, VariantEvaluation } from "../../../planning/types";
import type { VariantParams } from "../../../schemas/planning";
import type { ProgramPoint } from "../../../chem/solvent-use";
import { HttpError } from "../../http";
import type { MethodSummary } from "../../../ledger/types";
import { mainSolvents, methodLedgerUse, streamOf, todayRates, withCurrentSolvents, type MethodLedgerUse } from "./ledger-use";

const YEAR_MS = 365 * 86_400_000;

/** The period the savings cover: the 12 months before `now`. */
export function savingPeriod(now: Date): { from: Date; to: Date } {
  return { from: new Date(now.getTime() - YEAR_MS), to: now };
}

export interface EvaluationContext {
  use: MethodLedgerUse;
  rates: Awaited<ReturnType<typeof todayRates>>;
  period: { from: Date; to: Date };
}

export async function evaluationContext(methodId: number, now: Date): Promise<EvaluationContext> {
  const period = savingPeriod(now);
  const [recorded, rates] = await Promise.all([methodLedgerUse(methodId, period.from, period.to), todayRates(now)]);
  return { use: await withCurrentSolvents(methodId, recorded), rates, period };
}

function summary(
  program: readonly ProgramPoint[],
  solvents: Record<string, string>,
  blend: Parameters<typeof greennessOf>[3],
  ledger100: { cost: GreennessSummary["cost100"]; byStream_mL: Record<string, number> },
): GreennessSummary {
  const one = greennessOf(program, 1, solvents, blend);
  const hundred = greennessOf(program, 100, solvents, blend);
  return {
    perInjection_mL: one.solvents_mL,
    per100_mL: hundred.solvents_mL,
    // Waste by the streams the ledger books this method's reagents to, as the saving counts it.
    waste100_mL: ledger100.byStream_mL,
    cost100: ledger100.cost,
    score: { name: one.score.name, value: one.score.value, source: one.score.source, unit: one.score.unit },
    warnings: one.warnings,
  };
}

export function evaluate(method: MethodSummary, params: VariantParams, context: EvaluationContext): VariantEvaluation {
  const { use, rates, period } = context;
  const fromLedger = mainSolvents(use.contents);
  const solventsFrom: VariantEvaluation["solventsFrom"] = params.solvents ? "given" : Object.keys(fromLedger).length ? "ledger" : "assumed";
  const organic = params.substitution?.channel ?? "B";
  const solvents: Record<string, string> = params.solvents
    ? { ...params.solvents }
    : Object.keys(fromLedger).length
      ? fromLedger
      : { A: "water", [organic]: params.substitution?.from ?? "acetonitrile" };
  let built;
  try {
    built = buildVariant(method.program, params, solvents, method.reEquilibration_min);
  } catch (error) {
    if (error instanceof ChemInputError) {
      // Name the field as the request spells it: scouting runs and column fields sit under their group.
      const raw = error.field ?? "input";
      const field = /^(runs|deadTime)/.test(raw)
        ? `scouting.${raw}`
        : /^(from|to)\./.test(raw) && params.transfer
          ? `transfer.${raw}`
          : raw;
      throw new HttpError(400, `${field}: ${error.message.startsWith(raw) ? error.message.slice(raw.length).trim() : error.message}`);
    }
    throw error;
  }
  const s = params.substitution;
  const swaps: SavingInput["swaps"] = s
    ? { [s.channel]: { [s.from]: typeof s.to === "string" ? { [s.to]: 100 } : (s.to as Record<string, number>) } }
    : undefined;
  // Contents for a method never run: what the channels are said to hold.
  const contents = Object.keys(use.contents).length
    ? use.contents
    : Object.fromEntries(Object.entries(solvents).map(([ch, r]) => [ch, { mL_per_mL: { [r]: 1 }, g_per_mL: {} }]));
  const streams: Record<string, string> = {};
  const reagents = new Set<string>([...Object.values(solvents), ...Object.keys(use.byReagent_mL)]);
  for (const blend of Object.values(swaps ?? {})) for (const b of Object.values(blend)) for (const r of Object.keys(b)) reagents.add(r);
  for (const r of reagents) streams[r] = s && !use.streams[r] && use.streams[s.from] ? use.streams[s.from]! : streamOf(use.streams, r);
  const base = { current: method.program, variant: built.program, contents, swaps, rates, streams };
  const saving = variantSaving({ ...base, injections: use.injections });
  const per100 = variantSaving({ ...base, injections: 100 });
  return {
    methodId: method.id,
    solvents,
    solventsFrom,
    program: built.program,
    variantSolvents: built.solvents,
    injection_uL: built.injection_uL,
    transfer: built.transfer,
    warnings: built.warnings,
    prediction: built.prediction,
    greenness: {
      current: summary(method.program, solvents, null, per100.current),
      variant: summary(built.program, built.solvents, built.blend, per100.variant),
    },
    saving: { ...saving, from: period.from.toISOString().slice(0, 10), to: period.to.toISOString().slice(0, 10), runs: use.runs },
  };
}
