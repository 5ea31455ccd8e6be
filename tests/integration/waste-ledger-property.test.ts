// Property: for any ledger, the waste summary of a period equals, stream by stream, the sum of the
// entries that reach waste in that period — runs, discards and draws (the summary's definition in
// services/waste/totals.ts), and the corrections that reverse one of them, under the original's stream
// when the correction carries none. Preparation entries, and corrections reversing them, never count.
// Each generated ledger lives in a year of its own far ahead, in a database of this file's own, so
// the demo data and earlier runs (the ledger is append-only) cannot move the figures.
import fc from "fast-check";
import { QueryTypes, type Sequelize } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import type { LedgerKind, NewLedgerEntry } from "../../src/lib/ledger/types";
import { periodBounds } from "../../src/lib/ledger/period";
import { getFacilitySettings } from "../../src/lib/server/services/facility-settings";
import { appendEntries } from "../../src/lib/server/services/ledger";
import { wasteSummary } from "../../src/lib/server/services/waste/totals";
import { useServiceDatabase } from "../support/service-database";

const handle = useServiceDatabase();
let db: Sequelize;
let streams: string[] = [];
let timeZone = "UTC";
beforeAll(async () => {
  db = handle.sequelize;
  ({ timeZone } = await getFacilitySettings());
  streams = (await db.query<{ id: string }>("SELECT id FROM waste_streams ORDER BY id", { type: QueryTypes.SELECT })).map((r) => r.id);
});

const KINDS = ["run", "draw", "discard", "preparation"] as const;
const REAGENTS = ["acetonitrile", "water", "methanol", "formic-acid"];
const WASTE_KINDS = new Set<LedgerKind>(["run", "draw", "discard"]);
const DAY = 86_400_000;

interface Original {
  kind: (typeof KINDS)[number];
  day: number; // 0–364 within the run's year
  minute: number;
  volume_dL: number; // tenths of a mL, so sums are exact
  stream: number | null; // index into the site's streams, or none recorded
  container: number | null;
  project: number | null;
  reagent: number;
}
interface Correction {
  target: number; // which original (index, mod the count)
  laterDays: number; // dated on or after the original
  keepStream: boolean; // a correction carries its original's stream, or none
}

const original = fc.record({
  kind: fc.constantFrom(...KINDS),
  day: fc.integer({ min: 0, max: 364 }),
  minute: fc.integer({ min: 0, max: 24 * 60 - 1 }),
  volume_dL: fc.integer({ min: 0, max: 50_000 }),
  stream: fc.option(fc.integer({ min: 0, max: 9 }), { nil: null, freq: 5 }),
  container: fc.option(fc.integer({ min: 1, max: 6 }), { nil: null }),
  project: fc.option(fc.integer({ min: 1, max: 6 }), { nil: null }),
  reagent: fc.integer({ min: 0, max: REAGENTS.length - 1 }),
});
const correction = fc.record({ target: fc.nat(), laterDays: fc.integer({ min: 0, max: 120 }), keepStream: fc.boolean() });
const period = fc.tuple(fc.integer({ min: 0, max: 364 }), fc.integer({ min: 0, max: 120 }));

let run = 0;

describe("the waste summary over random ledgers", () => {
  it("equals the sum by stream of the entries that reach waste in each period", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(original, { minLength: 1, maxLength: 160 }),
        fc.array(correction, { maxLength: 40 }),
        fc.array(period, { minLength: 1, maxLength: 4 }),
        async (originals, corrections, periods) => {
          const year = 2200 + run++;
          const yearStart = Date.UTC(year, 0, 1);
          const tag = `prop:${year}`;
          const streamOf = (i: number | null) => (i === null ? null : streams[i % streams.length]!);
          const at = (day: number, minute: number) => new Date(yearStart + day * DAY + minute * 60_000);
          const entries: NewLedgerEntry[] = originals.map((o) => ({
            occurredAt: at(o.day, o.minute),
            projectId: o.project,
            kind: o.kind,
            batchId: null,
            reagentId: REAGENTS[o.reagent]!,
            volume_mL: o.volume_dL / 10,
            mass_g: null,
            channel: null,
            wasteStreamId: streamOf(o.stream),
            wasteContainerId: o.container,
            sourceKind: "manual",
            sourceId: tag,
            authorId: 3,
          }));
          await db.transaction((transaction) => appendEntries(entries, transaction));
          const ids = (
            await db.query<{ id: number }>("SELECT id FROM ledger_entries WHERE source_id = ? ORDER BY id", {
              type: QueryTypes.SELECT,
              replacements: [tag],
            })
          ).map((r) => r.id);
          expect(ids).toHaveLength(originals.length);

          // Corrections reverse distinct originals (reverses_id is unique), each once.
          const reversed = new Map<number, Correction>();
          for (const c of corrections) reversed.set(c.target % originals.length, reversed.get(c.target % originals.length) ?? c);
          const corrected = [...reversed].map(([index, c]) => {
            const o = originals[index]!;
            const day = Math.min(364, o.day + c.laterDays);
            return {
              index,
              c,
              entry: {
                occurredAt: at(day, day === o.day ? o.minute : 0),
                projectId: o.project,
                kind: "correction" as const,
                batchId: null,
                reagentId: REAGENTS[o.reagent]!,
                volume_mL: -o.volume_dL / 10,
                mass_g: null,
                channel: null,
                wasteStreamId: c.keepStream ? streamOf(o.stream) : null,
                wasteContainerId: o.container,
                sourceKind: "manual" as const,
                sourceId: `${tag}:correction`,
                authorId: 3,
                reversesId: ids[index]!,
                reason: "generated",
              },
            };
          });
          if (corrected.length)
            await db.transaction((transaction) =>
              appendEntries(
                corrected.map((x) => x.entry),
                transaction,
              ),
            );

          // The model: what reaches waste, with its stream and instant.
          const model: { at: number; stream: string; volume_dL: number }[] = [];
          originals.forEach((o, i) => {
            if (WASTE_KINDS.has(o.kind))
              model.push({ at: entries[i]!.occurredAt.getTime(), stream: streamOf(o.stream) ?? "unassigned", volume_dL: o.volume_dL });
          });
          for (const { index, entry } of corrected) {
            const o = originals[index]!;
            if (WASTE_KINDS.has(o.kind))
              model.push({
                at: entry.occurredAt.getTime(),
                stream: entry.wasteStreamId ?? streamOf(o.stream) ?? "unassigned",
                volume_dL: -o.volume_dL,
              });
          }

          for (const [fromDay, length] of [...periods, [0, 364] as [number, number]]) {
            const toDay = Math.min(364, fromDay + length);
            const from = new Date(yearStart + fromDay * DAY).toISOString().slice(0, 10);
            const to = new Date(yearStart + toDay * DAY).toISOString().slice(0, 10);
            // A period is the facility's local days (lib/ledger/period.ts), whatever zone the demo has.
            const [startAt, endAt] = periodBounds(from, to, timeZone);
            const start = startAt.getTime();
            const end = endAt.getTime();
            const expected = new Map<string, number>(streams.map((s) => [s, 0]));
            for (const m of model) if (m.at >= start && m.at < end) expected.set(m.stream, (expected.get(m.stream) ?? 0) + m.volume_dL);

            const summary = await wasteSummary({ from, to });
            const got = new Map(summary.streams.map((s) => [s.stream, s.volume_mL]));
            // Every site stream is listed; a stream with nothing in it shows 0, not a gap.
            for (const s of streams) expect(got.has(s)).toBe(true);
            for (const stream of new Set([...expected.keys(), ...got.keys()])) {
              expect({ stream, from, to, volume_mL: (got.get(stream) ?? 0) + 0 }).toEqual({
                stream,
                from,
                to,
                volume_mL: (expected.get(stream) ?? 0) / 10 + 0,
              });
            }
          }
        },
      ),
      { numRuns: 25, seed: Number(process.env.DECANT_PROPERTY_SEED) || undefined },
    );
  }, 240_000);
});
