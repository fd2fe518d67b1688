import { describe, expect, it } from 'vitest';
import { describeProblem, ProblemError, R } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import {
  AMOUNT_MAX_ITERATIONS,
  AMOUNT_TOLERANCE,
  eosComposition,
  planAmounts,
} from '../../src/core/plan/amounts.js';
import { pureInput, workedInput } from './planner-input.js';
import { fixture, TORR } from '../helpers.js';

const worked = fixture('worked-plan.json');

function problemOf(f: () => unknown): ProblemError {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return e;
    throw e;
  }
  throw new Error('no problem raised');
}

describe('plan stage 2: amounts', () => {
  it('worked vector of properties.md 1.2 (CoolProp 8.0): total 0.538290 mol within 0.01 %, Z 0.999120 within 5e-5', () => {
    const a = planAmounts(validatePlanInput(workedInput()));
    expect(Math.abs(a.totalMol / worked.amount_mol - 1)).toBeLessThan(1e-4);
    expect(Math.abs(a.compressibility - worked.compressibility)).toBeLessThan(5e-5);
  });

  it('consistency: the amounts sum to the total, split as the design (single-species cylinders), and Z = P/(rho R T) to 1e-12', () => {
    const b = validatePlanInput(workedInput());
    const a = planAmounts(b);
    const sum = a.allocation.amountsMol.reduce((p, q) => p + q, 0);
    expect(Math.abs(sum / a.totalMol - 1)).toBeLessThan(1e-12);
    [0.05, 0.1, 0.85].forEach((x, i) =>
      expect(Math.abs(a.allocation.amountsMol[i] / a.totalMol - x)).toBeLessThan(1e-12),
    );
    expect(Math.abs(a.totalMol / (a.densityMolPerM3 * b.volumeM3) - 1)).toBeLessThan(1e-12);
    const zFromState = b.finalPressurePa / (a.densityMolPerM3 * R * b.temperatureK);
    expect(Math.abs(zFromState / a.compressibility - 1)).toBeLessThan(1e-12);
  });

  it('settles within the cap: a single rescaling without gas in the tank, a few more with it', () => {
    const fresh = planAmounts(validatePlanInput(workedInput()));
    expect(fresh.iterations).toBeLessThanOrEqual(3);
    const topUp = planAmounts(
      validatePlanInput({ ...workedInput(), inTank: { composition: { Ar: 1 }, pressurePa: 600 * TORR } }),
    );
    expect(topUp.iterations).toBeLessThan(AMOUNT_MAX_ITERATIONS);
    expect(Math.abs(topUp.totalMol / fresh.totalMol - 1)).toBeLessThan(1e-3);
  });

  it('a loop that has not settled within its cap raises not-converged with its name, iterations, residual and tolerance', () => {
    // at 10 bar the first rescaling moves the total by about B rho (a few 1e-3), far above 1e-13
    const b = validatePlanInput(
      pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 10e5),
    );
    const e = problemOf(() => planAmounts(b, { maxIterations: 1 }));
    expect(e.problem.code).toBe('not-converged');
    if (e.problem.code !== 'not-converged') return;
    expect(e.problem.computation).toBe('fill amounts');
    expect(e.problem.iterations).toBe(1);
    expect(e.problem.tolerance).toBe(AMOUNT_TOLERANCE);
    expect(e.problem.residual).toBeGreaterThan(1e-4);
    expect(describeProblem(e.problem)).toMatch(/^the fill amounts did not converge: after 1 iterations/);
    // the same input settles with the default cap
    expect(planAmounts(b).iterations).toBeGreaterThan(1);
  });

  it('a finished batch beyond 5 % from ideal gas is a typed model-range problem, worded as before', () => {
    const b = validatePlanInput(pureInput({ CO2: 1 }, ['CO2'], 300, 20e5));
    const e = problemOf(() => planAmounts(b));
    expect(e.problem).toMatchObject({ code: 'model-range', kind: 'non-ideal', maxDeviation: 0.05 });
    expect(e.where.field).toBe('pressure');
    expect(describeProblem(e.problem)).toMatch(
      /^the finished batch would have Z = 0\.\d{4}; the truncated virial model is trusted only within 5 % of ideal gas\. Lower the final pressure/,
    );
  });

  it('eosComposition counts a source’s unidentified remainder as its main gas and normalises', () => {
    const src = {
      id: 'n2',
      label: 'N2',
      kind: 'cylinder' as const,
      composition: { N2: 0.99, O2: 0.005 },
      unidentified: 0.005,
      mainSpecies: 'N2',
    };
    const y = eosComposition([
      { source: src, mol: 1 },
      { source: { Ar: 1 }, mol: 1 },
    ]);
    expect(y.N2).toBeCloseTo(0.4975, 12);
    expect(y.O2).toBeCloseTo(0.0025, 12);
    expect(y.Ar).toBeCloseTo(0.5, 12);
  });
});
