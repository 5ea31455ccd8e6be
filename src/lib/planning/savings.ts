/**
 * What a variant of a method would have saved: the method's program and the variant's, each run
 * over the injections the ledger records (solventUse), each channel split into reagents by the
 * shares the ledger recorded for that method's runs, the variant's solvent swaps applied, and
 * costed at today's rates. Pure: the service reads the ledger and hands the figures in.
 */
import { solventUse, type ProgramPoint } from "../chem/solvent-use";

/** What one mL pumped on a channel contained, from the ledger: mL of each liquid, g of each solid. */
export interface ChannelContent {
  mL_per_mL: Record<string, number>;
  g_per_mL: Record<string, number>;
}

/** Today's price of a reagent: per L for liquids, per g for solids, in integer minor units. */
export interface TodayRate {
  unit: "L" | "g";
  amount_minor: number;
  currency: string;
}

export interface UseFigures {
  byChannel_mL: Record<string, number>;
  total_mL: number;
  /** mL by reagent id (`channel:<X>` where the ledger never named what a channel held). */
  byReagent_mL: Record<string, number>;
  byReagent_g: Record<string, number>;
  byStream_mL: Record<string, number>;
  /** At today's rates; null when no reagent has a rate. Reagents without a rate are listed. */
  cost: { amount: number; currency: string } | null;
  unpriced: string[];
}

export interface SavingInput {
  current: readonly ProgramPoint[];
  variant: readonly ProgramPoint[];
  /** Injections and blanks of the method's runs over the period, as the ledger records them. */
  injections: number;
  contents: Readonly<Record<string, ChannelContent>>;
  /** Per channel: a reagent the variant replaces, and the replacement blend (percent, adding up to 100). */
  swaps?: Readonly<Record<string, Readonly<Record<string, Readonly<Record<string, number>>>>>>;
  rates: Readonly<Record<string, TodayRate>>;
  /** The waste stream of each reagent (the ledger's), `unassigned` otherwise. */
  streams: Readonly<Record<string, string>>;
}

export interface SavingResult {
  injections: number;
  current: UseFigures;
  variant: UseFigures;
  /** current − variant: positive is saved. */
  saved: {
    total_mL: number;
    byReagent_mL: Record<string, number>;
    byStream_mL: Record<string, number>;
    cost: { amount: number; currency: string } | null;
  };
}

const add = (to: Record<string, number>, key: string, v: number) => {
  to[key] = (to[key] ?? 0) + v;
};

/** What a channel holds once a reagent on it is replaced by a blend (percent adding up to 100). */
export function swapped(
  content: ChannelContent | undefined,
  swaps: Readonly<Record<string, Readonly<Record<string, number>>>> | undefined,
): ChannelContent | undefined {
  if (!content || !swaps) return content;
  const mL_per_mL: Record<string, number> = {};
  for (const [reagent, share] of Object.entries(content.mL_per_mL)) {
    const blend = swaps[reagent];
    if (!blend) add(mL_per_mL, reagent, share);
    else for (const [to, pct] of Object.entries(blend)) add(mL_per_mL, to, (share * pct) / 100);
  }
  return { mL_per_mL, g_per_mL: { ...content.g_per_mL } };
}

function figures(
  program: readonly ProgramPoint[],
  injections: number,
  contents: SavingInput["contents"],
  swaps: SavingInput["swaps"],
  rates: SavingInput["rates"],
  streams: SavingInput["streams"],
): UseFigures {
  const use = solventUse({ program, injections });
  const byReagent_mL: Record<string, number> = {};
  const byReagent_g: Record<string, number> = {};
  const byStream_mL: Record<string, number> = {};
  for (const [channel, volume] of Object.entries(use.byChannel_mL)) {
    const content = swapped(contents[channel], swaps?.[channel]);
    const liquids = Object.entries(content?.mL_per_mL ?? {});
    const named = liquids.reduce((a, [, s]) => a + s, 0);
    if (liquids.length === 0 || named <= 0) {
      add(byReagent_mL, `channel:${channel}`, volume);
      add(byStream_mL, "unassigned", volume);
    } else
      for (const [reagent, share] of liquids) {
        // Shares are normalised so that a channel's reagents add up to what the pump delivered.
        const v = (volume * share) / named;
        add(byReagent_mL, reagent, v);
        add(byStream_mL, streams[reagent] ?? "unassigned", v);
      }
    for (const [reagent, g] of Object.entries(content?.g_per_mL ?? {})) add(byReagent_g, reagent, volume * g);
  }
  let amount = 0;
  let currency: string | null = null;
  const unpriced: string[] = [];
  const price = (reagent: string, quantity: number, unit: "L" | "g") => {
    const rate = rates[reagent];
    if (!rate || rate.unit !== unit) {
      if (!reagent.startsWith("channel:")) unpriced.push(reagent);
      return;
    }
    currency ??= rate.currency;
    if (rate.currency === currency) amount += (unit === "L" ? quantity / 1000 : quantity) * rate.amount_minor;
  };
  for (const [reagent, mL] of Object.entries(byReagent_mL)) price(reagent, mL, "L");
  for (const [reagent, g] of Object.entries(byReagent_g)) price(reagent, g, "g");
  return {
    byChannel_mL: use.byChannel_mL,
    total_mL: use.total_mL,
    byReagent_mL,
    byReagent_g,
    byStream_mL,
    cost: currency === null ? null : { amount: Math.round(amount), currency },
    unpriced,
  };
}

const difference = (a: Record<string, number>, b: Record<string, number>) => {
  const out: Record<string, number> = {};
  for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) out[k] = (a[k] ?? 0) - (b[k] ?? 0);
  return out;
};

export function variantSaving(input: SavingInput): SavingResult {
  const current = figures(input.current, input.injections, input.contents, undefined, input.rates, input.streams);
  const variant = figures(input.variant, input.injections, input.contents, input.swaps, input.rates, input.streams);
  const cost =
    current.cost && variant.cost && current.cost.currency === variant.cost.currency
      ? { amount: current.cost.amount - variant.cost.amount, currency: current.cost.currency }
      : (current.cost ?? variant.cost)
        ? { amount: (current.cost?.amount ?? 0) - (variant.cost?.amount ?? 0), currency: (current.cost ?? variant.cost)!.currency }
        : null;
  return {
    injections: input.injections,
    current,
    variant,
    saved: {
      total_mL: current.total_mL - variant.total_mL,
      byReagent_mL: difference(current.byReagent_mL, variant.byReagent_mL),
      byStream_mL: difference(current.byStream_mL, variant.byStream_mL),
      cost,
    },
  };
}
