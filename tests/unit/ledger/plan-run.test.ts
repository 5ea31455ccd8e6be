import { describe, expect, it } from "vitest";
import { batchUnavailable, planRun, type BatchForUse, type RunToPlan } from "../../../src/lib/ledger/plan-run";

const HOUR = 3_600_000;
const start = new Date("2026-12-02T09:00:00.000Z");

// Isocratic 50 % B at 0.5 mL/min for 10 min: 2.5 mL from each channel per program (worked by hand).
const isocratic = {
  id: 7,
  name: "Isocratic 50 % B",
  program: [
    { time_min: 0, flow_mL_min: 0.5, composition: { A: 50, B: 50 } },
    { time_min: 10, flow_mL_min: 0.5, composition: { A: 50, B: 50 } },
  ],
};
const instrument = { id: 1, name: "Wren", channels: ["A", "B"], wasteContainerId: 3, active: true };

const batch = (id: number, overrides: Partial<BatchForUse> = {}): BatchForUse => ({
  id,
  code: `B26-${1100 + id}`,
  status: "in_use",
  preparedAt: new Date(start.getTime() - 24 * HOUR),
  expiresAt: new Date(start.getTime() + 24 * HOUR),
  remaining_mL: 1000,
  // 0.1 % formic acid in water, as the demo batches are made: 4000 mL water + 4 mL formic acid.
  composition: {
    volume_mL: 4004,
    parts: [
      { reagentId: "water", unit: "mL", amount: 4000 },
      { reagentId: "formic-acid", unit: "mL", amount: 4 },
    ],
  },
  ...overrides,
});
const acetonitrile = (id: number, overrides: Partial<BatchForUse> = {}) =>
  batch(id, { composition: { volume_mL: 4000, parts: [{ reagentId: "acetonitrile", unit: "mL", amount: 4000 }] }, ...overrides });

const run = (overrides: Partial<RunToPlan> = {}): RunToPlan => ({
  instrument,
  method: isocratic,
  projectId: 2,
  injections: 3,
  blanks: 1,
  purge_mL: 2,
  channelBatches: { A: 4, B: 5 },
  startedAt: start,
  authorId: 3,
  ...overrides,
});
const batches = (...list: BatchForUse[]) => new Map(list.map((b) => [b.id, b]));

describe("planRun: the volumes and ledger entries of a run", () => {
  it("pumps the program once per injection and blank, adds the purge, and splits each channel by its batch", () => {
    const { plan, problems } = planRun(run(), batches(batch(4), acetonitrile(5)));
    expect(problems).toEqual([]);
    // 4 programs × 2.5 mL + 2 mL purge = 12 mL per channel (by hand).
    expect(plan!.channelVolumes).toEqual({ A: 12, B: 12 });
    expect(plan!.batchUse).toEqual(
      new Map([
        [4, 12],
        [5, 12],
      ]),
    );
    // A: formic acid 12 × 4/4004 = 0.011988 → 0.012 mL, water the rest 11.988 mL (by hand); B is all acetonitrile.
    // Streams as the reagent catalogue gives them (the same as in tests/integration/ledger/runs-ledger.test.ts).
    expect(plan!.entries.map((e) => [e.channel, e.reagentId, e.volume_mL, e.batchId, e.wasteStreamId])).toEqual([
      ["A", "water", 11.988, 4, "aqueous"],
      ["A", "formic-acid", 0.012, 4, "acidic-corrosive"],
      ["B", "acetonitrile", 12, 5, "non-halogenated-organic"],
    ]);
    for (const e of plan!.entries)
      expect(e).toMatchObject({ kind: "run", occurredAt: start, projectId: 2, wasteContainerId: 3, authorId: 3, mass_g: null });
  });

  it("takes both channels' volume from a batch that feeds two channels", () => {
    const { plan } = planRun(run({ channelBatches: { A: 4, B: 4 } }), batches(batch(4)));
    expect(plan!.batchUse).toEqual(new Map([[4, 24]]));
  });

  it("carries what earlier runs of an import took: the second run finds what the first left", () => {
    const left = new Map<number, number>();
    const small = batches(batch(4, { remaining_mL: 20 }), acetonitrile(5));
    expect(planRun(run(), small, left).problems).toEqual([]);
    expect(left.get(4)).toBe(8);
    expect(planRun(run(), small, left).problems).toEqual([
      { field: "channelBatches.A", message: "batch B26-1104 has 8 mL left; this run needs 12 mL" },
    ]);
  });

  it.each([
    [
      "an instrument out of service",
      run({ instrument: { ...instrument, active: false } }),
      batches(batch(4), acetonitrile(5)),
      [{ field: "instrumentId", message: "Wren is out of service" }],
    ],
    [
      "a channel the method pumps left without a batch",
      run({ channelBatches: { A: 4 } }),
      batches(batch(4)),
      [{ field: "channelBatches.B", message: "Isocratic 50 % B pumps channel B: choose the batch on it" }],
    ],
    [
      "a method channel the instrument lacks",
      run({ instrument: { ...instrument, channels: ["A"] }, channelBatches: { A: 4 } }),
      batches(batch(4)),
      [{ field: "methodId", message: "Isocratic 50 % B pumps channel B, which Wren does not have" }],
    ],
    [
      "a batch on a channel the instrument lacks",
      run({ channelBatches: { A: 4, B: 5, C: 6 } }),
      batches(batch(4), acetonitrile(5), batch(6)),
      [{ field: "channelBatches.C", message: "Wren has no channel C" }],
    ],
    ["a batch id that does not exist", run(), batches(batch(4)), [{ field: "channelBatches.B", message: "no batch with id 5" }]],
    [
      "a used-up batch",
      run(),
      batches(batch(4, { status: "empty" }), acetonitrile(5)),
      [{ field: "channelBatches.A", message: "batch B26-1104 is used up" }],
    ],
    [
      "a discarded batch",
      run(),
      batches(batch(4), acetonitrile(5, { status: "discarded" })),
      [{ field: "channelBatches.B", message: "batch B26-1105 is discarded" }],
    ],
    // Expiry at the very minute the run starts counts as expired.
    [
      "a batch that expired before the run started",
      run(),
      batches(batch(4, { expiresAt: start }), acetonitrile(5)),
      [{ field: "channelBatches.A", message: "batch B26-1104 expired 2026-12-02 09:00 UTC, before the run started" }],
    ],
    [
      "a batch prepared after the run started",
      run(),
      batches(batch(4), acetonitrile(5, { preparedAt: new Date(start.getTime() + HOUR) })),
      [{ field: "channelBatches.B", message: "batch B26-1105 was prepared after the run started" }],
    ],
    [
      "a batch with less left than the run needs",
      run(),
      batches(batch(4), acetonitrile(5, { remaining_mL: 11.5 })),
      [{ field: "channelBatches.B", message: "batch B26-1105 has 11.5 mL left; this run needs 12 mL" }],
    ],
    [
      "a batch whose composition is unknown",
      run(),
      batches(batch(4, { composition: { volume_mL: 1000, parts: [] } }), acetonitrile(5)),
      [{ field: "channelBatches.A", message: "batch B26-1104: the batch has no liquid component to split the volume over" }],
    ],
  ])("refuses %s, naming the field", (_case, input, known, expected) => {
    const { plan, problems } = planRun(input, known);
    expect(plan).toBeNull();
    expect(problems).toEqual(expected);
  });
});

describe("batchUnavailable", () => {
  it.each([
    ["ready", null],
    ["in_use", null],
    ["empty", "batch B26-1104 is used up"],
    ["discarded", "batch B26-1104 is discarded"],
  ])("a %s batch: %s", (status, expected) => {
    expect(batchUnavailable({ code: "B26-1104", status })).toBe(expected);
  });
});
