import { z } from "zod";
import { day, id } from "./fields";
import { anyOr, listQuery } from "./lists";

/** `GET /api/audit` and `/audit`: newest first; filter by person, entity (and one record), period; search an action or a record id. */
export const auditListQuery = listQuery
  .extend({
    actor: anyOr(id()),
    entity: anyOr(z.string().max(60)),
    entityId: anyOr(z.string().max(64)),
    from: anyOr(day()),
    to: anyOr(day()),
  })
  .strict();
export type AuditListQuery = z.infer<typeof auditListQuery>;
