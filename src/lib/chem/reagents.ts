/**
 * The reagent catalogue: solvents, acids, bases and buffer salts used to make
 * LC mobile phases. Every value carries the key of its source (see
 * `sources.ts`); molar masses are computed from the formula and the CIAAW
 * atomic weights, never typed in.
 */
import { ACID_SYSTEMS, type AcidSystem, type StrongIonId } from "./acid-systems";
import { molarMass } from "./formula";
import { anchoredDensity, PERRY_105, type Dippr105 } from "./liquid-density";
import type { SourceKey } from "./sources";
import { waterDensity_g_mL } from "./water";

export type PhysicalForm = "liquid" | "solid";
export type ReagentRole = "solvent" | "acid" | "base" | "salt";
export type WasteStream = "non-halogenated-organic" | "halogenated-organic" | "aqueous" | "acidic-corrosive" | "basic-corrosive";
export type GhsPictogram = "GHS01" | "GHS02" | "GHS03" | "GHS04" | "GHS05" | "GHS06" | "GHS07" | "GHS08" | "GHS09";

export interface Sourced<T> {
  value: T;
  source: SourceKey;
  note?: string;
}

export interface GhsData {
  pictograms: readonly GhsPictogram[];
  signalWord: "Danger" | "Warning" | null;
  hazardStatements: readonly string[];
  source: SourceKey;
  note?: string;
}

export interface AcidBaseData {
  /** Acid–base systems per mole of reagent (borax carries 4 boron). */
  systems: readonly { system: AcidSystem; count: number }[];
  /** Fully dissociated ions per mole of reagent. */
  ions: readonly { ion: StrongIonId; count: number }[];
}

export interface Reagent {
  /** kebab-case, stable: other tables refer to it. */
  id: string;
  name: string;
  /** Formula as weighed, water of crystallisation included. */
  formula: string;
  /** From the formula and CIAAW 2021 atomic weights. */
  molarMass_g_mol: number;
  form: PhysicalForm;
  role: ReagentRole;
  /** For liquids: g/mL at 20 and 25 °C (of the product as sold, e.g. 85 % H3PO4). */
  density_g_mL?: { at20_C?: Sourced<number>; at25_C?: Sourced<number> };
  /** Temperature dependence of the density (organic liquids: Perry's DIPPR 105 coefficients). */
  densityCorrelation?: Dippr105;
  /**
   * Typical mass fraction of the formula substance in the product as sold (85 % H3PO4, KOH pellets
   * about 85 %); used when the lot's own assay is not recorded. Absent means taken as 100 %.
   */
  purity_w_w?: Sourced<number>;
  acidBase: AcidBaseData;
  /** UV cutoff (absorbance about 1 in a 1 cm cell); for additives at the stated usual concentration. */
  uvCutoff_nm?: Sourced<number>;
  /** Snyder's polarity index P′ (solvents). */
  polarityIndex?: Sourced<number>;
  ghs: GhsData;
  wasteStream: Sourced<WasteStream>;
  /** Volatile enough for LC–MS (common practice). */
  volatile: boolean;
  flammable: boolean;
  /** A concentrated acid or base as sold: add it to water, never water to it. */
  concentrated: "acid" | "base" | null;
  flashPoint_C?: Sourced<number>;
}

type ReagentInput = Omit<Reagent, "molarMass_g_mol" | "acidBase" | "densityCorrelation"> & {
  systems?: readonly { system: AcidSystem; count: number }[] | undefined;
  ions?: readonly { ion: StrongIonId; count: number }[] | undefined;
};

const S = ACID_SYSTEMS;
const NO_GHS: GhsData = {
  pictograms: [],
  signalWord: null,
  hazardStatements: [],
  source: "CLPM",
  note: "not classified as hazardous by typical suppliers (from memory)",
};
const AQUEOUS: Sourced<WasteStream> = { value: "aqueous", source: "CPwaste" };
const ORGANIC: Sourced<WasteStream> = { value: "non-halogenated-organic", source: "CPwaste" };
const PHOSPHATE_UV: Sourced<number> = { value: 200, source: "SKD10", note: "10 mM phosphate: below 200 nm" };

function reagent(input: ReagentInput): Reagent {
  const { systems = [], ions = [], ...rest } = input;
  const correlation = PERRY_105[input.id];
  return Object.freeze({
    ...rest,
    ...(correlation !== undefined ? { densityCorrelation: correlation } : {}),
    molarMass_g_mol: molarMass(input.formula),
    acidBase: Object.freeze({ systems, ions }),
  });
}

function salt(
  id: string,
  name: string,
  formula: string,
  systems: ReagentInput["systems"],
  ions: ReagentInput["ions"],
  extra: Partial<ReagentInput> = {},
): Reagent {
  return reagent({
    id,
    name,
    formula,
    form: "solid",
    role: "salt",
    systems,
    ions,
    ghs: NO_GHS,
    wasteStream: AQUEOUS,
    volatile: false,
    flammable: false,
    concentrated: null,
    ...extra,
  });
}

const list: Reagent[] = [
  // ── Solvents ────────────────────────────────────────────────────────────
  reagent({
    id: "water",
    name: "Water",
    formula: "H2O",
    form: "liquid",
    role: "solvent",
    density_g_mL: { at20_C: { value: 0.998207, source: "Tanaka01" }, at25_C: { value: 0.997047, source: "Tanaka01" } },
    uvCutoff_nm: { value: 190, source: "SKD10", note: "below 190 nm" },
    polarityIndex: { value: 10.2, source: "Snyder78" },
    ghs: NO_GHS,
    wasteStream: AQUEOUS,
    volatile: true,
    flammable: false,
    concentrated: null,
  }),
  reagent({
    id: "acetonitrile",
    name: "Acetonitrile",
    formula: "CH3CN",
    form: "liquid",
    role: "solvent",
    density_g_mL: {
      at20_C: { value: 0.7821, source: "ThermoMLjct06", note: "a solvent data page gives 0.782; ECHA 0.79" },
      at25_C: { value: 0.7768, source: "ThermoMLjct06" },
    },
    uvCutoff_nm: { value: 190, source: "SKD10" },
    polarityIndex: { value: 5.8, source: "Snyder78" },
    ghs: {
      pictograms: ["GHS02", "GHS07"],
      signalWord: "Danger",
      hazardStatements: ["H225", "H302", "H312", "H332", "H319"],
      source: "CLP",
    },
    wasteStream: ORGANIC,
    volatile: true,
    flammable: true,
    concentrated: null,
    flashPoint_C: { value: 2, source: "MerckM", note: "sources conflict: 2 °C (ICSC, from memory) and 12.8 °C (ECHA)" },
  }),
  reagent({
    id: "methanol",
    name: "Methanol",
    formula: "CH3OH",
    form: "liquid",
    role: "solvent",
    density_g_mL: { at20_C: { value: 0.7915, source: "Merck" }, at25_C: { value: 0.7866, source: "Merck" } },
    uvCutoff_nm: { value: 205, source: "SKD10" },
    polarityIndex: { value: 5.1, source: "Snyder78" },
    ghs: {
      pictograms: ["GHS02", "GHS06", "GHS08"],
      signalWord: "Danger",
      hazardStatements: ["H225", "H301", "H311", "H331", "H370"],
      source: "CLP",
    },
    wasteStream: ORGANIC,
    volatile: true,
    flammable: true,
    concentrated: null,
    flashPoint_C: { value: 12, source: "Merck" },
  }),
  reagent({
    id: "ethanol",
    name: "Ethanol",
    formula: "C2H5OH",
    form: "liquid",
    role: "solvent",
    density_g_mL: { at20_C: { value: 0.7893, source: "CRCconc" } },
    uvCutoff_nm: { value: 210, source: "SKD10" },
    polarityIndex: { value: 4.3, source: "Snyder78" },
    ghs: {
      pictograms: ["GHS02"],
      signalWord: "Danger",
      hazardStatements: ["H225"],
      source: "CLP",
      note: "Annex VI harmonised classification (C&L inventory); many supplier SDSs add Eye Irrit. 2, H319 (GHS07)",
    },
    wasteStream: ORGANIC,
    volatile: true,
    flammable: true,
    concentrated: null,
    flashPoint_C: { value: 13, source: "MerckM" },
  }),
  reagent({
    id: "isopropanol",
    name: "2-Propanol",
    formula: "(CH3)2CHOH",
    form: "liquid",
    role: "solvent",
    density_g_mL: { at20_C: { value: 0.7848, source: "CRCconc", note: "100 % row of the 2-propanol table" } },
    uvCutoff_nm: { value: 205, source: "SKD10" },
    polarityIndex: { value: 3.9, source: "Snyder78" },
    ghs: { pictograms: ["GHS02", "GHS07"], signalWord: "Danger", hazardStatements: ["H225", "H319", "H336"], source: "SDSipa" },
    wasteStream: ORGANIC,
    volatile: true,
    flammable: true,
    concentrated: null,
    flashPoint_C: { value: 12, source: "MerckM" },
  }),
  reagent({
    id: "tetrahydrofuran",
    name: "Tetrahydrofuran",
    formula: "C4H8O",
    form: "liquid",
    role: "solvent",
    density_g_mL: { at20_C: { value: 0.8892, source: "Merck" }, at25_C: { value: 0.8833, source: "Montgomery" } },
    uvCutoff_nm: { value: 212, source: "SKD10", note: "unstabilised HPLC grade; 220 nm for spectroscopic grade (Merck)" },
    polarityIndex: { value: 4.0, source: "Snyder78" },
    ghs: {
      pictograms: ["GHS02", "GHS07", "GHS08"],
      signalWord: "Danger",
      hazardStatements: ["H225", "H319", "H335", "H351", "EUH019"],
      source: "GisChem",
    },
    wasteStream: ORGANIC,
    volatile: true,
    flammable: true,
    concentrated: null,
    flashPoint_C: { value: -14, source: "Merck", note: "Merck gives −17 °C" },
  }),
  // ── Acids ───────────────────────────────────────────────────────────────
  reagent({
    id: "formic-acid",
    name: "Formic acid",
    formula: "HCOOH",
    form: "liquid",
    role: "acid",
    density_g_mL: { at20_C: { value: 1.2197, source: "Perry105", note: "the Merck Index gives 1.220 (from memory)" } },
    systems: [{ system: S.formate, count: 1 }],
    uvCutoff_nm: { value: 210, source: "SKD10", note: "0.1 % v/v" },
    ghs: {
      pictograms: ["GHS05"],
      signalWord: "Danger",
      hazardStatements: ["H314"],
      source: "CLH21",
      note: "2021 CLH proposal adds H226, H302, H331, H290, H318",
    },
    wasteStream: { value: "acidic-corrosive", source: "CPwaste" },
    volatile: true,
    flammable: false,
    concentrated: "acid",
  }),
  reagent({
    id: "acetic-acid",
    name: "Acetic acid, glacial",
    formula: "CH3COOH",
    form: "liquid",
    role: "acid",
    density_g_mL: { at20_C: { value: 1.0477, source: "CRCconc" } },
    systems: [{ system: S.acetate, count: 1 }],
    uvCutoff_nm: { value: 230, source: "SKD10", note: "1 % v/v" },
    ghs: { pictograms: ["GHS02", "GHS05"], signalWord: "Danger", hazardStatements: ["H226", "H314"], source: "CLPM" },
    wasteStream: { value: "acidic-corrosive", source: "CPwaste" },
    volatile: true,
    flammable: true,
    concentrated: "acid",
    flashPoint_C: { value: 39, source: "MerckM" },
  }),
  reagent({
    id: "trifluoroacetic-acid",
    name: "Trifluoroacetic acid",
    formula: "CF3COOH",
    form: "liquid",
    role: "acid",
    density_g_mL: {
      at20_C: { value: 1.489, source: "MerckM" },
      at25_C: { value: 1.48, source: "MerckM", note: "one data page gives 1.5351 (conflict)" },
    },
    systems: [{ system: S.trifluoroacetate, count: 1 }],
    uvCutoff_nm: { value: 210, source: "SKD10", note: "0.1 % v/v" },
    ghs: { pictograms: ["GHS05", "GHS07"], signalWord: "Danger", hazardStatements: ["H332", "H314", "H412"], source: "CLPM" },
    wasteStream: {
      value: "halogenated-organic",
      source: "CPwaste",
      note: "TFA-containing waste goes to the halogenated stream at some sites",
    },
    volatile: true,
    flammable: false,
    concentrated: "acid",
  }),
  reagent({
    id: "phosphoric-acid",
    name: "Phosphoric acid 85 %",
    formula: "H3PO4",
    form: "liquid",
    role: "acid",
    density_g_mL: { at20_C: { value: 1.69, source: "MerckM" }, at25_C: { value: 1.685, source: "MerckM" } },
    purity_w_w: { value: 0.85, source: "CPassay", note: "the usual product as sold; products are 85–88 %: use the lot's assay" },
    systems: [{ system: S.phosphate, count: 1 }],
    uvCutoff_nm: PHOSPHATE_UV,
    ghs: { pictograms: ["GHS05"], signalWord: "Danger", hazardStatements: ["H314", "H290"], source: "CLPM" },
    wasteStream: { value: "acidic-corrosive", source: "CPwaste" },
    volatile: false,
    flammable: false,
    concentrated: "acid",
  }),
  reagent({
    id: "hydrochloric-acid",
    name: "Hydrochloric acid 37 %",
    formula: "HCl",
    form: "liquid",
    role: "acid",
    density_g_mL: { at20_C: { value: 1.1839, source: "CRCconc", note: "interpolated between 36 % (1.1791) and 38 % (1.1886)" } },
    purity_w_w: { value: 0.37, source: "CRCconc", note: "the usual product as sold (37 % w/w)" },
    ions: [{ ion: "Cl-", count: 1 }],
    ghs: { pictograms: ["GHS05", "GHS07"], signalWord: "Danger", hazardStatements: ["H290", "H314", "H335"], source: "CLPM" },
    wasteStream: { value: "acidic-corrosive", source: "CPwaste" },
    volatile: true,
    flammable: false,
    concentrated: "acid",
  }),
  // ── Bases ───────────────────────────────────────────────────────────────
  reagent({
    id: "ammonia-solution",
    name: "Ammonia solution 25 %",
    formula: "NH3",
    form: "liquid",
    role: "base",
    density_g_mL: { at20_C: { value: 0.9071, source: "CRCconc", note: "interpolated between 24 % (0.9102) and 26 % (0.9040)" } },
    purity_w_w: { value: 0.25, source: "CRCconc", note: "the usual product as sold (25 % w/w NH3)" },
    systems: [{ system: S.ammonium, count: 1 }],
    ghs: { pictograms: ["GHS05", "GHS07", "GHS09"], signalWord: "Danger", hazardStatements: ["H314", "H335", "H400"], source: "CLPM" },
    wasteStream: { value: "basic-corrosive", source: "CPwaste" },
    volatile: true,
    flammable: false,
    concentrated: "base",
  }),
  reagent({
    id: "sodium-hydroxide",
    name: "Sodium hydroxide",
    formula: "NaOH",
    form: "solid",
    role: "base",
    purity_w_w: { value: 0.98, source: "CPassay", note: "pellets; the lot's certificate of analysis governs" },
    ions: [{ ion: "Na+", count: 1 }],
    ghs: { pictograms: ["GHS05"], signalWord: "Danger", hazardStatements: ["H290", "H314"], source: "CLPM" },
    wasteStream: { value: "basic-corrosive", source: "CPwaste" },
    volatile: false,
    flammable: false,
    concentrated: "base",
  }),
  reagent({
    id: "potassium-hydroxide",
    name: "Potassium hydroxide",
    formula: "KOH",
    form: "solid",
    role: "base",
    purity_w_w: { value: 0.85, source: "CPassay", note: "pellets are about 85 % KOH; the lot's certificate of analysis governs" },
    ions: [{ ion: "K+", count: 1 }],
    ghs: {
      pictograms: ["GHS05", "GHS07"],
      signalWord: "Danger",
      hazardStatements: ["H290", "H302", "H314"],
      source: "CLPM",
      note: "pellets are often about 85 % KOH: use the assay on the lot",
    },
    wasteStream: { value: "basic-corrosive", source: "CPwaste" },
    volatile: false,
    flammable: false,
    concentrated: "base",
  }),
  // ── Volatile salts ──────────────────────────────────────────────────────
  salt(
    "ammonium-formate",
    "Ammonium formate",
    "HCOONH4",
    [
      { system: S.formate, count: 1 },
      { system: S.ammonium, count: 1 },
    ],
    [],
    {
      volatile: true,
      uvCutoff_nm: { value: 210, source: "SKD10", note: "10 mM" },
      ghs: { pictograms: ["GHS07"], signalWord: "Warning", hazardStatements: ["H315", "H319", "H335"], source: "CLPM" },
    },
  ),
  salt(
    "ammonium-acetate",
    "Ammonium acetate",
    "CH3COONH4",
    [
      { system: S.acetate, count: 1 },
      { system: S.ammonium, count: 1 },
    ],
    [],
    {
      volatile: true,
      uvCutoff_nm: { value: 205, source: "SKD10", note: "10 mM" },
    },
  ),
  salt(
    "ammonium-bicarbonate",
    "Ammonium hydrogen carbonate",
    "NH4HCO3",
    [
      { system: S.ammonium, count: 1 },
      { system: S.carbonate, count: 1 },
    ],
    [],
    {
      volatile: true,
      ghs: { pictograms: ["GHS07"], signalWord: "Warning", hazardStatements: ["H302"], source: "CLPM" },
    },
  ),
  // ── Non-volatile buffer salts ───────────────────────────────────────────
  salt("sodium-acetate", "Sodium acetate", "CH3COONa", [{ system: S.acetate, count: 1 }], [{ ion: "Na+", count: 1 }]),
  salt(
    "sodium-acetate-trihydrate",
    "Sodium acetate trihydrate",
    "CH3COONa·3H2O",
    [{ system: S.acetate, count: 1 }],
    [{ ion: "Na+", count: 1 }],
  ),
  salt(
    "potassium-dihydrogen-phosphate",
    "Potassium dihydrogen phosphate",
    "KH2PO4",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "K+", count: 1 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "dipotassium-hydrogen-phosphate",
    "Dipotassium hydrogen phosphate",
    "K2HPO4",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "K+", count: 2 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "sodium-dihydrogen-phosphate",
    "Sodium dihydrogen phosphate",
    "NaH2PO4",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 1 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "sodium-dihydrogen-phosphate-monohydrate",
    "Sodium dihydrogen phosphate monohydrate",
    "NaH2PO4·H2O",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 1 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "sodium-dihydrogen-phosphate-dihydrate",
    "Sodium dihydrogen phosphate dihydrate",
    "NaH2PO4·2H2O",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 1 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "disodium-hydrogen-phosphate",
    "Disodium hydrogen phosphate",
    "Na2HPO4",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 2 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "disodium-hydrogen-phosphate-dihydrate",
    "Disodium hydrogen phosphate dihydrate",
    "Na2HPO4·2H2O",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 2 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "disodium-hydrogen-phosphate-heptahydrate",
    "Disodium hydrogen phosphate heptahydrate",
    "Na2HPO4·7H2O",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 2 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  salt(
    "disodium-hydrogen-phosphate-dodecahydrate",
    "Disodium hydrogen phosphate dodecahydrate",
    "Na2HPO4·12H2O",
    [{ system: S.phosphate, count: 1 }],
    [{ ion: "Na+", count: 2 }],
    { uvCutoff_nm: PHOSPHATE_UV },
  ),
  reagent({
    id: "citric-acid",
    name: "Citric acid, anhydrous",
    formula: "C6H8O7",
    form: "solid",
    role: "acid",
    systems: [{ system: S.citrate, count: 1 }],
    uvCutoff_nm: { value: 225, source: "SKD10", note: "10 mM citrate" },
    ghs: { pictograms: ["GHS07"], signalWord: "Warning", hazardStatements: ["H319"], source: "CLPM" },
    wasteStream: AQUEOUS,
    volatile: false,
    flammable: false,
    concentrated: null,
  }),
  reagent({
    id: "citric-acid-monohydrate",
    name: "Citric acid monohydrate",
    formula: "C6H8O7·H2O",
    form: "solid",
    role: "acid",
    systems: [{ system: S.citrate, count: 1 }],
    uvCutoff_nm: { value: 225, source: "SKD10", note: "10 mM citrate" },
    ghs: { pictograms: ["GHS07"], signalWord: "Warning", hazardStatements: ["H319"], source: "CLPM" },
    wasteStream: AQUEOUS,
    volatile: false,
    flammable: false,
    concentrated: null,
  }),
  salt(
    "trisodium-citrate-dihydrate",
    "Trisodium citrate dihydrate",
    "Na3C6H5O7·2H2O",
    [{ system: S.citrate, count: 1 }],
    [{ ion: "Na+", count: 3 }],
    {
      uvCutoff_nm: { value: 225, source: "SKD10", note: "10 mM citrate" },
    },
  ),
  salt(
    "potassium-dihydrogen-citrate",
    "Potassium dihydrogen citrate",
    "KH2C6H5O7",
    [{ system: S.citrate, count: 1 }],
    [{ ion: "K+", count: 1 }],
    {
      uvCutoff_nm: { value: 225, source: "SKD10", note: "10 mM citrate" },
    },
  ),
  salt(
    "potassium-hydrogen-tartrate",
    "Potassium hydrogen tartrate",
    "KHC4H4O6",
    [{ system: S.tartrate, count: 1 }],
    [{ ion: "K+", count: 1 }],
  ),
  salt(
    "potassium-hydrogen-phthalate",
    "Potassium hydrogen phthalate",
    "KHC8H4O4",
    [{ system: S.phthalate, count: 1 }],
    [{ ion: "K+", count: 1 }],
  ),
  salt(
    "sodium-tetraborate-decahydrate",
    "Sodium tetraborate decahydrate (borax)",
    "Na2B4O7·10H2O",
    [{ system: S.borate, count: 4 }],
    [{ ion: "Na+", count: 2 }],
    {
      ghs: { pictograms: ["GHS08"], signalWord: "Danger", hazardStatements: ["H360FD"], source: "CLPM" },
    },
  ),
  salt("sodium-bicarbonate", "Sodium hydrogen carbonate", "NaHCO3", [{ system: S.carbonate, count: 1 }], [{ ion: "Na+", count: 1 }]),
  salt("sodium-carbonate", "Sodium carbonate", "Na2CO3", [{ system: S.carbonate, count: 1 }], [{ ion: "Na+", count: 2 }], {
    ghs: { pictograms: ["GHS07"], signalWord: "Warning", hazardStatements: ["H319"], source: "CLPM" },
  }),
  salt("tris", "Tris(hydroxymethyl)aminomethane", "(HOCH2)3CNH2", [{ system: S.tris, count: 1 }], [], {
    role: "base",
    uvCutoff_nm: { value: 212, source: "SKD10", note: "20 mM" },
    ghs: {
      pictograms: ["GHS07"],
      signalWord: "Warning",
      hazardStatements: ["H315", "H319", "H335"],
      source: "CLPM",
      note: "some suppliers do not classify it",
    },
  }),
  salt("tris-hydrochloride", "Tris hydrochloride", "(HOCH2)3CNH2·HCl", [{ system: S.tris, count: 1 }], [{ ion: "Cl-", count: 1 }], {
    uvCutoff_nm: { value: 212, source: "SKD10", note: "20 mM" },
    ghs: {
      pictograms: ["GHS07"],
      signalWord: "Warning",
      hazardStatements: ["H315", "H319", "H335"],
      source: "CLPM",
      note: "some suppliers do not classify it",
    },
  }),
];

/** The catalogue, in a stable order. */
export const reagents: readonly Reagent[] = Object.freeze(list);

const byId: ReadonlyMap<string, Reagent> = new Map(list.map((r) => [r.id, r]));

/** The reagent with this id, or undefined. */
export function getReagent(id: string): Reagent | undefined {
  return byId.get(id);
}

/**
 * Density of a liquid reagent (the product as sold) at a temperature, g/mL. Water from Tanaka et al.;
 * organic liquids from their DIPPR 105 correlation anchored at the catalogue's 25 °C value (or 20 °C);
 * other liquids linear through their 20 and 25 °C values, or the one value held (concentrated aqueous
 * acids and bases: no temperature data are held, see DEVELOPERS.md).
 */
export function reagentDensity(reagent: Reagent, temperature_C: number): number | undefined {
  if (reagent.id === "water") return waterDensity_g_mL(temperature_C);
  const d20 = reagent.density_g_mL?.at20_C?.value;
  const d25 = reagent.density_g_mL?.at25_C?.value;
  const c = reagent.densityCorrelation;
  if (c !== undefined && (d25 ?? d20) !== undefined) {
    const anchor = d25 !== undefined ? { temperature_C: 25, value_g_mL: d25 } : { temperature_C: 20, value_g_mL: d20 ?? 0 };
    return anchoredDensity(c, anchor, temperature_C);
  }
  if (d20 !== undefined && d25 !== undefined) return d20 + ((d25 - d20) * (temperature_C - 20)) / 5;
  return d25 ?? d20;
}

/** Mass fraction of the formula substance in the product: the lot's assay when given, else the catalogue's typical value (1 when none). */
export function reagentPurity(reagent: Reagent, lotAssay?: number): number {
  return lotAssay ?? reagent.purity_w_w?.value ?? 1;
}
