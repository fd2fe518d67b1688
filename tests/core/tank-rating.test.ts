// The tank's rating (its maximum allowed working pressure) against the plan: a final pressure above it,
// or a reading band whose top passes it, is refused (never planned with a danger finding); between the
// working limit (rating x working fraction) and the rating the plan is made with the tank-over-rating
// danger, as the guided fill makes a reading past the working limit a danger to vent from or accept.
// Our rule, after common practice (a pressure vessel is never filled past its rating); the numbers are
// exact arithmetic on the plan's own band (tolerance 0 unless said).
import { describe, expect, it } from 'vitest';
import { describeProblem, planFill, planTwoStage } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { refusal, workedInput } from './planner-input.js';
import { TORR } from '../helpers.js';

// the worked vector: CH4, O2, Ar to 1000 Torr in a 10 L tank
const input = workedInput();
const rated = (ratedPressurePa: number, workingFraction = 1) => ({
  ...input,
  tank: { ...input.tank, ratedPressurePa, workingFraction },
});

describe('a final pressure above the tank rating is refused, not planned', () => {
  it('above the rating: design-conflict above-rating at the final pressure, with what, why and what to do', () => {
    const r = refusal(() => planFill(rated(900 * TORR, 0.9)));
    expect(r.field).toBe('pressure');
    expect(r.problem).toMatchObject({
      code: 'design-conflict',
      kind: 'above-rating',
      what: 'final',
      tank: 'T',
      pressurePa: 1000 * TORR,
      ratedPa: 900 * TORR,
      workingLimitPa: expect.closeTo(810 * TORR, 6),
    });
    // the same refusal from the first stage, before any fill is worked out
    expect(refusal(() => validatePlanInput(rated(900 * TORR))).problem).toMatchObject({
      kind: 'above-rating',
    });
    const words = describeProblem(r.problem);
    expect(words).toContain('the final pressure, 133322 Pa (1000 Torr), is above the rating of tank T');
    expect(words).toContain('a tank is never filled past its rating');
    expect(words).toContain(
      'lower the final pressure (or the number of experiments that sets it) to at most',
    );
    expect(words).toContain('or use a tank rated for it');
    expect(words).toContain('the working limit (rating x working fraction), 107991 Pa (810 Torr)');
  });

  it('the last band reaching past the rating is refused too; a rating above the band top plans', () => {
    const free = planFill(rated(2000 * TORR));
    const last = free.steps[free.steps.length - 1];
    const top = last.targetPa + last.bandPa;
    // a rating between the final pressure and the top of its band: a reading inside the band would pass it
    const r = refusal(() => planFill(rated(last.targetPa + last.bandPa / 2)));
    expect(r.field).toBe('pressure');
    expect(r.problem).toMatchObject({ kind: 'above-rating', pressurePa: last.targetPa, bandPa: last.bandPa });
    const words = describeProblem(r.problem);
    expect(words).toContain('but a reading inside its band');
    expect(words).toContain('above it');
    // a rating just above the band's top: planned, with no tank-over-rating (working fraction 1)
    const held = planFill(rated(top * (1 + 1e-9)));
    expect(held.findings.some((f) => f.code === 'tank-over-rating')).toBe(false);
    expect(held.steps[held.steps.length - 1].targetPa).toBe(last.targetPa);
  });

  it('between the working limit and the rating: planned, with the tank-over-rating danger (unchanged)', () => {
    // rated 1200 Torr, working fraction 0.8: limit 960 Torr, below the final 1000 Torr
    const plan = planFill(rated(1200 * TORR, 0.8));
    const over = plan.findings.filter((f) => f.code === 'tank-over-rating');
    expect(over.map((f) => f.severity)).toEqual(['danger']);
    expect(over[0]).toMatchObject({ step: 3, limitPa: 960 * TORR, ratedPa: 1200 * TORR });
  });

  it('a premix pressure above the premix tank rating is refused at premix.pressure (two stages)', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const mt2 = req.lab.tanks.find((t) => t.id === 'MT-2')!;
    // MT-2 is rated 7 bar (5250.4 Torr), working fraction 0.9; the demo lab's thermometer
    const thermometer = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };
    const r = refusal(() =>
      planTwoStage({ batch: req.input, premixTank: mt2, thermometer, premixPressurePa: 6000 * TORR }),
    );
    expect(r.field).toBe('premix.pressure');
    expect(r.problem).toMatchObject({
      code: 'design-conflict',
      kind: 'above-rating',
      what: 'premix',
      tank: 'MT-2',
      ratedPa: 7e5,
    });
    expect(describeProblem(r.problem)).toContain(
      'lower the premix pressure of tank MT-2 to at most 700000 Pa',
    );
  });
});
