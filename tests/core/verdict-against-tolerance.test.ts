// worstAgainstTolerance: the design fraction furthest off in its own tolerance, max(relative x design,
// absolute), the rule of `judge` (core/verdict.ts). References: the docstring's example, by hand
// (0.5 % of 0.5 is 0.0025), and an absolute floor.
import { describe, expect, it } from 'vitest';
import { designMixture, worstAgainstTolerance } from '../../src/core/index.js';

const design = designMixture({ kind: 'fractions', fractions: { CH4: 0.5, Ar: 0.5 } });

describe('worstAgainstTolerance', () => {
  it('CH4 0.498 / Ar 0.502 against 0.5 % (0.0025): 0.002 off, within (by hand, 1e-15)', () => {
    const w = worstAgainstTolerance({ CH4: 0.498, Ar: 0.502 }, design, { relative: 0.005, absolute: 0 })!;
    expect(w.tolerance).toBeCloseTo(0.0025, 15);
    expect(Math.abs(w.deviation)).toBeCloseTo(0.002, 15);
    expect(w.within).toBe(true);
  });

  it('CH4 0.4985 / Ar 0.5035: Ar 0.0035 off is the worst, beyond 0.0025', () => {
    const w = worstAgainstTolerance({ CH4: 0.4985, Ar: 0.5035 }, design, { relative: 0.005, absolute: 0 })!;
    expect(w.species).toBe('Ar');
    expect(w.deviation).toBeCloseTo(0.0035, 15);
    expect(w.within).toBe(false);
  });

  it('an absolute floor of 0.004 above 0.5 % of 0.5 makes 0.003 off within (by hand)', () => {
    const w = worstAgainstTolerance({ CH4: 0.497, Ar: 0.503 }, design, { relative: 0.005, absolute: 0.004 })!;
    expect(w.tolerance).toBe(0.004);
    expect(w.within).toBe(true);
  });

  it('a design species missing from the composition is off by its whole design fraction', () => {
    const w = worstAgainstTolerance({ Ar: 1 }, design, { relative: 0.005, absolute: 0 })!;
    expect([w.species, w.deviation, w.within]).toEqual(['CH4', -0.5, false]);
  });
});
