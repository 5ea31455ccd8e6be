import { useState } from "react";
import type { InvoiceStatus } from "../../lib/billing/types";
import { errorMessage, postJson } from "../forms/post-json";
import { HydratedControls } from "../forms/island-form";

interface Props {
  invoiceId: number;
  number: string | null;
  status: InvoiceStatus;
}

/** The manager's follow-up on a sent invoice: cancel it, or write it off. */
export default function InvoiceActions({ invoiceId, number, status }: Props) {
  const [busy, setBusy] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  async function act(action: "void" | "uncollectible", question: string) {
    if (!window.confirm(question)) return;
    setBusy(action);
    setProblem(null);
    try {
      await postJson(`/api/invoices/${invoiceId}/${action}`, {});
      window.location.reload();
    } catch (error) {
      setProblem(errorMessage(error));
      setBusy(null);
    }
  }
  if (status !== "open" && status !== "uncollectible") return null;
  return (
    <HydratedControls>
      <span className="inline-flex flex-wrap items-center gap-2">
        <button
          type="button"
          className="btn btn-quiet"
          disabled={busy !== null}
          onClick={() =>
            act("void", `Void invoice ${number ?? ""}? The client can no longer pay it; anything owed goes on the next period.`)
          }
        >
          {busy === "void" ? "Voiding…" : "Void"}
        </button>
        {status === "open" && (
          <button
            type="button"
            className="btn btn-quiet"
            disabled={busy !== null}
            onClick={() => act("uncollectible", `Mark invoice ${number ?? ""} uncollectible? It stays payable.`)}
          >
            {busy === "uncollectible" ? "Saving…" : "Write off"}
          </button>
        )}
        {problem && (
          <span className="field-error" role="alert">
            {problem}
          </span>
        )}
      </span>
    </HydratedControls>
  );
}
