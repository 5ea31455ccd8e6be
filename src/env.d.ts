/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in user, or null for an anonymous request. Set by src/middleware.ts. */
    user: (import("lucia").User & { id: number }) | null;
    /** The live lucia session behind `user`, or null. Renewed by the middleware while in use. */
    session: import("lucia").Session | null;
  }
}
