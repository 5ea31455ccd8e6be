import { describe, expect, it } from "vitest";
import { endSessionsSchema, secondFactorSchema, sessionHandleParams } from "../../../src/lib/schemas/account-security";
import { DEFAULT_SIGN_IN_SETTINGS, signInSettingsSchema } from "../../../src/lib/schemas/sign-in-settings";

describe("codes as people type them", () => {
  it.each([
    ["123456", "123456"],
    [" 123 456 ", "123456"],
    ["abcd-efgh-ijkl-mnop", "ABCDEFGHIJKLMNOP"],
    ["ABCD EFGH IJKL MNOP", "ABCDEFGHIJKLMNOP"],
  ])("%j is read as %s", (typed, code) => expect(secondFactorSchema.parse({ code: typed }).code).toBe(code));

  it.each(["12345", "1234567", "abcd-efgh-ijkl-mno1", "", "ABCDEFGHIJKLMNO"])("%j is refused", (typed) =>
    expect(secondFactorSchema.safeParse({ code: typed }).success).toBe(false),
  );
});

describe("the other inputs", () => {
  it("a session handle is 16 hexadecimal digits, and signing out everywhere says what to keep", () => {
    expect(sessionHandleParams.safeParse({ handle: "0123456789abcdef" }).success).toBe(true);
    expect(sessionHandleParams.safeParse({ handle: "0123456789abcdeg" }).success).toBe(false);
    expect(endSessionsSchema.safeParse({}).success).toBe(false);
    expect(endSessionsSchema.parse({ keep: "this" })).toEqual({ keep: "this" });
  });

  it("settings fill in every default; an account block above NIST's 100 is refused", () => {
    expect(signInSettingsSchema.parse({})).toEqual(DEFAULT_SIGN_IN_SETTINGS);
    expect(DEFAULT_SIGN_IN_SETTINGS.sessions).toEqual({ idle_min: 720, absolute_days: 30, sharedBenchIdle_min: 15, twoFactorRoles: [] });
    expect(signInSettingsSchema.safeParse({ throttle: { accountBlockFailures: 101 } }).success).toBe(false);
    expect(signInSettingsSchema.safeParse({ other: 1 }).success).toBe(false);
  });
});
