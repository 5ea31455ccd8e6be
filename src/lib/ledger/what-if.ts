/**
 * What a change of eluent strength does to a method: Snyder's linear-solvent-strength (LSS) fit
 * of two or more isocratic scouting runs predicts the last peak's retention at another %B, and,
 * for a gradient method, under the method's own gradient; the run time follows (last peak + a
 * margin), and `solventUse` gives the solvent (and so the waste) per injection.
 *
 * Pure: no I/O; runs in the browser as the scientist types.
 */
// Direct imports, not the chem index: the index pulls in the reagent catalogue (≈11 KB gz) the browser does not need here.
import { fitLSS, gradientRetention, predictRetention } from "../chem/retention";
import { solventUse, type ProgramPoint, type SolventUseResult } from "../chem/solvent-use";

export interface ScoutingRun {
  percentB: number;
  retention_min: number;
}

export interface WhatIfInput {
  /** Isocratic scouting runs: %B and the retention time of the last peak. */
  runs: readonly ScoutingRun[];
  deadTime_min: number;
  /** The %B to predict the isocratic retention at. */
  targetPercentB: number;
  /** Added after the last peak (wash, return, re-equilibration), min. */
  margin_min: number;
  /** The method's program as it is now. */
  program: readonly ProgramPoint[];
  /** The system's dwell (gradient delay) volume, mL; only used for a gradient method. */
  dwell_mL?: number;
}

export interface Scenario {
  retention_min: number;
  runTime_min: number;
  program: ProgramPoint[];
  perInjection: SolventUseResult;
  per100: SolventUseResult;
}

export interface WhatIfResult {
  fit: { logKw: number; S: number; r2: number };
  /** The method as it is now. */
  current: { runTime_min: number; perInjection: SolventUseResult; per100: SolventUseResult };
  /** Isocratic at the target %B, on channels A and B, at the program's initial flow. */
  isocratic: Scenario & { k: number };
  /** Under the method's gradient (null for a method whose %B never rises). */
  gradient: (Scenario & { kStar: number; b: number; dwell_min: number; segment: GradientSegment; elutesAfterGradient: boolean }) | null;
  warnings: string[];
}

export interface GradientSegment {
  start_min: number;
  end_min: number;
  from_percentB: number;
  to_percentB: number;
}

/** Multiplies every volume of a solventUse result (per 100 injections from one). */
export function scaleUse(use: SolventUseResult, factor: number): SolventUseResult {
  return {
    total_mL: use.total_mL * factor,
    byChannel_mL: Object.fromEntries(Object.entries(use.byChannel_mL).map(([ch, v]) => [ch, v * factor])),
  };
}

const lastTime = (program: readonly ProgramPoint[]) => program[program.length - 1]?.time_min ?? 0;

/** The first stretch of the program over which %B rises without a break (the gradient). */
export function gradientSegment(program: readonly ProgramPoint[]): GradientSegment | null {
  const b = (p: ProgramPoint) => p.composition.B ?? 0;
  let i = program.findIndex((p, j) => j + 1 < program.length && b(program[j + 1]!) > b(p) && program[j + 1]!.time_min > p.time_min);
  if (i < 0) return null;
  const start = program[i]!;
  while (i + 1 < program.length && b(program[i + 1]!) > b(program[i]!)) i++;
  const end = program[i]!;
  return { start_min: start.time_min, end_min: end.time_min, from_percentB: b(start), to_percentB: b(end) };
}

/** The program's flow and composition at time t (linear between points, as the pump delivers them). */
export function pointAt(program: readonly ProgramPoint[], t: number): ProgramPoint {
  const after = program.findIndex((p) => p.time_min >= t);
  if (after <= 0) {
    const p = program[after === 0 ? 0 : program.length - 1]!;
    return { time_min: t, flow_mL_min: p.flow_mL_min, composition: { ...p.composition } };
  }
  const a = program[after - 1]!;
  const b = program[after]!;
  const f = b.time_min === a.time_min ? 1 : (t - a.time_min) / (b.time_min - a.time_min);
  const channels = new Set([...Object.keys(a.composition), ...Object.keys(b.composition)]);
  const composition: Record<string, number> = {};
  for (const ch of channels) composition[ch] = (a.composition[ch] ?? 0) + f * ((b.composition[ch] ?? 0) - (a.composition[ch] ?? 0));
  return { time_min: t, flow_mL_min: a.flow_mL_min + f * (b.flow_mL_min - a.flow_mL_min), composition };
}

/**
 * The gradient program cut to a new run time: the gradient keeps its slope and runs until the
 * last peak leaves (held at its final composition if the peak leaves after the gradient's end);
 * the rows after the gradient (wash, return to start, re-equilibration) are stretched or shrunk
 * in time to fill the margin. Without such rows, the last composition is held for the margin.
 */
export function adjustGradientProgram(
  program: readonly ProgramPoint[],
  segment: GradientSegment,
  lastPeak_min: number,
  margin_min: number,
): ProgramPoint[] {
  const cut = Math.max(lastPeak_min, segment.start_min);
  const head = program.filter((p) => p.time_min < Math.min(cut, segment.end_min)).map((p) => ({ ...p, composition: { ...p.composition } }));
  if (cut <= segment.end_min) head.push(pointAt(program, cut));
  else head.push(pointAt(program, segment.end_min), { ...pointAt(program, segment.end_min), time_min: cut });
  const tail = program.filter((p) => p.time_min > segment.end_min);
  const span = tail.length ? lastTime(tail) - segment.end_min : 0;
  const last = head[head.length - 1]!;
  if (margin_min <= 0) return head;
  if (span <= 0) return [...head, { ...last, composition: { ...last.composition }, time_min: cut + margin_min }];
  return [
    ...head,
    ...tail.map((p) => ({ ...p, composition: { ...p.composition }, time_min: cut + ((p.time_min - segment.end_min) / span) * margin_min })),
  ];
}

/** An isocratic program on A and B: the target %B for the whole run at one flow. */
export function isocraticProgram(percentB: number, flow_mL_min: number, runTime_min: number): ProgramPoint[] {
  const composition = { A: 100 - percentB, B: percentB };
  return [
    { time_min: 0, flow_mL_min, composition },
    { time_min: runTime_min, flow_mL_min, composition },
  ];
}

function scenario(retention_min: number, runTime_min: number, program: ProgramPoint[]): Scenario {
  const perInjection = solventUse({ program });
  return { retention_min, runTime_min, program, perInjection, per100: scaleUse(perInjection, 100) };
}

/** Throws ChemInputError (with the field) for input the model cannot take. */
export function whatIf(input: WhatIfInput): WhatIfResult {
  const fit = fitLSS({ runs: input.runs, deadTime_min: input.deadTime_min });
  const warnings: string[] = [];
  const t0 = input.deadTime_min;
  const margin = Math.max(0, input.margin_min);
  const flow = input.program[0]?.flow_mL_min ?? 0;

  const currentUse = solventUse({ program: input.program });
  const current = { runTime_min: lastTime(input.program), perInjection: currentUse, per100: scaleUse(currentUse, 100) };

  const iso = predictRetention({ logKw: fit.logKw, S: fit.S, percentB: input.targetPercentB, deadTime_min: t0 });
  const isoRun = iso.retention_min + margin;
  const isocratic = { ...scenario(iso.retention_min, isoRun, isocraticProgram(input.targetPercentB, flow, isoRun)), k: iso.k };

  if (!(fit.S > 0))
    warnings.push("Retention does not fall as %B rises in these runs (S ≤ 0): check the runs; the LSS model does not apply.");
  else if (fit.S < 2 || fit.S > 10)
    warnings.push(
      `S = ${fit.S.toFixed(2)} is unusual (about 4 for small molecules; larger for peptides and proteins): check the runs and the dead time.`,
    );
  const bs = input.runs.map((r) => r.percentB);
  if (input.targetPercentB < Math.min(...bs) - 1e-9 || input.targetPercentB > Math.max(...bs) + 1e-9)
    warnings.push("The target %B lies outside the scouting runs: the prediction is an extrapolation.");
  if (input.runs.length > 2 && fit.r2 < 0.99)
    warnings.push(`The runs fit a straight line of log k against %B only loosely (r² = ${fit.r2.toFixed(3)}).`);
  if (iso.k < 1)
    warnings.push(
      `k = ${iso.k.toFixed(2)} at ${input.targetPercentB} %B: the last peak leaves close to the dead time, where resolution suffers.`,
    );
  if (iso.k > 20)
    warnings.push(`k = ${iso.k.toFixed(1)} at ${input.targetPercentB} %B: long runs and broad peaks; a gradient may suit better.`);

  const segment = gradientSegment(input.program);
  let gradient: WhatIfResult["gradient"] = null;
  if (segment && fit.S > 0 && flow > 0) {
    const dwell_min = (input.dwell_mL ?? 0) / flow;
    // Rows before the gradient hold the initial composition: to the solute they are more dwell.
    const delay = dwell_min + segment.start_min;
    const g = gradientRetention({
      logKw: fit.logKw,
      S: fit.S,
      deadTime_min: t0,
      dwell_min: delay,
      gradient: { from_percentB: segment.from_percentB, to_percentB: segment.to_percentB, time_min: segment.end_min - segment.start_min },
    });
    const elutesAfterGradient = g.retention_min > segment.end_min + dwell_min + t0;
    if (elutesAfterGradient)
      warnings.push(
        "Under the gradient, the last peak leaves after the gradient has ended: it is taken to finish at the final composition.",
      );
    const runTime = g.retention_min + margin;
    const program = adjustGradientProgram(input.program, segment, g.retention_min, margin);
    gradient = { ...scenario(g.retention_min, runTime, program), kStar: g.kStar, b: g.b, dwell_min, segment, elutesAfterGradient };
  }
  return { fit, current, isocratic, gradient, warnings };
}
