import { z } from "zod";

/** `GET /api/batches` query. */
export const batchListQuery = z
  .object({
    /** Only batches in this state. */
    status: z.enum(["ready", "in_use", "empty", "discarded"]).optional(),
    /** At most this many, newest first. */
    limit: z.coerce.number().int().min(1).max(1000).default(200),
  })
  .strict();
