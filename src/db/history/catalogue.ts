// What the demo facility's year is made of: the clients, projects, people, the fourth instrument,
// the recipes and what each instrument runs. Every name is invented; volumes, prices and lot sizes
// are illustrative demo figures, not reference values.

export interface ClientPlan {
  key: string;
  name: string;
  kind: "internal" | "external";
  costCentre?: string;
  billingEmail?: string;
}

/** The three groups and two companies of the small demo are looked up by name; these join them. */
export const NEW_CLIENTS: ClientPlan[] = [
  { key: "glyco", name: "Glycobiology Group", kind: "internal", costCentre: "CC-4415" },
  { key: "biomarker", name: "Clinical Biomarker Unit", kind: "internal", costCentre: "CC-4508" },
  { key: "corriebrae", name: "Corriebrae Formulations", kind: "external", billingEmail: "ledger@corriebrae.test" },
];

/** Client names of the small demo, by the keys the projects below use. */
export const DEMO_CLIENTS: Record<string, string> = {
  plant: "Plant Metabolomics Group",
  protein: "Protein Chemistry Group",
  trace: "Environmental Trace Analysis Group",
  quillfeather: "Quillfeather Therapeutics",
  tarnbrook: "Tarnbrook Agritech",
};

export interface ProjectPlan {
  code: string;
  name: string;
  client: string;
  /** Instrument keys the project's samples run on. */
  on: InstrumentKey[];
  /** Active from this many days ago until `until` days ago (0: still running). */
  from: number;
  until: number;
  contact: string;
}

export type InstrumentKey = "wren" | "kestrel" | "heron" | "sandpiper";

// prettier-ignore
export const NEW_PROJECTS: ProjectPlan[] = [
  { code: "PMG-LEAF-25", name: "Leaf flavonoid survey", client: "plant", on: ["wren", "sandpiper"], from: 364, until: 150, contact: "Dr. Amara Nkem" },
  { code: "PMG-SEED-26", name: "Seed coat phenolics", client: "plant", on: ["wren"], from: 200, until: 0, contact: "Dr. Amara Nkem" },
  { code: "PMG-STRS-26", name: "Drought stress time course", client: "plant", on: ["sandpiper"], from: 120, until: 0, contact: "Oskar Venn" },
  { code: "PCG-PEPM-25", name: "Peptide mapping of reference constructs", client: "protein", on: ["heron"], from: 364, until: 180, contact: "Dr. Lukas Brenner" },
  { code: "PCG-GLYC-26", name: "Released glycan profiling", client: "protein", on: ["heron", "sandpiper"], from: 240, until: 0, contact: "Dr. Lukas Brenner" },
  { code: "PCG-AGGR-26", name: "Aggregation screen, buffer series", client: "protein", on: ["kestrel"], from: 160, until: 40, contact: "Ada Ferreira" },
  { code: "ETA-LAKE-25", name: "Lake sediment extracts, autumn", client: "trace", on: ["heron"], from: 364, until: 250, contact: "Dr. Sofia Marrow" },
  { code: "ETA-WELL-26", name: "Groundwater wells, quarterly panel", client: "trace", on: ["heron", "kestrel"], from: 300, until: 0, contact: "Dr. Sofia Marrow" },
  { code: "ETA-SOIL-26", name: "Soil leachate pesticides", client: "trace", on: ["heron"], from: 180, until: 60, contact: "Yusuf Aldane" },
  { code: "GLY-HMO-25", name: "Milk oligosaccharide standards", client: "glyco", on: ["sandpiper"], from: 364, until: 200, contact: "Dr. Katrin Olsen" },
  { code: "GLY-SIAL-26", name: "Sialic acid quantitation", client: "glyco", on: ["sandpiper", "kestrel"], from: 260, until: 0, contact: "Dr. Katrin Olsen" },
  { code: "GLY-LECT-26", name: "Lectin binding fractions", client: "glyco", on: ["wren"], from: 150, until: 0, contact: "Mei Tanaka-Roux" },
  { code: "CBU-VITD-25", name: "Vitamin D metabolite method transfer", client: "biomarker", on: ["wren"], from: 364, until: 230, contact: "Dr. Emil Sandor" },
  { code: "CBU-CORT-26", name: "Cortisol panel, pilot cohort", client: "biomarker", on: ["wren", "heron"], from: 280, until: 0, contact: "Dr. Emil Sandor" },
  { code: "CBU-AMIN-26", name: "Plasma amino acids", client: "biomarker", on: ["sandpiper"], from: 210, until: 0, contact: "Lena Morell" },
  { code: "CBU-STAB-26", name: "Sample stability at −80 °C", client: "biomarker", on: ["kestrel"], from: 330, until: 120, contact: "Lena Morell" },
  { code: "QFT-IMP-011", name: "Impurity profiling, lead series QF-11", client: "quillfeather", on: ["kestrel"], from: 364, until: 210, contact: "Jun Okabe" },
  { code: "QFT-DISS-012", name: "Dissolution samples QF-12 tablets", client: "quillfeather", on: ["kestrel", "wren"], from: 300, until: 90, contact: "Jun Okabe" },
  { code: "QFT-CLN-013", name: "Cleaning validation swabs", client: "quillfeather", on: ["wren"], from: 250, until: 0, contact: "Jun Okabe" },
  { code: "TBA-MYC-005", name: "Mycotoxin screen, harvest lots", client: "tarnbrook", on: ["heron"], from: 364, until: 190, contact: "Mireille Aubart" },
  { code: "TBA-RES-006", name: "Residue panel, fruit extracts", client: "tarnbrook", on: ["heron", "kestrel"], from: 220, until: 30, contact: "Mireille Aubart" },
  { code: "TBA-SOIL-008", name: "Soil amendment trial", client: "tarnbrook", on: ["sandpiper"], from: 100, until: 0, contact: "Mireille Aubart" },
  { code: "CRF-EXC-01", name: "Excipient compatibility, series A", client: "corriebrae", on: ["kestrel"], from: 340, until: 150, contact: "Rhian Calder" },
  { code: "CRF-ASSY-02", name: "Assay and related substances, batch release", client: "corriebrae", on: ["kestrel", "sandpiper"], from: 270, until: 0, contact: "Rhian Calder" },
  { code: "CRF-PRES-03", name: "Preservative content, syrup", client: "corriebrae", on: ["wren"], from: 180, until: 0, contact: "Tobias Quint" },
  { code: "CRF-STAB-04", name: "Long-term stability, 12-month pull", client: "corriebrae", on: ["sandpiper"], from: 90, until: 0, contact: "Tobias Quint" },
];

export const NEW_USERS = [
  { email: "hana.vesely@demo.test", name: "Hana Vesely", role: "technician" },
  { email: "client.corriebrae@demo.test", name: "Rhian Calder", role: "client", client: "corriebrae" },
] as const;

/** Recipes the small demo does not have. Specs in the recipe form's shape. */
export interface RecipePlan {
  code: string;
  name: string;
  channel: string | null;
  status: "approved" | "retired";
  spec: object;
  storage: string;
  detectionNm: number | null;
  /** Shelf life of a batch, in days. */
  lifeDays: number;
  /** What one litre of batch takes, per reagent: mL of liquids, g of solids. */
  perLitre: { reagent: string; role: "solvent" | "additive" | "buffer" | "titrant"; unit: "mL" | "g"; amount: number }[];
}

const fa = (solvent: string) => ({
  solvents: [{ reagent: solvent, percent: 100 }],
  additives: [{ reagent: "formic-acid", amount: 0.1, unit: "%v/v" }],
});
const tfa = (solvent: string) => ({
  solvents: [{ reagent: solvent, percent: 100 }],
  additives: [{ reagent: "trifluoroacetic-acid", amount: 0.05, unit: "%v/v" }],
});

export const NEW_RECIPES: RecipePlan[] = [
  {
    code: "MP-MEOH",
    name: "Methanol, HPLC grade",
    channel: "B",
    status: "approved",
    spec: { solvents: [{ reagent: "methanol", percent: 100 }] },
    storage: "Flammables cabinet",
    detectionNm: 230,
    lifeDays: 30,
    perLitre: [{ reagent: "methanol", role: "solvent", unit: "mL", amount: 1000 }],
  },
  {
    code: "MP-TFA-W",
    name: "0.05 % TFA in water",
    channel: "A",
    status: "approved",
    spec: tfa("water"),
    storage: "Room temperature, capped",
    detectionNm: 214,
    lifeDays: 30,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "trifluoroacetic-acid", role: "additive", unit: "mL", amount: 0.5 },
    ],
  },
  {
    code: "MP-TFA-ACN",
    name: "0.05 % TFA in acetonitrile",
    channel: "B",
    status: "approved",
    spec: tfa("acetonitrile"),
    storage: "Flammables cabinet",
    detectionNm: 214,
    lifeDays: 30,
    perLitre: [
      { reagent: "acetonitrile", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "trifluoroacetic-acid", role: "additive", unit: "mL", amount: 0.5 },
    ],
  },
  {
    code: "MP-AMAC-W",
    name: "10 mM ammonium acetate in water",
    channel: "A",
    status: "approved",
    spec: { solvents: [{ reagent: "water", percent: 100 }], additives: [{ reagent: "ammonium-acetate", amount: 0.771, unit: "g/L" }] },
    storage: "2–8 °C, use within 3 days",
    detectionNm: 260,
    lifeDays: 3,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "ammonium-acetate", role: "additive", unit: "g", amount: 0.771 },
    ],
  },
  {
    code: "MP-FA-MEOH",
    name: "0.1 % formic acid in methanol",
    channel: "B",
    status: "approved",
    spec: fa("methanol"),
    storage: "Flammables cabinet",
    detectionNm: 254,
    lifeDays: 30,
    perLitre: [
      { reagent: "methanol", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "formic-acid", role: "additive", unit: "mL", amount: 1 },
    ],
  },
  {
    code: "SW-ACN-10",
    name: "Seal wash, 10 % acetonitrile in water",
    channel: null,
    status: "approved",
    spec: {
      solvents: [
        { reagent: "water", percent: 90 },
        { reagent: "acetonitrile", percent: 10 },
      ],
    },
    storage: "Room temperature",
    detectionNm: null,
    lifeDays: 14,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 900 },
      { reagent: "acetonitrile", role: "solvent", unit: "mL", amount: 100 },
    ],
  },
  {
    code: "NW-IPA-50",
    name: "Needle wash, 2-propanol/water 50:50",
    channel: null,
    status: "approved",
    spec: {
      solvents: [
        { reagent: "isopropanol", percent: 50 },
        { reagent: "water", percent: 50 },
      ],
    },
    storage: "Flammables cabinet",
    detectionNm: null,
    lifeDays: 30,
    perLitre: [
      { reagent: "isopropanol", role: "solvent", unit: "mL", amount: 500 },
      { reagent: "water", role: "solvent", unit: "mL", amount: 500 },
    ],
  },
  {
    code: "MP-MEOH-80",
    name: "Methanol/water 80:20",
    channel: "B",
    status: "approved",
    spec: {
      solvents: [
        { reagent: "methanol", percent: 80 },
        { reagent: "water", percent: 20 },
      ],
    },
    storage: "Flammables cabinet",
    detectionNm: 230,
    lifeDays: 30,
    perLitre: [
      { reagent: "methanol", role: "solvent", unit: "mL", amount: 800 },
      { reagent: "water", role: "solvent", unit: "mL", amount: 200 },
    ],
  },
  {
    code: "MP-H3PO4-W",
    name: "0.1 % phosphoric acid in water",
    channel: "A",
    status: "approved",
    spec: { solvents: [{ reagent: "water", percent: 100 }], additives: [{ reagent: "phosphoric-acid", amount: 0.1, unit: "%v/v" }] },
    storage: "Room temperature, capped",
    detectionNm: 210,
    lifeDays: 30,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "phosphoric-acid", role: "additive", unit: "mL", amount: 1 },
    ],
  },
  {
    code: "MP-TFA-W-01",
    name: "0.1 % TFA in water (replaced by MP-TFA-W)",
    channel: "A",
    status: "retired",
    spec: { solvents: [{ reagent: "water", percent: 100 }], additives: [{ reagent: "trifluoroacetic-acid", amount: 0.1, unit: "%v/v" }] },
    storage: "Room temperature, capped",
    detectionNm: 214,
    lifeDays: 30,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "trifluoroacetic-acid", role: "additive", unit: "mL", amount: 1 },
    ],
  },
  {
    code: "MP-ACN",
    name: "Acetonitrile, gradient grade",
    channel: "B",
    status: "approved",
    spec: { solvents: [{ reagent: "acetonitrile", percent: 100 }] },
    storage: "Flammables cabinet",
    detectionNm: 210,
    lifeDays: 30,
    perLitre: [{ reagent: "acetonitrile", role: "solvent", unit: "mL", amount: 1000 }],
  },
];

/** The small demo's recipes the year uses, with what a litre takes (phosphate: 25 mM KH₂PO₄, 136.09 g/mol). */
export const DEMO_RECIPES: Record<string, Pick<RecipePlan, "lifeDays" | "perLitre">> = {
  "MP-FA-W": {
    lifeDays: 30,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "formic-acid", role: "additive", unit: "mL", amount: 1 },
    ],
  },
  "MP-FA-ACN": {
    lifeDays: 30,
    perLitre: [
      { reagent: "acetonitrile", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "formic-acid", role: "additive", unit: "mL", amount: 1 },
    ],
  },
  "MP-PHOS-30": {
    lifeDays: 7,
    perLitre: [
      { reagent: "water", role: "solvent", unit: "mL", amount: 1000 },
      { reagent: "potassium-dihydrogen-phosphate", role: "buffer", unit: "g", amount: 3.4021 },
      { reagent: "phosphoric-acid", role: "titrant", unit: "mL", amount: 0.15 },
    ],
  },
};

export interface InstrumentPlan {
  key: InstrumentKey;
  name: string;
  prefix: string;
  /** Recipe codes on channels A and B, and mL each channel takes per injection (method flow × run time). */
  recipes: { A: string; B: string };
  perInjection: { A: number; B: number };
  method: string;
  runMinutes: number;
  injections: [number, number];
  runsPerDay: [number, number];
  /** Batch size in litres (1 L bottles). */
  batchLitres: { A: number; B: number };
  /** The runs of the small demo cover the last 90 days on the first three instruments. */
  untilDaysAgo: number;
  wasteStream: string;
  wasteCapacity_mL: number;
  room: string;
}

export const INSTRUMENTS: InstrumentPlan[] = [
  {
    key: "wren",
    name: "Wren",
    prefix: "WRN",
    recipes: { A: "MP-FA-W", B: "MP-FA-ACN" },
    perInjection: { A: 3.38, B: 2.62 },
    method: "Scout gradient 5–95 % B, 12 min",
    runMinutes: 15,
    injections: [4, 16],
    runsPerDay: [4, 7],
    batchLitres: { A: 2, B: 2 },
    untilDaysAgo: 91,
    wasteStream: "non-halogenated-organic",
    wasteCapacity_mL: 20_000,
    room: "B2.14",
  },
  {
    key: "kestrel",
    name: "Kestrel",
    prefix: "KES",
    recipes: { A: "MP-PHOS-30", B: "MP-MEOH" },
    perInjection: { A: 20.1, B: 12.9 },
    method: "Impurity method 10–60 % B, 25 min",
    runMinutes: 33,
    injections: [3, 10],
    runsPerDay: [3, 5],
    batchLitres: { A: 2, B: 4 },
    untilDaysAgo: 91,
    wasteStream: "non-halogenated-organic",
    wasteCapacity_mL: 20_000,
    room: "B2.14",
  },
  {
    key: "heron",
    name: "Heron",
    prefix: "HRN",
    recipes: { A: "MP-TFA-W", B: "MP-TFA-ACN" },
    perInjection: { A: 4.8, B: 3.2 },
    method: "Scout gradient 5–95 % B, 12 min",
    runMinutes: 15,
    injections: [4, 16],
    runsPerDay: [4, 7],
    batchLitres: { A: 2, B: 2 },
    untilDaysAgo: 91,
    wasteStream: "halogenated-organic",
    wasteCapacity_mL: 10_000,
    room: "B2.16",
  },
  {
    key: "sandpiper",
    name: "Sandpiper",
    prefix: "SND",
    recipes: { A: "MP-AMAC-W", B: "MP-FA-MEOH" },
    perInjection: { A: 6.3, B: 3.7 },
    method: "Fluorescence gradient 20–80 % B, 10 min",
    runMinutes: 14,
    injections: [4, 16],
    runsPerDay: [4, 6],
    batchLitres: { A: 1, B: 2 },
    untilDaysAgo: 1,
    wasteStream: "non-halogenated-organic",
    wasteCapacity_mL: 20_000,
    room: "B2.16",
  },
];

/** Stock as it arrives: bottle size (mL or g), supplier, grade, lot prefix and the room it is kept in. */
export const STOCK: Record<string, { size: number; supplier: string; grade: string; prefix: string; room: string }> = {
  acetonitrile: { size: 4000, supplier: "Northfold Chemicals", grade: "HPLC", prefix: "AN", room: "B2.14" },
  methanol: { size: 4000, supplier: "Northfold Chemicals", grade: "HPLC", prefix: "ME", room: "B2.14" },
  isopropanol: { size: 2500, supplier: "Northfold Chemicals", grade: "HPLC", prefix: "IP", room: "B2.14" },
  "formic-acid": { size: 100, supplier: "Pellworth Reagents", grade: "LC-MS", prefix: "FA", room: "B2.14" },
  "trifluoroacetic-acid": { size: 100, supplier: "Pellworth Reagents", grade: "LC-MS", prefix: "TF", room: "B2.16" },
  "phosphoric-acid": { size: 500, supplier: "Pellworth Reagents", grade: "analytical", prefix: "PA", room: "B2.16" },
  "potassium-dihydrogen-phosphate": { size: 500, supplier: "Pellworth Reagents", grade: "analytical", prefix: "KP", room: "B2.16" },
  "ammonium-acetate": { size: 250, supplier: "Pellworth Reagents", grade: "LC-MS", prefix: "AA", room: "B2.16" },
};
