import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { designMixture, nnls, planFill, pureCylinder, retarget } from '../../src/core/index.js';
import { TORR } from '../helpers.js';
import { GAUGES } from './planner-input.js';

// The outside reference of every check here is the plan itself: a reading exactly on the plan's
// first target leaves the tank as the plan put it, so the remaining fills are the plan's own
// (algebra on the design, common practice; no other tool needed). Tolerance 1e-9 relative.
const gauges = GAUGES;
const T = 298.15;
const rel = (a: number, b: number) => Math.abs(a / b - 1);

/** plan a design in the given fill order, read the first fill exactly on target, re-target */
function perfectFirstReading(
  fuel: string,
  diluent: string,
  fuelFraction: number,
  phi: number,
  order: readonly number[],
  volumeM3: number,
  pressureTorr: number,
) {
  const design = designMixture({
    kind: 'phi',
    fuel: { [fuel]: 1 },
    oxidizer: { O2: 1 },
    diluent: { [diluent]: 1 },
    phi,
    basis: { kind: 'fuel-fraction', value: fuelFraction },
  });
  const names = [fuel, 'O2', diluent];
  const sources = order.map((i) => pureCylinder({ id: names[i], species: names[i], purity: 1 }));
  const plan = planFill({
    design,
    finalPressurePa: pressureTorr * TORR,
    temperatureK: T,
    tank: { id: 'T', label: 'T', volumeM3 },
    sources,
    order: 'given',
    gauges,
    reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
    tolerance: { relative: 0.005, absolute: 0 },
  });
  const r = retarget({
    design,
    tolerance: plan.tolerance,
    sources: plan.steps.map((s) => s.source),
    temperatureK: T,
    finalPressurePa: pressureTorr * TORR,
    volumeM3,
    done: [{ pressurePa: plan.steps[0].targetPa, temperatureK: T }],
  });
  return { design, plan, r };
}

function expectPlanOwn({ design, plan, r }: ReturnType<typeof perfectFirstReading>) {
  expect(r.remaining).toHaveLength(plan.steps.length - 1);
  r.remaining.forEach((s, i) => {
    const p = plan.steps[i + 1];
    expect(s.source.id).toBe(p.source.id);
    expect(rel(s.amountMol, p.amountMol)).toBeLessThan(1e-9);
    expect(rel(s.targetPa, p.targetPa)).toBeLessThan(1e-9);
  });
  for (const [k, x] of Object.entries(design.composition))
    expect(rel(r.predicted.composition[k] ?? 0, x)).toBeLessThan(1e-9);
  expect(r.gave).toEqual([]);
}

describe("re-target after a reading on the plan's first target: the plan's own remaining fills (1e-9 relative)", () => {
  it('CH4 10 ppb and O2 20 ppb in Ar, 15 L at 1000 Torr, every fill order (was: nnls singular with Ar first)', () => {
    const orders = [
      [0, 1, 2],
      [1, 0, 2],
      [0, 2, 1],
      [1, 2, 0],
      [2, 0, 1],
      [2, 1, 0],
    ];
    for (const order of orders) expectPlanOwn(perfectFirstReading('CH4', 'Ar', 1e-8, 1, order, 0.015, 1000));
  });

  it('CH4 1 ppm and O2 2 ppm in Ar, 10 L at 1000 Torr, CH4 then Ar then O2 (was: the solve never ended, its step not finite)', () => {
    expectPlanOwn(perfectFirstReading('CH4', 'Ar', 1e-6, 1, [0, 2, 1], 0.01, 1000));
  });

  it('property: fuel from 1 ppb of the batch to fuel and O2 together 0.5, any fuel of three, phi 0.3 to 3, Ar or N2, any fill order', () => {
    // O2 needed per mol of fuel (c + h/4 - o/2): CH4 2, C2H4 3, H2 0.5
    const stoich: Record<string, number> = { CH4: 2, C2H4: 3, H2: 0.5 };

    fc.assert(
      fc.property(
        fc.constantFrom('CH4', 'C2H4', 'H2'),
        fc.constantFrom('Ar', 'N2'),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0.3, max: 3, noNaN: true }),
        fc.constantFrom([0, 1, 2], [1, 0, 2], [0, 2, 1], [1, 2, 0], [2, 0, 1], [2, 1, 0]),
        fc.constantFrom(0.005, 0.015, 0.05),
        fc.constantFrom(760, 1500, 3000),
        (fuel, diluent, t, phi, order, V, P) => {
          // fuel and O2 at most half the batch
          const highest = Math.log10(0.5 / (1 + stoich[fuel] / phi));
          // fuel and O2 each at least 1 ppb (the planner's smallest meterable fraction)
          const lowest = Math.log10(1.001e-9 * Math.max(1, phi / stoich[fuel]));
          const xf = 10 ** (lowest + t * (highest - lowest));
          expectPlanOwn(perfectFirstReading(fuel, diluent, xf, phi, order, V, P));
        },
      ),
      { numRuns: 60 },
    );
  });
});

describe('nnls on rows weighted over many orders of magnitude (Householder QR, Cox & Higham 1998)', () => {
  it("a row weighted 1e12 (the re-target's widest weight ratio, limit : each fraction) that two columns share, and light rows that tell them apart: both amounts to 1e-9 (algebra: the exact solution x = (1, 2))", () => {
    // row 1: 2 x1 - x2 = 0 weighted 1e12; rows 2, 3: x1 = 1 and x2 = 2, weighted 1; the system is
    // consistent, so the least-squares solution is x = (1, 2); the normal equations square 1e12 and
    // lose the light rows (their matrix is singular to double precision)
    const A = [
      [2e12, -1e12],
      [1, 0],
      [0, 1],
    ];
    const x = nnls(A, [0, 1, 2], undefined, { gradientTest: 'per-column' }).x;
    expect(rel(x[0], 1)).toBeLessThan(1e-12);
    expect(rel(x[1], 2)).toBeLessThan(1e-12);
  });
});
