// The demo facility's recipes and batches: a few current ones and older ones already used up.
import { DAY_MS, type DemoClock } from "../../demo-time";

const DAY = DAY_MS;
const stamp = (d: Date) => ({ created_at: d, updated_at: d });

export function preparationRows(at: DemoClock, t0: Date) {
  const spec = (s: object) => JSON.stringify(s);
  const recipes = [
    { id: 1, code: "MP-FA-W", name: "0.1 % formic acid in water", channel: "A", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 2, code: "MP-FA-ACN", name: "0.1 % formic acid in acetonitrile", channel: "B", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 3, code: "MP-PHOS-30", name: "25 mM potassium phosphate, pH 3.0", channel: "A", status: "approved", created_by: 3, ...stamp(t0) },
    { id: 4, code: "MP-AMF-35", name: "10 mM ammonium formate, pH 3.5", channel: "A", status: "draft", created_by: 6, ...stamp(at(10)) },
  ];
  const recipeVersions = [
    {
      id: 1,
      recipe_id: 1,
      version: 1,
      spec: spec({ solvents: [{ reagent: "water", percent: 100 }], additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }] }),
      detection_nm: 254,
      storage: "Room temperature, capped",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 2,
      recipe_id: 2,
      version: 1,
      spec: spec({
        solvents: [{ reagent: "acetonitrile", percent: 100 }],
        additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
      }),
      detection_nm: 254,
      storage: "Flammables cabinet",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 3,
      recipe_id: 3,
      version: 1,
      spec: spec({
        solvents: [{ reagent: "water", percent: 100 }],
        buffer: {
          reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"],
          targetPH: 3.0,
          concentration_mM: 25,
          basis: "first",
          temperature_C: 25,
        },
      }),
      detection_nm: 210,
      storage: "2–8 °C, use within 7 days",
      created_by: 3,
      approved_by: 2,
      approved_at: t0,
      created_at: t0,
    },
    {
      id: 4,
      recipe_id: 4,
      version: 1,
      spec: spec({
        solvents: [{ reagent: "water", percent: 100 }],
        buffer: { reagents: ["ammonium-formate", "formic-acid"], targetPH: 3.5, concentration_mM: 10, basis: "first", temperature_C: 25 },
      }),
      detection_nm: 220,
      storage: "Room temperature, 48 h",
      created_by: 6,
      created_at: at(10),
    },
  ];

  // Batches: a few current ones and older ones already used up.
  const batchPlan = [
    { id: 1, code: "B26-0901", recipe_version_id: 1, days: 75, volume: 2000, remaining: 0, status: "empty", life: 30 },
    { id: 2, code: "B26-0902", recipe_version_id: 2, days: 75, volume: 2000, remaining: 0, status: "empty", life: 30 },
    { id: 3, code: "B26-1014", recipe_version_id: 3, days: 40, volume: 1000, remaining: 0, status: "discarded", life: 7 },
    { id: 4, code: "B26-1103", recipe_version_id: 1, days: 12, volume: 4000, remaining: 2650, status: "in_use", life: 30 },
    { id: 5, code: "B26-1104", recipe_version_id: 2, days: 12, volume: 4000, remaining: 2890, status: "in_use", life: 30 },
    { id: 6, code: "B26-1120", recipe_version_id: 3, days: 2, volume: 1000, remaining: 1000, status: "ready", life: 7 },
  ];
  const batches = batchPlan.map((b) => ({
    id: b.id,
    code: b.code,
    recipe_version_id: b.recipe_version_id,
    spec_snapshot: JSON.stringify({ recipeVersionId: b.recipe_version_id }),
    volume_ml: b.volume,
    remaining_ml: b.remaining,
    bottles: b.volume / 1000,
    bottle_size_ml: 1000,
    temperature_c: 22,
    measured_ph: b.recipe_version_id === 3 ? 3.02 : null,
    prepared_by: b.id % 2 ? 3 : 6,
    prepared_at: at(b.days, 8),
    expires_at: new Date(at(b.days, 8).getTime() + b.life * DAY),
    status: b.status,
    ...stamp(at(b.days, 8)),
  }));
  const batchComponents = [
    { batch_id: 4, reagent_id: "water", stock_lot_id: 6, role: "solvent", unit: "mL", target_amount: 4000, actual_amount: 4000 },
    { batch_id: 4, reagent_id: "formic-acid", stock_lot_id: 3, role: "additive", unit: "mL", target_amount: 4, actual_amount: 4 },
    { batch_id: 5, reagent_id: "acetonitrile", stock_lot_id: 1, role: "solvent", unit: "mL", target_amount: 4000, actual_amount: 4000 },
    { batch_id: 5, reagent_id: "formic-acid", stock_lot_id: 3, role: "additive", unit: "mL", target_amount: 4, actual_amount: 4 },
    { batch_id: 6, reagent_id: "water", stock_lot_id: 6, role: "solvent", unit: "mL", target_amount: 1000, actual_amount: 1000 },
    {
      batch_id: 6,
      reagent_id: "potassium-dihydrogen-phosphate",
      stock_lot_id: 4,
      role: "buffer",
      unit: "g",
      target_amount: 3.4021,
      actual_amount: 3.405,
    },
  ];
  return { recipes, recipeVersions, batches, batchComponents, batchBottles: bottleRows(batchPlan, at) };
}

/**
 * Every batch gets its bottles (1 L each), in the state the batch's use explains: the bottles
 * drawn from first are empty, the one being drawn from is in use, the rest still ready.
 */
function bottleRows(plan: { id: number; days: number; volume: number; remaining: number; status: string }[], at: DemoClock) {
  return plan.flatMap((b) => {
    const count = b.volume / 1000;
    const used = b.volume - b.remaining;
    return Array.from({ length: count }, (_, index) => {
      const number = index + 1;
      const status =
        b.status === "empty" || b.status === "discarded"
          ? b.status
          : used >= number * 1000
            ? "empty"
            : used > index * 1000
              ? "in_use"
              : "ready";
      return { batch_id: b.id, number, status, ...stamp(at(b.days, 8)) };
    });
  });
}
