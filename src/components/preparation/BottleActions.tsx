import { useState } from "react";
import type { BatchComponentDetail, BatchDetail, BottleDetail, BottleStatus } from "../../lib/preparation/types";
import { ConfirmAction, UndoNotice } from "../common/ConfirmAction";
import { HydratedControls } from "../forms/island-form";
import { errorMessage, postJson } from "../forms/post-json";
import { fmt } from "./amounts";

const LABEL: Record<BottleStatus, string> = { ready: "ready", in_use: "in use", empty: "empty", discarded: "discarded" };

/** How a discarded volume splits over the liquids of the mix, as the service books it. */
function split(liquids: readonly BatchComponentDetail[], volume_mL: number): string {
  const total = liquids.reduce((a, c) => a + (c.actual ?? c.target), 0) || 1;
  return liquids.map((c) => `${fmt((volume_mL * (c.actual ?? c.target)) / total)} mL ${c.name.toLowerCase()}`).join(", ");
}

/** Per-bottle state: put in use, mark empty, or discard what is left (it goes to waste); the last two confirmed, and undoable for a while. */
export default function BottleActions({
  batchId,
  batchCode,
  bottles,
  share_mL,
  remaining_mL,
  components,
  expired,
  canUpdate,
}: {
  batchId: number;
  batchCode: string;
  bottles: BottleDetail[];
  share_mL: number;
  remaining_mL: number;
  components: BatchComponentDetail[];
  expired: boolean;
  canUpdate: boolean;
}) {
  const [list, setList] = useState(bottles);
  const [remaining, setRemaining] = useState(remaining_mL);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<number | null>(null);
  const [left, setLeft] = useState<Record<number, string>>({});
  const [done, setDone] = useState<{ number: number; text: string } | null>(null);
  const [undone, setUndone] = useState<string | null>(null);
  const liquids = components.filter((c) => c.unit === "mL");

  const leftIn = (number: number) => {
    const text = (left[number] ?? "").replace(",", ".").trim();
    const n = Number(text);
    return text !== "" && Number.isFinite(n) && n >= 0 ? Math.min(n, remaining) : Math.min(share_mL, remaining);
  };
  function show(result: { batch: BatchDetail }) {
    setList(result.batch.bottleList);
    setRemaining(result.batch.remaining_mL);
  }
  async function change(number: number, status: "in_use" | "empty" | "discarded") {
    setError(null);
    setUndone(null);
    const body: Record<string, unknown> = { status };
    if (status === "discarded") body.discarded_mL = leftIn(number);
    const result = await postJson<{ batch: BatchDetail }>(`/api/batches/${batchId}/bottles/${number}`, body);
    show(result);
    const bottle = result.batch.bottleList.find((b) => b.number === number);
    if (status !== "in_use")
      setDone({
        number,
        text:
          status === "discarded"
            ? `Bottle ${number} discarded: ${fmt(bottle?.discarded_mL ?? 0)} mL to waste.`
            : `Bottle ${number} marked empty.`,
      });
  }
  async function putInUse(number: number) {
    setBusy(number);
    try {
      await change(number, "in_use");
    } catch (e) {
      setError(errorMessage(e));
    } finally {
      setBusy(null);
    }
  }
  async function undo(number: number) {
    const before = list.find((b) => b.number === number);
    const result = await postJson<{ batch: BatchDetail }>(`/api/batches/${batchId}/bottles/${number}`, { undo: true });
    show(result);
    setDone(null);
    setUndone(
      before?.status === "discarded"
        ? `Undone: ${fmt(before.discarded_mL ?? 0)} mL back in ${batchCode}. The ledger keeps the discard and a reversing entry (correction) beside it.`
        : `Undone: bottle ${number} is ${LABEL[result.batch.bottleList.find((b) => b.number === number)?.status ?? "ready"]} again.`,
    );
  }
  const offerFor = done ? list.find((b) => b.number === done.number)?.undo : null;
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
              const volume = leftIn(b.number);
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
                      <span className="ml-2 text-xs text-[var(--color-muted)]">{fmt(b.discarded_mL)} mL to waste</span>
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
                              onClick={() => putInUse(b.number)}
                            >
                              Put in use
                            </button>
                          )}
                          <ConfirmAction
                            label="Mark empty"
                            ariaLabel={`Mark bottle ${b.number} empty`}
                            title={`Mark bottle ${b.number} of ${batchCode} empty?`}
                            consequences={[
                              `Bottle ${b.number} of ${list.length} is marked empty; nothing goes to the waste ledger (what it held was drawn in runs).`,
                              `The batch still records ${fmt(remaining)} mL left over its open bottles.`,
                            ]}
                            confirmLabel={`Mark bottle ${b.number} empty`}
                            onConfirm={() => change(b.number, "empty")}
                          />
                          <ConfirmAction
                            label="Discard"
                            ariaLabel={`Discard bottle ${b.number}`}
                            tone="danger"
                            title={`Discard bottle ${b.number} of ${batchCode}?`}
                            consequences={[
                              `${fmt(volume)} mL go to waste as "discard" entries in the ledger${liquids.length ? `: ${split(liquids, volume)}` : ""}.`,
                              `The batch goes from ${fmt(remaining)} mL to ${fmt(Math.max(0, remaining - volume))} mL left.`,
                              `Bottle ${b.number} of ${list.length} is discarded.`,
                            ]}
                            confirmLabel={`Discard ${fmt(volume)} mL`}
                            caution="Empty it into the waste container for its stream, as your laboratory's waste rules and SOPs say."
                            onConfirm={() => change(b.number, "discarded")}
                          >
                            <label className="field">
                              <span className="text-sm">mL left in bottle {b.number}</span>
                              <input
                                className="input w-32 text-right"
                                inputMode="decimal"
                                aria-label={`mL left in bottle ${b.number}`}
                                value={left[b.number] ?? String(Math.round(Math.min(share_mL, remaining)))}
                                onChange={(e) => setLeft({ ...left, [b.number]: e.target.value })}
                              />
                            </label>
                          </ConfirmAction>
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
      {done && offerFor && (
        <UndoNotice key={`${done.number}-${offerFor.until}`} done={done.text} offer={offerFor} onUndo={() => undo(done.number)} />
      )}
      {undone && (
        <p className="notice notice-ok mt-3" role="status" data-testid="undone">
          {undone}
        </p>
      )}
      {error && (
        <p className="notice notice-danger mt-3" role="alert">
          {error}
        </p>
      )}
      {canUpdate && (
        <p className="mt-2 text-xs text-[var(--color-muted)]">
          Discarding sends what is left in the bottle to waste (a "discard" entry in the ledger); it can be undone for two minutes, by a
          reversing entry. Dispose of it by your laboratory's waste rules.
        </p>
      )}
    </div>
  );
}
