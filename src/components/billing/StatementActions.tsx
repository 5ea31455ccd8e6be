import { useState } from "react";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

interface Props {
  statementId: number;
  kind: "internal" | "external";
  /** The total the manager has in front of them; the server refuses if the ledger moved since. */
  total_minor: number;
  totalText: string;
  billingEmail: string | null;
  blocker: string | null;
}

/** Issue (internal) or invoice and send (external) a reviewed draft. */
export default function StatementActions({ statementId, kind, total_minor, totalText, billingEmail, blocker }: Props) {
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [confirming, setConfirming] = useState(false);
  const label = kind === "external" ? "Issue and send invoice" : "Issue chargeback statement";

  async function go() {
    setBusy(true);
    setProblem(null);
    try {
      await postJson(`/api/statements/${statementId}/${kind === "external" ? "invoice" : "issue"}`, { expectedTotal_minor: total_minor });
      window.location.reload();
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(false);
      setConfirming(false);
    }
  }

  if (blocker) return <p className="notice">{blocker}</p>;
  return (
    <HydratedControls>
      <div className="card flex flex-col gap-3 p-4">
        {!confirming ? (
          <div className="flex flex-wrap items-center gap-3">
            <button type="button" className="btn" onClick={() => setConfirming(true)}>
              {label}
            </button>
            <span className="text-sm text-[var(--color-muted)]">Issuing freezes these lines and closes the period for this client.</span>
          </div>
        ) : (
          <div className="flex flex-wrap items-center gap-3" role="group" aria-label="Confirm">
            <span className="text-sm">
              {kind === "external" ? (
                <>
                  Send an invoice for <strong>{totalText}</strong> to {billingEmail ?? "the client"}?
                </>
              ) : (
                <>
                  Issue the statement for <strong>{totalText}</strong>?
                </>
              )}
            </span>
            <button type="button" className="btn" onClick={go} disabled={busy}>
              {busy ? "Working…" : kind === "external" ? "Send invoice" : "Issue"}
            </button>
            <button type="button" className="btn btn-quiet" onClick={() => setConfirming(false)} disabled={busy}>
              Back to review
            </button>
          </div>
        )}
        {problem && (
          <p className="notice notice-danger" role="alert">
            {problem}
          </p>
        )}
      </div>
    </HydratedControls>
  );
}
