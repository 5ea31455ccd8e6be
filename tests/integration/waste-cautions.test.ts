// Cautions on the rendered waste pages of the running test app: a container's page shows the GHS
// pictograms and signal word of what was routed into it (worked out here from the ledger rows), the
// streams page those of each stream's reagents, and the route preview answers a mix's hazards.
import { QueryTypes, type Sequelize } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { reagents } from "../../src/lib/chem";
import { hazardSummary } from "../../src/lib/labels/hazards";
import { createSequelize } from "../../src/lib/server/db";
import { testEnv } from "../support/database";
import { client, type Client } from "../support/http";

let sql: Sequelize;
let safety: Client;
beforeAll(async () => {
  sql = createSequelize(testEnv());
  safety = await client("safety@demo.test");
});
afterAll(async () => {
  await sql.close();
});

const pictogramsIn = (html: string) => [...html.matchAll(/aria-label="(GHS0\d)"/g)].map((m) => m[1]);

describe("the container page", () => {
  it("shows the pictograms and signal word of what the container holds, and only those", async () => {
    const [container] = await sql.query<{ id: number; code: string }>("SELECT id, code FROM waste_containers WHERE code = 'WC-0103'", {
      type: QueryTypes.SELECT,
    });
    // What went in during the current accumulation, straight from the ledger.
    const contents = await sql.query<{ reagent_id: string; v: string }>(
      `SELECT l.reagent_id, SUM(l.volume_ml) AS v FROM ledger_entries l JOIN waste_containers c ON c.id = l.waste_container_id
        WHERE c.id = ? AND (c.accumulation_started_at IS NULL OR l.occurred_at >= c.accumulation_started_at)
        GROUP BY l.reagent_id HAVING SUM(l.volume_ml) > 0`,
      { type: QueryTypes.SELECT, replacements: [container!.id] },
    );
    expect(contents.length).toBeGreaterThan(0);
    const total = contents.reduce((s, c) => s + Number(c.v), 0);
    const expected = hazardSummary(contents.map((c) => ({ reagent: c.reagent_id, share_percent: (Number(c.v) / total) * 100 })));
    expect(expected.pictograms.length).toBeGreaterThan(0);

    const response = await safety.fetch(`/waste/containers/${container!.id}`);
    expect(response.status).toBe(200);
    // Whitespace in HTML collapses on screen, so compare the text as it reads.
    const html = (await response.text()).replace(/\s+/g, " ");
    const section = html.slice(html.indexOf('id="hazard-heading"'), html.indexOf("</section>", html.indexOf('id="hazard-heading"')));
    expect(section.length).toBeGreaterThan(0);
    expect(pictogramsIn(section).sort()).toEqual([...expected.pictograms].sort());
    expect(section).toContain(expected.signalWord!);
    expect(section).toContain("follow your institution's hazardous-waste procedures");
  });
});

describe("the streams page", () => {
  it("shows, per stream, the pictograms and signal word of its catalogue reagents", async () => {
    const html = await (await safety.fetch("/waste/streams")).text();
    for (const stream of ["halogenated-organic", "non-halogenated-organic"]) {
      const start = html.indexOf(`id="stream-${stream}"`);
      expect(start).toBeGreaterThan(0);
      const card = html.slice(start, html.indexOf("</section>", start));
      const members = reagents.filter((r) => r.wasteStream.value === stream);
      const expected = hazardSummary(members.map((r) => ({ reagent: r.id, share_percent: 100 })));
      expect(pictogramsIn(card).sort()).toEqual([...expected.pictograms].sort());
      if (expected.signalWord) expect(card).toContain(expected.signalWord);
    }
    expect(html).toContain("Follow your institution's hazardous-waste procedures and local regulations");
  });
});

describe("POST /api/waste/route", () => {
  it("answers the mix's pictograms and signal word with its stream", async () => {
    const response = await safety.fetch("/api/waste/route", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({
        containerId: 1,
        parts: [
          { reagentId: "acetonitrile", volume_mL: 999 },
          { reagentId: "formic-acid", volume_mL: 1 },
        ],
      }),
    });
    expect(response.status).toBe(200);
    const body = (await response.json()) as {
      assignment: { streamId: string };
      hazards: { pictograms: string[]; signalWord: string | null };
    };
    const expected = hazardSummary([
      { reagent: "acetonitrile", share_percent: 99.9 },
      { reagent: "formic-acid", share_percent: 0.1 },
    ]);
    expect(body.assignment.streamId).toBe("non-halogenated-organic");
    expect(body.hazards.pictograms).toEqual(expected.pictograms);
    expect(body.hazards.pictograms).toContain("GHS02");
    expect(body.hazards.signalWord).toBe(expected.signalWord);
  });
});
