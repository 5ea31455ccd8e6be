// Moments and days are refused outside the years the database's DATETIME can hold and a lab
// would mean (1970–2199), with a message, instead of failing in the database.
import { describe, expect, it } from "vitest";
import { day, idParam, instant } from "../../../src/lib/schemas/fields";

describe("instant", () => {
  const schema = instant("Enter the time");
  it.each([
    ["2026-12-02T09:30", "2026-12-02T09:30:00.000Z"], // no zone: read as UTC
    ["2026-12-02T09:30+01:00", "2026-12-02T08:30:00.000Z"],
    ["1970-01-01T00:00Z", "1970-01-01T00:00:00.000Z"],
    ["2199-12-31T23:59:59.999Z", "2199-12-31T23:59:59.999Z"],
  ])("accepts %s", (text, iso) => {
    expect(schema.parse(text).toISOString()).toBe(iso);
  });
  it.each([
    ["1969-12-31T23:59:59Z", "must be in 1970 or later"],
    ["0001-01-01T00:00Z", "must be in 1970 or later"],
    ["2200-01-01T00:00Z", "must be in 2199 or earlier"],
    ["+275760-09-13T00:00Z", "must be in 2199 or earlier"],
    ["yesterday", "Enter the time as YYYY-MM-DDTHH:MM"],
  ])("refuses %s: %s", (text, message) => {
    const result = schema.safeParse(text);
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.message).toBe(message);
  });
});

describe("day", () => {
  const schema = day("from");
  it.each(["1970-01-01", "2026-02-28", "2028-02-29", "2199-12-31"])("accepts %s", (text) => {
    expect(schema.parse(text)).toBe(text);
  });
  it.each([
    ["2026-02-29", "is not a calendar day"],
    ["0000-01-01", "must be in 1970–2199"], // a calendar day to JavaScript, but not to the database
    ["1969-12-31", "must be in 1970–2199"],
    ["2200-01-01", "must be in 1970–2199"],
    ["26-1-1", "give a day as YYYY-MM-DD"],
  ])("refuses %s: %s", (text, message) => {
    const result = schema.safeParse(text);
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.message)).toContain(message);
  });
});

describe("idParam", () => {
  it.each([
    ["12", 12],
    ["1", 1],
  ])("accepts {id: %s}", (text, value) => {
    expect(idParam.parse({ id: text })).toEqual({ id: value });
  });
  it.each(["0", "-3", "1.5", "abc", ""])("refuses {id: %j}, naming the field", (text) => {
    const result = idParam.safeParse({ id: text });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]).toMatchObject({ path: ["id"], message: "must be a positive whole number" });
  });
});
