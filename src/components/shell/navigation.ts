import { can, type Permission, type Role } from "../../lib/permissions";

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** Also shown with the `…:own` variant of the permission. */
  own?: boolean;
  /** Shown only while Decant sends mail to the local SMTP fake (SMTP_FAKE_MAILBOX is set). */
  devMailOnly?: boolean;
}

/** The app's sections; each role sees the ones its permissions open. */
export const NAV_ITEMS: NavItem[] = [
  { href: "/home", label: "Overview", permission: "read:dashboard" },
  { href: "/batches", label: "Batches", permission: "read:batch" },
  { href: "/recipes", label: "Recipes", permission: "read:recipe" },
  { href: "/stock-lots", label: "Stock lots", permission: "read:stock-lot" },
  { href: "/settings/facility", label: "Facility settings", permission: "manage:settings" },
  { href: "/settings/preparation", label: "Preparation settings", permission: "manage:preparation-settings" },
  { href: "/runs", label: "Runs & draws", permission: "read:run" },
  { href: "/instruments", label: "Instruments", permission: "read:instrument" },
  { href: "/methods", label: "Methods", permission: "read:instrument" },
  { href: "/planning", label: "Plan ahead", permission: "read:planning" },
  { href: "/planning/supply", label: "Supply", permission: "read:supply" },
  { href: "/imports", label: "Import run logs", permission: "create:import" },
  { href: "/usage", label: "Usage", permission: "read:usage", own: true },
  { href: "/statements", label: "Statements", permission: "read:statement", own: true },
  { href: "/invoices", label: "Invoices", permission: "read:invoice", own: true },
  { href: "/rates", label: "Rates", permission: "manage:rate" },
  { href: "/waste", label: "Waste", permission: "read:waste" },
  { href: "/users", label: "People", permission: "manage:user" },
  { href: "/settings/sign-in", label: "Sign-in & sessions", permission: "manage:settings" },
  { href: "/dev/inbox", label: "Mail outbox (dev)", permission: "read:dev-inbox", devMailOnly: true },
  { href: "/account", label: "My account", permission: "read:own-account" },
];

export function navFor(role: Role, options: { devMail?: boolean } = {}): NavItem[] {
  return NAV_ITEMS.filter(
    (item) =>
      (!item.devMailOnly || options.devMail === true) &&
      (can(role, item.permission) || (item.own && can(role, `${item.permission}:own` as Permission))),
  );
}
