/**
 * Solvent consumed by a pump program. Between two program points the pump
 * changes flow and composition linearly in time, so each channel's flow,
 * F(t)·φ(t), is a quadratic in time and is integrated exactly:
 * ∫ F φ dt = Δt·[F1 φ1 + (F1 Δφ + φ1 ΔF)/2 + ΔF Δφ/3].
 */
import { ChemInputError, requireFinite, isList } from "./warnings";

export interface ProgramPoint {
  time_min: number;
  flow_mL_min: number;
  /** Percent of each channel; the channels of a point add up to 100. */
  composition: Readonly<Record<string, number>>;
}

export interface SolventUseInput {
  program: readonly ProgramPoint[];
  /** Each injection runs the whole program once. */
  injections?: number;
}

export interface SolventUseResult {
  total_mL: number;
  byChannel_mL: Record<string, number>;
}

export function solventUse(input: SolventUseInput): SolventUseResult {
  const program = input.program;
  const injections = input.injections ?? 1;
  requireFinite(injections, "injections", { min: 0 });
  if (!Number.isInteger(injections)) throw new ChemInputError("invalid-input", "injections must be a whole number.", "injections");
  if (!isList(program) || program.length === 0)
    throw new ChemInputError("invalid-input", "program must have at least one point.", "program");
  const channels = new Set<string>();
  program.forEach((p, i) => {
    requireFinite(p.time_min, `program[${i}].time_min`, { min: 0 });
    requireFinite(p.flow_mL_min, `program[${i}].flow_mL_min`, { min: 0 });
    let sum = 0;
    for (const [ch, pct] of Object.entries(p.composition)) {
      requireFinite(pct, `program[${i}].composition.${ch}`, { min: 0, max: 100 });
      sum += pct;
      channels.add(ch);
    }
    if (Math.abs(sum - 100) > 1e-6)
      throw new ChemInputError(
        "composition-not-100",
        `Channels at program point ${i} add up to ${sum} %, not 100 %.`,
        `program[${i}].composition`,
      );
    const prev = program[i - 1];
    if (prev !== undefined && p.time_min < prev.time_min)
      throw new ChemInputError("invalid-input", `Program times must not decrease (point ${i}).`, `program[${i}].time_min`);
  });

  const byChannel_mL: Record<string, number> = {};
  for (const ch of channels) byChannel_mL[ch] = 0;
  let total = 0;
  for (let i = 1; i < program.length; i++) {
    const a = program[i - 1];
    const b = program[i];
    if (a === undefined || b === undefined) continue;
    const dt = b.time_min - a.time_min;
    if (dt === 0) continue;
    const F1 = a.flow_mL_min;
    const dF = b.flow_mL_min - F1;
    total += dt * (F1 + 0.5 * dF);
    for (const ch of channels) {
      const p1 = (a.composition[ch] ?? 0) / 100;
      const dp = (b.composition[ch] ?? 0) / 100 - p1;
      byChannel_mL[ch] = (byChannel_mL[ch] ?? 0) + dt * (F1 * p1 + 0.5 * (F1 * dp + p1 * dF) + (dF * dp) / 3);
    }
  }
  for (const ch of channels) byChannel_mL[ch] = (byChannel_mL[ch] ?? 0) * injections;
  return { total_mL: total * injections, byChannel_mL };
}
