import { z } from "zod";
import { id } from "./fields";

/** `{id}` in a route path. */
export const idParam = z.object({ id: id("must be a positive whole number") });
