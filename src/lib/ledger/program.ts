/** The gradient table as people edit it (%B, %C, %D; %A the rest) ↔ the pump program solventUse reads. */
import type { ProgramPoint } from "../chem";
import type { ProgramRow } from "../schemas/methods";

const OTHER = ["B", "C", "D"] as const;

export function rowsToProgram(rows: readonly ProgramRow[]): ProgramPoint[] {
  const used = OTHER.filter((ch) => rows.some((r) => r[ch] > 0));
  return rows.map((r) => {
    const composition: Record<string, number> = { A: Math.round((100 - used.reduce((a, ch) => a + r[ch], 0)) * 1e9) / 1e9 };
    for (const ch of used) composition[ch] = r[ch];
    return { time_min: r.time_min, flow_mL_min: r.flow_mL_min, composition };
  });
}

export function programToRows(program: readonly ProgramPoint[]): ProgramRow[] {
  return program.map((p) => ({
    time_min: p.time_min,
    flow_mL_min: p.flow_mL_min,
    B: p.composition.B ?? 0,
    C: p.composition.C ?? 0,
    D: p.composition.D ?? 0,
  }));
}

/** Channels the program draws from (a channel at 0 % throughout draws nothing). */
export function programChannels(program: readonly ProgramPoint[]): string[] {
  const set = new Set<string>();
  for (const p of program) for (const [ch, v] of Object.entries(p.composition)) if (v > 0) set.add(ch);
  return [...set].sort();
}
