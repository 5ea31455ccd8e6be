import { useState } from "react";
import type { ContainerStatus } from "../../lib/waste/types";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

/** Marks a container full (it then takes no more runs) or back in use. */
export default function StatusButtons({
  containerId,
  status,
}: {
  containerId: number;
  status: Extract<ContainerStatus, "in_use" | "full">;
}) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const next = status === "in_use" ? "full" : "in_use";
  const change = async () => {
    setBusy(true);
    setProblem(null);
    try {
      await postJson(`/api/waste/containers/${containerId}/status`, { status: next });
      window.location.reload();
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(false);
    }
  };
  return (
    <HydratedControls>
      <div className="flex flex-col gap-1">
        <button type="button" className="btn btn-quiet text-sm" disabled={busy} onClick={change}>
          {next === "full" ? "Mark full (takes no more waste)" : "Put back in use"}
        </button>
        {problem && (
          <p className="field-error" role="alert">
            {problem}
          </p>
        )}
      </div>
    </HydratedControls>
  );
}
