import { can, type Permission, type Role } from "../../lib/permissions";

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** Also shown with the `…:own` variant of the permission. */
  own?: boolean;
}

/** The app's sections; each role sees the ones its permissions open. */
export const NAV_ITEMS: NavItem[] = [
  { href: "/home", label: "Overview", permission: "read:dashboard" },
  { href: "/batches", label: "Batches", permission: "read:batch" },
  { href: "/users", label: "People", permission: "manage:user" },
  { href: "/dev/inbox", label: "Mail outbox (dev)", permission: "read:dev-inbox" },
  { href: "/account", label: "My account", permission: "update:own-account" },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => can(role, item.permission) || (item.own && can(role, `${item.permission}:own` as Permission)));
}
