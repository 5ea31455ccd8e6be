// What is weighed matches what is in the bottle: a stock lot's assay (and density) from its certificate
// sets the amounts of a batch made with it, and the batch record says which assay was used.
import { beforeAll, describe, expect, it } from "vitest";
import { preparationPlan } from "../../src/lib/preparation/plan";
import type { RecipeSpec } from "../../src/lib/schemas/recipes";
import { client, type Client } from "../support/http";

const unique = Math.random().toString(36).slice(2, 7).toUpperCase();
let tech: Client;
let manager: Client;

const postJson = (c: Client, path: string, body: unknown) =>
  c.fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });

interface Lot {
  id: number;
  lotNumber: string;
  usable: boolean;
  assayPercent: number | null;
  density_g_mL: number | null;
}
const lotsOf = async (reagent: string) =>
  ((await (await tech.fetch(`/api/stock-lots?reagent=${reagent}`)).json()) as { items: Lot[] }).items;

function lotForm(fields: Record<string, string>) {
  const body = new FormData();
  for (const [k, v] of Object.entries(fields)) body.set(k, v);
  return body;
}
const koh = (lot: string, extra: Record<string, string> = {}) =>
  lotForm({
    reagent: "potassium-hydroxide",
    lotNumber: lot,
    supplier: "Example Supplies",
    grade: "analytical",
    receivedOn: "2026-01-05",
    expiresOn: "2099-01-05",
    quantity: "500",
    ...extra,
  });

beforeAll(async () => {
  tech = await client("tech@demo.test");
  manager = await client("manager@demo.test");
});

describe("a stock lot records its assay and density", () => {
  it("keeps the assay from the certificate and lists it", async () => {
    const r = await tech.fetch("/api/stock-lots", { method: "POST", body: koh(`KOH-${unique}-A`, { assayPercent: "85.0" }) });
    expect(r.status).toBe(201);
    const { lot } = (await r.json()) as { lot: Lot };
    expect(lot.assayPercent).toBe(85);
    expect(lot.density_g_mL).toBeNull();
    expect((await lotsOf("potassium-hydroxide")).find((l) => l.id === lot.id)?.assayPercent).toBe(85);
    const page = await (await tech.fetch("/stock-lots")).text();
    expect(page).toContain(`data-testid="lot-assay-${lot.id}"`);
  });

  it.each([
    [{ assayPercent: "120" }, /^assayPercent: Assay: at most 100 %/],
    [{ assayPercent: "0" }, /^assayPercent: Assay: more than 0 %/],
    [{ assayPercent: "lots" }, /^assayPercent: Assay must be a number/],
    [{ density_g_mL: "1.5" }, /^density_g_mL: A solid has no density/],
  ])("refuses %j with a 400 naming the field", async (extra, message) => {
    const r = await tech.fetch("/api/stock-lots", { method: "POST", body: koh(`KOH-${unique}-X${Object.keys(extra)[0]}`, extra) });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(message);
  });

  it("keeps a solution's density", async () => {
    const r = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: lotForm({
        reagent: "phosphoric-acid",
        lotNumber: `PA-${unique}`,
        supplier: "Example Supplies",
        grade: "analytical",
        receivedOn: "2026-01-05",
        expiresOn: "2099-01-05",
        quantity: "250",
        assayPercent: "87.9",
        density_g_mL: "1.712",
      }),
    });
    expect(r.status).toBe(201);
    expect(((await r.json()) as { lot: Lot }).lot).toMatchObject({ assayPercent: 87.9, density_g_mL: 1.712 });
  });
});

describe("a batch uses the assay of the lot picked", () => {
  const spec: RecipeSpec = {
    solvents: [{ reagent: "water", percent: 100 }],
    buffer: {
      reagents: ["potassium-dihydrogen-phosphate", "potassium-hydroxide"],
      targetPH: 7,
      concentration_mM: 25,
      basis: "first",
      temperature_C: 25,
    },
    additives: [],
    labile: false,
  };
  let versionId = 0;
  let withAssay = 0;
  let withoutAssay = 0;

  beforeAll(async () => {
    const create = await postJson(tech, "/api/recipes", { name: `Phosphate pH 7 with KOH ${unique}`, channel: "A", spec });
    const { recipe } = (await create.json()) as { recipe: { id: number } };
    const approved = (await (await postJson(manager, `/api/recipes/${recipe.id}/approve`, { version: 1 })).json()) as {
      recipe: { versions: { id: number }[] };
    };
    versionId = approved.recipe.versions[0]!.id;
    const lots = await lotsOf("potassium-hydroxide");
    withAssay = lots.find((l) => l.lotNumber === `KOH-${unique}-A`)!.id;
    const r = await tech.fetch("/api/stock-lots", { method: "POST", body: koh(`KOH-${unique}-B`) });
    withoutAssay = ((await r.json()) as { lot: Lot }).lot.id;
  });

  const record = async (kohLot: number, key: string) => {
    const water = (await lotsOf("water")).find((l) => l.usable)!.id;
    // KP-8120 is the demo lot whose certificate says 99.6 %.
    const phosphate = (await lotsOf("potassium-dihydrogen-phosphate")).find((l) => l.lotNumber === "KP-8120")!;
    expect(phosphate.assayPercent).toBeCloseTo(99.6, 6);
    const r = await postJson(tech, "/api/batches", {
      idempotencyKey: `${key}-${unique}-0001`,
      recipeVersionId: versionId,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      temperature_C: 22,
      measuredPH: 7.0,
      // Actuals near the targets (25 mM KH2PO4 is about 3.4 g); what this test reads is the targets.
      components: [
        { reagent: "water", stockLotId: water, actualAmount: 1000 },
        { reagent: "potassium-dihydrogen-phosphate", stockLotId: phosphate.id, actualAmount: 3.4 },
        { reagent: "potassium-hydroxide", stockLotId: kohLot, actualAmount: 0.7 },
      ],
      deviationReason: "amounts not weighed: a test of the computed targets",
    });
    expect(r.status).toBe(201);
    return (
      (await r.json()) as {
        batch: { id: number; components: { reagent: string; target: number; assay: { percent: number; source: string } | null }[] };
      }
    ).batch;
  };

  it("weighs 1/0.85 of the pure KOH for the 85 % lot and 1/0.996 of the KH2PO4 for its 99.6 % lot, and records both", async () => {
    const batch = await record(withAssay, "assay");
    const plan = (purities: Record<string, number>) => preparationPlan({ spec, volume_mL: 1000, temperature_C: 22, purities });
    const pure = plan({ "potassium-hydroxide": 1, "potassium-dihydrogen-phosphate": 1 });
    const koh = batch.components.find((c) => c.reagent === "potassium-hydroxide")!;
    const kp = batch.components.find((c) => c.reagent === "potassium-dihydrogen-phosphate")!;
    const pureKoh = pure.components.find((c) => c.reagent === "potassium-hydroxide")!.target;
    const pureKp = pure.components.find((c) => c.reagent === "potassium-dihydrogen-phosphate")!.target;
    expect(koh.target / pureKoh).toBeCloseTo(1 / 0.85, 4);
    expect(kp.target / pureKp).toBeCloseTo(1 / 0.996, 4);
    expect(koh.assay).toEqual({ percent: 85, source: "lot" });
    expect(kp.assay).toEqual({ percent: 99.6, source: "lot" });
    expect(batch.components.find((c) => c.reagent === "water")!.assay).toBeNull();
    const page = await (await tech.fetch(`/batches/${batch.id}`)).text();
    expect(page).toContain("assay 85 % (lot&#39;s certificate)");
    expect(page).toContain('data-testid="mobile-phase-ph"');
    expect(page).toMatch(/Bates–Guggenheim/);
  });

  it("falls back to the catalogue's typical 85 % for a lot with no assay, and says so on the batch", async () => {
    const batch = await record(withoutAssay, "typical");
    const koh = batch.components.find((c) => c.reagent === "potassium-hydroxide")!;
    expect(koh.assay).toEqual({ percent: 85, source: "typical" });
    const page = await (await tech.fetch(`/batches/${batch.id}`)).text();
    expect(page).toContain("catalogue&#39;s typical value, no assay recorded for the lot");
  });

  it("refuses two lots of one reagent with different assays in one batch", async () => {
    const water = (await lotsOf("water")).find((l) => l.usable)!.id;
    const kp = await lotsOf("potassium-dihydrogen-phosphate");
    const r = await postJson(tech, "/api/batches", {
      idempotencyKey: `mixed-${unique}-0001`,
      recipeVersionId: versionId,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      measuredPH: 7,
      components: [
        { reagent: "water", stockLotId: water },
        { reagent: "potassium-dihydrogen-phosphate", stockLotId: kp.find((l) => l.lotNumber === "KP-8120")!.id },
        { reagent: "potassium-hydroxide", stockLotId: withAssay },
        { reagent: "potassium-hydroxide", stockLotId: withoutAssay },
      ],
    });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/^components\.3\.stockLotId: Use one lot of Potassium hydroxide/);
  });

  it("shows the pH of the mobile phase beside the aqueous pH on the recipe page", async () => {
    const list = (await (await tech.fetch("/api/recipes")).json()) as { items: { id: number; name: string }[] };
    const recipe = list.items.find((r) => r.name === `Phosphate pH 7 with KOH ${unique}`)!;
    const page = await (await tech.fetch(`/recipes/${recipe.id}`)).text();
    expect(page).toContain('data-testid="ww-ph"');
    expect(page).toContain("What these figures cover");
  });
});
