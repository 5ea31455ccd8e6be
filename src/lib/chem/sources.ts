/**
 * Citation keys used beside every reference value in the library.
 *
 * `confidence` follows the project's check-value key: `C` seen in the source,
 * `D` derived from confirmed inputs, `M` from memory (not seen in the source
 * when entered: verify before relying on it), `CP` common practice. Every `M`
 * entry says in `unchecked` why it has not been checked yet (a test holds the
 * catalogue to that).
 */
export type Confidence = "C" | "D" | "M" | "CP";

export interface Source {
  citation: string;
  confidence: Confidence;
  /** For `M`: why the value is still unchecked, and what would check it. */
  unchecked?: string;
}

export const SOURCES = {
  CIAAW21: {
    citation: "CIAAW, Standard atomic weights 2021 (abridged/conventional values for interval elements); molar masses computed in code",
    confidence: "C",
  },
  GKL02: {
    citation: "Goldberg, Kishore, Lennen, J. Phys. Chem. Ref. Data 31, 231 (2002)",
    confidence: "M",
    unchecked:
      "the paper's tables were not reachable; the pKa, ΔH° and ΔCp° used agree with two public copies of those tables, and pKa and ΔH° with NIST 46 where it has them (phosphate, carbonate, borate, citrate)",
  },
  Harris: { citation: "Harris, Quantitative Chemical Analysis, App. G (NIST SRD 46 data)", confidence: "C" },
  HPA46: {
    citation:
      "Hamer, Pinching, Acree, J. Res. NBS 36, 47 (1946), abstract: 0.05 mol/kg KHP, pH = 1336.08/T − 5.2678 + 0.016069 T = 4.000 + 0.0000479 (t − 15)², 0–60 °C",
    confidence: "C",
  },
  Bowden96: { citation: "Bowden et al., Chemosphere 32, 405 (1996): trifluoroacetic acid pKa 0.47", confidence: "C" },
  Davies62: {
    citation: "Davies, Ion Association, Butterworths (1962): log g = -A z^2 [sqrt(I)/(1+sqrt(I)) - 0.3 I]",
    confidence: "M",
    unchecked:
      "the book was not reachable; the form is the one in every textbook, and the primary pH standards it reproduces (within 0.015 at 25 °C, tests) are the working check",
  },
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
  MerckM: {
    citation: "Merck Index / CRC Handbook physical constants",
    confidence: "M",
    unchecked:
      "the monographs were not reachable for these entries (flash points, a few 25 °C densities of concentrated solutions); each value is close to the supplier safety data sheets the authors remember",
  },
  Montgomery: { citation: "Aminabhavi & Patil (1998), in the Montgomery handbook (THF density)", confidence: "C" },
  SKD10: {
    citation: "Snyder, Kirkland, Dolan, Introduction to Modern Liquid Chromatography, 3rd ed., Wiley (2010), App. I",
    confidence: "M",
    unchecked: "the appendix was not reachable; UV cutoffs only raise warnings, never change an amount",
  },
  Snyder78: {
    citation: "Snyder, J. Chromatogr. Sci. 16, 223 (1978), polarity index P prime",
    confidence: "M",
    unchecked: "the paper was not reachable; P′ is shown for information only and changes no amount",
  },
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
  CLPM: {
    citation: "CLP Annex VI or typical supplier SDS classification",
    confidence: "M",
    unchecked:
      "the Annex VI entries were not looked up one by one; labels also tell the technician to follow the supplier's safety data sheet, which governs",
  },
  GisChem: { citation: "GisChem THF datasheet", confidence: "C" },
  CLH21: { citation: "Formic acid CLH consultation report (2021); Annex VI entry H314", confidence: "C" },
  SDG79: {
    citation: "Snyder, Dolan, Gant, J. Chromatogr. 165, 3 (1979), linear-solvent-strength model",
    confidence: "M",
    unchecked:
      "the paper was not reachable; the equations are re-derived in the tests (check-values §7) and only feed the what-if estimate",
  },
  SD07: {
    citation: "Snyder, Dolan, High-Performance Gradient Elution, Wiley (2007)",
    confidence: "M",
    unchecked: "the book was not reachable; its gradient equations are re-derived in the tests and only feed the what-if estimate",
  },
  Perry105: {
    citation:
      "Perry's Chemical Engineers' Handbook, Table 2-32 (coefficients of DIPPR equation 105 for liquid density), as tabulated in the CalebBell/chemicals repository (Perry Parameters 105.tsv); checked against the Merck and ThermoML values at 20 and 25 °C in the tests",
    confidence: "C",
  },
  CPassay: {
    citation:
      "Common practice: typical assays of the products as sold (potassium hydroxide pellets about 85 % KOH, the rest water and carbonate; sodium hydroxide pellets about 98 %); the lot's certificate of analysis governs",
    confidence: "CP",
  },
  Mussini: {
    citation:
      "Mussini, Longhi, Rondinini, Tettamanti, Covington, 'Reference value standards for pH measurements in 5, 15 and 30 % (w/w) acetonitrile/water solvent mixtures at temperatures from 288.15 to 308.15 K', abstract: pH(RVS) of 0.05 mol/kg KHP = 4.0080 + 6.330x + 16.177x² − 115.3x³ + 0.3089u − 201.0ux² + 909ux³ + 13.04v (x mole fraction of acetonitrile, u = z/(1+z), v = ln(1+z) − u, z = (T − 298.15)/298.15); journal not recorded in the copy seen",
    confidence: "C",
  },
  KLB07: {
    citation:
      "Kazakevich, LoBrutto (eds.), HPLC for Pharmaceutical Scientists, Wiley (2007), ch. 4 (pH effect on HPLC separations), Table 4-5 and eqs. 4-20/4-21 from Espinosa et al. and Canals et al.: δ = swpH − sspH; methanol δ = 0.2632χ + 0.4826χ² (table 0–60 % v/v: 0, 0.01, 0.03, 0.05, 0.09, 0.13, 0.18), acetonitrile δ = 0.03χ − 3.93χ² (χ mole fraction of organic, up to 60 % v/v); seen in a text copy whose equations are garbled: the terms were matched to the methanol table, the sign of acetonitrile's small linear term is uncertain (≤ 0.02 up to 60 %)",
    confidence: "C",
  },
  RBshift: {
    citation:
      "Shifts of buffer pKa (s_s pKa − w_w pKa) and of the autoprotolysis constant with acetonitrile and methanol, by charge type of the acid, after Rosés, Bosch and co-workers (Bosch et al., Anal. Chem. 68, 3651 (1996); Espinosa et al., Anal. Chem. 74, 3809 (2002), tables of buffer pKa in the mixtures)",
    confidence: "M",
    unchecked:
      "the papers' tables were not reachable (only abstracts); the values are recollections, with the anionic-acid shift in acetonitrile set so that the KHP reference values of Mussini et al. (C) come out within 0.03. Expect ±0.2 in pH; check against Espinosa et al. 2002 (acetonitrile) and Bosch et al. 1996 / Rived et al. 2001 (methanol) before relying on them",
  },
  Permittivity: {
    citation:
      "Relative permittivity at 25 °C: water 78.36, methanol 32.66, acetonitrile 35.94 (CRC Handbook), mixtures linear in volume fraction",
    confidence: "M",
    unchecked:
      "the CRC table was not reachable; the permittivity only scales the Debye–Hückel A in the mix (a 5 % error in it moves the pH of a 0.05 mol/L buffer by under 0.01)",
  },
  SBG81: {
    citation:
      "Schoenmakers, Billiet, de Galan, J. Chromatogr. 205, 13 (1981): iso-eluotropic binary mixtures, phi(ACN) = 0.32 phi(MeOH)^2 + 0.57 phi(MeOH), phi(THF) = 0.66 phi(MeOH); ternary mixes of iso-eluotropic binaries are about iso-eluotropic",
    confidence: "M",
    unchecked:
      "the paper was not reachable; the coefficients are as remembered and the tests check hand-worked values and round trips only",
  },
  Snyder79S: {
    citation:
      "Snyder, Dolan, Gant, J. Chromatogr. 165, 3 (1979) and SKD10 ch. 6: reversed-phase solvent strength S of water 0, methanol 3.0, acetonitrile 3.2, tetrahydrofuran 4.4",
    confidence: "M",
    unchecked: "the paper and book were not reachable; the S values are as remembered and only rank the solvents for the swap warnings",
  },
  USP621: {
    citation:
      "USP <621> Chromatography (harmonised, 1 Dec 2022), allowed adjustments: F2 = F1 (dc2^2 dp1)/(dc1^2 dp2); tG2 = tG1 (F1/F2)(L2 dc2^2)/(L1 dc1^2); Vinj2 = Vinj1 (L2 dc2^2)/(L1 dc1^2); L/dp within -25 % to +50 %",
    confidence: "M",
    unchecked:
      "the chapter was not reachable; the equations are the geometric ones, re-derived in the tests (gradient volume in column volumes kept)",
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
    unchecked: "the paper was not reachable; the score is computed as remembered from its definition, with indices from EHS00",
  },
  EHS00: {
    citation:
      "Koller, Fischer, Hungerbuehler, Ind. Eng. Chem. Res. 39, 960 (2000), EHS method indices (safety, health, environment) as used by HPLC-EAT; values seen as copied into a public HPLC-EAT calculator's solvent table (not in the paper)",
    confidence: "C",
  },
  SC04: {
    citation:
      "Schellinger, Carr, LCGC North Am. 22, 544 (2004), solubility of buffers in aqueous-organic eluents: phosphate precipitates near 80 % methanol, 70 % acetonitrile, 60 % tetrahydrofuran",
    confidence: "M",
    unchecked: "the paper was not reachable; the precipitation limits are as remembered and only raise a warning",
  },
  CPwaste: { citation: "Common practice for laboratory waste segregation; follow local rules", confidence: "CP" },
  CPms: { citation: "Common practice: non-volatile buffers foul mass-spectrometer sources", confidence: "CP" },
} as const satisfies Record<string, Source>;

export type SourceKey = keyof typeof SOURCES;
