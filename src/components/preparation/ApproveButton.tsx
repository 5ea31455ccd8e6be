import { useState } from "react";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

export default function ApproveButton({ recipeId, version }: { recipeId: number; version: number }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function approve() {
    setBusy(true);
    setError(null);
    try {
      await postJson(`/api/recipes/${recipeId}/approve`, { version });
      window.location.assign(`/recipes/${recipeId}?approved=1`);
    } catch (e) {
      setError(errorMessage(e));
      setBusy(false);
    }
  }
  return (
    <HydratedControls>
      <div>
        <button type="button" className="btn" onClick={approve} disabled={busy}>
          Approve version {version}
        </button>
        {error && (
          <p className="field-error mt-2" role="alert">
            {error}
          </p>
        )}
      </div>
    </HydratedControls>
  );
}
