// Uploads gone wrong, against a private instance of the built app (its pid known, so its memory is
// read from /proc): certificates of analysis (POST /api/stock-lots) and run-log CSV imports
// (POST /api/imports). Each bad file gets a clear message naming the field; nothing is half-written
// (no lot, no run, no ledger entry, no import record, no stray file); the server's memory stays bounded.
import { readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { QueryTypes } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { RUN_LOG_HEADER, RUN_LOG_MAX_ROWS } from "../../src/lib/imports/run-log";
import { databaseFingerprint, useAppInstance } from "../support/app-instance";
import { demoBatchCodes } from "../support/demo-batches";
import type { Client } from "../support/http";

const app = useAppInstance();
const unique = Math.random().toString(36).slice(2, 8);
let tech: Client;
const MiB = 1024 * 1024;

const countFiles = (dir: string): number =>
  readdirSync(dir).reduce((n, name) => n + (statSync(join(dir, name)).isDirectory() ? countFiles(join(dir, name)) : 1), 0);
const one = async <T extends object>(sql: string, replacements: unknown[] = []) =>
  (await app.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements }))[0]!;
const lotCount = async (lotNumber: string) =>
  Number((await one<{ n: number }>("SELECT COUNT(*) AS n FROM stock_lots WHERE lot_number = ?", [lotNumber])).n);
const figures: string[] = [];

let codes: Record<number, string> = {};
beforeAll(async () => {
  tech = await app.client("tech@demo.test");
  codes = await demoBatchCodes(app.sequelize);
});

function lotForm(lotNumber: string, file?: { bytes: Uint8Array<ArrayBuffer>; name: string; type: string }) {
  const form = new FormData();
  for (const [k, v] of Object.entries({
    reagent: "water",
    lotNumber,
    supplier: "Veldmoor stores",
    grade: "HPLC",
    receivedOn: "2026-11-01",
    expiresOn: "2027-11-01",
    quantity: "1000",
  }))
    form.append(k, v);
  if (file) form.append("certificate", new Blob([file.bytes], { type: file.type }), file.name);
  return form;
}

const PDF = new TextEncoder().encode("%PDF-1.7\n1 0 obj << >> endobj\ntrailer << >>\n%%EOF\n");

describe("certificate of analysis uploads", () => {
  it.each([
    [
      "a text file named coa.pdf",
      { bytes: new TextEncoder().encode("Certificate of analysis\nLot 42\n"), name: "coa.pdf", type: "application/pdf" },
      400,
      /^certificate: only a PDF or an image .*whatever its name says/,
    ],
    [
      "an HTML page named coa.png",
      { bytes: new TextEncoder().encode("<html><script>alert(1)</script></html>"), name: "coa.png", type: "image/png" },
      400,
      /^certificate: only a PDF or an image/,
    ],
    [
      "an SVG (which could carry script) named coa.jpg",
      {
        bytes: new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>'),
        name: "coa.jpg",
        type: "image/jpeg",
      },
      400,
      /^certificate: only a PDF or an image/,
    ],
    ["a zero-byte file", { bytes: new Uint8Array(0), name: "coa.pdf", type: "application/pdf" }, 400, /^certificate: the file is empty/],
    [
      "a PDF 1 kB over the 10 MB limit",
      {
        bytes: (() => {
          const b = new Uint8Array(10 * MiB + 1024);
          b.set(PDF);
          return b;
        })(),
        name: "big.pdf",
        type: "application/pdf",
      },
      400,
      /^certificate: the file is 10\.0 MB; the limit is 10 MB/,
    ],
    [
      "a 30 MB PDF, refused by its size before it is read",
      {
        bytes: (() => {
          const b = new Uint8Array(30 * MiB);
          b.set(PDF);
          return b;
        })(),
        name: "huge.pdf",
        type: "application/pdf",
      },
      413,
      /^certificate: the upload is over the 10 MB limit/,
    ],
  ] as const)("refuses %s with a clear message, and writes nothing", async (_name, file, status, message) => {
    const lotNumber = `UP-${unique}-${Math.random().toString(36).slice(2, 6)}`;
    const filesBefore = countFiles(app.uploadDir);
    const response = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: lotForm(lotNumber, { ...file, bytes: new Uint8Array(file.bytes) }),
    });
    expect(response.status).toBe(status);
    expect(((await response.json()) as { error: string }).error).toMatch(message);
    expect(await lotCount(lotNumber)).toBe(0);
    expect(countFiles(app.uploadDir)).toBe(filesBefore);
    figures.push(_name);
  });

  it("refuses a chunked upload with no Content-Length as soon as it passes the limit, with the server's memory bounded", async () => {
    const rssBefore = app.rss_MiB();
    const boundary = "----decantfuzz";
    const head = new TextEncoder().encode(
      `--${boundary}\r\nContent-Disposition: form-data; name="certificate"; filename="endless.pdf"\r\nContent-Type: application/pdf\r\n\r\n%PDF-1.7\n`,
    );
    let sent = 0;
    const chunk = new Uint8Array(MiB).fill(0x41);
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent === 0) controller.enqueue(head);
        // 200 MB if the server read it all; it must stop long before.
        if (sent >= 200) return controller.close();
        sent++;
        controller.enqueue(chunk);
      },
    });
    const response = await tech.fetch("/api/stock-lots", {
      method: "POST",
      headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
      body,
      duplex: "half",
    } as RequestInit);
    expect(response.status).toBe(413);
    expect(((await response.json()) as { error: string }).error).toMatch(/^certificate: the upload is over the 10 MB limit/);
    const grown = app.rss_MiB() - rssBefore;
    expect(grown, `the server grew by ${grown.toFixed(0)} MiB`).toBeLessThan(120);
    figures.push(`chunked 200 MB upload refused after ≤ ${sent} MB sent, server grew ${grown.toFixed(0)} MiB`);
  });

  it("a lot refused after its certificate was stored (a duplicate lot number) leaves no stray file", async () => {
    const lotNumber = `UP-${unique}-DUP`;
    const first = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: lotForm(lotNumber, { bytes: PDF, name: "coa.pdf", type: "application/pdf" }),
    });
    expect(first.status).toBe(201);
    const filesBefore = countFiles(app.uploadDir);
    const again = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: lotForm(lotNumber, { bytes: PDF, name: "coa.pdf", type: "application/pdf" }),
    });
    expect(again.status).toBe(409);
    expect(((await again.json()) as { error: string }).error).toMatch(/^lotNumber: /);
    expect(await lotCount(lotNumber)).toBe(1);
    expect(countFiles(app.uploadDir)).toBe(filesBefore);
  });
});

const row = (i: number, project = "PMG-ROOT-26") =>
  `SEQ-${unique}-${i},Wren,"Scout gradient 5–95 % B, 12 min",${project},${new Date(Date.now() - 60_000).toISOString().slice(0, 16)},1,0,0,${codes[4]},${codes[5]},,,`;
const header = RUN_LOG_HEADER.join(",");
const utf8 = (text: string) => new TextEncoder().encode(text);

async function importFile(bytes: Uint8Array<ArrayBuffer>, mode: "check" | "commit", type = "text/csv") {
  const response = await tech.fetch(`/api/imports?mode=${mode}&fileName=runs-${unique}.csv`, {
    method: "POST",
    headers: { "content-type": type },
    body: bytes,
  });
  return {
    status: response.status,
    body: (await response.json()) as {
      error?: string;
      issues?: { row: number; column: string | null; message: string }[];
      rowCount?: number;
    },
  };
}

describe("run-log CSV imports", () => {
  const latin1 = Uint8Array.from([
    ...utf8(`${header}\r\n`),
    ...utf8(row(1).replace(",,,", ",,,ren")),
    0xe9,
    0x40,
    ...utf8("demo.test\r\n"),
  ]);
  const utf16 = (() => {
    const text = `${header}\r\n${row(1)}\r\n`;
    const out = new Uint8Array(2 + text.length * 2);
    out.set([0xff, 0xfe]);
    for (let i = 0; i < text.length; i++) {
      const c = text.charCodeAt(i);
      out[2 + i * 2] = c & 0xff;
      out[3 + i * 2] = c >> 8;
    }
    return out;
  })();
  const png = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
  const workbook = Uint8Array.from([0x50, 0x4b, 0x03, 0x04, 20, 0, 6, 0, 8, 0, ...utf8("[Content_Types].xml")]);

  it.each([
    ["a zero-byte file", new Uint8Array(0), /^file: the file is empty/],
    ["a UTF-16 export", utf16, /^file: this file is UTF-16 text; save it as CSV UTF-8/],
    ["a Latin-1 file", latin1, /^file: this file is not UTF-8 text \(perhaps Latin-1/],
    ["a PNG named runs.csv", png, /^file: this is a PNG file, not a CSV run log/],
    ["a spreadsheet workbook named runs.csv", workbook, /^file: this is a spreadsheet workbook/],
    [
      "a file 1 byte over 16 MB",
      (() => {
        const b = new Uint8Array(16 * MiB + 1);
        b.fill(0x61);
        return b;
      })(),
      /^file: larger than 16 MB/,
    ],
  ] as const)("refuses %s with a clear message (check and commit), and writes nothing", async (_name, bytes, message) => {
    const before = await databaseFingerprint(app.sequelize);
    for (const mode of ["check", "commit"] as const) {
      const { status, body } = await importFile(new Uint8Array(bytes), mode);
      expect(status, JSON.stringify(body).slice(0, 300)).toBe(bytes.byteLength > 16 * MiB ? 413 : 400);
      expect(body.error).toMatch(message);
    }
    expect(await databaseFingerprint(app.sequelize)).toEqual(before);
    figures.push(_name);
  });

  it.each([
    ["semicolons", ";"],
    ["tabs", "\t"],
  ])("a file separated by %s: check says it is not comma-separated; commit writes nothing", async (_name, separator) => {
    const text = `${RUN_LOG_HEADER.join(separator)}\r\n${["SEQ-1", "Wren", "Scout", "PMG-ROOT-26", "2026-11-03T09:15", "1", "0", "0", "B26-1103", "B26-1104", "", "", ""].join(separator)}\r\n`;
    const check = await importFile(utf8(text), "check");
    expect(check.status).toBe(200);
    expect(check.body.issues?.[0]?.message).toMatch(/does not look like a CSV file with comma-separated columns/);
    const before = await databaseFingerprint(app.sequelize);
    const commit = await importFile(utf8(text), "commit");
    expect(commit.status).toBe(400);
    expect(commit.body.error).toMatch(/nothing was written/);
    expect(await databaseFingerprint(app.sequelize)).toEqual(before);
    figures.push(`${_name}-separated file`);
  });

  it(`a ${RUN_LOG_MAX_ROWS.toLocaleString("en")}-row file is read within bounded memory; one problem row means nothing is written`, async () => {
    // Every row is well-formed; the batches run dry after a few hundred runs and the last row names a
    // project that does not exist, so the commit must refuse the whole file and write nothing at all.
    const lines = [header];
    for (let i = 1; i < RUN_LOG_MAX_ROWS; i++) lines.push(row(i));
    lines.push(row(RUN_LOG_MAX_ROWS, "NO-SUCH-PROJECT"));
    const file = utf8(lines.join("\r\n") + "\r\n");
    const before = await databaseFingerprint(app.sequelize);
    const rssBefore = app.rss_MiB();
    const started = Date.now();
    const commit = await importFile(file, "commit");
    const seconds = (Date.now() - started) / 1000;
    const grown = app.rss_MiB() - rssBefore;
    expect(commit.status, JSON.stringify(commit.body).slice(0, 300)).toBe(400);
    expect(commit.body.error).toMatch(/problem.*nothing was written/);
    expect(commit.body.issues?.length).toBeGreaterThan(0);
    expect((commit.body as { report?: { rowCount: number } }).report?.rowCount).toBe(RUN_LOG_MAX_ROWS);
    expect(await databaseFingerprint(app.sequelize)).toEqual(before);
    // The largest file accepted is read whole and every row planned before the transaction; this
    // bound guards against regressions (the figure is printed below), it is not a target.
    expect(grown, `the server grew by ${grown.toFixed(0)} MiB`).toBeLessThan(1024);
    console.log(
      `uploads: ${RUN_LOG_MAX_ROWS.toLocaleString("en")}-row run log (${(file.byteLength / MiB).toFixed(1)} MB) committed with one bad row in ${seconds.toFixed(1)} s: 400, rows written 0, server RSS +${grown.toFixed(0)} MiB`,
    );
  }, 240_000);

  it(`a file of ${(RUN_LOG_MAX_ROWS + 1).toLocaleString("en")} rows is refused with the limit in the message`, async () => {
    const lines = [header];
    for (let i = 1; i <= RUN_LOG_MAX_ROWS + 1; i++) lines.push(`S${i},W,M,P,2026-11-03T09:15,1,,,B,,,,`);
    const check = await importFile(utf8(lines.join("\n")), "check");
    expect(check.status).toBe(200);
    expect(check.body.issues?.[0]?.message).toMatch(new RegExp(`import at most ${RUN_LOG_MAX_ROWS} at a time`));
    const before = await databaseFingerprint(app.sequelize);
    const commit = await importFile(utf8(lines.join("\n")), "commit");
    expect(commit.status).toBe(400);
    expect(await databaseFingerprint(app.sequelize)).toEqual(before);
    console.log(`uploads: bad files refused with a message each: ${figures.join("; ")}`);
  }, 120_000);
});
