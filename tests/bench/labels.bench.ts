/**
 * Label PDFs, rendered by the label module itself (the endpoint adds one batch lookup): 100
 * labels on an A4 sheet, 100 roll labels, and a single roll label once warm. The baseline is the
 * floor of any label PDF: an empty page with the two fonts embedded, saved.
 * `npm run bench -- labels` or `npx tsx tests/bench/labels.bench.ts`.
 */
import { PDFDocument } from "pdf-lib";
import { hazardSummary } from "../../src/lib/labels/hazards";
import { embedLabelFonts, renderLabels } from "../../src/lib/labels/label-pdf";
import type { LabelContent } from "../../src/lib/labels/layout";
import { DEFAULT_LABEL_STOCKS } from "../../src/lib/labels/stocks";
import { emit, fmt, main, row, stats, timeIt } from "./lib";

const REPS = 7;
// A demanding invented label: four pictograms, hazard statements, a deviation line.
const hazards = hazardSummary([
  { reagent: "methanol", share_percent: 40 },
  { reagent: "phosphoric-acid", share_percent: 1.2 },
  { reagent: "water", share_percent: 58.8 },
]);
const CONTENT: LabelContent = {
  code: "B26-1203-12",
  name: "25 mM potassium phosphate pH 2.5 / methanol 60:40",
  composition:
    "Water 60 % + methanol 40 % · 25 mM potassium dihydrogen phosphate with phosphoric acid 85 %, pH 2.50 at 25 °C (aqueous part)",
  prepared: "2026-12-03 08:30 UTC",
  expires: "2026-12-10 08:30 UTC",
  preparer: "Rowan Ellery",
  bottles: 4,
  storage: "2–8 °C, capped",
  pictograms: hazards.pictograms,
  signalWord: hazards.signalWord,
  hazardStatements: hazards.statements,
  deviation: "pH 2.58 is +0.08 from the target 2.50. Reason: meter recalibrated",
  channel: "A",
};
const stock = (id: string) => {
  const s = DEFAULT_LABEL_STOCKS.find((x) => x.id === id);
  if (!s) throw new Error(`no label stock ${id}`);
  return s;
};

main(async () => {
  const a4 = stock("a4-2x6");
  const roll = stock("roll-100x50");
  const floor = stats(
    await timeIt(
      async () => {
        const doc = await PDFDocument.create();
        await embedLabelFonts(doc);
        doc.addPage();
        await doc.save();
      },
      REPS,
      2,
    ),
  );
  const sheet = stats(await timeIt(() => renderLabels({ content: CONTENT, stock: a4, copies: 100 }), REPS, 1));
  const rolls = stats(await timeIt(() => renderLabels({ content: CONTENT, stock: roll, copies: 100 }), REPS, 1));
  // Warm, but each call another batch (its own code and times), as consecutive print jobs are.
  let n = 0;
  const single = stats(
    await timeIt(
      () => {
        n++;
        const code = `B26-1203-${String(100 + n)}`;
        return renderLabels({
          content: {
            ...CONTENT,
            code,
            prepared: `2026-12-03 08:${String(n % 60).padStart(2, "0")} UTC`,
            expires: `2026-12-10 08:${String(n % 60).padStart(2, "0")} UTC`,
          },
          stock: roll,
          copies: 1,
        });
      },
      15,
      3,
    ),
  );
  console.log(
    `labels: floor ${fmt(floor.median, 1)} ms; 100 on A4 ${fmt(sheet.median, 1)} ms; 100 roll ${fmt(rolls.median, 1)} ms; single ${fmt(single.median, 1)} ms`,
  );
  const base = "empty PDF with fonts (ms)";
  emit([
    row({
      group: "labels",
      figure: "100 labels, A4 sheet (9 pages)",
      unit: "ms",
      stats: sheet,
      target: { op: "<", value: 1000 },
      baseline: base,
      ratio: sheet.median / floor.median,
    }),
    row({
      group: "labels",
      figure: "100 roll labels",
      unit: "ms",
      stats: rolls,
      target: { op: "<", value: 1000 },
      baseline: base,
      ratio: rolls.median / floor.median,
    }),
    row({
      group: "labels",
      figure: "single label, warm",
      unit: "ms",
      stats: single,
      target: { op: "<", value: 50 },
      baseline: base,
      ratio: single.median / floor.median,
    }),
  ]);
});
