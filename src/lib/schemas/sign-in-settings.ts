import { z } from "zod";
import { ROLES } from "../permissions";
import { wholeNumber } from "./fields";

/**
 * How sign-in, sessions and the expensive routes are limited: one settings record, every field
 * with its default. The defaults follow NIST SP 800-63B §5.2.2 (at most 100 consecutive failures
 * on one account; delays rather than lockout) and OWASP's device-cookie approach to lockout.
 */
export const throttleSettingsSchema = z.object({
  /** Failures from one address for one account before that pair must wait. */
  pairFailures: wholeNumber({ min: 1, max: 100 }).default(5),
  pairWindow_min: wholeNumber({ min: 1, max: 1440 }).default(15),
  /** Failures for one account (from browsers it has never signed in on) before each further attempt is delayed. */
  accountDelayAfter: wholeNumber({ min: 1, max: 100 }).default(10),
  /** The delay doubles from 1 s with each further failure, up to this. */
  accountMaxDelay_s: wholeNumber({ min: 1, max: 600 }).default(30),
  /** Failures for one account after which new browsers are refused; NIST allows no more than 100. */
  accountBlockFailures: wholeNumber({ min: 2, max: 100 }).default(100),
  accountWindow_min: wholeNumber({ min: 1, max: 1440 }).default(60),
  /** Failures from one address, over every account, before the address must wait: above what a campus's typos reach. */
  addressFailures: wholeNumber({ min: 10, max: 100_000 }).default(150),
  addressWindow_min: wholeNumber({ min: 1, max: 1440 }).default(15),
  /** Failures from a browser that has signed in to the account before, judged apart from everyone else. */
  deviceFailures: wholeNumber({ min: 1, max: 100 }).default(5),
  deviceWindow_min: wholeNumber({ min: 1, max: 1440 }).default(15),
});
export type ThrottleSettings = z.infer<typeof throttleSettingsSchema>;

export const sessionSettingsSchema = z.object({
  /** A session not used for this long ends (12 hours). */
  idle_min: wholeNumber({ min: 5, max: 7 * 1440 }).default(720),
  /** A session ends this long after sign-in, however much it is used (30 days). */
  absolute_days: wholeNumber({ min: 1, max: 365 }).default(30),
  /** Idle limit of a session started with "shared bench computer" ticked. */
  sharedBenchIdle_min: wholeNumber({ min: 1, max: 240 }).default(15),
  /** Roles that must sign in with a second factor; those without one are led to set it up. */
  twoFactorRoles: z.array(z.enum(ROLES, { errorMap: () => ({ message: `Choose among ${ROLES.join(", ")}` }) })).default([]),
});
export type SessionSettings = z.infer<typeof sessionSettingsSchema>;

const bucket = (perMinute: number) =>
  z
    .object({
      /** Requests a person may make at once. */
      burst: wholeNumber({ min: 1, max: 10_000 }).default(perMinute),
      /** Requests a minute after the burst is spent. */
      perMinute: wholeNumber({ min: 1, max: 10_000 }).default(perMinute),
    })
    .default({});

export const RATE_LIMITED = ["label-pdf", "statement-pdf", "import", "export"] as const;
export type RateLimited = (typeof RATE_LIMITED)[number];

export const rateLimitSettingsSchema = z.object({
  "label-pdf": bucket(30),
  "statement-pdf": bucket(20),
  import: bucket(20),
  export: bucket(30),
});
export type RateLimitSettings = z.infer<typeof rateLimitSettingsSchema>;

/** `PUT /api/settings/sign-in`, and what `GET` answers. */
export const signInSettingsSchema = z
  .object({
    throttle: throttleSettingsSchema.default({}),
    sessions: sessionSettingsSchema.default({}),
    rateLimits: rateLimitSettingsSchema.default({}),
  })
  .strict();
export type SignInSettings = z.infer<typeof signInSettingsSchema>;

export const DEFAULT_SIGN_IN_SETTINGS: SignInSettings = signInSettingsSchema.parse({});
