import { z } from "zod";
import { canonicalTimeZone, isLocale } from "../format";

/** The facility's settings as `GET /api/settings/facility` answers them. */
export interface FacilitySettings {
  /** IANA zone: every time shown, typed and summed by day is in it. */
  timeZone: string;
  /** BCP 47 locale of dates and numbers. */
  locale: string;
  /** ISO 4217 code of new clients' and rates' currency. */
  currency: string;
}

/** Until an administrator chooses, Decant keeps UTC (what it stored and showed before the setting). */
export const DEFAULT_FACILITY: FacilitySettings = { timeZone: "UTC", locale: "en-GB", currency: "EUR" };

const timeZone = z
  .string({ invalid_type_error: "Enter an IANA time zone such as Europe/Berlin" })
  .trim()
  .transform((v, ctx) => {
    const zone = canonicalTimeZone(v);
    if (!zone) ctx.addIssue({ code: z.ZodIssueCode.custom, message: `${v} is not an IANA time zone (e.g. Europe/Berlin)` });
    return zone ?? v;
  });

const locale = z
  .string({ invalid_type_error: "Enter a locale such as de-DE" })
  .trim()
  .refine(isLocale, (v) => ({ message: `${v} is not a locale this server can format in (e.g. de-DE, en-GB)` }))
  .transform((v) => Intl.getCanonicalLocales(v)[0]!);

const currency = z
  .string({ invalid_type_error: "Enter a three-letter currency code such as EUR" })
  .trim()
  .toUpperCase()
  .refine((v) => /^[A-Z]{3}$/.test(v) && (Intl.supportedValuesOf("currency") as string[]).includes(v), {
    message: "is not an ISO 4217 currency code (e.g. EUR, CHF)",
  });

/** `PUT /api/settings/facility`: any of the three. */
export const facilitySettingsPatch = z
  .object({ timeZone: timeZone.optional(), locale: locale.optional(), currency: currency.optional() })
  .strict();
export type FacilitySettingsPatch = z.infer<typeof facilitySettingsPatch>;
