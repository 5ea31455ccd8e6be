import { z } from "zod";
import { amount, CHANNELS, id, idempotencyKey, instant, localInstant, optionalId, wholeNumber } from "./fields";

/** The batch on each pump channel; unused channels are left out (or blank). */
const channelBatches = z
  .object(Object.fromEntries(CHANNELS.map((c) => [c, optionalId()])) as Record<(typeof CHANNELS)[number], ReturnType<typeof optionalId>>)
  .strict()
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: "Choose the batch on at least one channel" });

/** `POST /api/runs` and the run form: one sequence on an instrument for a project. */
export const runSchema = z.object({
  instrumentId: id("Choose an instrument"),
  methodId: id("Choose a method"),
  projectId: id("Choose a project"),
  /** Sample injections; each runs the whole method program once. */
  injections: wholeNumber({ min: 1, max: 10_000 }),
  /** Extra blank injections, each also a full program. */
  blanks: wholeNumber({ min: 0, max: 10_000 }).default(0),
  /** Purge or prime volume pumped through each channel in use, mL. */
  purge_mL: amount({ min: 0, max: 5_000 }).default(0),
  channelBatches,
  startedAt: instant("Enter the start time"),
  /** Defaults to the signed-in user. */
  operatorId: optionalId(),
  /** The sequence name on the instrument; unique per instrument. */
  reference: z.preprocess((v) => (v === "" ? undefined : v), z.string().trim().max(64, "is too long").optional()),
  idempotencyKey,
});
export type RunInput = z.infer<typeof runSchema>;

/** The run form: the same, with the start time typed as a wall-clock time in the facility's zone. */
export const runFormSchema = (timeZone: string) => runSchema.extend({ startedAt: localInstant("Enter the start time", timeZone) });

export const DRAW_PURPOSES = ["wash", "spill", "transfer", "other"] as const;

/** `POST /api/draws`: a manual withdrawal from a batch. */
export const drawSchema = z
  .object({
    batchId: id("Choose a batch"),
    /** The project charged; none for facility overhead (a spill, a system wash). */
    projectId: optionalId(),
    volume_mL: amount({ min: 0.001, max: 100_000 }),
    purpose: z.enum(DRAW_PURPOSES, { errorMap: () => ({ message: `Choose one of ${DRAW_PURPOSES.join(", ")}` }) }),
    note: z.string().trim().max(200, "is too long").default(""),
    /** Where the liquid went; none when it did not go to a container (a spill absorbed). */
    wasteContainerId: optionalId(),
    occurredAt: instant("Enter the time").optional(),
    idempotencyKey,
  })
  .refine((v) => v.purpose !== "other" || v.note.length >= 3, { path: ["note"], message: "Say what the draw was for" });
export type DrawInput = z.infer<typeof drawSchema>;

/** `GET /api/runs` query. */
export const runListQuery = z.object({ limit: z.coerce.number().int().min(1).max(500).default(50) }).strict();
