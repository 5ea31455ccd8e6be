import convert from "convert-units";
import type { UseFormReturn } from "react-hook-form";
import { lotExpired } from "../../lib/preparation/expiry";
import { assayNote, assayUsed } from "../../lib/preparation/lot-assays";
import type { PlannedComponent } from "../../lib/preparation/plan";
import type { FormLot } from "../../lib/preparation/types";
import type { BatchCreateInput } from "../../lib/schemas/preparation";
import { fmt, type MassUnit, type VolumeUnit } from "./amounts";

const ROLE_LABEL: Record<string, string> = { solvent: "solvent", buffer: "buffer", titrant: "to pH", additive: "additive" };

interface Props {
  lines: PlannedComponent[];
  lots: FormLot[];
  /** The lot picked on each line, if any: its assay sets the amount and is said under the pick. */
  pickedLots: (FormLot | undefined)[];
  form: UseFormReturn<BatchCreateInput>;
  units: { liquid: VolumeUnit; mass: MassUnit };
  /** What was typed as each line's actual amount, by row key (the form keeps the canonical number). */
  texts: Record<string, string>;
  onText: (rowKey: string, text: string) => void;
  rowKey: (index: number) => string;
  /** Form fields outside the facility's tolerances. */
  deviantFields: Set<string>;
}

/** The planned components: target amount, the lot used and the amount actually weighed or measured. */
export function AmountsTable({ lines, lots, pickedLots, form, units, texts, onText, rowKey, deviantFields }: Props) {
  const display = (amount: number, unit: "mL" | "g") =>
    unit === "mL" ? convert(amount).from("ml").to(units.liquid) : convert(amount).from("g").to(units.mass);
  const canonical = (value: number, unit: "mL" | "g") =>
    unit === "mL" ? convert(value).from(units.liquid).to("ml") : convert(value).from(units.mass).to("g");
  const unitLabel = (unit: "mL" | "g") => (unit === "mL" ? (units.liquid === "ml" ? "mL" : "L") : units.mass);
  return (
    <div className="overflow-x-auto">
      <table className="table" data-testid="amounts">
        <thead>
          <tr>
            <th>Component</th>
            <th className="num">Target</th>
            <th>Lot used</th>
            <th className="num">Actual</th>
          </tr>
        </thead>
        <tbody>
          {lines.map((c, i) => {
            const options = lots.filter((l) => l.reagent === c.reagent);
            const field = `components.${i}.actualAmount`;
            const lotError = form.formState.errors.components?.[i]?.stockLotId?.message;
            const text = texts[rowKey(i)] ?? "";
            return (
              <tr key={rowKey(i)} data-reagent={c.reagent}>
                <td>
                  <span className="font-medium">{c.name}</span> <span className="tag tag-muted ml-1">{ROLE_LABEL[c.role]}</span>
                </td>
                <td className="num whitespace-nowrap" data-testid={`target-${c.reagent}`}>
                  {fmt(display(c.target, c.unit))} {unitLabel(c.unit)}
                </td>
                <td>
                  <select
                    className="input w-full min-w-44 py-1"
                    aria-label={`Lot of ${c.name}`}
                    aria-invalid={lotError ? true : undefined}
                    aria-describedby={lotError ? `lot-${i}-error` : undefined}
                    {...form.register(`components.${i}.stockLotId` as const, { valueAsNumber: true })}
                  >
                    <option value={0}>Choose a lot…</option>
                    {options.map((l) => {
                      const expired = lotExpired(l.expiresOn);
                      return (
                        <option key={l.id} value={l.id} disabled={expired}>
                          {`${l.lotNumber} · ${l.grade} · exp. ${l.expiresOn}${expired ? " · EXPIRED" : l.low ? " · low" : ""}`}
                        </option>
                      );
                    })}
                  </select>
                  {options.length === 0 && <p className="field-error">No lot of {c.name} is recorded: add it under Stock lots.</p>}
                  {(() => {
                    const lot = pickedLots[i];
                    const note = lot ? assayNote(assayUsed(c.reagent, c.role, lot)) : null;
                    return note ? (
                      <p
                        className={lot?.assayPercent === null ? "text-xs text-[var(--color-amber)]" : "text-xs text-[var(--color-muted)]"}
                        data-testid={`assay-${c.reagent}`}
                      >
                        {note}
                      </p>
                    ) : null;
                  })()}
                  {lotError && (
                    <p id={`lot-${i}-error`} className="field-error" role="alert">
                      {lotError}
                    </p>
                  )}
                </td>
                <td className="num">
                  <input
                    className="input w-28 py-1 text-right"
                    inputMode="decimal"
                    aria-label={`Actual amount of ${c.name} (${unitLabel(c.unit)})`}
                    value={text}
                    placeholder={fmt(display(c.target, c.unit))}
                    aria-invalid={deviantFields.has(field) ? true : undefined}
                    onChange={(e) => {
                      onText(rowKey(i), e.target.value);
                      const n = Number(e.target.value.replace(",", "."));
                      form.setValue(
                        `components.${i}.actualAmount` as const,
                        e.target.value.trim() !== "" && Number.isFinite(n) ? canonical(n, c.unit) : null,
                      );
                    }}
                  />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
