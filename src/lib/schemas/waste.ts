import { z } from "zod";
import { day, id, instant } from "./fields";

/** `GET /api/waste/summary` and the waste page's period. Both ends inclusive, UTC days. */
export const wastePeriodQuery = z
  .object({
    /** First day of the period. */
    from: day(),
    /** Last day of the period (inclusive). */
    to: day(),
  })
  .strict()
  .refine((p) => p.from <= p.to, { path: ["to"], message: "must be on or after from" })
  .refine((p) => Date.parse(p.to) - Date.parse(p.from) <= 5 * 366 * 86_400_000, {
    path: ["to"],
    message: "a period may span at most five years",
  });
export type WastePeriodQuery = z.infer<typeof wastePeriodQuery>;

/** `GET /api/waste/report` (CSV or PDF of a period). */
export const wasteReportQuery = z
  .object({ from: day(), to: day(), format: z.enum(["csv", "pdf", "json"]).default("json") })
  .strict()
  .refine((p) => p.from <= p.to, { path: ["to"], message: "must be on or after from" });

const streamId = z.string().regex(/^[a-z0-9-]{2,40}$/, "use 2–40 lower-case letters, digits or dashes");

/** A waste stream as the safety officer edits it. */
export const streamSchema = z
  .object({
    /** Stable id (kebab-case); the reagent catalogue's stream names are ids. */
    id: streamId,
    name: z.string().trim().min(2, "give the stream a name").max(120),
    description: z.string().trim().max(2000).nullable().default(null),
    /** Higher is more restrictive. */
    restrictiveness: z.coerce.number({ invalid_type_error: "must be a number" }).int("must be a whole number").min(0).max(100),
    /** Null: the common-practice default. */
    minShare_percent: z.coerce
      .number({ invalid_type_error: "must be a number" })
      .min(0, "must be 0 % or more")
      .max(100, "must be 100 % or less")
      .nullable()
      .default(null),
    /** Null: the common-practice default. */
    alsoAccepts: z.array(streamId).max(20).nullable().default(null),
  })
  .strict();
export type StreamInput = z.infer<typeof streamSchema>;
export const streamUpdateSchema = streamSchema.omit({ id: true });
export type StreamUpdate = z.infer<typeof streamUpdateSchema>;

export const CONTAINER_STATUSES = ["in_use", "full", "awaiting_pickup", "collected"] as const;
export const LOCATION_KINDS = ["room", "satellite_area", "instrument"] as const;

/** A waste container, created or edited. */
export const containerSchema = z
  .object({
    /** Decant's own code, printed on the container label. */
    code: z
      .string()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z0-9][A-Z0-9-]{1,31}$/, "use 2–32 letters, digits or dashes, e.g. WC-0110"),
    streamId,
    capacity_mL: z.coerce
      .number({ invalid_type_error: "must be a number" })
      .int("must be whole millilitres")
      .min(100, "must be at least 100 mL")
      .max(1_000_000, "must be at most 1,000 L"),
    room: z.string().trim().min(1, "say which room").max(40),
    locationKind: z.enum(LOCATION_KINDS, { errorMap: () => ({ message: "choose room, satellite_area or instrument" }) }),
    locationNote: z.string().trim().max(120).nullable().default(null),
    /** The instrument that drains into this container (it then drains to no other). */
    instrumentId: id("choose an instrument, or none").nullable().default(null),
  })
  .strict();
export type ContainerInput = z.infer<typeof containerSchema>;

/** A manual level reading. */
export const readingSchema = z
  .object({
    level_mL: z.coerce.number({ invalid_type_error: "must be a number" }).min(0, "cannot be negative").max(1_000_000),
    /** When it was read; now when omitted. */
    readAt: instant("use an ISO date and time").optional(),
    note: z.string().trim().max(255).nullable().default(null),
  })
  .strict();
export type ReadingInput = z.infer<typeof readingSchema>;

/** A status change: full, back in use, or a fresh start after emptying. */
export const statusSchema = z
  .object({
    status: z.enum(["in_use", "full"], { errorMap: () => ({ message: "choose in_use or full (pickups set the other states)" }) }),
  })
  .strict();

/** Request a pickup for one or more containers. */
export const pickupRequestSchema = z
  .object({
    containerIds: z.array(id("must be a container id")).min(1, "choose at least one container").max(50),
    note: z.string().trim().max(255).nullable().default(null),
  })
  .strict();
export type PickupRequest = z.infer<typeof pickupRequestSchema>;

/** Record that a pickup was collected. */
export const collectionSchema = z
  .object({
    manifestRef: z.string().trim().min(2, "give the manifest or reference number").max(64),
    collectedAt: instant("use an ISO date and time").optional(),
    note: z.string().trim().max(255).nullable().default(null),
  })
  .strict();
export type CollectionInput = z.infer<typeof collectionSchema>;

/** The waste limits; example values, the institution's rules decide. */
export const wasteSettingsSchema = z
  .object({
    fullThreshold_percent: z.coerce
      .number({ invalid_type_error: "must be a number" })
      .int("must be a whole number")
      .min(10, "must be 10 % or more")
      .max(100, "must be 100 % or less"),
    accumulationLimit_days: z.coerce.number({ invalid_type_error: "must be a number" }).int("must be whole days").min(1).max(3650),
    accumulationWarning_days: z.coerce.number({ invalid_type_error: "must be a number" }).int("must be whole days").min(0).max(365),
    /** Room → litres of flammable liquids allowed. */
    roomLimits_L: z.record(z.string().trim().min(1).max(40), z.coerce.number().min(0, "must be 0 L or more").max(100_000)).default({}),
    /** Reagent id → stream id, where the site routes a reagent differently from the catalogue. */
    reagentStreams: z.record(z.string().min(1).max(64), streamId).default({}),
  })
  .strict()
  .refine((s) => s.accumulationWarning_days < s.accumulationLimit_days, {
    path: ["accumulationWarning_days"],
    message: "must be shorter than the accumulation limit",
  });
export type WasteSettingsInput = z.infer<typeof wasteSettingsSchema>;

export const streamIdParam = z.object({ id: streamId });

/** `GET /api/waste/containers`. */
export const containerListQuery = z
  .object({
    includeCollected: z
      .enum(["true", "false"])
      .default("false")
      .transform((v) => v === "true"),
  })
  .strict();

/** `POST /api/waste/route`: where would this mix go, and does the container take it? */
export const routeCheckSchema = z
  .object({
    /** The container the mix would go to. */
    containerId: id("choose the container"),
    /** The mix: liquids in mL, solids in g. */
    parts: z
      .array(
        z
          .object({
            reagentId: z.string().min(1).max(64),
            volume_mL: z.number().min(0).max(1_000_000, "at most 1,000 L").optional(),
            mass_g: z.number().min(0).max(1_000_000, "at most 1,000 kg").optional(),
          })
          .strict(),
      )
      .min(1, "give at least one part of the mix")
      .max(50),
  })
  .strict();

/** `GET /api/waste/containers/{id}/label.pdf`. */
export const labelQuery = z
  .object({
    copies: z.coerce
      .number({ invalid_type_error: "copies must be a number" })
      .int("copies must be a whole number")
      .min(1)
      .max(20)
      .default(1),
  })
  .strict();
