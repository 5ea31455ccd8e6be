/**
 * A proposed variant of a method, worked out from its program: the organic modifier changed at
 * equal strength (substituteSolvent), then the method moved to another column (transferMethod);
 * its greenness beside the method's; and, from scouting runs where there are some, the last peak
 * and the run time predicted by the LSS model before and after. Pure.
 */
import { transferMethod, type TransferMethodResult } from "../chem/column-transfer";
import { methodGreenness, type MethodGreennessResult } from "../chem/greenness";
import type { ProgramPoint } from "../chem/solvent-use";
import {
  fromMethanolEquivalent,
  substituteSolvent,
  toMethanolEquivalent,
  type ModifierBlend,
  type OrganicModifier,
} from "../chem/substitution";
import type { ChemWarning } from "../chem/warnings";
import { whatIf } from "../ledger/what-if";
import type { VariantParams } from "../schemas/planning";

export interface RetentionPrediction {
  lastPeak_min: number;
  runTime_min: number;
}

export interface BuiltVariant {
  program: ProgramPoint[];
  /** The solvent on each channel after the change (a blend splits a channel into sub-channels for the score). */
  solvents: Record<string, string>;
  blend: ModifierBlend | null;
  transfer: Omit<TransferMethodResult, "program" | "warnings"> | null;
  injection_uL: number | null;
  warnings: ChemWarning[];
  prediction: { current: RetentionPrediction; variant: RetentionPrediction; notes: string[] } | null;
}

export function buildVariant(
  program: readonly ProgramPoint[],
  params: VariantParams,
  solvents: Record<string, string>,
  margin_min: number,
): BuiltVariant {
  let next: ProgramPoint[] = program.map((p) => ({ ...p, composition: { ...p.composition } }));
  const warnings: ChemWarning[] = [];
  const after = { ...solvents };
  let blend: ModifierBlend | null = null;
  const s = params.substitution;
  if (s) {
    const r = substituteSolvent({
      program: next,
      channel: s.channel,
      aqueous: s.aqueous,
      from: s.from,
      to: s.to,
      ...(params.detection_nm !== undefined ? { detection_nm: params.detection_nm } : {}),
      aqueousSolutes: Object.values(solvents),
    });
    next = r.program;
    blend = r.to;
    warnings.push(...r.warnings);
    const only = Object.keys(r.to);
    after[s.channel] = only.length === 1 ? only[0]! : `blend:${s.channel}`;
  }
  let transfer: BuiltVariant["transfer"] = null;
  let injection_uL: number | null = null;
  const t = params.transfer;
  if (t) {
    const r = transferMethod({ program: next, injection_uL: t.injection_uL, from: t.from, to: t.to, keep: t.keep });
    next = r.program;
    const { program: _p, warnings: w, ...rest } = r;
    transfer = rest;
    injection_uL = r.injection_uL;
    warnings.push(...w);
  }
  return {
    program: next,
    solvents: after,
    blend,
    transfer,
    injection_uL,
    warnings,
    prediction: predict(program, next, params, margin_min),
  };
}

function predict(
  current: readonly ProgramPoint[],
  variant: readonly ProgramPoint[],
  params: VariantParams,
  margin_min: number,
): BuiltVariant["prediction"] {
  const scouting = params.scouting;
  if (!scouting) return null;
  const channel = params.substitution?.channel ?? "B";
  const notes: string[] = [];
  // The what-if reads %B from channel B: rename the organic channel to B for it.
  const asB = (program: readonly ProgramPoint[]) =>
    program.map((p) => ({ ...p, composition: { A: 100 - (p.composition[channel] ?? 0), B: p.composition[channel] ?? 0 } }));
  const lastPeak = (
    program: readonly ProgramPoint[],
    runs: { percentB: number; retention_min: number }[],
    t0: number,
    dwell: number,
    margin: number,
  ) => {
    const r = whatIf({
      runs,
      deadTime_min: t0,
      targetPercentB: program[0]?.composition.B ?? 0,
      margin_min: margin,
      program,
      dwell_mL: dwell,
    });
    const last = r.gradient ?? r.isocratic;
    // The what-if also reports on its isocratic scenario at the first point's %B; only the gradient's notes concern this method.
    notes.push(...r.warnings.filter((w) => !(r.gradient && /target %B|^k = /.test(w))));
    return { lastPeak_min: last.retention_min, runTime_min: Math.max(last.runTime_min, program[program.length - 1]?.time_min ?? 0) };
  };
  const t = params.transfer;
  const before = lastPeak(asB(current), scouting.runs, scouting.deadTime_min, t?.from.dwell_mL ?? 0, margin_min);
  // Scouting runs carried to the variant: %B through the strength relation, times by the column's time factor.
  let runs = scouting.runs.map((r) => ({ ...r }));
  const s = params.substitution;
  if (s) {
    const blendOf: ModifierBlend = typeof s.to === "string" ? { [s.to]: 100 } : s.to;
    runs = runs.map((r) => {
      const phiM = toMethanolEquivalent(s.from, r.percentB / 100);
      let inverse = 0;
      for (const [m, pct] of Object.entries(blendOf) as [OrganicModifier, number][])
        if (pct) inverse += pct / 100 / fromMethanolEquivalent(m, phiM);
      return { ...r, percentB: Math.min(100, phiM > 0 ? 100 / inverse : 0) };
    });
    notes.push(
      "Retention after the solvent change assumes the iso-eluotropic relation holds for the last peak; it holds only roughly (about ±10 % in k).",
    );
  }
  let t0 = scouting.deadTime_min;
  let margin = margin_min;
  if (t) {
    const f = (t.to.length_mm * t.to.diameter_mm ** 2) / (t.from.length_mm * t.from.diameter_mm ** 2);
    const flow = (t.to.diameter_mm / t.from.diameter_mm) ** 2 * (t.keep === "reduced-velocity" ? t.from.particle_um / t.to.particle_um : 1);
    const timeFactor = f / flow;
    runs = runs.map((r) => ({ ...r, retention_min: r.retention_min * timeFactor }));
    t0 *= timeFactor;
    margin *= timeFactor;
  }
  const after = lastPeak(asB(variant), runs, t0, t?.to.dwell_mL ?? 0, margin);
  return { current: before, variant: after, notes: [...new Set(notes)] };
}

/** Greenness of a program whose channels may hold a blend (`blend:<X>`): the channel is split by the blend's shares. */
export function greennessOf(
  program: readonly ProgramPoint[],
  injections: number,
  solvents: Record<string, string>,
  blend: ModifierBlend | null,
): MethodGreennessResult {
  const blended = Object.entries(solvents).find(([, r]) => r.startsWith("blend:"));
  if (!blended || !blend) return methodGreenness({ program, injections, solvents });
  const [channel] = blended;
  const parts = Object.entries(blend) as [string, number][];
  const split = program.map((p) => {
    const composition: Record<string, number> = { ...p.composition };
    const v = composition[channel] ?? 0;
    delete composition[channel];
    parts.forEach(([m, pct], i) => {
      composition[`${channel}${i + 1}`] = (v * pct) / 100;
    });
    // Keep the sum at exactly 100 for solventUse.
    const sum = Object.values(composition).reduce((a, x) => a + x, 0);
    const first = `${channel}1`;
    composition[first] = (composition[first] ?? 0) + (100 - sum);
    return { ...p, composition };
  });
  const mapping: Record<string, string> = { ...solvents };
  delete mapping[channel];
  parts.forEach(([m], i) => {
    mapping[`${channel}${i + 1}`] = m;
  });
  return methodGreenness({ program: split, injections, solvents: mapping });
}
