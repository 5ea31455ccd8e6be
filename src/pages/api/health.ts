import type { APIRoute } from "astro";
import { databaseIsUp } from "../../lib/server/db";
import { json } from "../../lib/server/http";

/** Public: load balancers and checks poll it. */
export const GET: APIRoute = async () => {
  const up = await databaseIsUp();
  return json({ ok: up, db: up ? "up" : "down" }, up ? 200 : 503);
};
