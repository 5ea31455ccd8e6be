import type { APIContext, AstroGlobal } from "astro";
import { can, canAtLeastOwn, type Permission } from "../permissions";
import { errorResponse, HttpError } from "./http";

type Locals = App.Locals;
export type SignedInUser = NonNullable<Locals["user"]>;

/**
 * The one permission check used by every API route and page. Throws 401 when signed out and
 * 403 naming the missing permission. With `{ own: true }`, a `…:own` grant also passes: the
 * caller must then scope its query to `user.clientId`.
 */
export function requirePermission(locals: Locals, permission: Permission, options: { own?: boolean } = {}): SignedInUser {
  const user = locals.user;
  if (!user) throw new HttpError(401, "Sign in first.");
  const allowed = options.own ? canAtLeastOwn(user.role, permission) : can(user.role, permission);
  if (!allowed) throw new HttpError(403, `Your role may not do this (needs ${permission}).`, { missingPermission: permission });
  return user;
}

/** True when the user may see every organisation's records, not only their own. */
export function seesAllClients(user: SignedInUser, permission: Permission): boolean {
  return can(user.role, permission);
}

/** Wraps an API handler: thrown HttpErrors and database outages become JSON answers. */
export function endpoint(handler: (context: APIContext) => Promise<Response> | Response) {
  return async (context: APIContext) => {
    try {
      return await handler(context);
    } catch (error) {
      return errorResponse(error);
    }
  };
}

/**
 * For pages: returns the user, or a Response to send instead (a redirect to sign-in, or the 403 page).
 * Usage: `const user = await guardPage(Astro, "read:batch"); if (user instanceof Response) return user;`
 */
export async function guardPage(
  astro: AstroGlobal,
  permission: Permission,
  options: { own?: boolean } = {},
): Promise<SignedInUser | Response> {
  try {
    return requirePermission(astro.locals, permission, options);
  } catch (error) {
    if (error instanceof HttpError && error.status === 401) {
      const next = astro.url.pathname + astro.url.search;
      return astro.redirect(`/sign-in?next=${encodeURIComponent(next)}`);
    }
    if (error instanceof HttpError && error.status === 403) {
      return astro.rewrite(`/forbidden?needs=${encodeURIComponent(permission)}`);
    }
    throw error;
  }
}
