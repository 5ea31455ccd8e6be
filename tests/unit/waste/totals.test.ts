// The period totals: every site stream is listed, the sums keep the ledger's precision (4 decimals
// of a mL) without floating-point noise, and every month of the period has a row.
import { describe, expect, it } from "vitest";
import { onHandFrom, summaryFrom, wasteReportFrom } from "../../../src/lib/waste/totals";

describe("summaryFrom", () => {
  it("lists every site stream, 0 where nothing went, largest first and then by id", () => {
    const summary = summaryFrom(
      ["halogenated-organic", "non-halogenated-organic", "aqueous"],
      [
        { stream: "non-halogenated-organic", volume_mL: 1200 },
        { stream: "unassigned", volume_mL: 5 },
      ],
    );
    expect(summary.streams).toEqual([
      { stream: "non-halogenated-organic", volume_mL: 1200 },
      { stream: "unassigned", volume_mL: 5 },
      { stream: "aqueous", volume_mL: 0 },
      { stream: "halogenated-organic", volume_mL: 0 },
    ]);
  });

  it("rounds to the ledger's 4 decimals", () => {
    expect(summaryFrom(["aqueous"], [{ stream: "aqueous", volume_mL: 0.1 + 0.2 }]).streams).toEqual([
      { stream: "aqueous", volume_mL: 0.3 },
    ]);
  });
});

describe("wasteReportFrom", () => {
  const summary = summaryFrom(
    ["aqueous", "non-halogenated-organic"],
    [
      { stream: "non-halogenated-organic", volume_mL: 900.5 },
      { stream: "aqueous", volume_mL: 100 },
      { stream: "unassigned", volume_mL: 2 },
    ],
  );
  const report = wasteReportFrom({
    period: { from: "2026-10-01", to: "2026-12-31" },
    summary,
    streamNames: new Map([
      ["aqueous", "Aqueous"],
      ["non-halogenated-organic", "Non-halogenated organic"],
    ]),
    byRoom: [
      { room: "B2.16", stream: "non-halogenated-organic", volume_mL: 900.5 },
      { room: "B2.14", stream: "aqueous", volume_mL: 100 },
      { room: "B2.14", stream: "unassigned", volume_mL: 2 },
    ],
    byProject: [
      { code: "PRJ-7", name: "Peptide maps", stream: "non-halogenated-organic", volume_mL: 900.5 },
      { code: null, name: null, stream: "aqueous", volume_mL: 102 },
    ],
    byMonth: [{ month: "2026-11", stream: "non-halogenated-organic", volume_mL: 1002.5 }],
  });

  it("names the streams, and says so where an entry names none", () => {
    expect(report.streams.map((s) => s.name)).toEqual(["Non-halogenated organic", "Aqueous", "No stream recorded"]);
  });

  it("sums each room over its streams, rooms in order", () => {
    expect(report.byRoom).toEqual([
      { room: "B2.14", streams: { aqueous: 100, unassigned: 2 }, volume_mL: 102 },
      { room: "B2.16", streams: { "non-halogenated-organic": 900.5 }, volume_mL: 900.5 },
    ]);
  });

  it("puts entries without a project under one row, largest project first", () => {
    expect(report.byProject.map((p) => [p.projectCode, p.projectName, p.volume_mL])).toEqual([
      ["PRJ-7", "Peptide maps", 900.5],
      ["—", "No project", 102],
    ]);
  });

  it("has a row for every month of the period, empty ones included", () => {
    expect(report.byMonth.map((m) => [m.month, m.volume_mL])).toEqual([
      ["2026-10", 0],
      ["2026-11", 1002.5],
      ["2026-12", 0],
    ]);
    expect(report.total_mL).toBe(1002.5);
  });
});

describe("onHandFrom", () => {
  it("adds the live containers by stream and by room", () => {
    const onHand = onHandFrom([
      { streamId: "aqueous", room: "B2.14", estimated_mL: 1500 },
      { streamId: "non-halogenated-organic", room: "B2.14", estimated_mL: 8000.5 },
      { streamId: "non-halogenated-organic", room: "B2.16", estimated_mL: 500 },
    ]);
    expect(onHand).toEqual({
      byStream: { aqueous: 1500, "non-halogenated-organic": 8500.5 },
      byRoom: { "B2.14": 9500.5, "B2.16": 500 },
      total_mL: 10_000.5,
    });
  });
});
