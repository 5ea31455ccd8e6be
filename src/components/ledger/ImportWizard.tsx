import { useRef, useState } from "react";
import { formatDateTime, formatVolume } from "../../lib/format";
import { readRunLog, RUN_LOG_MAX_BYTES, type RowIssue, type RunLogRow } from "../../lib/imports/run-log";
import type { ImportReport } from "../../lib/imports/types";
import { HydratedControls } from "../forms/island-form";

type Report = Omit<ImportReport, "fileName" | "checksum">;

type Stage =
  | { step: "idle" }
  | { step: "reading"; fraction: number; label: string }
  | { step: "checked"; rows: RunLogRow[]; rowCount: number; issues: RowIssue[]; report: Report | null }
  | { step: "committing" }
  | { step: "done"; report: Report };

const yieldToBrowser = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

async function send(mode: "check" | "commit", file: File, content: string): Promise<{ status: number; body: Report & { error?: string } }> {
  const response = await fetch(`/api/imports?mode=${mode}&fileName=${encodeURIComponent(file.name)}`, {
    method: "POST",
    headers: { "content-type": "text/csv" },
    body: content,
  });
  const body = (await response.json().catch(() => ({ error: `The server answered ${response.status}.` }))) as Report & {
    error?: string;
    report?: Report;
  };
  return { status: response.status, body: body.report ? { ...body.report, error: body.error } : body };
}

function Issues({ issues }: { issues: RowIssue[] }) {
  if (issues.length === 0) return null;
  return (
    <div className="card overflow-x-auto" role="alert">
      <p className="px-4 pt-3 text-sm font-semibold text-[var(--color-danger)]">
        {issues.length} problem{issues.length === 1 ? "" : "s"}: nothing has been written.
      </p>
      <table className="table" aria-label="Problems in the file">
        <thead>
          <tr>
            <th className="num">Row</th>
            <th>Column</th>
            <th>What is wrong</th>
          </tr>
        </thead>
        <tbody>
          {issues.slice(0, 200).map((i, n) => (
            <tr key={n}>
              <td className="num">{i.row}</td>
              <td>
                <code>{i.column ?? "—"}</code>
              </td>
              <td>{i.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {issues.length > 200 && <p className="px-4 py-2 text-sm text-[var(--color-muted)]">…and {issues.length - 200} more.</p>}
    </div>
  );
}

/** Upload → read and check in the browser (progress, preview, row messages) → check with Decant → commit. */
export default function ImportWizard() {
  const [stage, setStage] = useState<Stage>({ step: "idle" });
  const [problem, setProblem] = useState<string | null>(null);
  const file = useRef<{ file: File; content: string } | null>(null);

  async function choose(event: React.ChangeEvent<HTMLInputElement>) {
    setProblem(null);
    const chosen = event.target.files?.[0];
    if (!chosen) return;
    if (chosen.size > RUN_LOG_MAX_BYTES) {
      setProblem(
        `${chosen.name} is ${(chosen.size / 1024 / 1024).toFixed(1)} MB; the limit is ${RUN_LOG_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files.`,
      );
      setStage({ step: "idle" });
      return;
    }
    setStage({ step: "reading", fraction: 0, label: "Reading the file" });
    const content = await new Promise<string>((resolve, reject) => {
      const reader = new FileReader();
      reader.onprogress = (e) =>
        e.lengthComputable && setStage({ step: "reading", fraction: (e.loaded / e.total) * 0.3, label: "Reading the file" });
      reader.onerror = () => reject(reader.error ?? new Error("The file could not be read."));
      reader.onload = () => resolve(String(reader.result ?? ""));
      reader.readAsText(chosen);
    }).catch((error: unknown) => {
      setProblem(error instanceof Error ? error.message : String(error));
      return null;
    });
    if (content === null) return setStage({ step: "idle" });
    file.current = { file: chosen, content };
    const parsed = await readRunLog(content, {
      chunk: 1_000,
      onProgress: async (done, total) => {
        setStage({
          step: "reading",
          fraction: 0.3 + (done / Math.max(total, 1)) * 0.6,
          label: `Checking row ${done.toLocaleString("en-GB")} of ${total.toLocaleString("en-GB")}`,
        });
        await yieldToBrowser();
      },
    });
    if (parsed.issues.length)
      return setStage({ step: "checked", rows: parsed.rows, rowCount: parsed.rowCount, issues: parsed.issues, report: null });
    setStage({ step: "reading", fraction: 0.92, label: "Checking names, codes and batches with Decant" });
    try {
      const { status, body } = await send("check", chosen, content);
      if (status !== 200) throw new Error(body.error ?? `The check failed (${status}).`);
      setStage({ step: "checked", rows: parsed.rows, rowCount: parsed.rowCount, issues: body.issues, report: body });
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
      setStage({ step: "checked", rows: parsed.rows, rowCount: parsed.rowCount, issues: [], report: null });
    }
  }

  async function commit() {
    if (!file.current) return;
    setProblem(null);
    setStage({ step: "committing" });
    const { status, body } = await send("commit", file.current.file, file.current.content);
    if (status === 201) return setStage({ step: "done", report: body });
    setProblem(body.error ?? `The import failed (${status}).`);
    setStage({ step: "checked", rows: [], rowCount: body.rowCount ?? 0, issues: body.issues ?? [], report: null });
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="card p-5">
        <div className="field max-w-md">
          <label htmlFor="run-log-file">Run log (CSV, at most {RUN_LOG_MAX_BYTES / 1024 / 1024} MB)</label>
          <HydratedControls>
            <input
              id="run-log-file"
              type="file"
              accept=".csv,text/csv"
              className="input"
              onChange={choose}
              disabled={stage.step === "reading" || stage.step === "committing"}
            />
          </HydratedControls>
        </div>
        {stage.step === "reading" && (
          <div className="mt-4">
            <progress className="w-full" max={1} value={stage.fraction} aria-label="Progress" />
            <p className="text-sm text-[var(--color-muted)]" aria-live="polite">
              {stage.label}…
            </p>
          </div>
        )}
      </div>
      {problem && (
        <p className="notice notice-danger" role="alert">
          {problem}
        </p>
      )}
      {stage.step === "checked" && (
        <>
          <Issues issues={stage.issues} />
          {stage.report && stage.issues.length === 0 && (
            <div className="card flex flex-col gap-3 p-5" data-testid="import-ready">
              <p>
                <strong>{stage.report.newRuns.toLocaleString("en-GB")}</strong> new run{stage.report.newRuns === 1 ? "" : "s"} (
                {stage.report.entries.toLocaleString("en-GB")} ledger entries, {formatVolume(stage.report.volume_mL)})
                {stage.report.alreadyRecorded > 0 && (
                  <>
                    ; <strong>{stage.report.alreadyRecorded.toLocaleString("en-GB")}</strong> already recorded, which will be skipped
                  </>
                )}
                .
              </p>
              {stage.report.previousImport && (
                <p className="notice">
                  This very file was imported on {formatDateTime(stage.report.previousImport.at)} (import {stage.report.previousImport.id});
                  runs already recorded are not counted again.
                </p>
              )}
              <div>
                <button type="button" className="btn" onClick={commit} disabled={stage.report.newRuns === 0}>
                  {stage.report.newRuns === 0 ? "Nothing new to import" : `Import ${stage.report.newRuns.toLocaleString("en-GB")} runs`}
                </button>
              </div>
            </div>
          )}
          {stage.rows.length > 0 && (
            <div className="card overflow-x-auto">
              <p className="px-4 pt-3 text-sm text-[var(--color-muted)]">
                Preview: the first {Math.min(10, stage.rows.length)} of {stage.rowCount.toLocaleString("en-GB")} rows
              </p>
              <table className="table" aria-label="Preview">
                <thead>
                  <tr>
                    <th className="num">Row</th>
                    <th>Reference</th>
                    <th>Instrument</th>
                    <th>Method</th>
                    <th>Project</th>
                    <th>Started (UTC)</th>
                    <th className="num">Inj.</th>
                    <th>Batches</th>
                  </tr>
                </thead>
                <tbody>
                  {stage.rows.slice(0, 10).map((r) => (
                    <tr key={r.row}>
                      <td className="num">{r.row}</td>
                      <td>
                        <code>{r.reference}</code>
                      </td>
                      <td>{r.instrument}</td>
                      <td>{r.method}</td>
                      <td>{r.project}</td>
                      <td className="whitespace-nowrap">{formatDateTime(r.startedAt)}</td>
                      <td className="num">
                        {r.injections}
                        {r.blanks ? ` + ${r.blanks}` : ""}
                      </td>
                      <td>
                        {Object.entries(r.batches)
                          .map(([ch, code]) => `${ch}: ${code}`)
                          .join(", ")}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </>
      )}
      {stage.step === "committing" && (
        <p className="notice" aria-live="polite">
          Writing every run in one transaction…
        </p>
      )}
      {stage.step === "done" && (
        <p className="notice" role="status" data-testid="import-done">
          Imported {stage.report.newRuns.toLocaleString("en-GB")} runs ({stage.report.entries.toLocaleString("en-GB")} ledger entries)
          {stage.report.alreadyRecorded ? `; ${stage.report.alreadyRecorded.toLocaleString("en-GB")} already recorded were skipped` : ""}.
          Import {stage.report.importId}.
        </p>
      )}
    </div>
  );
}
