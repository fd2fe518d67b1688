/**
 * The amounts per source (supply.ts allocate, non-negative least squares) with a trace design
 * component: 10 ppb CH4 with O2 and Ar from the demo lab's cylinders and their listed impurities.
 * Three sources for three design species: the exact answer solves the square system by hand
 * (Cramer's rule on a triangular system), so the allocation must reproduce it to rounding.
 */
import { describe, expect, it } from 'vitest';
import { allocate, pureCylinder } from '../../src/core/index.js';

describe('allocation with a 10 ppb component', () => {
  it('CH4 1e-8, O2 0.21, Ar: the amounts of the exact hand solution, to 1e-12 relative', () => {
    const ch4 = pureCylinder({
      id: 'cyl-CH4',
      species: 'CH4',
      purity: 0.99995,
      impurities: { N2: 0.00002, C2H6: 0.00001 },
    });
    const o2 = pureCylinder({
      id: 'cyl-O2',
      species: 'O2',
      purity: 0.99998,
      impurities: { Ar: 0.00001, N2: 0.00001 },
    });
    const ar = pureCylinder({ id: 'cyl-Ar', species: 'Ar', purity: 0.99999 });
    const N = 0.8077;
    const design = { CH4: 1e-8, O2: 0.21, Ar: 0.79 - 1e-8 };
    const a = allocate([ch4, o2, ar], design, N);
    // by hand: CH4 only from its cylinder, O2 only from its, Ar from its own and the O2's 10 ppm
    const aCH4 = (N * 1e-8) / 0.99995;
    const aO2 = (N * 0.21) / 0.99998;
    const aAr = (N * design.Ar - 0.00001 * aO2) / 0.99999;
    [aCH4, aO2, aAr].forEach((x, i) => expect(Math.abs(a.amountsMol[i] / x - 1)).toBeLessThan(1e-12));
    expect(Math.abs(a.composition.CH4 / 1e-8 - 1)).toBeLessThan(1e-4);
  });
});
