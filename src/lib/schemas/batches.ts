import { z } from "zod";
import { day, id } from "./fields";
import { anyOr, listQuery } from "./lists";

/** `GET /api/batches` and `/batches`: a page, a search (code, mobile phase), a sort, and the filters of the batch list. */
export const batchListQuery = listQuery
  .extend({
    /** Only batches in this state. */
    status: anyOr(z.enum(["ready", "in_use", "empty", "discarded"])),
    recipe: anyOr(id()),
    /** Prepared on or after this day. */
    from: anyOr(day()),
    to: anyOr(day()),
  })
  .strict();
export type BatchListQuery = z.infer<typeof batchListQuery>;
