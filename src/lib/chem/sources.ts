/**
 * Citation keys used beside every reference value in the library.
 *
 * `confidence` follows the project's check-value key: `C` seen in the source,
 * `D` derived from confirmed inputs, `M` from memory (not seen in the source
 * when entered: verify before relying on it), `CP` common practice.
 */
export type Confidence = "C" | "D" | "M" | "CP";

export interface Source {
  citation: string;
  confidence: Confidence;
}

export const SOURCES = {
  CIAAW21: {
    citation: "CIAAW, Standard atomic weights 2021 (abridged/conventional values for interval elements); molar masses computed in code",
    confidence: "C",
  },
  GKL02: { citation: "Goldberg, Kishore, Lennen, J. Phys. Chem. Ref. Data 31, 231 (2002)", confidence: "M" },
  Harris: { citation: "Harris, Quantitative Chemical Analysis, App. G (NIST SRD 46 data)", confidence: "C" },
  HPA45: { citation: "Hamer, Pinching, Acree, J. Res. NBS 35, 381 and 539 (1945), phthalic acid", confidence: "M" },
  Dalton94: { citation: "J. Chem. Soc. Dalton Trans. 1994, 2729 (log beta 4.36, 7.36); ECHA dossier 2.98/4.34", confidence: "C" },
  Bowden96: { citation: "Bowden et al., Chemosphere 32, 405 (1996); TFA treated as a strong acid", confidence: "C" },
  Davies62: { citation: "Davies, Ion Association, Butterworths (1962): log g = -A z^2 [sqrt(I)/(1+sqrt(I)) - 0.3 I]", confidence: "M" },
  CRP94: {
    citation:
      "Debye-Hueckel A (log10, molal) derived from A_phi of Clegg, Rard, Pitzer, J. Chem. Soc. Faraday Trans. 90, 1875 (1994), as coded in pytzer",
    confidence: "D",
  },
  Tanaka01: { citation: "Tanaka et al., Metrologia 38, 301 (2001), density of water", confidence: "D" },
  HR40: {
    citation:
      "Harned, Robinson, Trans. Faraday Soc. 36, 973 (1940): pKw = 4470.99/T - 6.0875 + 0.01706 T; the formula seen as given in Stumm & Morgan, Aquatic Chemistry (1981) p. 127, reproduced in public water-quality model code (paper not seen)",
    confidence: "C",
  },
  NIST46: {
    citation:
      "NIST SRD 46 critically selected stability constants (log K, ΔH° at 25 °C, I = 0), as compiled in the public USGS aqueous-geochemistry database files",
    confidence: "C",
  },
  ThermoMLfpe12: {
    citation:
      "Fluid Phase Equilib., doi:10.1016/j.fluid.2011.09.016: V^E of acetonitrile + water at 298.15 K, x(water) 0.597–0.899 (6 points), as recorded in NIST ThermoML; seen in a public copy of that record, not in the paper",
    confidence: "C",
  },
  ThermoMLjct06: {
    citation:
      "J. Chem. Thermodyn., doi:10.1016/j.jct.2006.01.015: pure acetonitrile 782.1 kg/m3 (293.15 K) and 776.8 kg/m3 (298.15 K), as recorded in NIST ThermoML; seen in a public copy of that record",
    confidence: "C",
  },
  Zarei08: {
    citation:
      "Zarei, Zare Lavasani, Iloukhani, J. Chem. Eng. Data 53, 578 (2008), doi:10.1021/je700645p (abstract): V^E of water + acetonitrile negative over the whole range, 293.15–333.15 K",
    confidence: "C",
  },
  CRCconc: {
    citation:
      "CRC Handbook 102nd ed., Concentrative properties of aqueous solutions (20 C), as tabulated in the amosonabike/CRC-Solution-Properties- repository",
    confidence: "C",
  },
  Merck: { citation: "Merck Index monographs (densities d20, d25; boiling and flash points)", confidence: "C" },
  MerckM: { citation: "Merck Index / CRC Handbook physical constants", confidence: "M" },
  Montgomery: { citation: "Aminabhavi & Patil (1998), in the Montgomery handbook (THF density)", confidence: "C" },
  SKD10: {
    citation: "Snyder, Kirkland, Dolan, Introduction to Modern Liquid Chromatography, 3rd ed., Wiley (2010), App. I",
    confidence: "M",
  },
  Snyder78: { citation: "Snyder, J. Chromatogr. Sci. 16, 223 (1978), polarity index P prime", confidence: "M" },
  lcqc: {
    citation:
      "Water-organic viscosity tables (25 C) compiled from SKD10, Thompson-Kaiser-Jorgenson 2006, Teutenberg 2009, Wohlfarth 2001; as in github.com/Deniz-Koseoglu/lcqc",
    confidence: "C",
  },
  CLP: { citation: "Regulation (EC) 1272/2008 (CLP) Annex VI / C&L inventory aggregate pages", confidence: "C" },
  SDSipa: {
    citation: "2-propanol supplier safety data sheet, GHS revision 2024, section 2: Flam. Liq. 2 H225, Eye Irrit. 2 H319, STOT SE 3 H336",
    confidence: "C",
  },
  CLPM: { citation: "CLP Annex VI or typical supplier SDS classification", confidence: "M" },
  GisChem: { citation: "GisChem THF datasheet", confidence: "C" },
  CLH21: { citation: "Formic acid CLH consultation report (2021); Annex VI entry H314", confidence: "C" },
  SDG79: { citation: "Snyder, Dolan, Gant, J. Chromatogr. 165, 3 (1979), linear-solvent-strength model", confidence: "M" },
  SD07: { citation: "Snyder, Dolan, High-Performance Gradient Elution, Wiley (2007)", confidence: "M" },
  SBG81: {
    citation:
      "Schoenmakers, Billiet, de Galan, J. Chromatogr. 205, 13 (1981): iso-eluotropic binary mixtures, phi(ACN) = 0.32 phi(MeOH)^2 + 0.57 phi(MeOH), phi(THF) = 0.66 phi(MeOH); ternary mixes of iso-eluotropic binaries are about iso-eluotropic",
    confidence: "M",
  },
  Snyder79S: {
    citation:
      "Snyder, Dolan, Gant, J. Chromatogr. 165, 3 (1979) and SKD10 ch. 6: reversed-phase solvent strength S of water 0, methanol 3.0, acetonitrile 3.2, tetrahydrofuran 4.4",
    confidence: "M",
  },
  USP621: {
    citation:
      "USP <621> Chromatography (harmonised, 1 Dec 2022), allowed adjustments: F2 = F1 (dc2^2 dp1)/(dc1^2 dp2); tG2 = tG1 (F1/F2)(L2 dc2^2)/(L1 dc1^2); Vinj2 = Vinj1 (L2 dc2^2)/(L1 dc1^2); L/dp within -25 % to +50 %",
    confidence: "M",
  },
  Dolan14: {
    citation:
      "Dolan, LC Method Scaling, Part II: Gradient Separations, LCGC North Am. 32(3), 188 (2014): keep the gradient volume in column volumes, the dwell volume in column volumes, and N by L/dp",
    confidence: "C",
  },
  Gaber11: {
    citation:
      "Gaber, Tornvall, Kumar, Ali Amin, Hatti-Kaul, Green Chem. 13, 2021 (2011), HPLC-EAT: sum over solvents of (S + H + E) x mass in g per analysis",
    confidence: "M",
  },
  EHS00: {
    citation:
      "Koller, Fischer, Hungerbuehler, Ind. Eng. Chem. Res. 39, 960 (2000), EHS method indices (safety, health, environment) as used by HPLC-EAT; values seen as transcribed in a public HPLC-EAT calculator's solvent table (not in the paper)",
    confidence: "C",
  },
  SC04: {
    citation:
      "Schellinger, Carr, LCGC North Am. 22, 544 (2004), solubility of buffers in aqueous-organic eluents: phosphate precipitates near 80 % methanol, 70 % acetonitrile, 60 % tetrahydrofuran",
    confidence: "M",
  },
  CPwaste: { citation: "Common practice for laboratory waste segregation; follow local rules", confidence: "CP" },
  CPms: { citation: "Common practice: non-volatile buffers foul mass-spectrometer sources", confidence: "CP" },
} as const satisfies Record<string, Source>;

export type SourceKey = keyof typeof SOURCES;
