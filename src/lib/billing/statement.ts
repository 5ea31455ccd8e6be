/**
 * Statements, pure: the lines of a client's period from aggregated ledger usage, costed at the
 * rates in force on each day; the statement CSV and the chargeback journal CSV. No I/O; the
 * server services (src/lib/server/services/billing/) feed it rows from the database.
 *
 * Money stays in integer minor units. Each line's cost is summed exactly (10⁻⁹ minor units) and
 * rounded once, half away from zero; the statement total is the sum of the rounded lines, so
 * the total equals the sum of the invoice items sent for it.
 */
import { formatNumber, formatVolume } from "../format";
import { minorDigits, type Money } from "./money";
import { exactCost, rateInForce, roundMinor, supersedes, toMicro, type PriceList, type Rate, type RateKind, type RateUnit } from "./rates";

/** One project's use of one reagent on one UTC day (the database sums the entries). */
export interface UsageRow {
  projectCode: string;
  projectName: string;
  reagentId: string;
  reagentName: string;
  /** Grade of the stock lot the batch was made from, when known. */
  grade: string | null;
  day: string;
  /** Sums as the database gives them (numbers), or decimal strings; negative in corrections. */
  volume_mL: string | number;
  mass_g: string | number | null;
}

/** Counted things that carry a fee: injections of a run, batches prepared for a project. */
export interface CountRow {
  projectCode: string;
  projectName: string;
  day: string;
  count: number;
}

export interface StatementLine {
  projectCode: string;
  projectName: string;
  kind: RateKind;
  reagentId: string | null;
  /** e.g. "Acetonitrile (HPLC)" or "Injection fee". */
  description: string;
  /** Decimal string: mL, g, batches or injections. */
  quantity: string;
  quantityUnit: "mL" | "g" | "batch" | "injection";
  rateId: number | null;
  /** Price per rate unit, minor units; null when no rate was in force. */
  unitPrice_minor: number | null;
  rateUnit: RateUnit | null;
  rateEffectiveFrom: string | null;
  amount_minor: number;
}

export interface StatementComputation {
  lines: StatementLine[];
  total_minor: number;
  currency: string;
  /** Reagents used in the period with no rate in force on some day: not charged, flagged for review. */
  uncosted: string[];
}

/**
 * The rate for an entry: a grade-specific rate in force wins over the reagent's general rate;
 * otherwise the general rate in force (see `rateInForce`). Fees have no grade.
 */
export function gradeRateInForce(
  rates: readonly Rate[],
  query: { kind: RateKind; reagentId: string | null; grade: string | null; priceList: PriceList; currency: string; day: string },
): Rate | null {
  if (query.grade) {
    let best: Rate | null = null;
    for (const rate of rates) {
      if (rate.kind !== query.kind || rate.reagentId !== query.reagentId || rate.grade !== query.grade) continue;
      if (rate.priceList !== query.priceList || rate.currency !== query.currency || rate.effectiveFrom > query.day) continue;
      if (supersedes(rate, best)) best = rate;
    }
    if (best) return best;
  }
  return rateInForce(rates, {
    kind: query.kind,
    reagentId: query.reagentId,
    priceList: query.priceList,
    currency: query.currency,
    at: query.day,
  });
}

/** 12345600n (10⁻⁶) → "12.3456"; trailing zeros dropped. */
export function microToDecimal(micro: bigint): string {
  const negative = micro < 0n;
  const abs = negative ? -micro : micro;
  const whole = abs / 1_000_000n;
  const fraction = (abs % 1_000_000n).toString().padStart(6, "0").replace(/0+$/, "");
  return `${negative ? "-" : ""}${whole}${fraction ? `.${fraction}` : ""}`;
}

const KIND_ORDER: Record<RateKind, number> = { reagent: 0, preparation_fee: 1, injection_fee: 2 };
const FEE_LABEL = { preparation_fee: "Preparation fee", injection_fee: "Injection fee" } as const;

interface Group {
  line: Omit<StatementLine, "quantity" | "amount_minor">;
  quantity: bigint;
  exact: bigint;
  /** Grades of the lots used, shown on the line ("Acetonitrile, grade HPLC"). */
  grades?: Set<string>;
}

function describe(group: Group): string {
  const grades = [...(group.grades ?? [])].sort();
  if (grades.length === 0) return group.line.description;
  return `${group.line.description}, ${grades.length === 1 ? "grade" : "grades"} ${grades.join(", ")}`;
}

export function buildStatement(input: {
  usage: readonly UsageRow[];
  injections?: readonly CountRow[];
  preparations?: readonly CountRow[];
  rates: readonly Rate[];
  priceList: PriceList;
  currency: string;
}): StatementComputation {
  const groups = new Map<string, Group>();
  const uncosted = new Set<string>();
  const { priceList, currency, rates } = input;

  for (const row of input.usage) {
    const volume = toMicro(row.volume_mL ?? 0);
    const mass = row.mass_g == null ? 0n : toMicro(row.mass_g);
    if (volume === 0n && mass === 0n) continue;
    const rate = gradeRateInForce(rates, {
      kind: "reagent",
      reagentId: row.reagentId,
      grade: row.grade,
      priceList,
      currency,
      day: row.day,
    });
    const byMass = rate ? rate.unit === "g" : mass !== 0n && volume === 0n;
    const quantity = byMass ? mass : volume;
    if (quantity === 0n) continue;
    const cost = rate ? exactCost(byMass ? { mass_g: row.mass_g } : { volume_mL: row.volume_mL }, rate) : null;
    if (cost === null) uncosted.add(row.reagentId);
    // One line per price charged: a grade has its own line only when the grade has its own price.
    const pricedGrade = rate?.grade ?? null;
    const key = ["r", row.projectCode, row.reagentId, pricedGrade ?? "", rate?.id ?? "none"].join("|");
    const group = groups.get(key) ?? {
      line: {
        projectCode: row.projectCode,
        projectName: row.projectName,
        kind: "reagent" as const,
        reagentId: row.reagentId,
        description: row.reagentName,
        quantityUnit: byMass ? ("g" as const) : ("mL" as const),
        rateId: rate?.id ?? null,
        unitPrice_minor: rate?.amount_minor ?? null,
        rateUnit: rate?.unit ?? null,
        rateEffectiveFrom: rate?.effectiveFrom ?? null,
      },
      quantity: 0n,
      exact: 0n,
      grades: new Set<string>(),
    };
    const grade = pricedGrade ?? row.grade;
    if (grade) (group.grades ??= new Set()).add(grade);
    group.quantity += quantity;
    group.exact += cost ?? 0n;
    groups.set(key, group);
  }

  const fees: [Exclude<RateKind, "reagent">, readonly CountRow[] | undefined][] = [
    ["preparation_fee", input.preparations],
    ["injection_fee", input.injections],
  ];
  for (const [kind, rows] of fees) {
    for (const row of rows ?? []) {
      if (!row.count) continue;
      const rate = rateInForce(rates, { kind, priceList, currency, at: row.day });
      // No fee rate, or a zero fee: nothing to charge and nothing to show.
      if (!rate || rate.amount_minor === 0) continue;
      const key = ["f", row.projectCode, kind, rate.id].join("|");
      const group = groups.get(key) ?? {
        line: {
          projectCode: row.projectCode,
          projectName: row.projectName,
          kind,
          reagentId: null,
          description: FEE_LABEL[kind],
          quantityUnit: kind === "preparation_fee" ? ("batch" as const) : ("injection" as const),
          rateId: rate.id,
          unitPrice_minor: rate.amount_minor,
          rateUnit: rate.unit,
          rateEffectiveFrom: rate.effectiveFrom,
        },
        quantity: 0n,
        exact: 0n,
      };
      group.quantity += BigInt(row.count) * 1_000_000n;
      group.exact += BigInt(row.count) * BigInt(rate.amount_minor) * 10n ** 9n;
      groups.set(key, group);
    }
  }

  const lines: StatementLine[] = [...groups.values()]
    .filter((g) => g.quantity !== 0n)
    .map((g) => ({ ...g.line, description: describe(g), quantity: microToDecimal(g.quantity), amount_minor: roundMinor(g.exact) }))
    .sort(
      (a, b) =>
        a.projectCode.localeCompare(b.projectCode) ||
        KIND_ORDER[a.kind] - KIND_ORDER[b.kind] ||
        a.description.localeCompare(b.description) ||
        (a.rateEffectiveFrom ?? "").localeCompare(b.rateEffectiveFrom ?? ""),
    );
  return { lines, total_minor: lines.reduce((sum, line) => sum + line.amount_minor, 0), currency, uncosted: [...uncosted].sort() };
}

/** Why a draft ending on `periodEnd` cannot be issued on `today` (both YYYY-MM-DD), or null when it can. */
export function issueBlocker(periodEnd: string, computation: StatementComputation, today: string): string | null {
  if (periodEnd >= today) return `The period runs until ${periodEnd}; issue it once it has ended.`;
  if (computation.uncosted.length)
    return `No rate in force for ${computation.uncosted.join(", ")} on some days of the period; add a rate first.`;
  if (computation.lines.length === 0 || computation.total_minor === 0) return "Nothing to charge in this period.";
  return null;
}

/** Per-project subtotals, in line order. */
export function projectTotals(lines: readonly StatementLine[]): { projectCode: string; projectName: string; amount_minor: number }[] {
  const totals = new Map<string, { projectCode: string; projectName: string; amount_minor: number }>();
  for (const line of lines) {
    const t = totals.get(line.projectCode) ?? { projectCode: line.projectCode, projectName: line.projectName, amount_minor: 0 };
    t.amount_minor += line.amount_minor;
    totals.set(line.projectCode, t);
  }
  return [...totals.values()];
}

/**
 * Minor units as a plain decimal for files (no symbol, no grouping, "." as separator).
 *
 * @example decimalAmount({ amount: 123456, currency: "EUR" }) // → "1234.56"
 * @example decimalAmount({ amount: -5, currency: "EUR" })     // → "-0.05"
 */
export function decimalAmount(money: Money): string {
  if (!Number.isInteger(money.amount)) throw new RangeError(`Money amounts are integer minor units, got ${money.amount}`);
  const digits = minorDigits(money.currency);
  const negative = money.amount < 0;
  const abs = Math.abs(money.amount);
  if (digits === 0) return `${negative ? "-" : ""}${abs}`;
  const text = String(abs).padStart(digits + 1, "0");
  return `${negative ? "-" : ""}${text.slice(0, -digits)}.${text.slice(-digits)}`;
}

/**
 * Parses a major-unit amount typed by a person ("42", "42.5", "42.50") into minor units, exactly.
 * Null when it is not a plain non-negative decimal with at most the currency's digits.
 */
export function parseMajorAmount(text: string, currency: string): number | null {
  const digits = minorDigits(currency);
  const match = /^(\d{1,9})(?:[.,](\d*))?$/.exec(text.trim());
  if (!match) return null;
  const fraction = match[2] ?? "";
  if (fraction.length > digits) return null;
  return Number(match[1]) * 10 ** digits + Number((fraction + "0".repeat(digits)).slice(0, digits) || "0");
}

/** RFC 4180 field; text that a spreadsheet would run as a formula is prefixed with an apostrophe. */
export function csvField(value: string | number, options: { text?: boolean } = {}): string {
  let text = String(value);
  if (options.text && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

const csvRow = (fields: string[]) => `${fields.join(",")}\r\n`;

export interface StatementHeader {
  reference: string;
  clientName: string;
  periodStart: string;
  periodEnd: string;
  currency: string;
}

export const STATEMENT_CSV_COLUMNS = [
  "statement",
  "client",
  "period_start",
  "period_end",
  "project_code",
  "project_name",
  "item",
  "quantity",
  "quantity_unit",
  "unit_price",
  "price_per",
  "amount",
  "currency",
] as const;

/** One row per statement line; amounts as plain decimals in the statement's currency. */
export function statementCsv(header: StatementHeader, lines: readonly StatementLine[]): string {
  let out = csvRow([...STATEMENT_CSV_COLUMNS]);
  for (const line of lines) {
    out += csvRow([
      csvField(header.reference, { text: true }),
      csvField(header.clientName, { text: true }),
      header.periodStart,
      header.periodEnd,
      csvField(line.projectCode, { text: true }),
      csvField(line.projectName, { text: true }),
      csvField(line.description, { text: true }),
      line.quantity,
      line.quantityUnit,
      line.unitPrice_minor === null ? "" : decimalAmount({ amount: line.unitPrice_minor, currency: header.currency }),
      line.rateUnit ?? "",
      decimalAmount({ amount: line.amount_minor, currency: header.currency }),
      header.currency,
    ]);
  }
  return out;
}

export interface JournalStatement extends StatementHeader {
  costCentre: string;
  lines: readonly StatementLine[];
}

export const JOURNAL_CSV_COLUMNS = [
  "cost_centre",
  "project_code",
  "amount",
  "currency",
  "period_start",
  "period_end",
  "reference",
  "description",
] as const;

/** The chargeback journal for the finance office: one row per cost centre and project. */
export function journalCsv(statements: readonly JournalStatement[]): string {
  let out = csvRow([...JOURNAL_CSV_COLUMNS]);
  for (const statement of statements) {
    for (const total of projectTotals(statement.lines)) {
      if (total.amount_minor === 0) continue;
      out += csvRow([
        csvField(statement.costCentre, { text: true }),
        csvField(total.projectCode, { text: true }),
        decimalAmount({ amount: total.amount_minor, currency: statement.currency }),
        statement.currency,
        statement.periodStart,
        statement.periodEnd,
        csvField(statement.reference, { text: true }),
        csvField(`LC core facility chargeback: ${total.projectName}`, { text: true }),
      ]);
    }
  }
  return out;
}

/** "ST-000042": the reference printed on a statement and used in files. */
export const statementReference = (id: number) => `ST-${String(id).padStart(6, "0")}`;

/** First and last UTC day of a month "YYYY-MM". */
export function monthBounds(month: string): { periodStart: string; periodEnd: string } {
  const [y, m] = month.split("-").map(Number) as [number, number];
  const start = new Date(Date.UTC(y, m - 1, 1));
  const end = new Date(Date.UTC(y, m, 0));
  return { periodStart: start.toISOString().slice(0, 10), periodEnd: end.toISOString().slice(0, 10) };
}

/** The day after a UTC day. */
export function nextDay(day: string): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
}

/** A line's quantity for people: "1.12 L", "2.4 mL", "3.405 g", "222 injections". */
export function quantityLabel(line: Pick<StatementLine, "quantity" | "quantityUnit">): string {
  const q = Number(line.quantity);
  if (line.quantityUnit === "mL") return formatVolume(q);
  if (line.quantityUnit === "g") return `${formatNumber(q, 3)} g`;
  if (line.quantityUnit === "batch") return `${q} ${q === 1 ? "batch" : "batches"}`;
  return `${q} ${q === 1 ? "injection" : "injections"}`;
}
