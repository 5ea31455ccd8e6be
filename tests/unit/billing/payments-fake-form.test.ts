// The payments fake reads parameters as the SDK writes them (qs, bracketed keys, indexed arrays).
import { describe, expect, it } from "vitest";
import { decodeParams, mergeMetadata, reader } from "../../../fakes/payments/form";

describe("form decoding in the payments fake", () => {
  it.each([
    ["customer=cus_1&amount=1234", { customer: "cus_1", amount: "1234" }],
    ["metadata%5Bstatement_id%5D=12&metadata%5Bref%5D=ST-000012", { metadata: { statement_id: "12", ref: "ST-000012" } }],
    ["expand%5B0%5D=lines&expand%5B1%5D=customer", { expand: ["lines", "customer"] }],
    ["price_data%5Bunit_amount%5D=150&quantity=3", { price_data: { unit_amount: "150" }, quantity: "3" }],
    ["description=a%20b%2Bc%26d", { description: "a b+c&d" }],
  ])("%s", (text, expected) => {
    expect(decodeParams(text)).toEqual(expected);
  });

  it("names the parameter in its errors, as the real API does", () => {
    expect(() => reader({ amount: "12.5" }, ["amount"]).int("amount")).toThrow(
      expect.objectContaining({ param: "amount", code: "parameter_invalid_integer" }),
    );
    expect(() => reader({}, ["customer"]).str("customer", true)).toThrow(
      expect.objectContaining({ param: "customer", code: "parameter_missing" }),
    );
    expect(() => reader({ bogus: "1" }, ["customer"])).toThrow(expect.objectContaining({ param: "bogus", code: "parameter_unknown" }));
  });

  it("merges metadata: an empty value unsets a key, an empty object clears all", () => {
    expect(mergeMetadata({ a: "1", b: "2" }, { b: "", c: "3" })).toEqual({ a: "1", c: "3" });
    expect(mergeMetadata({ a: "1" }, {})).toEqual({});
    expect(mergeMetadata({ a: "1" }, undefined)).toEqual({ a: "1" });
  });
});
