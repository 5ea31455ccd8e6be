import { describe, expect, it } from 'vitest';
import { getReagent, reagentDensity, reagents, SOURCES } from '../../../src/lib/chem';

// The ids the issue requires (issue 4, "Public face").
const REQUIRED_IDS = [
  'water', 'acetonitrile', 'methanol', 'ethanol', 'isopropanol', 'tetrahydrofuran', 'formic-acid', 'acetic-acid',
  'trifluoroacetic-acid', 'phosphoric-acid', 'ammonia-solution', 'hydrochloric-acid', 'sodium-hydroxide',
  'potassium-hydroxide', 'ammonium-formate', 'ammonium-acetate', 'ammonium-bicarbonate', 'sodium-acetate',
  'sodium-acetate-trihydrate', 'potassium-dihydrogen-phosphate', 'dipotassium-hydrogen-phosphate',
  'sodium-dihydrogen-phosphate', 'sodium-dihydrogen-phosphate-monohydrate', 'sodium-dihydrogen-phosphate-dihydrate',
  'disodium-hydrogen-phosphate', 'disodium-hydrogen-phosphate-dihydrate', 'disodium-hydrogen-phosphate-heptahydrate',
  'disodium-hydrogen-phosphate-dodecahydrate', 'citric-acid', 'citric-acid-monohydrate', 'trisodium-citrate-dihydrate',
  'potassium-dihydrogen-citrate', 'potassium-hydrogen-tartrate', 'potassium-hydrogen-phthalate',
  'sodium-tetraborate-decahydrate', 'sodium-bicarbonate', 'sodium-carbonate', 'tris', 'tris-hydrochloride',
];

describe('catalogue', () => {
  it.each(REQUIRED_IDS)('has %s', (id) => {
    expect(getReagent(id)?.id).toBe(id);
  });

  it('has unique kebab-case ids', () => {
    const ids = reagents.map((r) => r.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
  });

  it('answers undefined for an unknown id', () => {
    expect(getReagent('unobtainium')).toBeUndefined();
  });

  it.each(reagents.map((r) => [r.id, r] as const))('%s names a known source for every sourced value', (_id, r) => {
    const keys = [
      r.density_g_mL?.at20_C?.source, r.density_g_mL?.at25_C?.source, r.purity_w_w?.source, r.uvCutoff_nm?.source,
      r.polarityIndex?.source, r.ghs.source, r.wasteStream.source, r.flashPoint_C?.source,
      ...r.acidBase.systems.map((s) => s.system.source.pKa),
    ].filter((k): k is NonNullable<typeof k> => k !== undefined);
    expect(keys.length).toBeGreaterThan(0);
    for (const k of keys) expect(SOURCES[k]).toBeDefined();
  });

  it.each(reagents.filter((r) => r.form === 'liquid').map((r) => [r.id, r] as const))('liquid %s has a density', (_id, r) => {
    expect(reagentDensity(r, 20)).toBeGreaterThan(0.5);
  });

  it.each(reagents.filter((r) => r.role === 'solvent').map((r) => [r.id, r] as const))('solvent %s has P′ and a UV cutoff', (_id, r) => {
    expect(r.polarityIndex?.value).toBeGreaterThan(0);
    expect(r.uvCutoff_nm?.value).toBeGreaterThanOrEqual(190);
  });
});

describe.each([
  // [id, 20 °C, 25 °C, source]
  ['methanol', 0.7915, 0.7866], // Merck Index methanol monograph, d20 and d25 (check-values §4, C)
  ['tetrahydrofuran', 0.8892, 0.8833], // Merck Index (20 °C); Aminabhavi & Patil 1998 in the Montgomery handbook (25 °C) (check-values §4, C)
  ['water', 0.998207, 0.997047], // Tanaka et al. 2001 formula (check-values §4, D)
])('density of %s', (id, d20, d25) => {
  it(`is ${d20} g/mL at 20 °C and ${d25} g/mL at 25 °C`, () => {
    const r = getReagent(id);
    if (r === undefined) throw new Error(id);
    expect(reagentDensity(r, 20)).toBeCloseTo(d20, 4);
    expect(reagentDensity(r, 25)).toBeCloseTo(d25, 4);
  });
});

describe.each([
  // CRC Handbook 102nd ed., concentrative properties at 20 °C (as tabulated in the amosonabike/CRC-Solution-Properties- repository):
  ['ethanol', 0.7893], // 100 % ethanol row
  ['acetic-acid', 1.0477], // 100 % acetic acid row
  ['ammonia-solution', (0.9102 + 0.904) / 2], // 24 % and 26 % NH3 rows, 25 % by linear interpolation
  ['hydrochloric-acid', (1.1791 + 1.1886) / 2], // 36 % and 38 % HCl rows, 37 % by linear interpolation
])('20 °C density of %s against the CRC concentrative-properties table', (id, expected) => {
  it(`is ${expected.toFixed(4)} g/mL`, () => {
    const r = getReagent(id);
    if (r === undefined) throw new Error(id);
    expect(reagentDensity(r, 20)).toBeCloseTo(expected, 3);
  });
});

describe.each([
  // EU CLP Annex VI / C&L aggregate pages (check-values §9, C)
  ['acetonitrile', ['GHS02', 'GHS07'], 'Danger', ['H225', 'H302', 'H312', 'H332', 'H319']],
  ['methanol', ['GHS02', 'GHS06', 'GHS08'], 'Danger', ['H225', 'H301', 'H311', 'H331', 'H370']],
  // GisChem THF datasheet (check-values §9, C)
  ['tetrahydrofuran', ['GHS02', 'GHS07', 'GHS08'], 'Danger', ['H225', 'H319', 'H335', 'H351', 'EUH019']],
  // Formic acid Annex VI entry (check-values §9, C)
  ['formic-acid', ['GHS05'], 'Danger', ['H314']],
])('GHS data of %s', (id, pictograms, signal, statements) => {
  it('match the published classification', () => {
    const r = getReagent(id);
    expect(r?.ghs.pictograms).toEqual(pictograms);
    expect(r?.ghs.signalWord).toBe(signal);
    expect(r?.ghs.hazardStatements).toEqual(statements);
  });
});

describe('purity and acid–base data', () => {
  it.each([
    ['phosphoric-acid', 0.85], // the usual product, 85 % w/w (issue 4)
    ['ammonia-solution', 0.25], // the usual product, 25 % w/w (issue 4)
  ])('%s is sold at %s w/w', (id, w) => {
    expect(getReagent(id)?.purity_w_w?.value).toBe(w);
  });

  it.each([
    // Thermodynamic pKa at 25 °C, I = 0 (check-values §2)
    ['potassium-dihydrogen-phosphate', [2.148, 7.198, 12.35]], // [GKL02] (M)
    ['acetic-acid', [4.756]], // Harris App. G (C)
    ['citric-acid', [3.128, 4.761, 6.396]], // [GKL02] (M)
    ['tris', [8.072]], // [GKL02] (M)
    ['ammonia-solution', [9.245]], // Harris App. G (C)
  ])('%s carries pKa %j', (id, pKa) => {
    const r = getReagent(id);
    expect(r?.acidBase.systems[0]?.system.pKa25).toEqual(pKa);
  });

  it('borax carries four borons and two sodium ions per formula unit', () => {
    const r = getReagent('sodium-tetraborate-decahydrate');
    expect(r?.acidBase.systems).toEqual([expect.objectContaining({ count: 4 })]);
    expect(r?.acidBase.ions).toEqual([{ ion: 'Na+', count: 2 }]);
  });

  it.each([
    ['acetonitrile', 'non-halogenated-organic'], // check-values §9 waste streams (CP)
    ['methanol', 'non-halogenated-organic'],
    ['potassium-dihydrogen-phosphate', 'aqueous'],
    ['trifluoroacetic-acid', 'halogenated-organic'],
  ])('%s goes to the %s stream', (id, stream) => {
    expect(getReagent(id)?.wasteStream.value).toBe(stream);
  });
});
