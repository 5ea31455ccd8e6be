/**
 * A year of the demo facility, simulated day by day (pure: the same anchors, clock and seed give
 * the same rows). Technicians prepare a batch when an instrument's channel runs dry or its batch
 * expires, drawing on stock lots that are received when the last one runs out; every run draws
 * its channels' volumes from the batches in use and sends them to the instrument's waste
 * container, which is collected when it is about 85 % full. Volumes are illustrative.
 */
import { batchCodeBase, nextBatchCode } from "../../lib/preparation/batch-code";
import { prng } from "../demo-random";
import { DAY_MS } from "../demo-time";
import { DEMO_RECIPES, INSTRUMENTS, NEW_PROJECTS, NEW_RECIPES, STOCK, type InstrumentKey, type RecipePlan } from "./catalogue";

export type Row = Record<string, unknown>;

/** What the small demo already holds, looked up by name, and the next free id of each table. */
export interface Anchors {
  now: Date;
  next: Record<"batch" | "stockLot" | "run" | "wasteContainer" | "pickup", number>;
  technicians: number[];
  safetyOfficer: number;
  instruments: Record<InstrumentKey, number>;
  instrumentContainers: Record<InstrumentKey, { from: Date; to: Date | null }[]>;
  methods: Record<string, number>;
  /** Recipe code → the version batches are made from. */
  recipeVersions: Record<string, number>;
  projects: Record<string, number>;
  waterLotId: number;
  takenBatchCodes: string[];
}

export interface Simulation {
  stockLots: Row[];
  batches: Row[];
  batchComponents: Row[];
  batchBottles: Row[];
  runs: Row[];
  ledger: Row[];
  pickups: Row[];
  wasteContainers: Row[];
  /** The container each instrument ends the year with (the fourth instrument's is still in use). */
  currentContainer: Partial<Record<InstrumentKey, number>>;
}

const recipePlan = (code: string): Pick<RecipePlan, "lifeDays" | "perLitre"> =>
  DEMO_RECIPES[code] ?? NEW_RECIPES.find((r) => r.code === code)!;
const day = (d: Date) => d.toISOString().slice(0, 10);
const round = (value: number, digits: number) => Math.round(value * 10 ** digits) / 10 ** digits;

export function simulateYear(anchors: Anchors, seed = 20261204): Simulation {
  const random = prng(seed);
  const between = (lo: number, hi: number) => lo + Math.floor(random() * (hi - lo + 1));
  const pick = <T>(items: readonly T[]) => items[Math.floor(random() * items.length)]!;
  const next = { ...anchors.next };
  const out: Simulation = {
    stockLots: [],
    batches: [],
    batchComponents: [],
    batchBottles: [],
    runs: [],
    ledger: [],
    pickups: [],
    wasteContainers: [],
    currentContainer: {},
  };
  const taken = [...anchors.takenBatchCodes];
  const midnight = new Date(anchors.now);
  midnight.setUTCHours(0, 0, 0, 0);
  const dayStart = (daysAgo: number) => new Date(midnight.getTime() - daysAgo * DAY_MS);

  // Stock: the lot in use per reagent; a new one arrives when it cannot cover a preparation.
  const lots = new Map<string, { row: Row; remaining: number }>();
  const lotCounter: Record<string, number> = {};
  const drawStock = (reagent: string, needed: number, at: Date): number => {
    let amount = needed;
    if (reagent === "water") return anchors.waterLotId;
    let lot = lots.get(reagent);
    if (!lot || lot.remaining < amount) {
      // The last of the old bottle goes into the batch first; the new lot gives the rest.
      if (lot) {
        amount -= lot.remaining;
        lot.row.remaining = 0;
      }
      const stock = STOCK[reagent]!;
      lotCounter[reagent] = (lotCounter[reagent] ?? 0) + 1;
      const received = new Date(at.getTime() - between(1, 6) * DAY_MS);
      const row: Row = {
        id: next.stockLot++,
        reagent_id: reagent,
        lot_number: `${stock.prefix}-${String(30_000 + lotCounter[reagent]! * 137 + Math.floor(seed % 97)).padStart(5, "0")}`,
        supplier: stock.supplier,
        grade: stock.grade,
        received_on: day(received),
        opened_on: day(at),
        expires_on: day(new Date(received.getTime() + between(540, 1080) * DAY_MS)),
        quantity: stock.size,
        remaining: stock.size,
        room: stock.room,
        created_at: received,
        updated_at: at,
      };
      out.stockLots.push(row);
      lot = { row, remaining: stock.size };
      lots.set(reagent, lot);
    }
    lot.remaining -= amount;
    lot.row.remaining = round(lot.remaining, 3);
    return lot.row.id as number;
  };

  // Batches: one in use per instrument channel (and one per wash solution for the facility).
  interface Batch {
    row: Row;
    remaining: number;
    perLitre: RecipePlan["perLitre"];
    expires: Date;
    used: number;
  }
  const prepare = (code: string, litres: number, at: Date, room: string): Batch => {
    const plan = recipePlan(code);
    const preparedAt = new Date(at.getTime() - between(20, 90) * 60_000);
    const batchCode = nextBatchCode(batchCodeBase(preparedAt), taken);
    taken.push(batchCode);
    const expires = new Date(preparedAt.getTime() + plan.lifeDays * DAY_MS);
    const id = next.batch++;
    const volume = litres * 1000;
    const row: Row = {
      id,
      code: batchCode,
      recipe_version_id: anchors.recipeVersions[code],
      spec_snapshot: JSON.stringify({ recipeVersionId: anchors.recipeVersions[code] }),
      volume_ml: volume,
      remaining_ml: volume,
      bottles: litres,
      bottle_size_ml: 1000,
      temperature_c: round(20.5 + random() * 2.5, 1),
      measured_ph: code === "MP-PHOS-30" ? round(2.97 + random() * 0.07, 2) : null,
      prepared_by: pick(anchors.technicians),
      prepared_at: preparedAt,
      expires_at: expires,
      status: "in_use",
      room,
      created_at: preparedAt,
      updated_at: preparedAt,
    };
    out.batches.push(row);
    for (const part of plan.perLitre) {
      const amount = round(part.amount * litres, part.unit === "g" ? 4 : 2);
      out.batchComponents.push({
        batch_id: id,
        reagent_id: part.reagent,
        stock_lot_id: drawStock(part.reagent, amount, preparedAt),
        role: part.role,
        unit: part.unit,
        target_amount: amount,
        actual_amount: part.unit === "g" ? round(amount * (1 + (random() - 0.5) * 0.004), 4) : amount,
      });
    }
    return { row, remaining: volume, perLitre: plan.perLitre, expires, used: 0 };
  };
  const finish = (batch: Batch, at: Date, handover = false) => {
    // Used up but for the bottle's dead volume, or past its expiry (or handed over) with the rest discarded.
    const expired = at >= batch.expires;
    const status = (expired || handover) && batch.remaining > 150 ? "discarded" : "empty";
    batch.row.status = status;
    batch.row.remaining_ml = status === "discarded" ? round(batch.remaining, 1) : 0;
    batch.row.updated_at = expired ? batch.expires : at;
  };

  // Waste: the container under each instrument, collected about 85 % full.
  interface Container {
    row: Row;
    volume: number;
  }
  const awaiting: Row[] = [];
  let pickupNumber = 100;
  const place = (plan: (typeof INSTRUMENTS)[number], at: Date): Container => {
    const id = next.wasteContainer++;
    const row: Row = {
      id,
      code: `WC-${String(id).padStart(4, "0")}`,
      stream_id: plan.wasteStream,
      capacity_ml: plan.wasteCapacity_mL,
      estimated_volume_ml: 0,
      room: plan.room,
      location_kind: "instrument",
      location_note: `Under ${plan.name}`,
      status: "in_use",
      accumulation_started_at: at,
      created_at: at,
      updated_at: at,
    };
    out.wasteContainers.push(row);
    return { row, volume: 0 };
  };
  const collect = (container: Container, at: Date) => {
    container.row.estimated_volume_ml = round(container.volume, 1);
    container.row.status = "awaiting_pickup";
    container.row.full_at = at;
    awaiting.push(container.row);
  };
  const pickUp = (at: Date) => {
    if (!awaiting.length) return;
    const id = next.pickup++;
    const requested = awaiting[0]!.full_at as Date;
    const collected = new Date(Math.max(at.getTime(), requested.getTime() + DAY_MS) + 10 * 3_600_000);
    out.pickups.push({
      id,
      reference: `PU-${collected.toISOString().slice(0, 4)}-${++pickupNumber}`,
      status: "collected",
      requested_at: requested,
      requested_by: anchors.safetyOfficer,
      collected_at: collected,
      manifest_ref: `HWM-${70_000 + id * 31}`,
      note: "Collected by the site waste service.",
      recorded_by: anchors.safetyOfficer,
      created_at: requested,
      updated_at: collected,
    });
    for (const row of awaiting.splice(0))
      Object.assign(row, { status: "collected", collected_at: collected, pickup_id: id, updated_at: collected });
  };

  const projectsOn = (key: InstrumentKey, daysAgo: number) =>
    NEW_PROJECTS.filter((p) => p.on.includes(key) && p.from >= daysAgo && p.until <= daysAgo).map((p) => anchors.projects[p.code]!);
  const batchesInUse = new Map<string, Batch>();
  const containers = new Map<InstrumentKey, Container>();
  const washes = ["SW-ACN-10", "NW-IPA-50"];

  const inSmallDemoWindow = (key: InstrumentKey, start: Date) =>
    anchors.instrumentContainers[key].some((w) => start >= new Date(w.from.getTime() - DAY_MS) && (!w.to || start <= w.to));

  for (let daysAgo = 364; daysAgo >= 1; daysAgo--) {
    const start = dayStart(daysAgo);
    const weekday = start.getUTCDay();
    // An instrument that hands over to the small demo's batches and carboys (its last history day passed, or
    // one of the small demo's carboys stands under it) finishes its batches and sends its carboy away the evening before.
    for (const plan of INSTRUMENTS) {
      if (daysAgo >= plan.untilDaysAgo && !inSmallDemoWindow(plan.key, start)) continue;
      const evening = new Date(start.getTime() - 6 * 3_600_000);
      for (const channel of ["A", "B"]) {
        const batch = batchesInUse.get(`${plan.key}:${channel}`);
        if (batch) finish(batch, evening, true);
        batchesInUse.delete(`${plan.key}:${channel}`);
      }
      const container = containers.get(plan.key);
      if (container) collect(container, evening);
      containers.delete(plan.key);
    }
    // Waste is collected on Tuesdays and Fridays.
    if (weekday === 2 || weekday === 5) pickUp(new Date(start.getTime() + 9 * 3_600_000));
    if (weekday === 0 || weekday === 6) continue;
    if (daysAgo % 9 === 0)
      for (const code of washes) {
        const wash = batchesInUse.get(code);
        if (wash) finish(wash, start);
        batchesInUse.set(code, prepare(code, 1, new Date(start.getTime() + 8 * 3_600_000), "B2.14"));
      }
    for (const plan of INSTRUMENTS) {
      if (daysAgo < plan.untilDaysAgo) continue;
      // The small demo's own carboys stand under the instrument in these windows: no history runs then.
      if (anchors.instrumentContainers[plan.key].some((w) => start >= new Date(w.from.getTime() - DAY_MS) && (!w.to || start <= w.to)))
        continue;
      const projects = projectsOn(plan.key, daysAgo);
      if (!projects.length) continue;
      let clock = new Date(start.getTime() + (7.5 + random()) * 3_600_000);
      const runs = between(...plan.runsPerDay);
      for (let n = 1; n <= runs; n++) {
        const injections = between(...plan.injections);
        const volumes = { A: round(plan.perInjection.A * injections, 2), B: round(plan.perInjection.B * injections, 2) };
        const channelBatches: Record<string, number> = {};
        for (const channel of ["A", "B"] as const) {
          const key = `${plan.key}:${channel}`;
          let batch = batchesInUse.get(key);
          if (!batch || batch.remaining < volumes[channel] || clock >= batch.expires) {
            if (batch) finish(batch, clock);
            batch = prepare(plan.recipes[channel], plan.batchLitres[channel], clock, plan.room);
            batchesInUse.set(key, batch);
          }
          batch.remaining -= volumes[channel];
          batch.used += volumes[channel];
          batch.row.remaining_ml = round(batch.remaining, 1);
          channelBatches[channel] = batch.row.id as number;
        }
        let container = containers.get(plan.key);
        if (!container || container.volume + volumes.A + volumes.B > plan.wasteCapacity_mL * 0.85) {
          if (container) collect(container, clock);
          container = place(plan, clock);
          containers.set(plan.key, container);
        }
        container.volume += volumes.A + volumes.B;
        const runId = next.run++;
        const projectId = pick(projects);
        const operator = pick(anchors.technicians);
        const startedAt = clock;
        out.runs.push({
          id: runId,
          instrument_id: anchors.instruments[plan.key],
          method_id: anchors.methods[plan.method],
          project_id: projectId,
          operator_id: operator,
          reference: `${plan.prefix}-${day(start).slice(2).replaceAll("-", "")}-${n}`,
          started_at: startedAt,
          injections,
          channel_batches: JSON.stringify(channelBatches),
          channel_volumes: JSON.stringify(volumes),
          created_at: startedAt,
          updated_at: startedAt,
        });
        for (const channel of ["A", "B"] as const) {
          const batch = batchesInUse.get(`${plan.key}:${channel}`)!;
          const litres = volumes[channel] / 1000;
          const liquids = batch.perLitre.filter((p) => p.unit === "mL");
          const total = liquids.reduce((sum, p) => sum + p.amount, 0);
          for (const part of batch.perLitre)
            out.ledger.push({
              occurred_at: startedAt,
              project_id: projectId,
              kind: "run",
              batch_id: channelBatches[channel],
              reagent_id: part.reagent,
              volume_ml: part.unit === "mL" ? round((volumes[channel] * part.amount) / total, 4) : 0,
              mass_g: part.unit === "g" ? round(part.amount * litres, 5) : null,
              channel,
              waste_stream_id: plan.wasteStream,
              waste_container_id: container.row.id,
              source_kind: "seed",
              source_id: `run:${runId}`,
              author_id: operator,
              created_at: startedAt,
            });
        }
        clock = new Date(clock.getTime() + (injections * plan.runMinutes + between(10, 40)) * 60_000);
      }
    }
  }
  pickUp(new Date(midnight.getTime() - DAY_MS));
  // What is still under an instrument at the end of the year stays in use.
  for (const [key, container] of containers) {
    container.row.estimated_volume_ml = round(container.volume, 1);
    out.currentContainer[key] = container.row.id as number;
  }
  // Bottles in the state each batch's use explains: drawn-from bottles empty, the one in use, the rest ready.
  for (const batch of out.batches) {
    const count = batch.bottles as number;
    const used = (batch.volume_ml as number) - (batch.remaining_ml as number);
    for (let number = 1; number <= count; number++) {
      const status =
        batch.status !== "in_use" ? batch.status : used >= number * 1000 ? "empty" : used > (number - 1) * 1000 ? "in_use" : "ready";
      out.batchBottles.push({ batch_id: batch.id, number, status, created_at: batch.prepared_at, updated_at: batch.updated_at });
    }
  }
  return out;
}
