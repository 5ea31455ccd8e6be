import { useState, type FormEvent } from "react";
import { IslandForm } from "../forms/island-form";
import { postJson } from "../forms/post-json";

interface Props {
  reagents: { id: string; name: string; unit: "mL" | "g"; leadTime_days: number; safetyStock: number }[];
}

/** One reagent's lead time and safety stock (the reorder point's two settings). */
export default function SupplySettingsForm({ reagents }: Props) {
  const [reagentId, setReagentId] = useState(reagents[0]?.id ?? "");
  const chosen = reagents.find((r) => r.id === reagentId);
  const [lead, setLead] = useState(String(chosen?.leadTime_days ?? 14));
  const [safety, setSafety] = useState(String(chosen?.safetyStock ?? 0));
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  function pick(id: string) {
    setReagentId(id);
    const r = reagents.find((x) => x.id === id);
    setLead(String(r?.leadTime_days ?? 14));
    setSafety(String(r?.safetyStock ?? 0));
  }

  async function save(event: FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    try {
      const asNumber = (s: string) => (s.trim() === "" ? undefined : Number(s.replace(",", ".")));
      await postJson("/api/planning/supply", { reagentId, leadTime_days: asNumber(lead), safetyStock: asNumber(safety) }, "PUT");
      window.location.assign(`/planning/supply?saved=${encodeURIComponent(reagentId)}`);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
      setBusy(false);
    }
  }

  return (
    <IslandForm className="card flex flex-wrap items-end gap-3 p-4" onSubmit={save} aria-label="Lead time and safety stock">
      <label className="field">
        <span>Reagent</span>
        <select className="input" name="reagentId" value={reagentId} onChange={(e) => pick(e.target.value)}>
          {reagents.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Lead time, days</span>
        <input className="input w-28" inputMode="numeric" name="leadTime_days" value={lead} onChange={(e) => setLead(e.target.value)} />
      </label>
      <label className="field">
        <span>Safety stock, {chosen?.unit ?? "mL"}</span>
        <input className="input w-32" inputMode="decimal" name="safetyStock" value={safety} onChange={(e) => setSafety(e.target.value)} />
      </label>
      <button type="submit" className="btn" disabled={busy}>
        Save
      </button>
      {error && (
        <p className="field-error w-full" role="alert">
          {error}
        </p>
      )}
    </IslandForm>
  );
}
