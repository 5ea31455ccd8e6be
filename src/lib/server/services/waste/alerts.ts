// Container alerts: as they stand now (/api/waste/alerts, the waste pages) and the scheduled check
// that records each one once and mails it to the safety officers. scheduler.ts runs the check.
import { alertMessage } from "../../../waste/alerts";
import type { AlertCheckResult, AlertView } from "../../../waste/types";
import { withJobLock } from "../../job-lock";
import { escapeHtml, sendMail, type OutgoingMail } from "../../mail";
import { execute, select } from "../../query";
import { storedJson } from "./audit";
import { listContainers } from "./containers";
import { readWasteSettings } from "./settings";

/** Alerts as they stand now (computed live, for the pages). */
export async function currentAlerts(now = new Date()): Promise<AlertView[]> {
  const [containers, settings] = await Promise.all([listContainers({ now }), readWasteSettings()]);
  return containers.flatMap((c) =>
    c.alerts.map((kind) => ({
      containerId: c.id,
      code: c.code,
      stream: c.stream,
      room: c.room,
      kind,
      message: alertMessage(c, kind, settings),
    })),
  );
}

/** Records the alerts raised now, once per container accumulation (a unique key in waste_alerts); answers how many are new. */
async function recordAlerts(now: Date): Promise<number> {
  const [containers, settings] = await Promise.all([listContainers({ now }), readWasteSettings()]);
  let raised = 0;
  for (const c of containers) {
    for (const kind of c.alerts) {
      const { affectedRows } = await execute(
        `INSERT IGNORE INTO waste_alerts (container_id, kind, cycle, detail, raised_at) VALUES (:id, :kind, :cycle, :detail, :now)`,
        {
          replacements: {
            id: c.id,
            kind,
            cycle: c.accumulationStartedAt ?? "none",
            detail: JSON.stringify({ message: alertMessage(c, kind, settings), fill_percent: c.fill.percent }),
            now,
          },
        },
      );
      raised += affectedRows > 0 ? 1 : 0;
    }
    // Keep the cached column close to the live estimate.
    await execute("UPDATE waste_containers SET estimated_volume_ml = :v WHERE id = :id AND status <> 'collected'", {
      replacements: { v: c.estimated_mL, id: c.id },
    });
  }
  return raised;
}

const CAUTION =
  "Follow your institution's hazardous-waste procedures and local regulations; Decant's estimates support, and never replace, a look at the container.";

/**
 * The scheduled check: raises each alert once per container accumulation and mails the new ones
 * to the safety officers, under a database lock so that two app instances never send the same mail.
 */
export async function runWasteAlertCheck(
  options: { now?: Date; send?: (mail: OutgoingMail) => Promise<void> } = {},
): Promise<AlertCheckResult> {
  const now = options.now ?? new Date();
  const send = options.send ?? sendMail;
  const outcome = await withJobLock("waste-alerts", 5 * 60_000, async () => {
    const raised = await recordAlerts(now);
    const pending = await select<{ id: number; detail: unknown; code: string }>(
      `SELECT a.id, a.detail, c.code FROM waste_alerts a JOIN waste_containers c ON c.id = a.container_id WHERE a.mailed_at IS NULL ORDER BY c.code, a.id`,
    );
    if (pending.length === 0) return { raised, mailed: 0, recipients: [] };
    const officers = await select<{ email: string }>("SELECT email FROM users WHERE role = 'safety' AND active = 1 ORDER BY id");
    if (officers.length === 0) return { raised, mailed: 0, recipients: [] };
    const lines = pending.map((p) => (storedJson(p.detail) as { message?: string } | null)?.message ?? p.code);
    const subject = `Decant waste alert: ${pending.length === 1 ? lines[0]!.split(" ")[0] : `${pending.length} containers need attention`}`;
    const text = `The scheduled waste check found:\n\n${lines.map((l) => `- ${l}`).join("\n")}\n\n${CAUTION}\n`;
    const html = `<p>The scheduled waste check found:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul><p>${escapeHtml(CAUTION)}</p>`;
    for (const officer of officers) await send({ to: officer.email, subject, text, html });
    await execute("UPDATE waste_alerts SET mailed_at = :now WHERE id IN (:ids)", {
      replacements: { now, ids: pending.map((p) => p.id) },
    });
    return { raised, mailed: pending.length, recipients: officers.map((o) => o.email) };
  });
  return outcome.ran ? { ran: true, ...outcome.result } : { ran: false, raised: 0, mailed: 0, recipients: [] };
}
