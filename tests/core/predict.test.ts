// The predicted uncertainty of a plan: check's model and GUM budget on the planned readings.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  designMixture,
  planFill,
  predictPlan,
  pureCylinder,
  withPrediction,
  type Gauge,
  R,
  type Plan,
  type PlanPrediction,
  type PredictionInput,
} from '../../src/core/index.js';
import { TORR } from '../helpers.js';

const head = (id: string, fsTorr: number, resTorr: number, acc: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: acc,
  accuracyOfFullScale: 0,
  resolutionPa: resTorr * TORR,
  unit: 'Torr',
});
const A = head('A-1kT', 1000, 0.01, 0.0012);
const B = head('B-10kT', 10000, 0.1, 0.0015);
const T = 298.15;

function twoFill(finalTorr: number, gauges: readonly Gauge[] = [A, B]): Plan {
  return planFill({
    design: designMixture({ kind: 'fractions', fractions: { O2: 0.3, Ar: 0.7 } }),
    finalPressurePa: finalTorr * TORR,
    temperatureK: T,
    tank: { id: 'T', label: 'T', volumeM3: 0.01 },
    sources: ['O2', 'Ar'].map((s) => pureCylinder({ id: `cyl-${s}`, species: s, purity: 1 })),
    order: 'given',
    gauges,
    reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
    tolerance: { relative: 0.005, absolute: 0 },
  });
}

const thermo = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };
const input = (plan: Plan, t = thermo): PredictionInput => ({
  plan,
  gauges: [A, B],
  reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
  thermometer: t,
});

/**
 * JCGM 100:2008 (GUM) 5.1.2, law of propagation for uncorrelated inputs, u_c^2 = sum (df/dx_i)^2 u^2(x_i),
 * worked by hand for two fills at one temperature in the ideal-gas limit: n_k = P_k / (R T_k), so
 *   x1 = (P1 / T1) / (P2 / T2) = P1 T2 / (P2 T1),   x2 = 1 - x1.
 * Inputs (GUM 4.3.7: a rectangular half-width a has u = a / sqrt(3)):
 *   span of the gauge of reading k: P_k (1 + d_k), u(d) = acc / sqrt(3); c = +x1 (P1), -x1 (P2);
 *     one gauge for both readings: d1 = d2, so the two terms cancel (c = x1 - x1 = 0);
 *   resolution of reading k: u(r_k) = res / (2 sqrt(3)); c = 1/P2 (reading 1), -x1/P2 (reading 2);
 *   thermometer offset (shared): T1 and T2 move together, c = 0;
 *   thermometer resolution and settling of reading k: u = 0.05 K / sqrt(3) each;
 *     c = -x1 / T (reading 1), +x1 / T (reading 2).
 *   second virial coefficients (first order in rho: n_k = rho_k,ideal (1 - B_mix,k rho_k,ideal),
 *     reading 1 pure O2, B_mix,1 = B11; reading 2 the mixture, B_mix,2 = x1^2 B11 + 2 x1 x2 B12 + x2^2 B22):
 *     d ln x1 / dB_ij = -rho1 dB_mix,1/dB_ij + rho2 dB_mix,2/dB_ij, so
 *     c(B11) = x1 (x1^2 rho2 - rho1), c(B12) = 2 x1^2 x2 rho2, c(B22) = x1 x2^2 rho2,
 *     with u(B_ij) the model's input uncertainty of each coefficient (mixture-eos VIRIAL_U).
 * What the hand calculation leaves out (second order in B rho, |Z - 1| < 2e-3 here; the thermometer
 * offset through dB/dT) moves u by well under 1 %: tolerance 1 % on u, 2 % on each term.
 */
function handGum(
  P1: number,
  P2: number,
  sameGauge: boolean,
  g1: Gauge,
  g2: Gauge,
  uB: (n: string) => number,
) {
  const rho1 = P1 / (R * T);
  const rho2 = P2 / (R * T);
  const x1 = P1 / P2;
  const x2 = 1 - x1;
  const uSpan1 = g1.accuracyOfReading / Math.sqrt(3);
  const uSpan2 = g2.accuracyOfReading / Math.sqrt(3);
  const uRes1 = g1.resolutionPa / (2 * Math.sqrt(3));
  const uRes2 = g2.resolutionPa / (2 * Math.sqrt(3));
  const uT = 0.05 / Math.sqrt(3); // resolution 0.1 K: half-width 0.05 K; settling: half-width 0.05 K
  const terms: Record<string, number> = sameGauge
    ? { [`span of ${g1.id}`]: 0 }
    : { [`span of ${g1.id}`]: x1 * uSpan1, [`span of ${g2.id}`]: x1 * uSpan2 };
  terms['resolution, reading 1'] = uRes1 / P2;
  terms['resolution, reading 2'] = (x1 * uRes2) / P2;
  for (const k of [1, 2]) {
    terms[`temperature resolution, reading ${k}`] = (x1 * uT) / T;
    terms[`temperature settling, reading ${k}`] = (x1 * uT) / T;
  }
  terms['B O2-O2'] = Math.abs(x1 * (x1 * x1 * rho2 - rho1)) * uB('B O2-O2');
  terms['B O2-Ar'] = 2 * x1 * x1 * x2 * rho2 * uB('B O2-Ar');
  terms['B Ar-Ar'] = x1 * x2 * x2 * rho2 * uB('B Ar-Ar');
  const u = Math.sqrt(Object.values(terms).reduce((a, c) => a + c * c, 0));
  return { x1, u, terms };
}

/** the standard uncertainty of a named input of the model (its given data, not a result) */
const inputU = (p: PlanPrediction) => (name: string) => p.result.components.find((c) => c.name === name)!.u;

describe('predicted uncertainty: the budget against a hand GUM calculation (JCGM 100:2008)', () => {
  it('two fills on two gauges (O2 to 450 Torr on a 1000 Torr head, Ar to 1500 Torr on a 10000 Torr head)', () => {
    const plan = twoFill(1500);
    expect(plan.steps.map((s) => s.gauge?.id)).toEqual(['A-1kT', 'B-10kT']);
    const p = predictPlan(input(plan))!;
    const hand = handGum(plan.steps[0].targetPa, plan.steps[1].targetPa, false, A, B, inputU(p));
    const st = p.result.composition.O2;
    expect(Math.abs(st.u / hand.u - 1)).toBeLessThan(0.01);
    // the same u for Ar (x2 = 1 - x1)
    expect(Math.abs(p.result.composition.Ar.u / hand.u - 1)).toBeLessThan(0.01);
    // term by term (the model's c_i u_i by central differences)
    const byName = new Map(p.result.components.map((c, i) => [c.name, Math.abs(st.contributions![i])]));
    for (const [name, c] of Object.entries(hand.terms)) {
      expect(byName.has(name)).toBe(true);
      expect(Math.abs(byName.get(name)! - c)).toBeLessThanOrEqual(0.02 * c + 1e-12);
    }
    // the shared thermometer offset cancels in the ideal-gas limit: left only with the real-gas terms
    expect(byName.get('thermometer')!).toBeLessThan(0.05 * hand.u);
    // U (k = 2) of O2 against the tolerance: 0.5 % of 0.3
    const row = p.rows.find((r) => r.name === 'O2')!;
    expect(row.expandedU).toBeCloseTo(2 * st.u, 15);
    expect(row.tolerance).toBeCloseTo(0.0015, 12);
    expect(row.within).toBe(row.expandedU <= 0.0015);
  });

  it("one gauge for both readings: its span error cancels (check's correlated budget), the heuristic's did not", () => {
    const plan = twoFill(760, [A]);
    expect(plan.steps.map((s) => s.gauge?.id)).toEqual(['A-1kT', 'A-1kT']);
    const p = predictPlan({ ...input(plan), gauges: [A] })!;
    const hand = handGum(plan.steps[0].targetPa, plan.steps[1].targetPa, true, A, A, inputU(p));
    expect(Math.abs(p.result.composition.O2.u / hand.u - 1)).toBeLessThan(0.01);
    const i = p.result.components.findIndex((c) => c.name === 'span of A-1kT');
    // 1e-3 of the uncorrelated value x1 u(d) sqrt(2): the cancellation is real, not a rounding
    const uncorrelated = hand.x1 * (A.accuracyOfReading / Math.sqrt(3)) * Math.SQRT2;
    expect(Math.abs(p.result.composition.O2.contributions![i])).toBeLessThan(1e-3 * uncorrelated);
  });

  it('the plan carries the prediction and its over-tolerance finding (the planner emits no per-reading gauge heuristic)', () => {
    // a coarse 10000 Torr head for a 1 % O2 fill at 1500 Torr: U far beyond 0.5 %
    const coarse = head('C-10kT', 10000, 1, 0.0015);
    const plan = planFill({
      design: designMixture({ kind: 'fractions', fractions: { O2: 0.01, Ar: 0.99 } }),
      finalPressurePa: 1500 * TORR,
      temperatureK: T,
      tank: { id: 'T', label: 'T', volumeM3: 0.01 },
      sources: ['Ar', 'O2'].map((s) => pureCylinder({ id: `cyl-${s}`, species: s, purity: 1 })),
      order: 'given',
      gauges: [coarse],
      reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
      tolerance: { relative: 0.005, absolute: 0 },
    });
    const p = predictPlan({ ...input(plan), gauges: [coarse] })!;
    const out = withPrediction(plan, p);
    expect(out.predicted).toBe(p);
    expect(plan.findings.filter((f) => f.severity === 'warning').map((f) => f.code)).toEqual([
      'tank-rating-unknown',
    ]);
    const over = out.findings.filter((f) => f.code === 'predicted-u-over-tolerance');
    expect(over.map((f) => (f.code === 'predicted-u-over-tolerance' ? f.species : ''))).toContain('O2');
    const o2 = over.find((f) => f.code === 'predicted-u-over-tolerance' && f.species === 'O2');
    // the 1 Torr display dominates: the advice names the finer gauge head, and the reading where it
    // weighs most (x(O2) = 1 - x(Ar): dx/dP1 = -1/P2 is a little larger than dx/dP2 = P1/P2^2)
    expect(o2 && o2.code === 'predicted-u-over-tolerance' ? o2.about?.kind : '').toBe('resolution');
    expect(o2?.step).toBe(1);
  });
});

describe('predicted uncertainty: property', () => {
  const species = ['Ar', 'O2', 'N2', 'CH4'] as const;
  it("U is never below the bound of the final reading's own resolution term (independent of every other input)", () => {
    fc.assert(
      fc.property(
        fc.shuffledSubarray([...species], { minLength: 2, maxLength: 3 }),
        fc.array(fc.double({ min: 0.02, max: 1, noNaN: true }), { minLength: 3, maxLength: 3 }),
        fc.double({ min: 200, max: 2500, noNaN: true }),
        fc.constantFrom(0.001, 0.01, 0.1),
        (order, weights, finalTorr, resTorr) => {
          const raw = order.map((_, i) => weights[i]);
          const sum = raw.reduce((a, b) => a + b, 0);
          const fractions = Object.fromEntries(order.map((k, i) => [k, raw[i] / sum]));
          const g = head('H', 5000, resTorr, 0.0012);
          const plan = planFill({
            design: designMixture({ kind: 'fractions', fractions }),
            finalPressurePa: finalTorr * TORR,
            temperatureK: T,
            tank: { id: 'T', label: 'T', volumeM3: 0.01 },
            sources: order.map((s) => pureCylinder({ id: `cyl-${s}`, species: s, purity: 1 })),
            order: 'given',
            gauges: [g],
            reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
            tolerance: { relative: 0.005, absolute: 0 },
          });
          const p = predictPlan({ ...input(plan), gauges: [g] })!;
          const K = plan.steps.length;
          const PK = plan.steps[K - 1].targetPa;
          const last = order[K - 1];
          // ideal-gas sensitivity of x_i to the last reading alone: dx_i/dP_K = (w_K,i - x_i) / P_K,
          // u(r_K) = res / (2 sqrt 3); the real-gas factor moves it by < 1 % below 2500 Torr
          for (const r of p.rows.filter((x) => x.kind === 'fraction')) {
            const w = r.name === last ? 1 : 0;
            const bound = (2 * Math.abs(w - r.stat.value) * (g.resolutionPa / (2 * Math.sqrt(3)))) / PK;
            expect(r.expandedU).toBeGreaterThanOrEqual(0.99 * bound);
          }
        },
      ),
      { numRuns: 40, seed: 14 },
    );
  });
});
