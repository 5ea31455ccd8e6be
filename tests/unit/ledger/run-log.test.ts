import { describe, expect, it } from "vitest";
import { CsvError, parseCsv } from "../../../src/lib/imports/csv";
import { readRunLog, RUN_LOG_HEADER, runLogTemplate } from "../../../src/lib/imports/run-log";

const header = RUN_LOG_HEADER.join(",");
const good = "SEQ-1,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,24,2,5,B26-1103,B26-1104,,,tech@demo.test";

describe("parseCsv", () => {
  it.each([
    [
      "a,b\r\n1,2\r\n",
      [
        ["a", "b"],
        ["1", "2"],
      ],
    ],
    [
      'a,"b, with comma"\n"say ""hi""",2',
      [
        ["a", "b, with comma"],
        ['say "hi"', "2"],
      ],
    ],
    ['"two\nlines",x\n', [["two\nlines", "x"]]],
    [
      "\uFEFFa,b\n\n1,2",
      [
        ["a", "b"],
        ["1", "2"],
      ],
    ], // BOM and a blank line
    ["a,,\n", [["a", "", ""]]],
  ])("%j", (text, expected) => {
    expect(parseCsv(text).map((r) => r.fields)).toEqual(expected);
  });

  it("names the line of an unclosed quote", () => {
    expect(() => parseCsv('a,b\n1,"open\n2,3')).toThrow(CsvError);
    try {
      parseCsv('a,b\n1,"open\n2,3');
    } catch (e) {
      expect((e as CsvError).line).toBe(2);
    }
  });
});

describe("readRunLog: row validation before anything is written", () => {
  it("accepts the downloadable template", async () => {
    const result = await readRunLog(runLogTemplate());
    expect(result.issues).toEqual([]);
    expect(result.rows).toHaveLength(1);
    expect(result.rows[0]).toMatchObject({
      row: 2,
      reference: "SEQ-2611-014",
      instrument: "Wren",
      injections: 24,
      blanks: 2,
      purge_mL: 5,
      batches: { A: "B26-1103", B: "B26-1104" },
    });
    expect(result.rows[0]!.startedAt.toISOString()).toBe("2026-11-03T09:15:00.000Z");
  });

  it.each([
    // [the bad row, expected { row, column, message fragment }]
    ["SEQ-2,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,0,,,B26-1103,,,,", { row: 3, column: "injections", message: /at least 1/ }],
    [
      "SEQ-2,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,2.5,,,B26-1103,,,,",
      { row: 3, column: "injections", message: /whole number/ },
    ],
    ["SEQ-2,Wren,Scout gradient,PMG-ROOT-26,3 Nov 2026 at 9,10,,,B26-1103,,,,", { row: 3, column: "started_at", message: /YYYY-MM-DD/ }],
    ["SEQ-2,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,10,,-1,B26-1103,,,,", { row: 3, column: "purge_mL", message: /at least 0/ }],
    [",Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,10,,,B26-1103,,,,", { row: 3, column: "run_reference", message: /empty/ }],
    ["SEQ-2,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,10,,,,,,,", { row: 3, column: "batch_A", message: /at least one channel/ }],
    [
      "SEQ-1,Wren,Scout gradient,PMG-ROOT-26,2026-11-03T09:15,10,,,B26-1103,,,,",
      { row: 3, column: "run_reference", message: /same instrument and run reference as row 2/ },
    ],
    ["SEQ-2,Wren,Scout gradient", { row: 3, column: null, message: /has 3 fields, the header has 13/ }],
  ])("%s", async (bad, expected) => {
    const result = await readRunLog(`${header}\n${good}\n${bad}\n`);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]).toMatchObject({ row: expected.row, column: expected.column });
    expect(result.issues[0]!.message).toMatch(expected.message);
  });

  it("names every bad row among good ones", async () => {
    const lines = [header];
    for (let i = 0; i < 1000; i++)
      lines.push(good.replace("SEQ-1", `SEQ-${i}`).replace(",24,", [100, 500, 900].includes(i) ? ",x," : ",24,"));
    const result = await readRunLog(lines.join("\n"));
    expect(result.rowCount).toBe(1000);
    expect(result.issues.map((i) => i.row)).toEqual([102, 502, 902]);
    expect(new Set(result.issues.map((i) => i.column))).toEqual(new Set(["injections"]));
  });

  it.each([
    ["%PDF-1.7\n\u0000\u0001binary", /binary data/],
    ["just some words in a text file\nwith no commas", /does not look like a CSV file/],
    ["name;date;volume\nx;y;z", /does not look like a CSV file/],
    ["reference,when,volume\nx,y,z", /not a Decant run log.*Missing columns: run_reference, instrument/],
    ["", /empty/],
    [`${header}\n`, /no runs/],
  ])("a file that is not a run log gets one clear message (%#)", async (text, message) => {
    const result = await readRunLog(text);
    expect(result.rows).toEqual([]);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]!.message).toMatch(message);
  });

  it("reports progress up to the total", async () => {
    const lines = [header, ...Array.from({ length: 10 }, (_, i) => good.replace("SEQ-1", `S${i}`))];
    const seen: [number, number][] = [];
    await readRunLog(lines.join("\n"), { chunk: 4, onProgress: (d, t) => void seen.push([d, t]) });
    expect(seen).toEqual([
      [4, 10],
      [8, 10],
      [10, 10],
    ]);
  });
});
