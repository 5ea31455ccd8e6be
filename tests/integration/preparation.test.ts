// The preparation journey through the running test app's API: recipes and their versions, stock
// lots with certificates, recording a batch (lots, deviations, idempotency) and its labels.
import { PDFDocument } from "pdf-lib";
import { beforeAll, describe, expect, it } from "vitest";
import { preparationPlan } from "../../src/lib/preparation/plan";
import { client, type Client } from "../support/http";
import { pdfText } from "../support/pdf-text";

const unique = Math.random().toString(36).slice(2, 7).toUpperCase();
let tech: Client;
let manager: Client;

const postJson = (c: Client, path: string, body: unknown, method = "POST") =>
  c.fetch(path, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body) });

beforeAll(async () => {
  tech = await client("tech@demo.test");
  manager = await client("manager@demo.test");
});

async function lotsOf(reagent: string) {
  const r = await tech.fetch(`/api/stock-lots?reagent=${reagent}`);
  return ((await r.json()) as { items: { id: number; lotNumber: string; expired: boolean; remaining: number; usable: boolean }[] }).items;
}

describe("recipes: technician writes, manager approves, editing an approved one makes v2", () => {
  let id = 0;
  const recipe = {
    name: `Test water–methanol 60:40 ${unique}`,
    channel: "A",
    detection_nm: 230,
    storage: "Room temperature",
    spec: {
      solvents: [
        { reagent: "water", percent: 60 },
        { reagent: "methanol", percent: 40 },
      ],
      additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
    },
  };

  it("creates a recipe awaiting approval", async () => {
    const r = await postJson(tech, "/api/recipes", recipe);
    expect(r.status).toBe(201);
    const body = (await r.json()) as { recipe: { id: number; state: string; versions: { version: number }[] } };
    id = body.recipe.id;
    expect(body.recipe.state).toBe("pending");
    expect(body.recipe.versions.map((v) => v.version)).toEqual([1]);
  });

  it("refuses bad input with a 400 naming the field", async () => {
    const r = await postJson(tech, "/api/recipes", { ...recipe, spec: { solvents: [{ reagent: "water", percent: 50 }] } });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/^spec.solvents: .*not 100 %/);
  });

  it("lets only a manager approve", async () => {
    expect((await postJson(tech, `/api/recipes/${id}/approve`, { version: 1 })).status).toBe(403);
    const r = await postJson(manager, `/api/recipes/${id}/approve`, { version: 1 });
    expect(r.status).toBe(200);
    expect(((await r.json()) as { recipe: { state: string } }).recipe.state).toBe("approved");
  });

  it("edits an approved recipe as a new version, leaving v1 approved for preparation", async () => {
    const r = await postJson(
      tech,
      `/api/recipes/${id}`,
      {
        ...recipe,
        spec: {
          ...recipe.spec,
          solvents: [
            { reagent: "water", percent: 55 },
            { reagent: "methanol", percent: 45 },
          ],
        },
      },
      "PUT",
    );
    expect(r.status).toBe(200);
    const body = (await r.json()) as {
      newVersion: boolean;
      recipe: { state: string; approvedVersion: number; versions: { version: number; approvedAt: string | null }[] };
    };
    expect(body.newVersion).toBe(true);
    expect(body.recipe.versions.map((v) => [v.version, v.approvedAt !== null])).toEqual([
      [2, false],
      [1, true],
    ]);
    expect(body.recipe.state).toBe("pending");
    expect(body.recipe.approvedVersion).toBe(1);
    const list = (await (await tech.fetch(`/api/recipes?q=${encodeURIComponent(unique)}`)).json()) as {
      items: { id: number; latestVersion: number }[];
    };
    expect(list.items.find((x) => x.id === id)?.latestVersion).toBe(2);
  });
});

describe("stock lots and certificates of analysis", () => {
  const form = (fields: Record<string, string>, file?: { bytes: Uint8Array; name: string; type: string }) => {
    const body = new FormData();
    for (const [k, v] of Object.entries(fields)) body.set(k, v);
    if (file) body.set("certificate", new Blob([new Uint8Array(file.bytes)], { type: file.type }), file.name);
    return body;
  };
  const fields = (lot: string) => ({
    reagent: "acetonitrile",
    lotNumber: lot,
    supplier: "Example Supplies",
    grade: "HPLC",
    receivedOn: "2026-01-05",
    expiresOn: "2099-01-05",
    quantity: "4000",
  });

  it("stores a real PDF certificate and serves it only to signed-in users", async () => {
    const doc = await PDFDocument.create();
    doc.addPage([200, 100]).drawText("Certificate of analysis, lot test");
    const pdf = await doc.save();
    const r = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: form(fields(`AN-${unique}-1`), { bytes: pdf, name: "coa.pdf", type: "application/pdf" }),
    });
    expect(r.status).toBe(201);
    const { lot } = (await r.json()) as { lot: { id: number; hasCertificate: boolean } };
    expect(lot.hasCertificate).toBe(true);
    const got = await tech.fetch(`/api/stock-lots/${lot.id}/certificate`);
    expect(got.status).toBe(200);
    expect(got.headers.get("content-type")).toBe("application/pdf");
    expect(
      Buffer.from(await got.arrayBuffer())
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
    const anonymous = await client();
    expect((await anonymous.fetch(`/api/stock-lots/${lot.id}/certificate`)).status).toBe(401);
    const clientContact = await client("client@demo.test");
    expect((await clientContact.fetch(`/api/stock-lots/${lot.id}/certificate`)).status).toBe(403);
  });

  it("refuses a text file renamed to .pdf, judged by its content", async () => {
    const r = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: form(fields(`AN-${unique}-2`), {
        bytes: new TextEncoder().encode("just some text\n"),
        name: "coa.pdf",
        type: "application/pdf",
      }),
    });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/^certificate: only a PDF or an image/);
    expect((await lotsOf("acetonitrile")).some((l) => l.lotNumber === `AN-${unique}-2`)).toBe(false);
  });

  it("refuses a file over the size limit", async () => {
    const big = new Uint8Array(10 * 1024 * 1024 + 10);
    big.set(new TextEncoder().encode("%PDF-1.7\n"));
    const r = await tech.fetch("/api/stock-lots", {
      method: "POST",
      body: form(fields(`AN-${unique}-3`), { bytes: big, name: "big.pdf", type: "application/pdf" }),
    });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/^certificate: .*limit/);
  });

  it("flags the demo's expired lot and keeps it out of the usable list", async () => {
    const lots = await lotsOf("ammonium-acetate");
    const expired = lots.find((l) => l.lotNumber === "AA-3307")!;
    expect(expired.expired).toBe(true);
    expect(expired.usable).toBe(false);
    const usable = ((await (await tech.fetch("/api/stock-lots?state=usable")).json()) as { items: { id: number }[] }).items;
    expect(usable.some((l) => l.id === expired.id)).toBe(false);
  });
});

describe("recording a batch", () => {
  // Demo recipe MP-FA-W (version id 1): 0.1 % formic acid in water, approved.
  const waterLot = async () => (await lotsOf("water")).find((l) => l.usable)!.id;
  const faLot = async () => (await lotsOf("formic-acid")).find((l) => l.usable)!.id;

  it("refuses an expired lot with a clear message naming the field", async () => {
    const create = await postJson(tech, "/api/recipes", {
      name: `Ammonium acetate 10 mM ${unique}`,
      channel: "A",
      spec: { solvents: [{ reagent: "water", percent: 100 }], additives: [{ reagent: "ammonium-acetate", amount: 10, unit: "mM" }] },
    });
    const { recipe } = (await create.json()) as { recipe: { id: number } };
    const approved = (await (await postJson(manager, `/api/recipes/${recipe.id}/approve`, { version: 1 })).json()) as {
      recipe: { versions: { id: number }[] };
    };
    const expired = (await lotsOf("ammonium-acetate")).find((l) => l.lotNumber === "AA-3307")!;
    const r = await postJson(tech, "/api/batches", {
      idempotencyKey: `exp-${unique}-0001`,
      recipeVersionId: approved.recipe.versions[0]!.id,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      components: [
        { reagent: "water", stockLotId: await waterLot() },
        { reagent: "ammonium-acetate", stockLotId: expired.id, actualAmount: 0.77 },
      ],
    });
    expect(r.status).toBe(400);
    const body = (await r.json()) as { error: string; fields: Record<string, string> };
    expect(body.error).toMatch(/^components\.1\.stockLotId: lot AA-3307 of Ammonium acetate expired on \d{4}-\d{2}-\d{2}/);
    expect(body.fields["components.1.stockLotId"]).toMatch(/expired/);
  });

  it("needs a reason for a deviation beyond tolerance", async () => {
    const r = await postJson(tech, "/api/batches", {
      idempotencyKey: `dev-${unique}-0001`,
      recipeVersionId: 1,
      volume_mL: 1000,
      bottles: 1,
      bottleSize_mL: 1000,
      components: [
        { reagent: "water", stockLotId: await waterLot(), actualAmount: 999 },
        { reagent: "formic-acid", stockLotId: await faLot(), actualAmount: 1.3 },
      ],
    });
    expect(r.status).toBe(400);
    // 0.1 % v/v of the final 1000 mL is 1.000 mL, so 1.3 mL is +30.0 % (the final volume is the batch volume).
    expect(((await r.json()) as { error: string }).error).toMatch(/^deviationReason: outside tolerance \(Formic acid: .*\+30\.0 %/);
  });

  it("stores what src/lib/chem computes, records once on a double click, lists it and prints N labels", async () => {
    const payload = {
      idempotencyKey: `ok-${unique}-0001`,
      recipeVersionId: 1,
      volume_mL: 3000,
      bottles: 3,
      bottleSize_mL: 1000,
      temperature_C: 22,
      components: [
        { reagent: "water", stockLotId: await waterLot(), actualAmount: 3000 },
        { reagent: "formic-acid", stockLotId: await faLot(), actualAmount: 3.0 },
      ],
    };
    const [a, b] = await Promise.all([postJson(tech, "/api/batches", payload), postJson(tech, "/api/batches", payload)]);
    const statuses = [a.status, b.status].sort();
    expect(statuses).toEqual([200, 201]);
    const [ba, bb] = (await Promise.all([a.json(), b.json()])) as {
      batch: { id: number; code: string; components: { reagent: string; target: number }[]; expiresAt: string; preparedAt: string };
    }[];
    expect(ba!.batch.id).toBe(bb!.batch.id);
    const batch = ba!.batch;
    // A third submit, later, still answers the same batch.
    const again = await postJson(tech, "/api/batches", payload);
    expect(again.status).toBe(200);
    expect(((await again.json()) as { batch: { id: number } }).batch.id).toBe(batch.id);

    const plan = preparationPlan({
      spec: {
        solvents: [{ reagent: "water", percent: 100 }],
        additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
        labile: false,
      },
      volume_mL: 3000,
      temperature_C: 22,
      detection_nm: 254,
    });
    for (const c of plan.components) expect(batch.components.find((x) => x.reagent === c.reagent)!.target).toBeCloseTo(c.target, 4);
    // Acidified water: a week, unless a lot runs out sooner.
    expect(Date.parse(batch.expiresAt) - Date.parse(batch.preparedAt)).toBeLessThanOrEqual(7 * 86_400_000);

    const list = (await (await tech.fetch("/api/batches")).json()) as {
      items: { id: number; code: string; preparedAt: string; expiresAt: string }[];
    };
    const listed = list.items.filter((x) => x.id === batch.id);
    expect(listed).toHaveLength(1);
    expect(listed[0]).toMatchObject({ id: batch.id, code: batch.code, preparedAt: batch.preparedAt, expiresAt: batch.expiresAt });
    expect(listed[0]!.preparedAt).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);

    const label = await tech.fetch(`/api/batches/${batch.id}/label.pdf?copies=4`);
    expect(label.status).toBe(200);
    expect(label.headers.get("content-type")).toBe("application/pdf");
    const bytes = new Uint8Array(await label.arrayBuffer());
    expect((await PDFDocument.load(bytes)).getPageCount()).toBe(4);
    const text = pdfText(bytes, { layout: false });
    expect(text.match(new RegExp(batch.code, "g"))!.length).toBe(4);
    expect(text).toContain("Bottle 3 of 3");
    expect(text).toContain("Rowan Ellery");

    const sheet = await tech.fetch(`/api/batches/${batch.id}/label.pdf?copies=13&stock=a4-2x6`);
    expect((await PDFDocument.load(new Uint8Array(await sheet.arrayBuffer()))).getPageCount()).toBe(2);
    expect((await tech.fetch(`/api/batches/${batch.id}/label.pdf?copies=0`)).status).toBe(400);
    expect((await tech.fetch(`/api/batches/${batch.id}/label.pdf?stock=nope`)).status).toBe(400);
    expect((await tech.fetch(`/api/batches/999999/label.pdf`)).status).toBe(404);

    // Discarding bottle 3 sends its share to waste and lowers what is left.
    const discard = await postJson(tech, `/api/batches/${batch.id}/bottles/3`, { status: "discarded", discarded_mL: 400 });
    expect(discard.status).toBe(200);
    const after = (await discard.json()) as { batch: { remaining_mL: number; bottleList: { number: number; status: string }[] } };
    expect(after.batch.remaining_mL).toBeCloseTo(2600, 3);
    expect(after.batch.bottleList.find((x) => x.number === 3)!.status).toBe("discarded");
    const lookup = await tech.fetch(`/api/batches/lookup?code=${batch.code.toLowerCase()}`);
    expect(((await lookup.json()) as { id: number }).id).toBe(batch.id);
  });
});
