/**
 * The quick Chapman-Jouguet estimate (detonation.ts, precision 'quick') that the order advice
 * and the sequence search judge a detonable state's severity by: how far its reflected pressure
 * is from the full estimate, and that the severity it gives is always the full review's.
 * Outside reference: Cantera 3.2.0's CJ states (tests/fixtures/reference/equilibrium-cantera.json,
 * the same fixture the full estimate is tested against in equilibrium.test.ts, to 1e-3).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  chapmanJouguet,
  detonableStretchFinding,
  detonationFinding,
  QUICK_CJ_MARGIN,
  reviewBulkPath,
  type FillEvent,
} from '../../src/core/index.js';
import { fixture } from '../helpers.js';

interface RefCase {
  name: string;
  X0: Record<string, number>;
  T0_K: number;
  P0_Pa: number;
  cj_P_Pa?: number;
}
const ref = fixture('equilibrium-cantera.json');
const cases = (ref.cases as RefCase[]).filter((c) => c.cj_P_Pa !== undefined);

describe('quick CJ estimate', () => {
  it(`is within 1e-3 of Cantera's CJ pressure (${ref.library as string}) on every reference state`, () => {
    expect(cases.length).toBeGreaterThanOrEqual(8);
    for (const c of cases) {
      const q = chapmanJouguet(c.X0, c.T0_K, c.P0_Pa, 'quick');
      const f = chapmanJouguet(c.X0, c.T0_K, c.P0_Pa);
      // tolerance 1e-3 relative against the reference; 1e-3 between quick and full
      expect(Math.abs(q.pressurePa / c.cj_P_Pa! - 1), c.name).toBeLessThan(1e-3);
      expect(Math.abs(q.reflectedPa / f.reflectedPa - 1), c.name).toBeLessThan(1e-3);
    }
  });

  // diluted fuel/O2 mixtures of the kinds labs fill, from 0.1 to 3 bar
  const fuels = ['CH4', 'H2', 'C2H4', 'C3H8', 'C2H2'] as const;
  const stoich: Record<(typeof fuels)[number], number> = { CH4: 2, H2: 0.5, C2H4: 3, C3H8: 5, C2H2: 2.5 };
  const state = fc.record({
    fuel: fc.constantFrom(...fuels),
    phi: fc.double({ min: 0.6, max: 1.8, noNaN: true }),
    dil: fc.double({ min: 0, max: 0.6, noNaN: true }),
    diluent: fc.constantFrom('Ar', 'N2', 'He'),
    pressurePa: fc.double({ min: 1e4, max: 3e5, noNaN: true }),
  });
  const compositionOf = (s: { fuel: (typeof fuels)[number]; phi: number; dil: number; diluent: string }) => {
    const o2 = stoich[s.fuel] / s.phi;
    const sum = 1 + o2;
    return { [s.fuel]: ((1 - s.dil) * 1) / sum, O2: ((1 - s.dil) * o2) / sum, [s.diluent]: s.dil };
  };

  it('moves the reflected pressure by far less than the margin it is trusted outside of (random states)', () => {
    fc.assert(
      fc.property(state, (s) => {
        const y = compositionOf(s);
        const q = chapmanJouguet(y, 298.15, s.pressurePa, 'quick');
        const f = chapmanJouguet(y, 298.15, s.pressurePa);
        // the margin is 2 %; the estimate must stay within a fifth of it
        expect(Math.abs(q.reflectedPa / f.reflectedPa - 1)).toBeLessThan(QUICK_CJ_MARGIN / 5);
      }),
      { numRuns: 30 },
    );
  });

  it("gives the full review's severity for a state at any working limit, the margin's edges included", () => {
    for (const c of cases) {
      const full = chapmanJouguet(c.X0, c.T0_K, c.P0_Pa).reflectedPa;
      const quick = chapmanJouguet(c.X0, c.T0_K, c.P0_Pa, 'quick').reflectedPa;
      // halfway between the two estimates, the quick one alone would put the state on the wrong side
      const between = (quick / full - 1) / 2;
      expect(between).not.toBe(0);
      for (const d of [-0.05, -0.021, -0.019, -0.001, between, 0.001, 0.019, 0.021, 0.05]) {
        const limit = full * (1 + d);
        const s = { composition: c.X0, pressurePa: c.P0_Pa };
        const a = detonationFinding(s, c.T0_K, limit, 1, 'full');
        const b = detonationFinding(s, c.T0_K, limit, 1, 'severity');
        expect(b?.severity, `${c.name} limit ${d}`).toBe(a?.severity);
      }
    }
  });

  it("gives the full review's severity for a detonable stretch of a fill path (random O2 fills)", () => {
    let judged = 0;
    fc.assert(
      fc.property(state, fc.double({ min: 0.5, max: 40, noNaN: true }), (s, limitOverP) => {
        // fuel and diluent in the tank, then the O2 of the design (the O2 goes in last)
        const y = compositionOf(s);
        const before = { [s.fuel]: y[s.fuel] / (1 - y.O2), [s.diluent]: y[s.diluent] / (1 - y.O2) };
        const p0 = s.pressurePa * (1 - y.O2);
        const e: FillEvent = {
          step: 2,
          sourceId: 'cyl-O2',
          sourceComposition: { O2: 1 },
          before: { step: 1, composition: before, pressurePa: p0, final: false },
          after: { step: 2, composition: y, pressurePa: s.pressurePa, final: true },
        };
        const points = reviewBulkPath(e, 298.15, true)?.detonable ?? [];
        if (!points.length) return;
        judged++;
        const limit = s.pressurePa * limitOverP;
        const a = detonableStretchFinding(points, 298.15, limit, 2, 'full');
        const b = detonableStretchFinding(points, 298.15, limit, 2, 'severity');
        expect(b?.severity).toBe(a?.severity);
      }),
      { numRuns: 40 },
    );
    // the generator must reach detonable stretches, or the property says nothing
    expect(judged).toBeGreaterThan(10);
  });
});
