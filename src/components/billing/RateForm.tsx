import { useId, useState, type FormEvent } from "react";
import type { PriceList, RateKind } from "../../lib/billing/rates";
import { parseMajorAmount } from "../../lib/billing/statement";
import type { RateReagent } from "../../lib/billing/types";
import { rateInput } from "../../lib/schemas/billing";
import { fieldErrors } from "../../lib/schemas/zod-error";
import { errorMessage, postJson } from "../forms/post-json";
import { IslandForm } from "../forms/island-form";

interface Props {
  reagents: RateReagent[];
  currency: string;
  /** Today, YYYY-MM-DD: the default effective-from. */
  today: string;
}

/** Adds a price. Nothing is edited in place: the new price supersedes the old one from its first day. */
export default function RateForm({ reagents, currency, today }: Props) {
  const id = useId();
  const [kind, setKind] = useState<RateKind>("reagent");
  const [reagentId, setReagentId] = useState(reagents[0]?.id ?? "");
  const [grade, setGrade] = useState("");
  const [priceList, setPriceList] = useState<PriceList>("internal");
  const [price, setPrice] = useState("");
  const [effectiveFrom, setEffectiveFrom] = useState(today);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const reagent = reagents.find((r) => r.id === reagentId);
  const unit = kind === "reagent" ? (reagent?.unit === "g" ? "g" : "L") : kind === "preparation_fee" ? "batch" : "injection";

  async function submit(event: FormEvent) {
    event.preventDefault();
    setProblem(null);
    const amount = parseMajorAmount(price, currency);
    const candidate = {
      kind,
      priceList,
      unit,
      currency,
      effectiveFrom,
      amount_minor: amount ?? Number.NaN,
      ...(kind === "reagent" ? { reagentId, ...(grade ? { grade } : {}) } : {}),
    };
    const parsed = rateInput.safeParse(candidate);
    const found = parsed.success ? {} : fieldErrors(parsed.error);
    if (amount === null) found.amount_minor = `Enter a price such as 42.50 (${currency})`;
    setErrors(found);
    if (Object.keys(found).length) return;
    setBusy(true);
    try {
      await postJson("/api/rates", parsed.success ? parsed.data : candidate);
      window.location.reload();
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(false);
    }
  }

  const error = (name: string) =>
    errors[name] ? (
      <p id={`${id}-${name}-error`} className="field-error" role="alert">
        {errors[name]}
      </p>
    ) : null;

  return (
    <IslandForm onSubmit={submit} className="card grid gap-4 p-5 sm:grid-cols-2 lg:grid-cols-3" noValidate aria-label="Add a rate">
      <div className="field">
        <label htmlFor={`${id}-kind`}>Priced item</label>
        <select id={`${id}-kind`} className="input" value={kind} onChange={(e) => setKind(e.target.value as RateKind)}>
          <option value="reagent">Reagent (per litre or gram)</option>
          <option value="preparation_fee">Preparation fee (per batch)</option>
          <option value="injection_fee">Injection fee (per injection)</option>
        </select>
        {kind !== "reagent" && (
          <p className="text-sm text-[var(--color-muted)]">
            {kind === "preparation_fee"
              ? "Charged once per batch, to the project that first draws from it, on the day of that first use."
              : "Charged per injection of each run, on the day the run started."}
          </p>
        )}
      </div>
      {kind === "reagent" && (
        <>
          <div className="field">
            <label htmlFor={`${id}-reagent`}>Reagent</label>
            <select
              id={`${id}-reagent`}
              className="input"
              value={reagentId}
              onChange={(e) => {
                setReagentId(e.target.value);
                setGrade("");
              }}
              aria-invalid={errors.reagentId ? true : undefined}
            >
              {reagents.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name}
                </option>
              ))}
            </select>
            {error("reagentId")}
          </div>
          <div className="field">
            <label htmlFor={`${id}-grade`}>Grade</label>
            <select
              id={`${id}-grade`}
              className="input"
              value={grade}
              onChange={(e) => setGrade(e.target.value)}
              aria-invalid={errors.grade ? true : undefined}
            >
              <option value="">Any grade (general price)</option>
              {(reagent?.grades ?? []).map((g) => (
                <option key={g} value={g}>
                  {g}
                </option>
              ))}
            </select>
            {error("grade")}
          </div>
        </>
      )}
      <div className="field">
        <label htmlFor={`${id}-list`}>Price list</label>
        <select id={`${id}-list`} className="input" value={priceList} onChange={(e) => setPriceList(e.target.value as PriceList)}>
          <option value="internal">Internal research groups</option>
          <option value="external">External clients</option>
        </select>
      </div>
      <div className="field">
        <label htmlFor={`${id}-price`}>
          Price in {currency} per {unit}
        </label>
        <input
          id={`${id}-price`}
          className="input num"
          inputMode="decimal"
          value={price}
          onChange={(e) => setPrice(e.target.value)}
          placeholder="42.00"
          aria-invalid={errors.amount_minor ? true : undefined}
          aria-describedby={errors.amount_minor ? `${id}-amount_minor-error` : undefined}
        />
        {error("amount_minor")}
      </div>
      <div className="field">
        <label htmlFor={`${id}-from`}>Effective from</label>
        <input
          id={`${id}-from`}
          type="date"
          className="input"
          value={effectiveFrom}
          onChange={(e) => setEffectiveFrom(e.target.value)}
          aria-invalid={errors.effectiveFrom ? true : undefined}
          aria-describedby={errors.effectiveFrom ? `${id}-effectiveFrom-error` : undefined}
        />
        {error("effectiveFrom")}
      </div>
      <div className="flex items-end gap-3 sm:col-span-2 lg:col-span-3">
        <button type="submit" className="btn" disabled={busy}>
          {busy ? "Adding…" : "Add rate"}
        </button>
        <p className="text-sm text-[var(--color-muted)]">Entries before this date keep the price that was in force then.</p>
      </div>
      {problem && (
        <p className="notice notice-danger sm:col-span-2 lg:col-span-3" role="alert">
          {problem}
        </p>
      )}
    </IslandForm>
  );
}
