// Planning against a real database: a variant's saving equals the difference of solventUse over
// the injections the ledger records for the method; a variant becomes a method version only with
// someone else's approval; and the reorder warning and weekly mail with a fixed clock.
import { QueryTypes } from "sequelize";
import { describe, expect, it } from "vitest";
import { solventUse, type ProgramPoint } from "../../../src/lib/chem/solvent-use";
import type { OutgoingMail } from "../../../src/lib/server/mail";
import { programToRows } from "../../../src/lib/ledger/program";
import { getMethod, updateMethod } from "../../../src/lib/server/services/methods";
import { facilityMethods } from "../../../src/lib/server/services/planning/facility";
import { runReorderMail } from "../../../src/lib/server/services/planning/reorder-mail";
import { saveSupplySetting, supplyOverview } from "../../../src/lib/server/services/planning/supply";
import { createVariant, listVariants, previewVariant } from "../../../src/lib/server/services/planning/variants";
import { decideVersion, listVersions, submitVariant } from "../../../src/lib/server/services/planning/versions";
import { actor, useServiceDatabase } from "../../support/service-database";

const db = useServiceDatabase();
const tech = actor(3, "technician");
const otherTech = actor(6, "technician");
const manager = actor(2, "manager");
const DAY = 86_400_000;

async function ledgerInjections(methodId: number, now: Date): Promise<number> {
  const [row] = await db.sequelize.query<{ n: number | null }>(
    "SELECT SUM(injections + blanks) AS n FROM runs WHERE method_id = ? AND started_at >= ? AND started_at < ?",
    { type: QueryTypes.SELECT, replacements: [methodId, new Date(now.getTime() - 365 * DAY), now] },
  );
  return Number(row?.n ?? 0);
}

describe("what a variant would save", () => {
  it("equals the difference of solventUse over the ledger's injections, split as the ledger split each channel", async () => {
    const now = new Date();
    const method = (await getMethod(1))!;
    const injections = await ledgerInjections(1, now);
    expect(injections).toBeGreaterThan(100); // the demo data runs the scouting gradient most days
    const input = {
      methodId: 1,
      substitution: { from: "acetonitrile" as const, to: "methanol" as const, channel: "B" as const, aqueous: "A" as const },
      transfer: {
        from: { length_mm: 100, diameter_mm: 2.1, particle_um: 2.7, dwell_mL: 0.4 },
        to: { length_mm: 50, diameter_mm: 2.1, particle_um: 1.8, dwell_mL: 0.1 },
        keep: "linear-velocity" as const,
        injection_uL: 2,
      },
    };
    const evaluation = await previewVariant(input, now);
    const expected =
      solventUse({ program: method.program, injections }).total_mL - solventUse({ program: evaluation.program, injections }).total_mL;
    expect(evaluation.saving.injections).toBe(injections);
    expect(evaluation.saving.saved.total_mL).toBeCloseTo(expected, 6);
    // Channel B held acetonitrile with 0.1 % formic acid (the demo batches): all of B's acetonitrile goes, methanol comes.
    const useB = (p: ProgramPoint[]) => solventUse({ program: p, injections }).byChannel_mL.B ?? 0;
    expect(evaluation.saving.saved.byReagent_mL.acetonitrile).toBeCloseTo(useB(method.program) * 0.999, 3);
    expect(evaluation.saving.saved.byReagent_mL.methanol).toBeCloseTo(-useB(evaluation.program) * 0.999, 3);
    expect(evaluation.saving.saved.cost?.currency).toBe("EUR");
    expect(evaluation.saving.saved.cost!.amount).toBeGreaterThan(0);
    expect(evaluation.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(["selectivity-change", "dwell-correction"]));
    // Nothing was written by the preview.
    const [counted] = await db.sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM method_variants", { type: QueryTypes.SELECT });
    expect(Number(counted?.n)).toBe(0);
  });
});

describe("a variant becomes a method version with someone else's approval", () => {
  it("keeps, submits, refuses the submitter's own approval, approves, and then the method runs the new program", async () => {
    const before = (await getMethod(3))!;
    const { id } = await createVariant(
      { methodId: 3, name: "Isocratic in methanol", substitution: { from: "acetonitrile", to: "methanol", channel: "B", aqueous: "A" } },
      tech,
    );
    const [kept] = await listVariants(3);
    expect(kept!.id).toBe(id);
    expect(kept!.version).toBeNull();
    const { versionId, version } = await submitVariant(id, "less acetonitrile", tech);
    expect(version).toBe(2);
    await expect(submitVariant(id, undefined, tech)).rejects.toMatchObject({ status: 409 });
    await expect(decideVersion(versionId, "approve", tech)).rejects.toMatchObject({ status: 403 });
    expect((await getMethod(3))!.program).toEqual(before.program);
    await decideVersion(versionId, "approve", manager);
    const after = (await getMethod(3))!;
    expect(after.program).toEqual(kept!.evaluation!.program);
    expect(after.program[0]!.composition.B).toBeGreaterThan(40); // 40 % acetonitrile needs more methanol
    const versions = await listVersions(3);
    expect(versions.map((v) => [v.version, v.state, v.current])).toEqual([
      [2, "approved", true],
      [1, "approved", false],
    ]);
    // The kept variant now describes an older program: it cannot be submitted again.
    expect((await listVariants(3))[0]!.stale).toBe(true);
    // From now on channel B holds methanol: a new proposal starts from it, not from the ledger's acetonitrile.
    const next = await previewVariant({ methodId: 3, substitution: { from: "methanol", to: "acetonitrile", channel: "B", aqueous: "A" } });
    expect(next.solvents.B).toBe("methanol");
    expect(next.saving.current.byReagent_mL.methanol).toBeGreaterThan(0);
    expect(next.saving.current.byReagent_mL.acetonitrile ?? 0).toBe(0);
    const { id: second } = await createVariant(
      { methodId: 3, substitution: { from: "methanol", to: "acetonitrile", channel: "B", aqueous: "A" } },
      otherTech,
    );
    const pending = await submitVariant(second, undefined, otherTech);
    await decideVersion(pending.versionId, "reject", manager);
    expect((await getMethod(3))!.program).toEqual(after.program);
    const audit = await db.sequelize.query<{ action: string }>("SELECT action FROM audit_log WHERE entity = 'method-version' ORDER BY id", {
      type: QueryTypes.SELECT,
    });
    expect(audit.map((a) => a.action)).toEqual(["submit", "approve", "submit", "reject"]);
    // A direct edit of the program is kept as the next version too, approved by the editor.
    await updateMethod(3, { name: after.name, description: "", rows: programToRows(before.program), reEquilibration_min: 0 }, manager);
    expect((await listVersions(3)).map((v) => [v.version, v.origin, v.state, v.current])).toEqual([
      [4, "edit", "approved", true],
      [3, "variant", "rejected", false],
      [2, "variant", "approved", false],
      [1, "initial", "approved", false],
    ]);
  });

  it("lists the method with the most solvent first, with its best kept variant", async () => {
    const rows = await facilityMethods();
    expect(rows[0]!.solvent_mL).toBeGreaterThanOrEqual(rows[rows.length - 1]!.solvent_mL);
    expect(rows.find((r) => r.methodId === 1)!.injections).toBe(await ledgerInjections(1, new Date()));
  });
});

describe("solvent that never runs out (fixed clock)", () => {
  // A Monday far from the demo data's own dates, so that only the rows below count.
  const now = new Date("2031-03-03T08:00:00Z");

  it("warns when a reagent runs out within its lead time, and mails the managers once that week", async () => {
    await db.sequelize.query(
      `INSERT INTO stock_lots (reagent_id, lot_number, supplier, grade, received_on, expires_on, quantity, remaining, created_at, updated_at)
       VALUES ('isopropanol', 'IPA-TEST', 'Test supplier', 'HPLC', '2031-01-01', '2032-01-01', 4000, 2000, NOW(3), NOW(3))`,
    );
    // 3 L drawn over the last 30 days: 100 mL a day, so 2 L last 20 days.
    for (let d = 1; d <= 30; d++)
      await db.sequelize.query(
        `INSERT INTO ledger_entries (occurred_at, project_id, kind, reagent_id, volume_ml, source_kind, source_id, created_at)
         VALUES (?, 1, 'draw', 'isopropanol', 100, 'manual', ?, NOW(3))`,
        { replacements: [new Date(now.getTime() - d * DAY + 3_600_000), `draw:ipa-${d}`] },
      );
    await saveSupplySetting({ reagentId: "isopropanol", leadTime_days: 10, safetyStock: 500 }, manager);
    let row = (await supplyOverview(now)).find((r) => r.reagentId === "isopropanol")!;
    expect(row.onHand).toBe(2000);
    expect(row.perDay).toBeCloseTo(100, 9);
    expect(row.daysOfSupply).toBeCloseTo(20, 9);
    expect(row.reorderPoint).toBeCloseTo(1500, 9);
    expect(row.state).toBe("ok");

    await saveSupplySetting({ reagentId: "isopropanol", leadTime_days: 21, safetyStock: 500 }, manager);
    row = (await supplyOverview(now)).find((r) => r.reagentId === "isopropanol")!;
    expect(row.state).toBe("runs-out");
    expect(row.runsOutOn).toBe("2031-03-23");

    const sent: OutgoingMail[] = [];
    const send = async (mail: OutgoingMail) => void sent.push(mail);
    const sunday = await runReorderMail({ now: new Date("2031-03-02T08:00:00Z"), send });
    expect(sunday.ran).toBe(false);
    const [a, b] = await Promise.all([runReorderMail({ now, send }), runReorderMail({ now, send })]);
    expect([a.ran, b.ran].filter(Boolean)).toHaveLength(1);
    expect((await runReorderMail({ now: new Date(now.getTime() + 3_600_000), send })).ran).toBe(false);
    const managers = await db.sequelize.query<{ email: string }>(
      "SELECT email FROM users WHERE role = 'manager' AND active = 1 ORDER BY email",
      {
        type: QueryTypes.SELECT,
      },
    );
    expect(sent.map((m) => m.to)).toEqual(managers.map((m) => m.email));
    expect(sent[0]!.text).toMatch(/2-Propanol: 2 L on hand, runs out about 2031-03-23, within its 21-day lead time; order about 3\.6 L/);
    expect(sent[0]!.html).toContain("2-Propanol");
  });
});
