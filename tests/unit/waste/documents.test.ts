// The container label and the period report: real PDFs (pdf-lib reads them back) and a CSV that
// a spreadsheet opens without surprises.
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { CONTAINER_LABEL_MM, renderContainerLabel } from "../../../src/lib/waste/container-label";
import { containerHazards } from "../../../src/lib/waste/hazards";
import { reportCsv, reportPdf, type ReportData } from "../../../src/lib/waste/report";
import { MM_TO_PT } from "../../../src/lib/labels/stocks";

const label = {
  code: "WC-0103",
  streamName: "Halogenated organic",
  capacity_mL: 10_000,
  room: "B2.16",
  where: "Under Heron",
  accumulationStartedOn: "2026-09-22",
  pictograms: ["GHS02", "GHS05", "GHS07"] as const,
  signalWord: "Danger" as const,
  contents: ["Acetonitrile", "Water", "Trifluoroacetic acid"],
  facility: "Veldmoor Separation Science Core",
};

describe("renderContainerLabel", () => {
  it("makes one 100 × 100 mm page per copy", async () => {
    const doc = await PDFDocument.load(await renderContainerLabel(label, 3));
    expect(doc.getPageCount()).toBe(3);
    const { width, height } = doc.getPage(0).getSize();
    expect(width).toBeCloseTo(CONTAINER_LABEL_MM.width * MM_TO_PT, 1);
    expect(height).toBeCloseTo(CONTAINER_LABEL_MM.height * MM_TO_PT, 1);
    expect(doc.getTitle()).toBe("Waste container label WC-0103");
  });

  it("refuses a code a Code 128 scanner could not type back", async () => {
    await expect(renderContainerLabel({ ...label, code: "WC–0103" })).rejects.toThrow(/printable ASCII/);
  });
});

describe("containerHazards", () => {
  it("shows the pictograms of what went in at 1 % or more", () => {
    const h = containerHazards("non-halogenated-organic", [
      { reagentId: "acetonitrile", volume_mL: 500 },
      { reagentId: "water", volume_mL: 500 },
      { reagentId: "formic-acid", volume_mL: 1 },
    ]);
    expect(h.pictograms).toEqual(["GHS02", "GHS07"]); // formic acid at 0.1 % is below the cut-off
    expect(h.signalWord).toBe("Danger");
  });
  it("falls back to the stream's catalogue reagents before anything went in", () => {
    const h = containerHazards("non-halogenated-organic", []);
    expect(h.pictograms).toContain("GHS02");
    expect(h.basis).toMatch(/catalogue/);
  });
});

const data: ReportData = {
  facility: "Test core",
  generatedAt: "2026-12-01T11:00:00+01:00",
  timeZone: "Europe/Berlin",
  period: { from: "2026-11-01", to: "2026-11-30" },
  total_mL: 1500.5,
  streams: [{ stream: "non-halogenated-organic", name: "Non-halogenated organic", volume_mL: 1500.5 }],
  byRoom: [{ room: 'B2.14, bench "3"', streams: { "non-halogenated-organic": 1500.5 }, volume_mL: 1500.5 }],
  byProject: [{ projectCode: "=HACK()", projectName: "x", volume_mL: 1500.5, streams: { "non-halogenated-organic": 1500.5 } }],
  byMonth: [{ month: "2026-11", streams: { "non-halogenated-organic": 1500.5 }, volume_mL: 1500.5 }],
  containers: [],
  flammables: [{ room: "B2.14", onHand_L: 12.5, limit_L: 50, state: "ok" }],
};

describe("the period report", () => {
  it("writes a CSV with quoting and no live formulas", () => {
    const lines = reportCsv(data).trim().split("\r\n");
    expect(lines[0]).toBe("section,key,stream,volume_mL");
    expect(lines).toContain('room,"B2.14, bench ""3""",non-halogenated-organic,1500.5');
    expect(lines).toContain("project,'=HACK(),non-halogenated-organic,1500.5");
    expect(lines.at(-1)).toBe("total,2026-11-01..2026-11-30,,1500.5");
  });
  it("writes a PDF that opens", async () => {
    const doc = await PDFDocument.load(await reportPdf(data));
    expect(doc.getPageCount()).toBeGreaterThanOrEqual(1);
    expect(doc.getTitle()).toBe("Waste report 2026-11-01 to 2026-11-30");
  });
});
