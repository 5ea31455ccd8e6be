import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { celsiusToKelvin, G_PER_MG, lToML, mgToG, ML_PER_L, mLToL, mMToMolar, molarToMM, ZERO_CELSIUS_K } from '../../../src/lib/chem/units';

// convert-units does the work; mathjs is the second opinion.
describe('unit conversions agree with mathjs', () => {
  it.each([0, 0.001, 1, 250, 1e6])('%s mL to L and back', (x) => {
    expect(mLToL(x)).toBeCloseTo(unit(x, 'mL').toNumber('L'), 12);
    expect(lToML(x)).toBeCloseTo(unit(x, 'L').toNumber('mL'), 6);
  });

  it.each([0, 1, 12.5, 1000])('%s mg to g', (x) => {
    expect(mgToG(x)).toBeCloseTo(unit(x, 'mg').toNumber('g'), 12);
  });

  it.each([0, 20, 25, 37, -10])('%s °C to K', (t) => {
    expect(celsiusToKelvin(t)).toBeCloseTo(unit(t, 'degC').toNumber('K'), 10);
  });

  it('module-level factors', () => {
    expect(ZERO_CELSIUS_K).toBe(273.15);
    expect(ML_PER_L).toBeCloseTo(unit(1, 'L').toNumber('mL'), 9);
    expect(G_PER_MG).toBeCloseTo(unit(1, 'mg').toNumber('g'), 15);
  });

  it('mM and mol/L', () => {
    expect(mMToMolar(25)).toBeCloseTo(unit(25, 'mmol').toNumber('mol'), 12);
    expect(molarToMM(0.025)).toBeCloseTo(25, 12);
  });
});
