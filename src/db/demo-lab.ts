// Demo data: the invented facility's lab — waste streams and containers, instruments, reagent
// rows, stock lots and methods. Split from the facility seeder, which calls it in the same order.
import type { QueryInterface } from "sequelize";
import type { demoClock } from "./demo-time";

const stamp = (d: Date) => ({ created_at: d, updated_at: d });

export async function seedDemoLab(qi: QueryInterface, at: ReturnType<typeof demoClock>, t0: Date): Promise<void> {
  // Common-practice defaults; the safety officer edits them to the institution's rules.
  await qi.bulkInsert("waste_streams", [
    {
      id: "aqueous",
      name: "Aqueous",
      description: "Organic-free buffers and salt solutions; local discharge limits apply.",
      restrictiveness: 1,
      ...stamp(t0),
    },
    {
      id: "non-halogenated-organic",
      name: "Non-halogenated organic",
      description: "Acetonitrile, methanol, ethanol, 2-propanol, THF and their aqueous mixes.",
      restrictiveness: 2,
      ...stamp(t0),
    },
    { id: "acidic-corrosive", name: "Acidic / corrosive", description: "Concentrated acids and bases.", restrictiveness: 3, ...stamp(t0) },
    {
      id: "halogenated-organic",
      name: "Halogenated organic",
      description: "Chlorinated solvents; TFA-containing waste at some sites.",
      restrictiveness: 4,
      ...stamp(t0),
    },
  ]);

  await qi.bulkInsert("waste_containers", [
    {
      id: 1,
      code: "WC-0101",
      stream_id: "non-halogenated-organic",
      capacity_ml: 20_000,
      estimated_volume_ml: 0,
      room: "B2.14",
      location_kind: "instrument",
      location_note: "Under Wren",
      accumulation_started_at: at(40),
      ...stamp(at(40)),
    },
    {
      id: 2,
      code: "WC-0102",
      stream_id: "non-halogenated-organic",
      capacity_ml: 20_000,
      estimated_volume_ml: 0,
      room: "B2.14",
      location_kind: "instrument",
      location_note: "Under Kestrel",
      accumulation_started_at: at(24),
      ...stamp(at(24)),
    },
    {
      id: 3,
      code: "WC-0103",
      stream_id: "halogenated-organic",
      capacity_ml: 10_000,
      estimated_volume_ml: 0,
      room: "B2.16",
      location_kind: "instrument",
      location_note: "Under Heron",
      accumulation_started_at: at(70),
      ...stamp(at(70)),
    },
    {
      id: 4,
      code: "WC-0104",
      stream_id: "aqueous",
      capacity_ml: 10_000,
      estimated_volume_ml: 0,
      room: "B2.16",
      location_kind: "satellite_area",
      location_note: "Satellite area, bench 3",
      accumulation_started_at: at(30),
      ...stamp(at(30)),
    },
  ]);

  await qi.bulkInsert("instruments", [
    {
      id: 1,
      name: "Wren",
      kind: "UHPLC, binary pump, diode-array detector",
      room: "B2.14",
      channels: JSON.stringify(["A", "B"]),
      waste_container_id: 1,
      ...stamp(t0),
    },
    {
      id: 2,
      name: "Kestrel",
      kind: "HPLC, quaternary pump, UV detector",
      room: "B2.14",
      channels: JSON.stringify(["A", "B", "C", "D"]),
      waste_container_id: 2,
      ...stamp(t0),
    },
    {
      id: 3,
      name: "Heron",
      kind: "UHPLC with single-quadrupole MS",
      room: "B2.16",
      channels: JSON.stringify(["A", "B"]),
      waste_container_id: 3,
      ...stamp(t0),
    },
  ]);

  const reagents: [string, string, "mL" | "g", string, boolean][] = [
    ["water", "Water", "mL", "aqueous", false],
    ["acetonitrile", "Acetonitrile", "mL", "non-halogenated-organic", true],
    ["methanol", "Methanol", "mL", "non-halogenated-organic", true],
    ["isopropanol", "2-Propanol", "mL", "non-halogenated-organic", true],
    ["formic-acid", "Formic acid", "mL", "acidic-corrosive", false],
    ["trifluoroacetic-acid", "Trifluoroacetic acid", "mL", "halogenated-organic", false],
    ["phosphoric-acid", "Phosphoric acid 85 %", "mL", "acidic-corrosive", false],
    ["ammonium-formate", "Ammonium formate", "g", "aqueous", false],
    ["ammonium-acetate", "Ammonium acetate", "g", "aqueous", false],
    ["potassium-dihydrogen-phosphate", "Potassium dihydrogen phosphate", "g", "aqueous", false],
    ["dipotassium-hydrogen-phosphate", "Dipotassium hydrogen phosphate", "g", "aqueous", false],
  ];
  await qi.bulkInsert(
    "reagents",
    reagents.map(([id, name, unit, stream, flammable]) => ({
      id,
      name,
      unit,
      grades: JSON.stringify(unit === "mL" && flammable ? ["HPLC", "LC-MS"] : ["analytical", "LC-MS"]),
      waste_stream_id: stream,
      flammable,
      ...stamp(t0),
    })),
  );

  await qi.bulkInsert("stock_lots", [
    {
      id: 1,
      reagent_id: "acetonitrile",
      lot_number: "AN-58213",
      supplier: "Northfold Chemicals",
      grade: "HPLC",
      received_on: at(60),
      opened_on: at(50),
      expires_on: at(-600),
      quantity: 10_000,
      remaining: 3_400,
      room: "B2.14",
      ...stamp(at(60)),
    },
    {
      id: 2,
      reagent_id: "methanol",
      lot_number: "ME-11907",
      supplier: "Northfold Chemicals",
      grade: "HPLC",
      received_on: at(80),
      opened_on: at(75),
      expires_on: at(-500),
      quantity: 4_000,
      remaining: 2_100,
      room: "B2.14",
      ...stamp(at(80)),
    },
    {
      id: 3,
      reagent_id: "formic-acid",
      lot_number: "FA-2290",
      supplier: "Pellworth Reagents",
      grade: "LC-MS",
      received_on: at(90),
      opened_on: at(88),
      expires_on: at(-300),
      quantity: 100,
      remaining: 64,
      room: "B2.14",
      ...stamp(at(90)),
    },
    {
      id: 4,
      reagent_id: "potassium-dihydrogen-phosphate",
      lot_number: "KP-7731",
      supplier: "Pellworth Reagents",
      grade: "analytical",
      received_on: at(200),
      opened_on: at(190),
      expires_on: at(-400),
      quantity: 500,
      remaining: 310,
      room: "B2.16",
      ...stamp(at(200)),
    },
    {
      id: 5,
      reagent_id: "ammonium-formate",
      lot_number: "AF-0418",
      supplier: "Northfold Chemicals",
      grade: "LC-MS",
      received_on: at(45),
      opened_on: at(40),
      expires_on: at(-700),
      quantity: 250,
      remaining: 236,
      room: "B2.16",
      ...stamp(at(45)),
    },
    {
      id: 6,
      reagent_id: "water",
      lot_number: "UPW-SYSTEM",
      supplier: "In-house purification",
      grade: "LC-MS",
      received_on: at(100),
      expires_on: at(-3650),
      quantity: 1_000_000,
      remaining: 1_000_000,
      room: "B2.14",
      ...stamp(at(100)),
    },
  ]);

  const program = (points: [number, number, number][]) =>
    JSON.stringify(points.map(([time_min, flow_mL_min, b]) => ({ time_min, flow_mL_min, composition: { A: 100 - b, B: b } })));
  await qi.bulkInsert("methods", [
    {
      id: 1,
      name: "Scout gradient 5–95 % B, 12 min",
      description: "Generic reversed-phase scouting gradient, 2.1 mm column.",
      program: program([
        [0, 0.4, 5],
        [10, 0.4, 95],
        [11, 0.4, 95],
        [11.1, 0.4, 5],
        [15, 0.4, 5],
      ]),
      re_equilibration_min: 3.9,
      run_time_min: 15,
      ...stamp(t0),
    },
    {
      id: 2,
      name: "Impurity method 10–60 % B, 25 min",
      description: "Shallow gradient, 4.6 mm column.",
      program: program([
        [0, 1.0, 10],
        [25, 1.0, 60],
        [27, 1.0, 90],
        [27.5, 1.0, 10],
        [33, 1.0, 10],
      ]),
      re_equilibration_min: 5.5,
      run_time_min: 33,
      ...stamp(t0),
    },
    {
      id: 3,
      name: "Isocratic 40 % B",
      description: "Isocratic assay.",
      program: program([
        [0, 1.0, 40],
        [8, 1.0, 40],
      ]),
      re_equilibration_min: 0,
      run_time_min: 8,
      ...stamp(t0),
    },
  ]);
}
