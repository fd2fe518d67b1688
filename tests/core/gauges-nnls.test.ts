import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  allocate,
  chooseGauge,
  nnls,
  pureCylinder,
  readingUncertaintyPa,
  type Gauge,
} from '../../src/core/index.js';
import { TORR } from '../helpers.js';

describe('gauge model (GUM JCGM 100:2008 4.3.7 rectangular, F.2.2.1 resolution)', () => {
  const g: Gauge = {
    id: 'h',
    label: 'h',
    reference: 'absolute',
    fullScalePa: 1000 * TORR,
    minimumPa: 0,
    accuracyOfReading: 0.0012,
    accuracyOfFullScale: 0,
    resolutionPa: 0.01 * TORR,
    unit: 'Torr',
  };
  const ctx = { barometricPa: 101325, barometricUncertaintyPa: 40 };
  it('0.12 % of 150 Torr with 0.01 Torr resolution: u = 0.1040 Torr (hand calculation of the doc-comment example)', () => {
    expect(readingUncertaintyPa(g, 150 * TORR, ctx) / TORR).toBeCloseTo(0.10396, 4);
  });
  it('a gauge-referenced sensor adds the barometer uncertainty and reads P - P_baro', () => {
    const gg: Gauge = {
      ...g,
      reference: 'gauge',
      accuracyOfReading: 0,
      accuracyOfFullScale: 0.0005,
      fullScalePa: 689475.7293168361,
      resolutionPa: 68.94757,
    };
    const u = readingUncertaintyPa(gg, 3e5, ctx);
    const spec = (0.0005 * 689475.7293168361) / Math.sqrt(3);
    expect(u).toBeCloseTo(Math.sqrt(spec ** 2 + 68.94757 ** 2 / 12 + 40 ** 2), 6);
  });
  it('chooses the covering gauge with the smallest uncertainty; none when nothing covers', () => {
    const low = { ...g, id: 'low', fullScalePa: 10 * TORR, resolutionPa: 1e-4 * TORR };
    expect(chooseGauge([g, low], 5 * TORR, 5.1 * TORR, ctx)?.gauge.id).toBe('low');
    expect(chooseGauge([g, low], 9.99 * TORR, 10.05 * TORR, ctx)?.gauge.id).toBe('h');
    expect(chooseGauge([g, low], 2000 * TORR, 2001 * TORR, ctx)).toBeUndefined();
  });
});

describe('non-negative least squares (Lawson & Hanson 1974)', () => {
  it('solves a square system with a non-negative solution exactly', () => {
    const r = nnls(
      [
        [1, 0.5],
        [0, 2],
      ],
      [2, 4],
    );
    expect(r.x[0]).toBeCloseTo(1, 12);
    expect(r.x[1]).toBeCloseTo(2, 12);
  });
  it('clips to zero where the unconstrained solution is negative (textbook case: min ||[1 0;0 1]x - (1,-1)|| -> (1, 0))', () => {
    const r = nnls(
      [
        [1, 0],
        [0, 1],
      ],
      [1, -1],
    );
    expect(r.x).toEqual([1, 0]);
    expect(r.residualNorm).toBeCloseTo(1, 12);
  });
  it('property: the result is non-negative and satisfies the KKT conditions', () => {
    fc.assert(
      fc.property(
        fc.array(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 3, maxLength: 3 }), {
          minLength: 4,
          maxLength: 4,
        }),
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }),
        (A, b) => {
          let x: number[];
          try {
            x = nnls(A, b).x;
          } catch {
            return true; // singular draws are refused loudly, which is the wanted behaviour
          }
          const r = b.map((bi, i) => bi - A[i].reduce((s, a, j) => s + a * x[j], 0));
          const w = [0, 1, 2].map((j) => A.reduce((s, row, i) => s + row[j] * r[i], 0));
          return (
            x.every((v) => v >= 0) && w.every((wj, j) => (x[j] > 1e-9 ? Math.abs(wj) < 1e-7 : wj < 1e-7))
          );
        },
      ),
    );
  });
  it('a column of subnormal size (5e-324) supplies nothing: its amount is 0, finite, and the KKT conditions hold (the property test’s counterexample)', () => {
    const A = [
      [0, 0, 0],
      [0, 5e-324, 0],
      [0, 0, 0],
      [0, 0, 0],
    ];
    const b = [0, 8.881784197001252e-16, 0, 0];
    const { x } = nnls(A, b);
    expect(x).toEqual([0, 0, 0]);
  });
  it('allocation with impure cylinders: CH4 at 99.9 % with 0.05 % C2H6 hits the design CH4 fraction', () => {
    const a = allocate(
      [
        pureCylinder({ id: 'c', species: 'CH4', purity: 0.999, impurities: { C2H6: 0.0005 } }),
        pureCylinder({ id: 'a', species: 'Ar', purity: 1 }),
      ],
      { CH4: 0.1, Ar: 0.9 },
      1,
    );
    expect(a.amountsMol[0]).toBeCloseTo(0.1 / 0.999, 12);
    expect(a.composition.C2H6).toBeGreaterThan(0);
  });
});
