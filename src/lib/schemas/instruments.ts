import { z } from "zod";
import { CHANNELS, optionalId } from "./fields";

/** `POST /api/instruments`, `PUT /api/instruments/{id}`. */
export const instrumentSchema = z.object({
  name: z.string({ required_error: "Enter a name" }).trim().min(1, "Enter a name").max(80, "is too long"),
  /** e.g. "UHPLC, binary pump, diode-array detector". */
  kind: z.string({ required_error: "Describe the system" }).trim().min(1, "Describe the system").max(80, "is too long"),
  room: z.string({ required_error: "Enter the room" }).trim().min(1, "Enter the room").max(40, "is too long"),
  /** Pump channels the system has. */
  channels: z
    .array(z.enum(CHANNELS, { errorMap: () => ({ message: "channels are A, B, C or D" }) }))
    .min(1, "Choose at least one channel")
    .max(4, "channels are A, B, C or D")
    .refine((v) => new Set(v).size === v.length, "each channel once"),
  /** The waste container the system drains to now. */
  wasteContainerId: optionalId().nullable().default(null),
  active: z.boolean().default(true),
});
export type InstrumentInput = z.infer<typeof instrumentSchema>;
