// The demo recipes' specifications (invented facility, common mobile phases), shared by the seeder
// and the tests that check every demo recipe's order of work.
export const DEMO_RECIPE_SPECS = {
  "MP-FA-W": {
    solvents: [{ reagent: "water", percent: 100 }],
    additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" as const }],
  },
  "MP-FA-ACN": {
    solvents: [{ reagent: "acetonitrile", percent: 100 }],
    additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" as const }],
  },
  "MP-PHOS-30": {
    solvents: [{ reagent: "water", percent: 100 }],
    buffer: {
      reagents: ["potassium-dihydrogen-phosphate", "phosphoric-acid"] as [string, string],
      targetPH: 3.0,
      concentration_mM: 25,
      basis: "first" as const,
      temperature_C: 25,
    },
  },
  "MP-AMF-35": {
    solvents: [{ reagent: "water", percent: 100 }],
    buffer: {
      reagents: ["ammonium-formate", "formic-acid"] as [string, string],
      targetPH: 3.5,
      concentration_mM: 10,
      basis: "first" as const,
      temperature_C: 25,
    },
  },
};
