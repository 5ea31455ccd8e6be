/**
 * Moving a gradient method to a column of another length, inner diameter or particle size, by
 * the geometric transfer equations (Dolan 2014, LCGC N. Am. 32, 188; the same equations as the
 * allowed gradient adjustments of USP <621>, harmonised 2022):
 *   flow       F2 = F1·(dc2/dc1)²             same linear velocity, or ·(dp1/dp2) for the same reduced velocity
 *   times      tG2 = tG1·(F1/F2)·(L2·dc2²)/(L1·dc1²)   same gradient volume in column volumes
 *   injection  V2 = V1·(L2·dc2²)/(L1·dc1²)
 *   dwell      the dwell volume should stay the same number of column volumes: a system with less
 *              adds an isocratic hold at the start, one with more delays the injection.
 * Column volume Vm ≈ 0.5·L·dc² (µL with mm; SKD10, from memory) is shown for orientation only; the
 * scaling uses ratios, so the packing's porosity cancels. Plate number goes with L/dp, so
 * resolution changes with √((L2/dp2)/(L1/dp1)); back-pressure with F·L/(dc²·dp²).
 */
import type { ProgramPoint } from "./solvent-use";
import { ChemInputError, type ChemWarning, isList, pushWarning, requireFinite } from "./warnings";

export interface ColumnGeometry {
  length_mm: number;
  diameter_mm: number;
  particle_um: number;
  /** The system's dwell (gradient delay) volume, mL. */
  dwell_mL: number;
}

export type TransferKeep = "linear-velocity" | "reduced-velocity";

export interface TransferMethodInput {
  program: readonly ProgramPoint[];
  injection_uL: number;
  from: ColumnGeometry;
  to: ColumnGeometry;
  keep?: TransferKeep;
}

export interface TransferMethodResult {
  program: ProgramPoint[];
  injection_uL: number;
  flowFactor: number;
  /** Every program time is multiplied by this (before a dwell hold is added). */
  timeFactor: number;
  /** Ratio of column volumes, to / from. */
  volumeFactor: number;
  columnVolume_mL: { from: number; to: number };
  /** Isocratic hold added at the start (min), or 0. */
  hold_min: number;
  /** Start the injection this long after the gradient program (min), or 0. */
  injectionDelay_min: number;
  /** Length over particle size (mm/µm ×1000 = plate-number proxy) and its relative change. */
  lOverDp: { from: number; to: number; change: number };
  /** Expected resolution relative to the original (√ of the L/dp ratio). */
  resolutionFactor: number;
  /** Expected back-pressure relative to the original, same mobile phase and temperature. */
  pressureFactor: number;
  warnings: ChemWarning[];
}

/** Column volume estimate, mL (Vm ≈ 0.5·L·dc², L and dc in mm → µL). */
export function columnVolume_mL(c: Pick<ColumnGeometry, "length_mm" | "diameter_mm">): number {
  return (0.5 * c.length_mm * c.diameter_mm * c.diameter_mm) / 1000;
}

function checkColumn(c: ColumnGeometry, field: string) {
  requireFinite(c?.length_mm, `${field}.length_mm`, { positive: true });
  requireFinite(c.diameter_mm, `${field}.diameter_mm`, { positive: true });
  requireFinite(c.particle_um, `${field}.particle_um`, { positive: true });
  requireFinite(c.dwell_mL, `${field}.dwell_mL`, { min: 0 });
}

const MIN_CORRECTION_MIN = 0.05;

export function transferMethod(input: TransferMethodInput): TransferMethodResult {
  const { from, to } = input;
  checkColumn(from, "from");
  checkColumn(to, "to");
  requireFinite(input.injection_uL, "injection_uL", { min: 0 });
  if (!isList(input.program) || input.program.length === 0)
    throw new ChemInputError("invalid-input", "program must have at least one point.", "program");
  input.program.forEach((p, i) => {
    requireFinite(p.time_min, `program[${i}].time_min`, { min: 0 });
    requireFinite(p.flow_mL_min, `program[${i}].flow_mL_min`, { min: 0 });
  });
  const keep = input.keep ?? "linear-velocity";
  const areaFactor = (to.diameter_mm / from.diameter_mm) ** 2;
  const flowFactor = areaFactor * (keep === "reduced-velocity" ? from.particle_um / to.particle_um : 1);
  const volumeFactor = (to.length_mm / from.length_mm) * areaFactor;
  const timeFactor = volumeFactor / flowFactor;
  const warnings: ChemWarning[] = [];

  let program: ProgramPoint[] = input.program.map((p) => ({
    time_min: p.time_min * timeFactor,
    flow_mL_min: p.flow_mL_min * flowFactor,
    composition: { ...p.composition },
  }));

  // Dwell in column volumes kept: the new system should have from.dwell × volumeFactor.
  const firstFlow = program[0]!.flow_mL_min;
  const missing_mL = from.dwell_mL * volumeFactor - to.dwell_mL;
  let hold_min = 0;
  let injectionDelay_min = 0;
  if (firstFlow > 0 && Math.abs(missing_mL) / firstFlow >= MIN_CORRECTION_MIN) {
    if (missing_mL > 0) {
      hold_min = missing_mL / firstFlow;
      const start = program[0]!;
      program = [{ ...start, composition: { ...start.composition } }, ...program.map((p) => ({ ...p, time_min: p.time_min + hold_min }))];
      pushWarning(warnings, {
        code: "dwell-correction",
        message: `The new system's dwell volume (${to.dwell_mL} mL) is smaller, in column volumes, than the original's: an isocratic hold of ${hold_min.toFixed(2)} min at the starting composition keeps the gradient's timing.`,
      });
    } else {
      injectionDelay_min = -missing_mL / firstFlow;
      pushWarning(warnings, {
        code: "dwell-correction",
        message: `The new system's dwell volume (${to.dwell_mL} mL) is larger, in column volumes, than the original's: start the injection ${injectionDelay_min.toFixed(2)} min after the gradient program (if the system can delay it), or accept later, shifted early peaks.`,
      });
    }
  }

  const ldpFrom = (from.length_mm / from.particle_um) * 1000;
  const ldpTo = (to.length_mm / to.particle_um) * 1000;
  const change = ldpTo / ldpFrom - 1;
  const resolutionFactor = Math.sqrt(ldpTo / ldpFrom);
  if (Math.abs(change) > 0.01)
    pushWarning(warnings, {
      code: "resolution-change",
      message: `L/dp goes from ${Math.round(ldpFrom).toLocaleString("en")} to ${Math.round(ldpTo).toLocaleString("en")} (${change > 0 ? "+" : ""}${(change * 100).toFixed(0)} %): the plate number, and so resolution (about × ${resolutionFactor.toFixed(2)}), ${change > 0 ? "rises" : "falls"}.${change < -0.25 || change > 0.5 ? " This is outside the −25 % to +50 % that USP <621> allows without revalidation." : ""}`,
    });
  if (to.diameter_mm <= 2.1 && from.diameter_mm > 2.1)
    pushWarning(warnings, {
      code: "resolution-change",
      message: `On a ${to.diameter_mm} mm column the system's extra-column volume broadens peaks more: use short, narrow connecting tubing and a small detector cell, or expect lower resolution than L/dp predicts.`,
    });
  const pressureFactor = flowFactor * (to.length_mm / from.length_mm) * (1 / areaFactor) * (from.particle_um / to.particle_um) ** 2;
  if (pressureFactor > 1.5)
    pushWarning(warnings, {
      code: "pressure-increase",
      message: `Back-pressure rises about × ${pressureFactor.toFixed(1)} at the new flow (ΔP ∝ F·L/(dc²·dp²)): check it against the column's and the system's pressure limits before the first run.`,
    });

  return {
    program,
    injection_uL: input.injection_uL * volumeFactor,
    flowFactor,
    timeFactor,
    volumeFactor,
    columnVolume_mL: { from: columnVolume_mL(from), to: columnVolume_mL(to) },
    hold_min,
    injectionDelay_min,
    lOverDp: { from: ldpFrom, to: ldpTo, change },
    resolutionFactor,
    pressureFactor,
    warnings,
  };
}
