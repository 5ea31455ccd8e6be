// Decodes request parameters the way the payments API reads them: form-encoded pairs whose keys
// carry bracketed paths (`metadata[statement_id]=12`, `expand[0]=lines`), as the official SDK
// writes them for both POST bodies and GET query strings.

export type Params = { [key: string]: ParamValue };
export type ParamValue = string | Params | ParamValue[];

export class ParamError extends Error {
  constructor(
    message: string,
    readonly param: string,
    readonly code = "parameter_invalid",
  ) {
    super(message);
  }
}

/** `a[b][0]` → ["a", "b", "0"]. */
function pathOf(key: string): string[] {
  const match = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(key);
  if (!match) throw new ParamError(`Invalid parameter name: ${key}`, key, "parameter_unknown");
  const rest = [...match[2]!.matchAll(/\[([^[\]]*)\]/g)].map((m) => m[1]!);
  return [match[1]!, ...rest];
}

export function decodeParams(text: string): Params {
  const root: Params = {};
  for (const [key, value] of new URLSearchParams(text)) {
    const path = pathOf(key);
    let node: Params | ParamValue[] = root;
    for (let i = 0; i < path.length; i++) {
      const segment = path[i]!;
      const last = i === path.length - 1;
      const nextIsIndex = !last && /^\d*$/.test(path[i + 1]!);
      if (Array.isArray(node)) {
        const index = segment === "" ? node.length : Number(segment);
        if (last) node[index] = value;
        else node = (node[index] ??= nextIsIndex ? [] : {}) as Params | ParamValue[];
      } else {
        if (last) node[segment] = value;
        else {
          const existing: ParamValue | undefined = node[segment];
          if (existing === undefined || typeof existing === "string") node[segment] = nextIsIndex ? [] : {};
          node = node[segment] as Params | ParamValue[];
        }
      }
    }
  }
  return root;
}

/** Typed readers that answer the API's usual errors naming the parameter. */
export function reader(params: Params, allowed: readonly string[], prefix = "") {
  for (const key of Object.keys(params)) {
    if (key === "expand") continue;
    if (!allowed.includes(key)) throw new ParamError(`Received unknown parameter: ${prefix}${key}`, `${prefix}${key}`, "parameter_unknown");
  }
  const str = (name: string, required = false): string | undefined => {
    const value = params[name];
    if (value === undefined) {
      if (required) throw new ParamError(`Missing required param: ${prefix}${name}.`, `${prefix}${name}`, "parameter_missing");
      return undefined;
    }
    if (typeof value !== "string") throw new ParamError(`Invalid string: ${prefix}${name}`, `${prefix}${name}`);
    if (required && value === "")
      throw new ParamError(
        `You passed an empty string for '${prefix}${name}'. We assume empty values are an attempt to unset a parameter; however '${prefix}${name}' cannot be unset.`,
        `${prefix}${name}`,
        "parameter_invalid_empty",
      );
    return value;
  };
  return {
    str,
    int(name: string, options: { required?: boolean; min?: number } = {}): number | undefined {
      const raw = str(name, options.required);
      if (raw === undefined || raw === "") return undefined;
      if (!/^-?\d+$/.test(raw)) throw new ParamError(`Invalid integer: ${raw}`, `${prefix}${name}`, "parameter_invalid_integer");
      const n = Number(raw);
      if (options.min !== undefined && n < options.min)
        throw new ParamError(
          `This value must be greater than or equal to ${options.min}.`,
          `${prefix}${name}`,
          "parameter_invalid_integer",
        );
      return n;
    },
    bool(name: string): boolean | undefined {
      const raw = str(name);
      if (raw === undefined || raw === "") return undefined;
      if (raw !== "true" && raw !== "false") throw new ParamError(`Invalid boolean: ${raw}`, `${prefix}${name}`);
      return raw === "true";
    },
    decimal(name: string): string | undefined {
      const raw = str(name);
      if (raw === undefined || raw === "") return undefined;
      if (!/^-?\d+(\.\d{1,12})?$/.test(raw))
        throw new ParamError(`Invalid decimal: ${raw}`, `${prefix}${name}`, "parameter_invalid_decimal");
      return raw;
    },
    oneOf<T extends string>(name: string, values: readonly T[], fallback?: T): T | undefined {
      const raw = str(name);
      if (raw === undefined || raw === "") return fallback;
      if (!values.includes(raw as T))
        throw new ParamError(`Invalid ${prefix}${name}: must be one of ${values.join(", ")}`, `${prefix}${name}`);
      return raw as T;
    },
    /** `metadata[key]=value` pairs; an empty string unsets a key. */
    metadata(name = "metadata"): Record<string, string> | undefined {
      const value = params[name];
      if (value === undefined) return undefined;
      if (value === "") return {};
      if (typeof value !== "object" || Array.isArray(value)) throw new ParamError(`Invalid object: ${prefix}${name}`, `${prefix}${name}`);
      const out: Record<string, string> = {};
      for (const [key, v] of Object.entries(value)) {
        if (typeof v !== "string") throw new ParamError(`Invalid metadata value for ${key}`, `${prefix}${name}[${key}]`);
        if (key.length > 40) throw new ParamError("Metadata keys can be at most 40 characters.", `${prefix}${name}[${key}]`);
        if (v.length > 500) throw new ParamError("Metadata values can be at most 500 characters.", `${prefix}${name}[${key}]`);
        out[key] = v;
      }
      return out;
    },
    object(name: string): Params | undefined {
      const value = params[name];
      if (value === undefined) return undefined;
      if (typeof value !== "object" || Array.isArray(value)) throw new ParamError(`Invalid object: ${prefix}${name}`, `${prefix}${name}`);
      return value;
    },
  };
}

/** Merges metadata as the API does: keys with an empty value are removed. */
export function mergeMetadata(current: Record<string, string>, update: Record<string, string> | undefined): Record<string, string> {
  if (update === undefined) return current;
  if (Object.keys(update).length === 0) return {};
  const next = { ...current };
  for (const [key, value] of Object.entries(update)) {
    if (value === "") delete next[key];
    else next[key] = value;
  }
  return next;
}
