import { describe, expect, it } from 'vitest';
import {
  correlationConstants,
  getSpecies,
  pairConstants,
  referenceB,
  sizeDifferenceKij,
  tsonopoulosB,
  virialModel,
} from '../../src/core/index.js';
import { fixture } from '../helpers.js';

const table = fixture('virial-b-table.json');
const cross = fixture('virial-cross.json');
const T: number[] = table.temperatures_K;
const cm3 = 1e6; // m3/mol -> cm3/mol
const LIGHT = new Set(['Ar', 'N2', 'O2', 'He', 'H2', 'Ne', 'CO', 'CH4', 'Kr']);

function tsonopoulos(key: string, t: number): number {
  return tsonopoulosB(correlationConstants(getSpecies(key), t), t) * cm3;
}

describe('pure B(T) used by the model vs the reference-EOS table (properties.md section 4, CoolProp 8.0)', () => {
  for (const [key, row] of Object.entries(table.species as Record<string, { B: number[] }>)) {
    // 0.03 % + rounding for rows given to whole units
    it(`${key}: 250-400 K within 0.05 cm3/mol (light), 0.1 % (others)`, () => {
      T.forEach((t, i) => {
        const b = virialModel([key], t).B[0][0] * cm3;
        // rows printed to whole cm3/mol (H2O, alcohols, heavy vapours) carry +-0.5 of rounding
        const rounded = row.B.every((v) => Number.isInteger(v));
        const tol = rounded
          ? Math.max(0.5, 3e-4 * Math.abs(row.B[i]))
          : LIGHT.has(key)
            ? 0.05
            : Math.max(0.05, 1e-3 * Math.abs(row.B[i]));
        expect(Math.abs(b - row.B[i]), `${key} at ${t} K: ${b} vs ${row.B[i]}`).toBeLessThanOrEqual(tol);
      });
    });
  }

  // 255-395 K
  it('interpolation between grid nodes agrees with the published cubic fits in 100/T within 0.05 cm3/mol', () => {
    for (const [key, c] of Object.entries(table.fits.coefficients as Record<string, number[]>)) {
      for (let t = 255; t <= 395; t += 7) {
        const x = 100 / t;
        const fit = c[0] + c[1] * x + c[2] * x * x + c[3] * x ** 3;
        expect(Math.abs(referenceB(key, t)! * cm3 - fit), `${key} at ${t} K`).toBeLessThan(0.05);
      }
    }
  });
});

describe('Tsonopoulos (1974) correlation', () => {
  // n-heptane 0.6 %
  it('reproduces the non-polar values of properties.md at 298.15 K within 0.3 cm3/mol or 0.3 %', () => {
    for (const [key, row] of Object.entries(table.species as Record<string, { tsonopoulos_298?: number }>)) {
      if (row.tsonopoulos_298 === undefined || ['CH3OCH3', 'H2O', 'CH3OH', 'Ne'].includes(key)) continue;
      const b = tsonopoulos(key, 298.15);
      // n-heptane: -3039.6 here against -3024 there; the table's critical constants differ slightly (CoolProp's
      // newer n-heptane EOS has Tc 541.23 K against 540.2 K here)
      const rel = key === 'n-C7H16' ? 6e-3 : 3e-3;
      expect(Math.abs(b - row.tsonopoulos_298), `${key}: ${b}`).toBeLessThanOrEqual(
        Math.max(0.3, rel * Math.abs(row.tsonopoulos_298)),
      );
    }
  });

  // properties.md 3.1
  it('polar terms: water -1237, methanol -1915, NH3 -275, DME -463 cm3/mol at 298.15 K within 1 %', () => {
    const ref: Record<string, number> = { H2O: -1237, CH3OH: -1915, NH3: -275, CH3OCH3: -463 };
    for (const [k, v] of Object.entries(ref)) {
      const b = tsonopoulos(k, 298.15);
      expect(Math.abs(b / v - 1), `${k}: ${b}`).toBeLessThan(0.01);
    }
  });

  // properties.md section 4, 250-400 K; C3H8 at 250 K: 3.5 %
  it('against the reference EOS: light gases within 1 cm3/mol, CO2, C2H6, C3H8 within 3 %', () => {
    for (const key of ['Ar', 'N2', 'O2', 'CH4']) {
      T.forEach((t, i) =>
        expect(Math.abs(tsonopoulos(key, t) - table.species[key].B[i]), `${key} ${t} K`).toBeLessThanOrEqual(
          1.0,
        ),
      );
    }
    for (const key of ['CO2', 'C2H6', 'C3H8']) {
      // measured: C3H8 deviates 3.3 % at 250 K (Tr 0.68), 2.0 % at 273 K, <= 1.4 % above
      T.forEach((t, i) =>
        expect(
          Math.abs(tsonopoulos(key, t) / table.species[key].B[i] - 1),
          `${key} ${t} K`,
        ).toBeLessThanOrEqual(t < 260 ? 0.035 : 0.03),
      );
    }
  });

  // properties.md 3.3
  it('quantum gases, effective constants: He +17.2, H2 +17.2, Ne +12.5 cm3/mol at 298 K within 0.3', () => {
    for (const k of ['He', 'H2', 'Ne']) {
      const b = tsonopoulos(k, 298);
      expect(Math.abs(b - cross.quantum_effective_298[k].effective), `${k}: ${b}`).toBeLessThan(0.3);
    }
  });

  it('the model uses the reference B for He, H2 and Ne, not the correlation', () => {
    for (const k of ['He', 'H2', 'Ne']) {
      const m = virialModel([k], 298.15);
      expect(m.entries[0].method).toBe('reference');
      expect(Math.abs(m.B[0][0] * cm3 - table.species[k].B[3])).toBeLessThan(0.02);
    }
  });
});

describe('cross coefficients (Prausnitz combining rules)', () => {
  // non-quantum pairs
  it('reproduce the Prausnitz + Tsonopoulos values of properties.md 3.2 at 298.15 K within 0.4 cm3/mol', () => {
    // the H2 pairs there used the true critical constants of H2 (we get 11.67 and 11.54 that way); the model uses the
    // Gunn-Chueh-Prausnitz effective constants inside cross terms (+10.0, +9.9), checked against the mixture
    // model below
    for (const p of cross.pairs.filter((q: { i: string }) => q.i !== 'H2')) {
      const ci = correlationConstants(getSpecies(p.i), 298.15);
      const cj = correlationConstants(getSpecies(p.j), 298.15);
      const b = tsonopoulosB(pairConstants(ci, cj), 298.15) * cm3;
      expect(Math.abs(b - p.prausnitz_tsonopoulos), `${p.i}-${p.j}: ${b}`).toBeLessThan(0.4);
    }
  });

  // the known spread of combining rules
  it('stay within 7 cm3/mol of the CoolProp mixture-model cross values of properties.md 3.2', () => {
    for (const p of cross.pairs) {
      const ci = correlationConstants(getSpecies(p.i), 298.15);
      const cj = correlationConstants(getSpecies(p.j), 298.15);
      const b = tsonopoulosB(pairConstants(ci, cj, sizeDifferenceKij(ci, cj)), 298.15) * cm3;
      expect(Math.abs(b - p.mixture_model), `${p.i}-${p.j}`).toBeLessThan(7);
    }
  });

  it('the matrix is symmetric and a pair of equal species reduces to the pure correlation', () => {
    const m = virialModel(['CH4', 'O2', 'Ar', 'CO2'], 310);
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) expect(m.B[i][j]).toBe(m.B[j][i]);
    const c = correlationConstants(getSpecies('C2H2'), 300);
    expect(tsonopoulosB(pairConstants(c, c), 300)).toBeCloseTo(tsonopoulosB(c, 300), 12);
  });
});
