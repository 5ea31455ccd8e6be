import { useState } from "react";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

interface Props {
  clientId: number;
  clientName: string;
  periodStart: string;
  periodEnd: string;
}

/** Opens (creates) the client's draft statement for the period and goes to it. */
export default function OpenStatementButton({ clientId, clientName, periodStart, periodEnd }: Props) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  async function open() {
    setBusy(true);
    setProblem(null);
    try {
      const { id } = await postJson<{ id: number }>("/api/statements", { clientId, periodStart, periodEnd });
      window.location.assign(`/statements/${id}`);
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(false);
    }
  }
  return (
    <HydratedControls>
      <span className="inline-flex flex-col gap-1">
        <button type="button" className="btn btn-quiet" onClick={open} disabled={busy} aria-label={`Open the draft for ${clientName}`}>
          {busy ? "Opening…" : "Open draft"}
        </button>
        {problem && (
          <span className="field-error" role="alert">
            {problem}
          </span>
        )}
      </span>
    </HydratedControls>
  );
}
