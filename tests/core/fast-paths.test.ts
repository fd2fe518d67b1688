// The faster paths of the plan's computation against the plain computation they replace: the same
// numbers to the last bit and the same results, so that every output stays as it was. The outside
// reference for the values themselves is elsewhere (flame temperatures: Cantera 3.2.0 in
// tests/fixtures/reference/flame-cantera.json, checked by combustion and examples tests); here the
// reference is the straightforward formula, and the tolerance is zero.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  assessFlammability,
  blendLimits,
  flameShareOf,
  flameShareToLimit,
  uflRisesWithPressure,
  closedVesselCombustion,
  completeCombustion,
  flameTemperatureK,
  planFill,
  planTwoStage,
  R,
  type Fractions,
} from '../../src/core/index.js';
import { enthalpyMolar, enthalpySum, thermoRangeK } from '../../src/core/thermo.js';
import { FUEL_SAFETY, type FuelSafetyRecord } from '../../src/core/data/safety-data.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction, predictionThermometer } from '../../src/io/plan-predict.js';

/** sum of n_k h_k(T) the plain way: one enthalpyMolar per species, in the mixture's order */
const plainSum = (n: Fractions, t: number) =>
  Object.entries(n).reduce((h, [k, v]) => h + v * enthalpyMolar(k, t), 0);

/** bisection exactly as the flame temperature runs it (combustion.ts solveIncreasing) */
function bisect(f: (t: number) => number, target: number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  for (let i = 0; i < 100; i++) {
    const m = (a + b) / 2;
    if (f(m) < target) a = m;
    else b = m;
    if (b - a < 1e-6) break;
  }
  return (a + b) / 2;
}
const ceiling = (n: Fractions) =>
  Object.keys(n).reduce((hi, k) => Math.min(hi, thermoRangeK(k)?.max ?? hi), 6000);

const FUELS = ['CH4', 'H2', 'C2H4', 'C3H8', 'CO', 'C2H6'] as const;
const INERTS = ['Ar', 'N2', 'He', 'CO2'] as const;
const mixture = fc
  .record({
    fuel: fc.constantFrom(...FUELS),
    inert: fc.constantFrom(...INERTS),
    f: fc.double({ min: 0.001, max: 0.6, noNaN: true }),
    o: fc.double({ min: 0.001, max: 0.6, noNaN: true }),
  })
  .map(({ fuel, inert, f, o }): Fractions => {
    const rest = Math.max(0, 1 - f - o);
    const s = f + o + rest;
    return { [fuel]: f / s, O2: o / s, [inert]: rest / s };
  });

describe('enthalpySum (the fits looked up once) against one enthalpyMolar per species', () => {
  it("is the same number to the last bit for product mixtures from 250 K to their fits' ceiling", () => {
    fc.assert(
      fc.property(mixture, fc.double({ min: 0, max: 1, noNaN: true }), (y, share) => {
        const { products } = completeCombustion(y);
        const t = 250 + share * (ceiling(products) - 250);
        expect(enthalpySum(products)(t)).toBe(plainSum(products, t));
        expect(enthalpySum(y)(298.15)).toBe(plainSum(y, 298.15));
      }),
      { numRuns: 200 },
    );
  });

  it('refuses as the plain sum does: a species without a fit, a temperature outside the fits', () => {
    expect(() => enthalpySum({ Ar: 0.5, XYZ: 0.5 })(300)).toThrowError('no NASA polynomial for XYZ');
    expect(() => plainSum({ Ar: 0.5, XYZ: 0.5 }, 300)).toThrowError('no NASA polynomial for XYZ');
    expect(() => enthalpySum({ Ar: 1 })(1e5)).toThrowError(/outside the NASA fit range/);
  });
});

describe('flame temperatures (Illinois regula falsi on enthalpySum) against a plain bisection', () => {
  // both solve to 1e-6 K (combustion.ts FLAME_TOLERANCE_K): each within 5e-7 K of the root
  it('the adiabatic flame temperature and the closed-vessel end state agree within 1e-6 K', () => {
    fc.assert(
      fc.property(mixture, fc.double({ min: 250, max: 400, noNaN: true }), (y, t0) => {
        const { products } = completeCombustion(y);
        const plainFlame = bisect((t) => plainSum(products, t), plainSum(y, t0), t0, ceiling(products));
        expect(Math.abs(flameTemperatureK(y, t0) - plainFlame)).toBeLessThanOrEqual(1e-6);
        const nr = Object.values(y).reduce((a, b) => a + b, 0);
        const np = Object.values(products).reduce((a, b) => a + b, 0);
        const u0 = plainSum(y, t0) - nr * R * t0;
        const tv = bisect((t) => plainSum(products, t) - np * R * t, u0, t0, ceiling(products));
        const cv = closedVesselCombustion(y, t0);
        expect(Math.abs(cv.temperatureK - tv)).toBeLessThanOrEqual(1e-6);
        expect(cv.pressureRatio).toBe((np * cv.temperatureK) / (nr * t0));
      }),
      { numRuns: 100 },
    );
  });
});

describe('the two-stage proposal given the plan it proposes for', () => {
  it('plans the same two stages as the search that plans the single tank itself (demo ch4-o2-ar-phi1, MT-2)', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const mt2 = req.lab.tanks.find((t) => t.id === 'MT-2')!;
    const input = {
      batch: req.input,
      premixTank: mt2,
      thermometer: predictionThermometer(req.lab.thermometer),
    };
    const single = planWithPrediction(planFill(req.input), req);
    // the demo's single-tank plan is over its tolerance, so the search picks its premix gas from it
    expect(single.predicted!.rows.some((r) => r.kind === 'fraction' && !r.within)).toBe(true);
    const given = planTwoStage(input, 'full', single);
    const planned = planTwoStage(input, 'full');
    expect(given).toEqual(planned);
    expect(given.candidates).toBeGreaterThan(1);
  });
});

describe("blendLimits with each fuel's listed limits worked out once", () => {
  it('gives for every fuel on file the plain derivation from its record: limits, LOC and sources in order', () => {
    for (const [k, rec] of FUEL_SAFETY) {
      const lfl = Math.min(...rec.lflAir.map((v) => v.value));
      const ufl = Math.max(...rec.uflAir.map((v) => v.value));
      const sources = new Set([...rec.lflAir, ...rec.uflAir].map((v) => v.source));
      if (rec.uflO2) sources.add(rec.uflO2.source);
      sources.add(rec.loc ? rec.loc.source : 'loc-estimate');
      // twice: the second call takes the derived numbers
      for (let i = 0; i < 2; i++) {
        const b = blendLimits({ [k]: 1 }, 298.15, 101325);
        expect(b.lfl, k).toBe(1 / (1 / lfl));
        expect(b.ufl, k).toBe(Math.min(1 / (1 / ufl), 1));
        expect(b.sources, k).toEqual([...sources]);
      }
    }
  });

  it('takes a changed table record as changed (derived per record, not per species)', () => {
    const m = FUEL_SAFETY as Map<string, FuelSafetyRecord>;
    const rec = m.get('CH4')!;
    const before = blendLimits({ CH4: 1 }, 298.15, 101325);
    m.set('CH4', { ...rec, lflAir: [{ ...rec.lflAir[0], value: 0.03 }] });
    try {
      expect(blendLimits({ CH4: 1 }, 298.15, 101325).lfl).toBe(1 / (1 / 0.03));
    } finally {
      m.set('CH4', rec);
    }
    expect(blendLimits({ CH4: 1 }, 298.15, 101325)).toEqual(before);
  });
});

describe("the fill-path review's shortcuts against the full assessment", () => {
  const states = fc
    .record({
      fuel: fc.constantFrom(...FUELS, 'C2H2'),
      second: fc.constantFrom(...FUELS),
      blend: fc.double({ min: 0, max: 1, noNaN: true }),
      inert: fc.constantFrom(...INERTS),
      f: fc.double({ min: 0, max: 0.7, noNaN: true }),
      o: fc.double({ min: 0, max: 0.7, noNaN: true }),
      t: fc.double({ min: 250, max: 400, noNaN: true }),
    })
    .map(({ fuel, second, blend, inert, f, o, t }) => {
      const rest = Math.max(0, 1 - f - o);
      const s = f + o + rest;
      const y: Record<string, number> = { [fuel]: (f * (1 - blend)) / s, O2: o / s, [inert]: rest / s };
      y[second] = (y[second] ?? 0) + (f * blend) / s;
      return { y, t };
    });

  it("flameShareToLimit is the share assessFlammability's own flame and limit flame temperatures give", () => {
    // the reference is assessFlammability's numbers (checked against Cantera 3.2.0 and the handbook
    // limits in the flammability and examples tests); tolerance zero: the same arithmetic
    fc.assert(
      fc.property(states, fc.double({ min: 1e3, max: 1e7, noNaN: true }), ({ y, t }, p) => {
        expect(flameShareToLimit(y, t)).toBe(flameShareOf(assessFlammability(y, t, p), t));
      }),
      { numRuns: 400 },
    );
  });

  it('a blend has the same limits at every pressure up to 1 atm (the gap guide reuses one envelope there)', () => {
    // the reference is blendLimits itself at each pressure; tolerance zero
    fc.assert(
      fc.property(
        states,
        fc.double({ min: 1, max: 101325, noNaN: true }),
        fc.double({ min: 1, max: 101325, noNaN: true }),
        ({ y, t }, p1, p2) => {
          const named = Object.entries(y).filter(([k, v]) => v > 0 && FUEL_SAFETY.has(k));
          const sum = named.reduce((a, [, v]) => a + v, 0);
          fc.pre(sum > 0);
          const fuels = Object.fromEntries(named.map(([k, v]) => [k, v / sum]));
          expect(uflRisesWithPressure(p1)).toBe(false);
          expect(blendLimits(fuels, t, p1)).toEqual(blendLimits(fuels, t, p2));
        },
      ),
      { numRuns: 200 },
    );
    expect(uflRisesWithPressure(101325 * 1.000001)).toBe(true);
    expect(blendLimits({ CH4: 1 }, 298.15, 2e6).ufl).toBeGreaterThan(
      blendLimits({ CH4: 1 }, 298.15, 1e5).ufl,
    );
  });
});
