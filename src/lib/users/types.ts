/** What the user administration answers and its island reads. Types only. */
import type { Role } from "../permissions";

export interface UserRow {
  id: number;
  email: string;
  name: string;
  role: Role;
  clientId: number | null;
  clientName: string | null;
  active: boolean;
  /** Invited and has not chosen a password yet. */
  invited: boolean;
  lastSignInAt: string | null;
  createdAt: string;
  /** Signs in with a second factor (only known in the list; false elsewhere). */
  twoFactor?: boolean;
}

export interface ClientOption {
  id: number;
  name: string;
  kind: "internal" | "external";
}
