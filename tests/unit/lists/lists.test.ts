// The pure parts of the paged lists: the cursor survives its round trip and refuses what is not one,
// CSV is written as RFC 4180 says (checked by reading it back with the importer's RFC 4180 reader),
// the list links keep the view in the URL, and an audit line's changes are read field by field.
import { describe, expect, it } from "vitest";
import { auditChanges, describeChanges, entityPage, historyHref } from "../../../src/lib/audit/changes";
import { csvHref, isFiltered, sortHref, withParams } from "../../../src/components/lists/list-links";
import { decodeCursor, encodeCursor } from "../../../src/lib/lists/cursor";
import { csvLine } from "../../../src/lib/lists/csv";
import { parseCsv } from "../../../src/lib/imports/csv";

describe("cursor", () => {
  it.each([
    { sort: "started", dir: "desc" as const, value: new Date("2026-03-29T01:30:00.123Z"), id: 42 },
    { sort: "code", dir: "asc" as const, value: 'B-2026-0007 ü,"', id: 7 },
    { sort: "injections", dir: "asc" as const, value: 12.5, id: 9007199254740991 },
  ])("round-trips $sort $dir", (cursor) => {
    const text = encodeCursor(cursor);
    expect(text).toMatch(/^[A-Za-z0-9_-]+$/); // safe in a URL as it is
    expect(decodeCursor(text)).toEqual(cursor);
  });

  it.each(["", "not-a-cursor", btoa("[1,2]"), btoa('{"s":"x","d":"up","v":1,"i":1}'), btoa('{"s":"x","d":"asc","v":{"t":"soon"},"i":1}')])(
    "refuses %j",
    (text) => expect(decodeCursor(text)).toBeNull(),
  );
});

describe("csvLine (RFC 4180, section 2)", () => {
  it("quotes commas, quotes and line breaks, and reads back to the same fields", () => {
    const fields = ["plain", 'say "hi"', "a,b", "two\nlines", "", "12.5"];
    const text = csvLine(fields) + csvLine([1, null, undefined, 0.25]);
    expect(text.split("\r\n")[0]).toBe('plain,"say ""hi""","a,b","two\nlines",,12.5');
    expect(parseCsv(text).map((r) => r.fields)).toEqual([fields, ["1", "", "", "0.25"]]);
  });

  it("defuses a text a spreadsheet would run as a formula (common practice, from memory), but not a number", () => {
    expect(csvLine(["=SUM(A1)", "+1", "-x", "@a"])).toBe("'=SUM(A1),'+1,'-x,'@a\r\n");
    expect(csvLine([-3])).toBe("-3\r\n");
  });
});

describe("list links carry the view in the URL", () => {
  const current = new URLSearchParams("q=ab&status=ready&cursor=abc&sort=code&dir=asc");
  it("a heading sorts by its column and a second click turns the direction, from the first page", () => {
    expect(sortHref("/batches", current, "code", { sort: "code", dir: "asc" })).toBe("/batches?q=ab&status=ready&sort=code&dir=desc");
    expect(sortHref("/batches", current, "expires", { sort: "code", dir: "asc" })).toBe("/batches?q=ab&status=ready&sort=expires&dir=asc");
  });
  it("the export keeps search, filters and sort, and drops the page", () => {
    expect(csvHref("/api/batches", new URLSearchParams("q=ab&limit=5&cursor=x&sort=code"))).toBe("/api/batches?q=ab&sort=code&format=csv");
  });
  it("knows a filtered view from a sorted one", () => {
    expect(isFiltered(new URLSearchParams("sort=code&dir=asc&cursor=x"))).toBe(false);
    expect(isFiltered(new URLSearchParams("state=all&q="))).toBe(false);
    expect(isFiltered(new URLSearchParams("state=low"))).toBe(true);
    expect(withParams("/runs", new URLSearchParams(), {})).toBe("/runs");
  });
});

describe("audit lines", () => {
  it("lists only the fields that changed, in order, a created record's fields from nothing", () => {
    expect(auditChanges({ status: "ready", remaining: 900, code: "B-1" }, { status: "in_use", remaining: 850, code: "B-1" })).toEqual([
      { field: "status", before: "ready", after: "in_use" },
      { field: "remaining", before: "900", after: "850" },
    ]);
    expect(auditChanges(null, { name: "Water", spec: { ph: 3 } })).toEqual([
      { field: "name", before: null, after: "Water" },
      { field: "spec", before: null, after: '{"ph":3}' },
    ]);
    expect(auditChanges("a", "a")).toEqual([]);
    expect(describeChanges(auditChanges({ a: 1 }, {}))).toBe("a: 1 → –");
  });
  it("links a record's page and its history", () => {
    expect(entityPage("batch", "12")).toBe("/batches/12");
    expect(entityPage("batch", null)).toBeNull();
    expect(entityPage("invoice", "3")).toBeNull();
    expect(historyHref("waste_container", 5)).toBe("/audit?entity=waste_container&entityId=5");
  });
});
