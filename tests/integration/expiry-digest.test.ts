import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import type { OutgoingMail } from "../../src/lib/server/mail";
import { runExpiryDigest } from "../../src/lib/server/services/expiry-digest";
import { useServiceDatabase } from "../support/service-database";

const db = useServiceDatabase();

describe("the daily expiry digest", () => {
  it("mails every technician once a day the batches that expire within 24 hours, even when two instances run it at once", async () => {
    const now = new Date();
    // Between 08:00 and 22:00 in the demo's Europe/Berlin, after the digest hour and on one local day.
    now.setUTCHours(Math.min(Math.max(now.getUTCHours(), 7), 20));
    const due = await db.sequelize.query<{ code: string }>(
      "SELECT code FROM batches WHERE status IN ('ready', 'in_use') AND expires_at > :now AND expires_at <= :until ORDER BY expires_at, code",
      { type: QueryTypes.SELECT, replacements: { now, until: new Date(now.getTime() + 24 * 3_600_000) } },
    );
    expect(due.length).toBeGreaterThan(0); // the demo data holds a batch due within a day

    const sent: OutgoingMail[] = [];
    const send = async (mail: OutgoingMail) => void sent.push(mail);
    const [first, second] = await Promise.all([runExpiryDigest({ now, send }), runExpiryDigest({ now, send })]);
    const third = await runExpiryDigest({ now: new Date(now.getTime() + 60_000), send });

    expect([first.ran, second.ran, third.ran].filter(Boolean)).toHaveLength(1);
    const technicians = await db.sequelize.query<{ email: string }>(
      "SELECT email FROM users WHERE role = 'technician' AND active = 1 ORDER BY email",
      { type: QueryTypes.SELECT },
    );
    expect(sent.map((m) => m.to).sort()).toEqual(technicians.map((t) => t.email));
    for (const mail of sent) {
      for (const { code } of due) {
        expect(mail.text).toContain(code);
        expect(mail.html).toContain(code);
      }
      expect(mail.subject).toMatch(/expire/);
    }
  });

  it("waits for the morning and sends again the next day", async () => {
    const sent: OutgoingMail[] = [];
    const send = async (mail: OutgoingMail) => void sent.push(mail);
    const early = new Date();
    early.setUTCDate(early.getUTCDate() + 1);
    early.setUTCHours(3, 0, 0, 0);
    expect((await runExpiryDigest({ now: early, send })).ran).toBe(false);
    const later = new Date(early);
    later.setUTCHours(8);
    const next = await runExpiryDigest({ now: later, send });
    expect(next.ran).toBe(true);
    expect(next.sentFor).toBe(later.toISOString().slice(0, 10));
  });
});
