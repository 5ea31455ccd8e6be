/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in user, or null for an anonymous request. Set by src/middleware.ts. */
    user: import("./lib/server/auth/sessions").SessionUser | null;
    /** The live session behind `user`, or null. Its activity is recorded by the middleware (idle limit). */
    session: import("./lib/server/auth/sessions").OpenSession | null;
    /**
     * A half-finished sign-in (waiting for a two-factor code, or for the set-up a role requires):
     * it opens no page but its own step, so `user` stays null.
     */
    signInStep: {
      session: import("./lib/server/auth/sessions").OpenSession;
      user: import("./lib/server/auth/sessions").SessionUser;
    } | null;
  }
}
