import { describe, expect, it } from 'vitest';
import { describeProblem, ProblemError, R } from '../../src/core/index.js';
import { MODEL_T_RANGE_K, validatePlanInput } from '../../src/core/plan/validate.js';
import { pureInput, workedInput } from './planner-input.js';
import { TORR } from '../helpers.js';

function problemOf(f: () => unknown): ProblemError {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return e;
    throw e;
  }
  throw new Error('no problem raised');
}

describe('plan stage 1: validate', () => {
  it('the basis carries the checked numbers, every species, and a model at the fill temperature', () => {
    const b = validatePlanInput(workedInput());
    expect(b.finalPressurePa).toBe(1000 * TORR);
    expect(b.temperatureK).toBe(298.15);
    expect(b.volumeM3).toBe(0.01);
    expect([...b.species].sort()).toEqual(['Ar', 'CH4', 'O2']);
    expect(b.model.temperatureK).toBe(298.15);
    expect(b.initial).toBeUndefined();
    expect(b.workingLimitPa).toBeUndefined();
    expect(b.safety).toMatchObject({ temperatureK: 298.15, tankId: 'T' });
  });

  it('the working limit is the rating times the working fraction (4 bar x 0.9 = 3.6 bar, exact arithmetic)', () => {
    const i = workedInput();
    const b = validatePlanInput({ ...i, tank: { ...i.tank, ratedPressurePa: 4e5, workingFraction: 0.9 } });
    expect(b.workingLimitPa).toBeCloseTo(3.6e5, 6);
    expect(b.safety.workingLimitPa).toBe(b.workingLimitPa);
  });

  it('gas in the tank: its amount from the same equation of state, near the ideal-gas amount PV/RT (within 0.1 % at 400 Torr, ideal-gas law)', () => {
    const b = validatePlanInput({
      ...workedInput(),
      inTank: { composition: { Ar: 1 }, pressurePa: 400 * TORR },
    });
    const ideal = (400 * TORR * 0.01) / (R * 298.15);
    expect(b.initial?.pressurePa).toBe(400 * TORR);
    expect(Math.abs(b.initial!.amountMol / ideal - 1)).toBeLessThan(1e-3);
  });

  it('refuses what cannot be planned, each with its code and field', () => {
    const i = workedInput();
    expect(problemOf(() => validatePlanInput({ ...i, finalPressurePa: 0 })).problem.code).toBe(
      'not-positive',
    );
    expect(problemOf(() => validatePlanInput({ ...i, temperatureK: -1 })).where.field).toBe('temperature');
    expect(problemOf(() => validatePlanInput({ ...i, tank: { ...i.tank, volumeM3: 0 } })).where.field).toBe(
      'volume',
    );
    const none = problemOf(() => validatePlanInput({ ...i, sources: [] }));
    expect(none.problem).toEqual({ code: 'design-missing', kind: 'no-fills' });
    expect(describeProblem(none.problem)).toBe('the plan has no fills');
  });

  it('a temperature outside the model range is a typed model-range problem, worded as before', () => {
    const e = problemOf(() => validatePlanInput(pureInput({ Ar: 1 }, ['Ar'], 150, 1e5)));
    expect(e.problem).toEqual({
      code: 'model-range',
      kind: 'temperature',
      temperatureK: 150,
      minK: MODEL_T_RANGE_K.min,
      maxK: MODEL_T_RANGE_K.max,
    });
    expect(describeProblem(e.problem)).toBe(
      'a fill at 150.00 K is outside the range the gas model is built for (200-600 K); ' +
        'check the temperature and its unit',
    );
  });

  it('gas in the tank at the final pressure is refused at in_tank.pressure', () => {
    const e = problemOf(() =>
      validatePlanInput({ ...workedInput(), inTank: { composition: { Ar: 1 }, pressurePa: 1000 * TORR } }),
    );
    expect(e.problem).toMatchObject({ code: 'design-conflict', kind: 'in-tank-at-final' });
    expect(e.where.field).toBe('in_tank.pressure');
    expect(describeProblem(e.problem)).toBe(
      'the tank already holds gas at or above the final pressure; evacuate it or raise the final pressure',
    );
  });
});
