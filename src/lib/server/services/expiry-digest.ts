// The daily e-mail to technicians listing the batches that expire within 24 hours.
import { formatInstant, localDay, wallClock } from "../../format";
import { withJobLock } from "../job-lock";
import { escapeHtml, publicOrigin, sendMail, type OutgoingMail } from "../mail";
import { Setting } from "../models/audit";
import { select } from "../query";
import { getFacilitySettings } from "./facility-settings";

const LAST_SENT_KEY = "digest.expiry.lastSentOn";
/** The digest goes out on the first check of the day at or after this hour, in the facility's zone. */
export const DIGEST_HOUR_LOCAL = 6;

export interface ExpiryDigestResult {
  ran: boolean;
  /** Local day (YYYY-MM-DD, the facility's zone) the digest counts for, when it was sent. */
  sentFor: string | null;
  batches: string[];
  recipients: string[];
}

interface ExpiringRow {
  code: string;
  name: string;
  expires_at: Date;
  remaining_ml: number;
}

/**
 * Sends the digest once per day, however many app instances call it and however often: a job
 * lock keeps two instances from sending at once, and the day it was sent is kept in settings.
 */
export async function runExpiryDigest(
  options: { now?: Date; send?: (mail: OutgoingMail) => Promise<void> } = {},
): Promise<ExpiryDigestResult> {
  const now = options.now ?? new Date();
  const send = options.send ?? sendMail;
  const facility = await getFacilitySettings();
  const day = localDay(now, facility.timeZone);
  const nothing: ExpiryDigestResult = { ran: false, sentFor: null, batches: [], recipients: [] };
  if (wallClock(now, facility.timeZone).hour < DIGEST_HOUR_LOCAL) return nothing;
  const outcome = await withJobLock("expiry-digest", 5 * 60_000, async () => {
    const last = await Setting.findByPk(LAST_SENT_KEY);
    if (last?.value === day) return nothing;
    const batches = await select<ExpiringRow>(
      `SELECT b.code, r.name, b.expires_at, b.remaining_ml
         FROM batches b JOIN recipe_versions v ON v.id = b.recipe_version_id JOIN recipes r ON r.id = v.recipe_id
        WHERE b.status IN ('ready', 'in_use') AND b.expires_at > :now AND b.expires_at <= :until
        ORDER BY b.expires_at, b.code`,
      { replacements: { now, until: new Date(now.getTime() + 24 * 3_600_000) } },
    );
    const technicians = await select<{ email: string }>("SELECT email FROM users WHERE role = 'technician' AND active = 1 ORDER BY email");
    if (batches.length > 0) {
      const lines = batches.map(
        (b) => `${b.code} · ${b.name} · expires ${formatInstant(new Date(b.expires_at), facility)} · ${b.remaining_ml} mL left`,
      );
      const link = `${publicOrigin()}/home`;
      const subject = `Decant: ${batches.length} batch${batches.length === 1 ? "" : "es"} expire${batches.length === 1 ? "s" : ""} within 24 hours`;
      const advice =
        "Replace them before the next run; an expired batch cannot be assigned to a run. Dispose of the remainder as your laboratory's SOPs and the waste rules say.";
      const text = `These batches expire within 24 hours:\n\n${lines.map((l) => `- ${l}`).join("\n")}\n\n${advice}\n\n${link}\n`;
      const html = `<p>These batches expire within 24 hours:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join("")}</ul><p>${escapeHtml(advice)}</p><p><a href="${escapeHtml(link)}">Open Decant</a></p>`;
      for (const { email } of technicians) await send({ to: email, subject, text, html });
    }
    await Setting.upsert({ key: LAST_SENT_KEY, value: day, updatedBy: null });
    return {
      ran: true,
      sentFor: day,
      batches: batches.map((b) => b.code),
      recipients: batches.length ? technicians.map((t) => t.email) : [],
    };
  });
  return outcome.ran ? outcome.result : nothing;
}
