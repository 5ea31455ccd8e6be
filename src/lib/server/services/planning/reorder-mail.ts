// The weekly e-mail to facility managers listing the reagents to order: those that will run out
// within their lead time and those at or below their reorder point.
import { formatNumber } from "../../../format";
import type { SupplyRow } from "../../../planning/types";
import { withJobLock } from "../../job-lock";
import { escapeHtml, publicOrigin, sendMail, type OutgoingMail } from "../../mail";
import { execute, select, selectOne } from "../../query";
import { settingValue, supplyOverview } from "./supply";

const LAST_SENT_KEY = "digest.reorder.lastSentWeek";
/** The mail goes out on the first check on a Monday at or after this hour (UTC). */
export const REORDER_MAIL_HOUR_UTC = 6;

export interface ReorderMailResult {
  ran: boolean;
  /** The Monday (YYYY-MM-DD, UTC) of the week the mail counts for, when it was sent. */
  sentFor: string | null;
  reagents: string[];
  recipients: string[];
}

/** Monday of the ISO week of `now`, UTC. */
export function weekOf(now: Date): string {
  const d = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()));
  d.setUTCDate(d.getUTCDate() - ((d.getUTCDay() + 6) % 7));
  return d.toISOString().slice(0, 10);
}

const amount = (row: SupplyRow, v: number) =>
  `${formatNumber(row.unit === "mL" ? v / 1000 : v, row.unit === "mL" ? 1 : 0)} ${row.unit === "mL" ? "L" : "g"}`;

export function reorderLine(row: SupplyRow): string {
  const when =
    row.state === "runs-out"
      ? `runs out about ${row.runsOutOn}, within its ${row.leadTime_days}-day lead time`
      : "at or below its reorder point";
  return `${row.name}: ${amount(row, row.onHand)} on hand, ${when}; order about ${amount(row, row.suggestedOrder)}`;
}

/**
 * Sends the mail once per week, however many instances call it and however often: a job lock
 * keeps two instances from sending at once, and the week it was sent for is kept in settings.
 */
export async function runReorderMail(
  options: { now?: Date; send?: (mail: OutgoingMail) => Promise<void> } = {},
): Promise<ReorderMailResult> {
  const now = options.now ?? new Date();
  const send = options.send ?? sendMail;
  const week = weekOf(now);
  const nothing: ReorderMailResult = { ran: false, sentFor: null, reagents: [], recipients: [] };
  if (now.getUTCDay() !== 1 || now.getUTCHours() < REORDER_MAIL_HOUR_UTC) return nothing;
  const outcome = await withJobLock("reorder-mail", 5 * 60_000, async () => {
    const last = await selectOne<{ value: unknown }>("SELECT value FROM settings WHERE `key` = ?", { replacements: [LAST_SENT_KEY] });
    const lastWeek = settingValue(last?.value);
    if (lastWeek === week) return nothing;
    const due = (await supplyOverview(now)).filter((r) => r.state !== "ok");
    const managers = await select<{ email: string }>("SELECT email FROM users WHERE role = 'manager' AND active = 1 ORDER BY email");
    if (due.length > 0) {
      const lines = due.map(reorderLine);
      const link = `${publicOrigin()}/planning/supply`;
      const subject = `Decant: ${due.length} reagent${due.length === 1 ? "" : "s"} to order this week`;
      const advice =
        "Amounts cover the lead time, the safety stock and about 30 days of use at the rate of the last 30 or 90 days, whichever is higher. Store what arrives as your SOPs and the room's limits for flammable liquids allow.";
      const text = `Reagents to order:\n\n${lines.map((l) => `- ${l}`).join("\n")}\n\n${advice}\n\n${link}\n`;
      const html = `<p>Reagents to order:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul><p>${escapeHtml(advice)}</p><p><a href="${escapeHtml(link)}">Open supply in Decant</a></p>`;
      for (const { email } of managers) await send({ to: email, subject, text, html });
    }
    await execute(
      "INSERT INTO settings (`key`, value, updated_at) VALUES (?, ?, NOW(3)) ON DUPLICATE KEY UPDATE value = VALUES(value), updated_at = NOW(3)",
      { replacements: [LAST_SENT_KEY, JSON.stringify(week)] },
    );
    return { ran: true, sentFor: week, reagents: due.map((r) => r.reagentId), recipients: due.length ? managers.map((m) => m.email) : [] };
  });
  return outcome.ran ? outcome.result : nothing;
}
