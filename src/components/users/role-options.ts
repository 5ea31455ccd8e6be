import { ROLE_LABELS, ROLES, type Role } from "../../lib/permissions";

/** The roles this person may give: only an administrator gives the administrator role. */
export function roleOptions(actorRole: Role) {
  return ROLES.filter((r) => actorRole === "admin" || r !== "admin").map((r) => ({ value: r, label: ROLE_LABELS[r] }));
}
