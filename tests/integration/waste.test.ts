// The waste service against a database of its own (migrated and seeded afresh): readings keep the
// difference, a halogenated mix is refused by a non-halogenated container, pickups take containers
// out of the live totals, and an alert mail goes out once however often the check runs.
import { readdir, readFile } from "node:fs/promises";
import { join } from "node:path";
import { QueryTypes, type Sequelize } from "sequelize";
import { beforeAll, describe, expect, it } from "vitest";
import { acquireJobLock, releaseJobLock } from "../../src/lib/server/job-lock";
import { runWasteAlertCheck } from "../../src/lib/server/services/waste/alerts";
import { getContainer, listContainers, setContainerStatus } from "../../src/lib/server/services/waste/containers";
import { recordCollection, requestPickup } from "../../src/lib/server/services/waste/pickups";
import { recordReading } from "../../src/lib/server/services/waste/readings";
import { checkContainerAccepts, wasteStreamForMix } from "../../src/lib/server/services/waste/route";
import { wasteOnHand, wasteSummary } from "../../src/lib/server/services/waste/totals";
import { useServiceDatabase } from "../support/service-database";

const actor = { id: 4 }; // the demo safety officer
const handle = useServiceDatabase();
let db: Sequelize;
beforeAll(() => {
  db = handle.sequelize;
});

const codeId = async (code: string) => (await listContainers({ includeCollected: true })).find((c) => c.code === code)!.id;

async function addWaste(containerId: number, volume_mL: number, stream: string, at = new Date()) {
  await db.query(
    `INSERT INTO ledger_entries (occurred_at, project_id, kind, reagent_id, volume_ml, waste_stream_id, waste_container_id, source_kind, source_id, author_id, created_at)
     VALUES (:at, 1, 'run', 'acetonitrile', :v, :stream, :containerId, 'manual', 'test', 3, :at)`,
    { replacements: { at, v: volume_mL, stream, containerId } },
  );
}

describe("level readings", () => {
  it("replace the estimate and keep the difference", async () => {
    const id = await codeId("WC-0101");
    const before = (await getContainer(id)).estimated_mL;
    expect(before).toBeGreaterThan(0);
    const result = await recordReading(id, { level_mL: before + 500, note: "read at the graduation" }, { actor });
    expect(result.estimatedBefore_mL).toBeCloseTo(before, 0);
    expect(result.difference_mL).toBeCloseTo(500, 0);
    expect(result.container.estimated_mL).toBeCloseTo(before + 500, 0);
    const [row] = await db.query<{ level_ml: string; estimated_before_ml: string }>(
      "SELECT level_ml, estimated_before_ml FROM waste_readings WHERE container_id = :id ORDER BY id DESC LIMIT 1",
      { type: QueryTypes.SELECT, replacements: { id } },
    );
    expect(Number(row!.level_ml) - Number(row!.estimated_before_ml)).toBeCloseTo(500, 1);
    const [audit] = await db.query<{ action: string; actor_id: number }>(
      "SELECT action, actor_id FROM audit_log WHERE entity = 'waste_container' AND entity_id = :id ORDER BY id DESC LIMIT 1",
      { type: QueryTypes.SELECT, replacements: { id: String(id) } },
    );
    expect(audit).toEqual({ action: "waste.reading", actor_id: 4 });

    // Waste logged after the reading adds to the level read, not to the old estimate.
    await addWaste(id, 120, "non-halogenated-organic");
    expect((await getContainer(id)).estimated_mL).toBeCloseTo(before + 620, 0);
  });

  it("refuse a level far beyond the container's capacity", async () => {
    const id = await codeId("WC-0101");
    await expect(recordReading(id, { level_mL: 99_000, note: null }, { actor })).rejects.toThrow(/level_mL/);
  });
});

describe("routing a mix to a container", () => {
  const tfaMix = [
    { reagentId: "water", volume_mL: 499.5 },
    { reagentId: "acetonitrile", volume_mL: 499.5 },
    { reagentId: "trifluoroacetic-acid", volume_mL: 1 },
  ];

  it("refuses a halogenated mix in a non-halogenated container, with the reason", async () => {
    const mix = await wasteStreamForMix(tfaMix);
    expect(mix.streamId).toBe("halogenated-organic");
    const answer = await checkContainerAccepts(await codeId("WC-0102"), mix.streamId);
    expect(answer.ok).toBe(false);
    if (answer.ok) return;
    expect(answer.code).toBe("wrong-stream");
    expect(answer.reason).toMatch(/WC-0102 is a non-halogenated organic container and does not take halogenated organic waste/);
  });

  it("takes it in a halogenated container, and takes a plain ACN mix there too", async () => {
    const heron = await codeId("WC-0103");
    expect((await checkContainerAccepts(heron, "halogenated-organic")).ok).toBe(true);
    expect((await checkContainerAccepts({ id: heron }, "non-halogenated-organic")).ok).toBe(true);
  });

  it("refuses a container marked full, and an unknown one", async () => {
    const id = await codeId("WC-0104");
    await setContainerStatus(id, "full", { actor });
    const answer = await checkContainerAccepts(id, "aqueous");
    expect(answer).toMatchObject({ ok: false, code: "not-in-use" });
    await setContainerStatus(id, "in_use", { actor });
    expect((await checkContainerAccepts(id, "aqueous")).ok).toBe(true);
    expect(await checkContainerAccepts(99_999, "aqueous")).toMatchObject({ ok: false, code: "unknown-container" });
  });

  it("follows a site override that routes TFA elsewhere", async () => {
    await db.query(
      `INSERT INTO settings (\`key\`, value, updated_at) VALUES ('waste.reagentStreams', '{"trifluoroacetic-acid":"acidic-corrosive"}', NOW(3))`,
    );
    expect((await wasteStreamForMix(tfaMix)).streamId).toBe("non-halogenated-organic");
    await db.query("DELETE FROM settings WHERE `key` = 'waste.reagentStreams'");
    expect((await wasteStreamForMix(tfaMix)).streamId).toBe("halogenated-organic");
  });
});

describe("pickups", () => {
  it("take a collected container out of the live totals and keep it in the history", async () => {
    const id = await codeId("WC-0103");
    const container = await getContainer(id);
    const onHandBefore = await wasteOnHand();
    const period = { from: "2020-01-01", to: new Date().toISOString().slice(0, 10) };
    const summaryBefore = await wasteSummary(period);

    const pickup = await requestPickup({ containerIds: [id], note: "carboy near full" }, { actor });
    expect(pickup.reference).toMatch(/^PU-\d{4}-\d{3}$/);
    expect((await getContainer(id)).status).toBe("awaiting_pickup");
    // It takes no more waste, and its instrument is unhooked.
    expect(await checkContainerAccepts(id, "halogenated-organic")).toMatchObject({ ok: false, code: "not-in-use" });
    const [heron] = await db.query<{ waste_container_id: number | null }>(
      "SELECT waste_container_id FROM instruments WHERE name = 'Heron'",
      { type: QueryTypes.SELECT },
    );
    expect(heron!.waste_container_id).toBeNull();
    await expect(requestPickup({ containerIds: [id], note: null }, { actor })).rejects.toThrow(/already/);

    const collected = await recordCollection(pickup.id, { manifestRef: "HWM-TEST-1", note: null }, { actor });
    expect(collected).toMatchObject({ status: "collected", manifestRef: "HWM-TEST-1" });
    expect((await listContainers()).map((c) => c.code)).not.toContain("WC-0103");
    const history = (await listContainers({ includeCollected: true })).find((c) => c.id === id)!;
    expect(history).toMatchObject({ status: "collected", pickupReference: pickup.reference });
    expect(history.estimated_mL).toBeCloseTo(container.estimated_mL, 0);

    const onHandAfter = await wasteOnHand();
    expect(onHandAfter.total_mL).toBeCloseTo(onHandBefore.total_mL - container.estimated_mL, 0);
    expect(onHandAfter.byStream["halogenated-organic"] ?? 0).toBeCloseTo(
      (onHandBefore.byStream["halogenated-organic"] ?? 0) - container.estimated_mL,
      0,
    );
    // What was produced stays in the period's totals: the ledger is history.
    expect(await wasteSummary(period)).toEqual(summaryBefore);
    await expect(recordCollection(pickup.id, { manifestRef: "again", note: null }, { actor })).rejects.toThrow(/collected already/);
  });
});

describe("the job lock", () => {
  it("lets one holder in at a time, and a lapsed lease be taken over", async () => {
    const first = await acquireJobLock("test-job", 60_000);
    expect(first).not.toBeNull();
    expect(await acquireJobLock("test-job", 60_000)).toBeNull();
    await releaseJobLock(first!);
    const second = await acquireJobLock("test-job", 1);
    expect(second).not.toBeNull();
    await new Promise((r) => setTimeout(r, 20));
    const third = await acquireJobLock("test-job", 60_000);
    expect(third).not.toBeNull();
    expect(third!.holder).not.toBe(second!.holder);
    await releaseJobLock(third!);
  });
});

describe("alert mails", () => {
  const mailbox = process.env.SMTP_FAKE_MAILBOX!;
  const address = `safety-${Math.random().toString(36).slice(2, 8)}@demo.test`;

  async function mailsTo(to: string): Promise<{ subject: string; text: string }[]> {
    const out: { subject: string; text: string }[] = [];
    for (const file of (await readdir(mailbox)).filter((f) => f.endsWith(".json") && !f.startsWith("."))) {
      const m = JSON.parse(await readFile(join(mailbox, file), "utf8")) as { envelope: { to: string[] }; subject: string; text: string };
      if (m.envelope.to.includes(to)) out.push(m);
    }
    return out;
  }
  const settle = () => new Promise((r) => setTimeout(r, 400));

  beforeAll(async () => {
    await db.query("UPDATE users SET email = :address WHERE id = 4", { replacements: { address } });
  });

  it("goes out once even when two checks run at the same time", async () => {
    const results = await Promise.all([runWasteAlertCheck(), runWasteAlertCheck()]);
    const mailed = results.reduce((a, r) => a + r.mailed, 0);
    expect(mailed).toBeGreaterThan(0);
    expect(results.filter((r) => r.ran && r.mailed > 0)).toHaveLength(1);
    await settle();
    const mails = await mailsTo(address);
    expect(mails).toHaveLength(1);
    expect(mails[0]!.text).toMatch(/WC-0105 has been accumulating/);
    expect(mails[0]!.text).toMatch(/institution's hazardous-waste procedures/);

    // Later checks find nothing new to say.
    await runWasteAlertCheck();
    await settle();
    expect(await mailsTo(address)).toHaveLength(1);
  });

  it("raises a container over capacity once, not on every run", async () => {
    const id = await codeId("WC-0102");
    await addWaste(id, 25_000, "non-halogenated-organic");
    await runWasteAlertCheck();
    await addWaste(id, 500, "non-halogenated-organic");
    await runWasteAlertCheck();
    const rows = await db.query<{ kind: string }>("SELECT kind FROM waste_alerts WHERE container_id = :id", {
      type: QueryTypes.SELECT,
      replacements: { id },
    });
    expect(rows).toEqual([{ kind: "over-capacity" }]);
    await settle();
    const mails = await mailsTo(address);
    expect(mails).toHaveLength(2);
    expect(mails.filter((m) => /WC-0102 is estimated above its capacity/.test(m.text))).toHaveLength(1);
  });
});
