import { useState } from "react";
import type { BatchDetail, BottleDetail, BottleStatus } from "../../lib/preparation/types";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

const LABEL: Record<BottleStatus, string> = { ready: "ready", in_use: "in use", empty: "empty", discarded: "discarded" };

/** Per-bottle state: put in use, mark empty, or discard what is left (it goes to waste). */
export default function BottleActions({
  batchId,
  bottles,
  share_mL,
  expired,
  canUpdate,
}: {
  batchId: number;
  bottles: BottleDetail[];
  share_mL: number;
  expired: boolean;
  canUpdate: boolean;
}) {
  const [list, setList] = useState(bottles);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<number | null>(null);
  const [left, setLeft] = useState<Record<number, string>>({});
  async function change(number: number, status: "in_use" | "empty" | "discarded") {
    setError(null);
    setBusy(number);
    try {
      const body: Record<string, unknown> = { status };
      if (status === "discarded") {
        const n = Number((left[number] ?? "").replace(",", "."));
        if ((left[number] ?? "").trim() !== "" && Number.isFinite(n)) body.discarded_mL = n;
      }
      const result = await postJson<{ batch: BatchDetail }>(`/api/batches/${batchId}/bottles/${number}`, body);
      setList(result.batch.bottleList);
    } catch (e) {
      setError(errorMessage(e));
    } finally {
      setBusy(null);
    }
  }
  return (
    <div>
      <HydratedControls>
        <table className="table table-cards">
          <thead>
            <tr>
              <th>Bottle</th>
              <th>State</th>
              {canUpdate && <th>Change</th>}
            </tr>
          </thead>
          <tbody>
            {list.map((b) => {
              const open = b.status === "ready" || b.status === "in_use";
              return (
                <tr key={b.number}>
                  <td data-label="Bottle">
                    {b.number} of {list.length}
                  </td>
                  <td data-label="State">
                    <span className={`tag ${b.status === "in_use" ? "" : b.status === "ready" ? "tag-amber" : "tag-muted"}`}>
                      {LABEL[b.status]}
                    </span>
                    {b.discarded_mL !== null && (
                      <span className="ml-2 text-xs text-[var(--color-muted)]">{b.discarded_mL} mL to waste</span>
                    )}
                  </td>
                  {canUpdate && (
                    <td data-label="Change">
                      {open ? (
                        <div className="flex flex-wrap items-center gap-2">
                          {b.status === "ready" && !expired && (
                            <button
                              type="button"
                              className="btn btn-quiet py-1"
                              disabled={busy === b.number}
                              onClick={() => change(b.number, "in_use")}
                            >
                              Put in use
                            </button>
                          )}
                          <button
                            type="button"
                            className="btn btn-quiet py-1"
                            disabled={busy === b.number}
                            onClick={() => change(b.number, "empty")}
                          >
                            Mark empty
                          </button>
                          <input
                            className="input w-24 py-1 text-right"
                            inputMode="decimal"
                            aria-label={`mL left in bottle ${b.number}`}
                            placeholder={`${Math.round(share_mL)} mL`}
                            value={left[b.number] ?? ""}
                            onChange={(e) => setLeft({ ...left, [b.number]: e.target.value })}
                          />
                          <button
                            type="button"
                            className="btn btn-quiet py-1 text-[var(--color-danger)]"
                            disabled={busy === b.number}
                            onClick={() => change(b.number, "discarded")}
                          >
                            Discard
                          </button>
                        </div>
                      ) : (
                        <span className="text-xs text-[var(--color-muted)]">done</span>
                      )}
                    </td>
                  )}
                </tr>
              );
            })}
          </tbody>
        </table>
      </HydratedControls>
      {error && (
        <p className="notice notice-danger mt-3" role="alert">
          {error}
        </p>
      )}
      {canUpdate && (
        <p className="mt-2 text-xs text-[var(--color-muted)]">
          Discarding sends what is left in the bottle to waste (a "discard" entry in the ledger). Dispose of it by your laboratory's waste
          rules.
        </p>
      )}
    </div>
  );
}
