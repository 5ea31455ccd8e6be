/**
 * Shelf life of a made mobile phase. The kind comes from what is in the bottle
 * (`mixture-kind.ts`); the rule table is the facility's (settings), with these common-practice
 * defaults. A batch expires at the earlier of its rule and the end of the expiry day of any
 * stock lot in it. Free of the reagent catalogue, so forms that only edit the rules stay light.
 */

export const MIXTURE_KINDS = ["labile-additive", "aqueous-buffer", "aqueous-acidified", "aqueous-organic", "neat-organic"] as const;
export type MixtureKind = (typeof MIXTURE_KINDS)[number];

export interface ExpiryRule {
  kind: MixtureKind;
  label: string;
  shelfLife_h: number;
  /** Shown to the technician beside the expiry. */
  reason: string;
}

/** Common practice, not a regulation: each facility sets its own in the preparation settings. */
export const DEFAULT_EXPIRY_RULES: readonly ExpiryRule[] = [
  {
    kind: "labile-additive",
    label: "With a labile additive",
    shelfLife_h: 24,
    reason:
      "Volatile or unstable additives (ammonium bicarbonate, ammonia) change the pH within a day; common practice is to make them daily.",
  },
  {
    kind: "aqueous-buffer",
    label: "Aqueous buffer without organic",
    shelfLife_h: 48,
    reason: "Aqueous buffers without organic solvent support microbial growth; common practice is to make them every one to two days.",
  },
  {
    kind: "aqueous-acidified",
    label: "Water with acid or additive, no salt",
    shelfLife_h: 7 * 24,
    reason: "Acidified water resists growth better than a salt buffer but still takes up contaminants; common practice is about a week.",
  },
  {
    kind: "aqueous-organic",
    label: "Aqueous with organic",
    shelfLife_h: 7 * 24,
    reason: "Organic solvent slows microbial growth, but evaporation shifts the composition; common practice is about a week.",
  },
  {
    kind: "neat-organic",
    label: "Neat organic (with or without additive)",
    shelfLife_h: 30 * 24,
    reason: "Organic solvents with volatile additives keep about a month capped; common practice.",
  },
];

export interface LotExpiry {
  lotNumber: string;
  /** Last day of use, "YYYY-MM-DD". */
  expiresOn: string;
}

/** What a batch's expiry was computed from, stored with the batch so every screen words it the same way. */
export interface ExpiryBasis {
  kind: MixtureKind;
  ruleLabel: string;
  shelfLife_h: number;
  ruleReason: string;
  /** The lot that cut the rule's shelf life short, if any. */
  limitedBy: LotExpiry | null;
}

/** The words every screen, the label and the digest use for an expiry. */
export interface ExpiryWording {
  /** "2026-12-06 01:05 UTC" */
  expires: string;
  /** "48 h" or "7 days": the rule's shelf life. */
  shelfLife: string;
  /** "aqueous buffer without organic, 48 h" or "lot KP-7731 expires 2026-12-05 (rule: 7 days)". */
  basis: string;
}

export interface BatchExpiry {
  expiresAt: Date;
  rule: ExpiryRule;
  /** Set when a lot expires before the rule would. */
  limitedBy: LotExpiry | null;
  reason: string;
  basis: ExpiryBasis;
  wording: ExpiryWording;
}

/** 168 → "7 days", 36 → "1 day 12 h", 20 → "20 h". */
export function shelfLifeText(hours: number): string {
  const days = Math.floor(hours / 24);
  const rest = hours - days * 24;
  const d = days === 0 ? "" : `${days} day${days === 1 ? "" : "s"}`;
  const h = rest === 0 ? "" : `${+rest.toFixed(2)} h`;
  return [d, h].filter(Boolean).join(" ") || "0 h";
}

/** "2026-12-06 01:05 UTC" */
export function instantText(at: Date): string {
  return `${at.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** The instant a lot stops being usable: the end of its expiry day (UTC). */
export function lotEndOfLife(expiresOn: string): Date {
  return new Date(Date.parse(`${expiresOn}T00:00:00Z`) + 86_400_000);
}

/** True when a lot's expiry day is already past. */
export function lotExpired(expiresOn: string, now = new Date()): boolean {
  return lotEndOfLife(expiresOn).getTime() <= now.getTime();
}

export function batchExpiry(input: {
  kind: MixtureKind;
  preparedAt: Date;
  rules: readonly ExpiryRule[];
  lots: readonly LotExpiry[];
}): BatchExpiry {
  const rule = input.rules.find((r) => r.kind === input.kind) ?? DEFAULT_EXPIRY_RULES.find((r) => r.kind === input.kind)!;
  let expiresAt = new Date(input.preparedAt.getTime() + rule.shelfLife_h * 3_600_000);
  let limitedBy: LotExpiry | null = null;
  for (const lot of input.lots) {
    const end = lotEndOfLife(lot.expiresOn);
    if (end < expiresAt) {
      expiresAt = end;
      limitedBy = lot;
    }
  }
  const life = shelfLifeText(rule.shelfLife_h);
  const reason = limitedBy
    ? `Lot ${limitedBy.lotNumber} expires on ${limitedBy.expiresOn}, before the ${life} of the rule "${rule.label}".`
    : `${rule.label}: ${life}. ${rule.reason}`;
  const basis: ExpiryBasis = { kind: rule.kind, ruleLabel: rule.label, shelfLife_h: rule.shelfLife_h, ruleReason: rule.reason, limitedBy };
  const wording: ExpiryWording = {
    expires: instantText(expiresAt),
    shelfLife: life,
    basis: limitedBy
      ? `lot ${limitedBy.lotNumber} expires ${limitedBy.expiresOn}, before the rule's ${life}`
      : `${rule.label.charAt(0).toLowerCase()}${rule.label.slice(1)}, ${life}`,
  };
  return { expiresAt, rule, limitedBy, reason, basis, wording };
}

/** The same computation from what a batch stored: the instant and its words again, never apart. */
export function expiryFromBasis(preparedAt: Date, basis: ExpiryBasis): BatchExpiry {
  return batchExpiry({
    kind: basis.kind,
    preparedAt,
    rules: [{ kind: basis.kind, label: basis.ruleLabel, shelfLife_h: basis.shelfLife_h, reason: basis.ruleReason }],
    lots: basis.limitedBy ? [basis.limitedBy] : [],
  });
}

/** The label's and the batch page's storage line: the recipe's conditions and the shelf life the expiry came from. */
export function storageLine(conditions: string | null, wording: ExpiryWording): string {
  return conditions ? `${conditions} · shelf life: ${wording.basis}` : `Shelf life: ${wording.basis}`;
}

/** Recipe storage text states conditions only: a shelf life there would contradict the expiry rules. */
export const SHELF_LIFE_IN_TEXT = /\buse\s+within\b|\b\d+(?:[.,]\d+)?\s*(?:h|hrs?|hours?|days?|d|weeks?|months?)\b/i;
