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

export interface BatchExpiry {
  expiresAt: Date;
  rule: ExpiryRule;
  /** Set when a lot expires before the rule would. */
  limitedBy: LotExpiry | null;
  reason: string;
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
  const life = rule.shelfLife_h % 24 === 0 ? `${rule.shelfLife_h / 24} days` : `${rule.shelfLife_h} h`;
  const reason = limitedBy
    ? `Lot ${limitedBy.lotNumber} expires on ${limitedBy.expiresOn}, before the ${life} of the rule "${rule.label}".`
    : `${rule.label}: ${life}. ${rule.reason}`;
  return { expiresAt, rule, limitedBy, reason };
}
