import { useState } from "react";
import type { PreparationSettings } from "../../lib/schemas/preparation";
import { preparationSettingsSchema } from "../../lib/schemas/preparation";
import { formatZodError } from "../../lib/schemas/zod-error";
import { errorMessage, postJson } from "../forms/post-json";
import { IslandForm } from "../forms/island-form";
import { shelfLifeText } from "../../lib/preparation/expiry";
import { LabelStockEditor } from "./LabelStockEditor";

/** Expiry rules, deviation tolerances and label stocks, for a manager. */
export default function PreparationSettingsForm({ initial }: { initial: PreparationSettings }) {
  const [rules, setRules] = useState(initial.expiryRules);
  const [pH, setPH] = useState(String(initial.tolerances.pH));
  const [amount, setAmount] = useState(String(initial.tolerances.amount_percent));
  const [stocks, setStocks] = useState(initial.labelStocks);
  const [defaultStock, setDefaultStock] = useState(initial.defaultLabelStockId);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const setLife = (i: number, hours: number) => setRules(rules.map((x, j) => (j === i ? { ...x, shelfLife_h: hours } : x)));

  async function save(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    const candidate = {
      expiryRules: rules,
      tolerances: { pH, amount_percent: amount },
      labelStocks: stocks,
      defaultLabelStockId: defaultStock,
    };
    const parsed = preparationSettingsSchema.safeParse(candidate);
    if (!parsed.success) return setMessage({ ok: false, text: formatZodError(parsed.error) });
    try {
      await postJson("/api/settings/preparation", parsed.data, "PUT");
      setMessage({ ok: true, text: "Saved. New batches use these settings; batches already made keep their expiry." });
    } catch (e) {
      setMessage({ ok: false, text: errorMessage(e) });
    }
  }

  return (
    <IslandForm onSubmit={save} className="grid gap-6" noValidate>
      <section className="card p-5" aria-labelledby="rules-heading">
        <h2 id="rules-heading">Expiry rules</h2>
        <p className="text-sm text-[var(--color-muted)]">
          The defaults are common practice, not regulation: set them to your facility's SOPs. A batch expires at the earlier of its rule and
          the expiry of any lot in it.
        </p>
        <div className="mt-3 overflow-x-auto">
          <table className="table">
            <thead>
              <tr>
                <th>Kind of mobile phase</th>
                <th className="num">Shelf life</th>
                <th>Reason shown to the technician</th>
              </tr>
            </thead>
            <tbody>
              {rules.map((r, i) => (
                <tr key={r.kind}>
                  <td className="font-medium">{r.label}</td>
                  <td className="num">
                    <span className="inline-flex items-center gap-1">
                      <input
                        aria-label={`Shelf life of ${r.label}: days`}
                        className="input w-16 text-right"
                        inputMode="numeric"
                        value={String(Math.floor(r.shelfLife_h / 24))}
                        onChange={(e) => setLife(i, Number(e.target.value) * 24 + (r.shelfLife_h % 24))}
                      />
                      d
                      <input
                        aria-label={`Shelf life of ${r.label}: hours`}
                        className="input w-14 text-right"
                        inputMode="numeric"
                        value={String(r.shelfLife_h % 24)}
                        onChange={(e) => setLife(i, Math.floor(r.shelfLife_h / 24) * 24 + Number(e.target.value))}
                      />
                      h
                    </span>
                    <p className="mt-1 text-xs text-[var(--color-muted)]">{shelfLifeText(r.shelfLife_h)}</p>
                  </td>
                  <td>
                    <input
                      aria-label={`Reason for ${r.label}`}
                      className="input w-full min-w-72"
                      value={r.reason}
                      onChange={(e) => setRules(rules.map((x, j) => (j === i ? { ...x, reason: e.target.value } : x)))}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>
      <section className="card grid gap-4 p-5 sm:grid-cols-2" aria-labelledby="tol-heading">
        <h2 id="tol-heading" className="sm:col-span-2">
          Deviation tolerances
        </h2>
        <div className="field">
          <label htmlFor="tol-ph">pH (± units)</label>
          <input id="tol-ph" className="input" inputMode="decimal" value={pH} onChange={(e) => setPH(e.target.value)} />
        </div>
        <div className="field">
          <label htmlFor="tol-amount">Amounts (± %)</label>
          <input id="tol-amount" className="input" inputMode="decimal" value={amount} onChange={(e) => setAmount(e.target.value)} />
        </div>
      </section>
      <section className="card grid gap-3 p-5" aria-labelledby="stocks-heading">
        <h2 id="stocks-heading">Label stocks</h2>
        <p className="text-sm text-[var(--color-muted)]">
          A roll prints one label per page; a sheet places a grid of labels on each page. The drawing shows what the printer gets.
        </p>
        <LabelStockEditor stocks={stocks} onChange={setStocks} />
        <div className="field w-72">
          <label htmlFor="stock-default">Default stock</label>
          <select id="stock-default" className="input" value={defaultStock} onChange={(e) => setDefaultStock(e.target.value)}>
            {stocks.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </div>
      </section>
      <div className="flex items-center gap-3">
        <button className="btn" type="submit">
          Save settings
        </button>
        {message && (
          <p className={message.ok ? "text-sm text-[var(--color-ok)]" : "field-error"} role={message.ok ? "status" : "alert"}>
            {message.text}
          </p>
        )}
      </div>
    </IslandForm>
  );
}
