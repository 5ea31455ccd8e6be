// Permissions as data: each role holds a list of `action:entity` (or `action:entity:own`) grants.
// `:own` means "only records of the user's own client organisation".

export const ROLES = ["technician", "manager", "safety", "client", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  "read:dashboard",
  "read:recipe",
  "create:recipe",
  "approve:recipe",
  "read:batch",
  "create:batch",
  "update:batch",
  "read:stock-lot",
  "create:stock-lot",
  "read:run",
  "create:run",
  "create:draw",
  "create:import",
  "read:instrument",
  "manage:instrument",
  /** Gradient programs of methods (reading them comes with read:instrument). */
  "manage:method",
  /** Reversing ledger entries with a reason. */
  "create:correction",
  "read:usage",
  "read:usage:own",
  "read:project",
  "read:project:own",
  "manage:project",
  "read:client",
  "manage:client",
  "read:statement",
  "read:statement:own",
  "manage:statement",
  "read:invoice",
  "read:invoice:own",
  "manage:invoice",
  "pay:invoice:own",
  "manage:rate",
  "read:waste",
  "manage:waste",
  "read:user",
  "manage:user",
  "manage:settings",
  /** Expiry rules, deviation tolerances and label stocks (preparation settings). */
  "manage:preparation-settings",
  /** Greener variants, solvent swaps and column transfers of methods; the facility-wide view. */
  "read:planning",
  /** Proposing a variant and submitting it as a new method version. */
  "manage:planning",
  /** Approving a pending method version (four eyes: never one's own). */
  "approve:method",
  /** Reagents on hand, days of supply and reorder points. */
  "read:supply",
  /** Each reagent's lead time and safety stock. */
  "manage:supply",
  "read:audit",
  "read:dev-inbox",
  "read:own-account",
  "update:own-account",
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const TECHNICIAN: Permission[] = [
  "read:dashboard",
  "read:recipe",
  "create:recipe",
  "read:batch",
  "create:batch",
  "update:batch",
  "read:stock-lot",
  "create:stock-lot",
  "read:run",
  "create:run",
  "create:draw",
  "create:import",
  "read:instrument",
  "read:project",
  "read:waste",
  "read:own-account",
  "update:own-account",
  "manage:method",
  "create:correction",
  "read:planning",
  "manage:planning",
  "read:supply",
];

const MANAGER: Permission[] = [
  ...TECHNICIAN,
  "approve:recipe",
  "manage:instrument",
  "read:usage",
  "manage:project",
  "read:client",
  "manage:client",
  "read:statement",
  "manage:statement",
  "read:invoice",
  "manage:invoice",
  "manage:rate",
  "read:user",
  "manage:user",
  /** Greener variants, solvent swaps and column transfers of methods; the facility-wide view. */
  "read:planning",
  /** Proposing a variant and submitting it as a new method version. */
  "manage:planning",
  /** Approving a pending method version (four eyes: never one's own). */
  "approve:method",
  /** Reagents on hand, days of supply and reorder points. */
  "read:supply",
  /** Each reagent's lead time and safety stock. */
  "manage:supply",
  "read:audit",
  "manage:preparation-settings",
  "approve:method",
  "manage:supply",
];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  technician: TECHNICIAN,
  manager: MANAGER,
  safety: [
    "read:dashboard",
    "read:waste",
    "manage:waste",
    "read:instrument",
    "read:batch",
    "read:stock-lot",
    "read:run",
    "read:project",
    "read:planning",
    "read:own-account",
    "update:own-account",
  ],
  client: [
    "read:dashboard",
    "read:project:own",
    "read:usage:own",
    "read:statement:own",
    "read:invoice:own",
    "pay:invoice:own",
    "read:own-account",
    "update:own-account",
  ],
  admin: [...new Set<Permission>([...MANAGER, "manage:settings", "manage:waste", "read:dev-inbox"])],
};

export function can(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].includes(permission);
}

/** Like can(), but a `read:x` check also passes with `read:x:own` (the caller then scopes the query). */
export function canAtLeastOwn(role: Role, permission: Permission): boolean {
  return can(role, permission) || (ROLE_PERMISSIONS[role] as readonly string[]).includes(`${permission}:own`);
}

export const ROLE_LABELS: Record<Role, string> = {
  technician: "Technician",
  manager: "Facility manager",
  safety: "Safety officer",
  client: "Client contact",
  admin: "Administrator",
};
