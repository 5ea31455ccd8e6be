// Three months of the demo facility's runs with their ledger entries (invented, illustrative volumes).
import type { DemoClock } from "../../demo-time";
import { prng } from "../../demo-random";

const stamp = (d: Date) => ({ created_at: d, updated_at: d });

export function runRows(at: DemoClock) {
  const random = prng(20261201);
  const runs: object[] = [];
  const ledger: object[] = [];
  const projectsByInstrument: Record<number, number[]> = { 1: [1, 2, 4], 2: [4, 5, 6], 3: [3, 6, 2] };
  const perInjection: Record<number, { A: number; B: number }> = {
    1: { A: 3.38, B: 2.62 },
    2: { A: 20.1, B: 12.9 },
    3: { A: 4.8, B: 3.2 },
  };
  const waste: Record<number, { stream: string; container: number }> = {
    1: { stream: "non-halogenated-organic", container: 1 },
    2: { stream: "non-halogenated-organic", container: 2 },
    3: { stream: "halogenated-organic", container: 3 },
  };
  let runId = 0;
  for (let daysAgo = 90; daysAgo >= 1; daysAgo--) {
    const day = at(daysAgo);
    if (day.getUTCDay() === 0 || day.getUTCDay() === 6) continue;
    for (const instrumentId of [1, 2, 3]) {
      if (random() < 0.45) continue;
      runId++;
      const projectId = projectsByInstrument[instrumentId]![Math.floor(random() * 3)]!;
      const methodId = instrumentId === 2 ? 2 : random() < 0.8 ? 1 : 3;
      const injections = 8 + Math.floor(random() * 40);
      const use = perInjection[methodId]!;
      const volumes = { A: +(use.A * injections).toFixed(2), B: +(use.B * injections).toFixed(2) };
      const startedAt = new Date(day.getTime() + Math.floor(random() * 6) * 3_600_000);
      const [batchA, batchB] = daysAgo > 12 ? [1, 2] : [4, 5];
      runs.push({
        id: runId,
        instrument_id: instrumentId,
        method_id: methodId,
        project_id: projectId,
        operator_id: random() < 0.6 ? 3 : 6,
        reference: `SEQ-${instrumentId}-${String(runId).padStart(4, "0")}`,
        started_at: startedAt,
        injections,
        channel_batches: JSON.stringify({ A: batchA, B: batchB }),
        channel_volumes: JSON.stringify(volumes),
        ...stamp(startedAt),
      });
      const { stream, container } = waste[instrumentId]!;
      const entry = (batchId: number, reagentId: string, volume_ml: number) => ({
        occurred_at: startedAt,
        project_id: projectId,
        kind: "run",
        batch_id: batchId,
        reagent_id: reagentId,
        volume_ml: +volume_ml.toFixed(4),
        waste_stream_id: stream,
        waste_container_id: container,
        source_kind: "seed",
        source_id: `run:${runId}`,
        author_id: 3,
        created_at: startedAt,
      });
      // 0.1 % v/v formic acid in each channel; the rest is water (A) or acetonitrile (B).
      ledger.push(entry(batchA, "water", volumes.A * 0.999), entry(batchA, "formic-acid", volumes.A * 0.001));
      ledger.push(entry(batchB, "acetonitrile", volumes.B * 0.999), entry(batchB, "formic-acid", volumes.B * 0.001));
    }
  }
  return { runs, ledger };
}
