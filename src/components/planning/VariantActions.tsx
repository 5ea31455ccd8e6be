import { useState } from "react";
import { HydratedControls } from "../forms/island-form";
import { postJson } from "../forms/post-json";

/** Sends a request and reloads the page on success; shows the route's message otherwise. */
function useAction(reloadTo: string) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function run(url: string, body: unknown) {
    setBusy(true);
    setError(null);
    try {
      await postJson(url, body);
      window.location.assign(reloadTo);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
      setBusy(false);
    }
  }
  return { error, busy, run };
}

const Problem = ({ error }: { error: string | null }) =>
  error ? (
    <p className="field-error mt-2" role="alert">
      {error}
    </p>
  ) : null;

/** Makes a kept variant the method's next version, waiting for a manager's approval. */
export function SubmitVariantButton({ variantId, methodId }: { variantId: number; methodId: number }) {
  const { error, busy, run } = useAction(`/planning/methods/${methodId}?submitted=${variantId}#versions`);
  const [note, setNote] = useState("");
  return (
    <div className="flex flex-col gap-2">
      <HydratedControls>
        <label className="field">
          <span>Note for the approver (optional)</span>
          <input className="input" value={note} maxLength={255} onChange={(e) => setNote(e.target.value)} name={`note-${variantId}`} />
        </label>
        <div>
          <button
            type="button"
            className="btn"
            disabled={busy}
            onClick={() => run(`/api/planning/variants/${variantId}/submit`, note.trim() ? { note: note.trim() } : {})}
          >
            Save as a new method version
          </button>
        </div>
      </HydratedControls>
      <Problem error={error} />
    </div>
  );
}

/** A manager's decision on a pending method version. */
export function VersionDecision({ versionId, version, methodId }: { versionId: number; version: number; methodId: number }) {
  const { error, busy, run } = useAction(`/planning/methods/${methodId}?decided=${versionId}#versions`);
  return (
    <div>
      <HydratedControls>
        <div className="flex flex-wrap gap-2">
          <button
            type="button"
            className="btn"
            disabled={busy}
            onClick={() => run(`/api/planning/versions/${versionId}`, { decision: "approve" })}
          >
            Approve version {version}
          </button>
          <button
            type="button"
            className="btn btn-quiet"
            disabled={busy}
            onClick={() => run(`/api/planning/versions/${versionId}`, { decision: "reject" })}
          >
            Set aside
          </button>
        </div>
      </HydratedControls>
      <Problem error={error} />
    </div>
  );
}
