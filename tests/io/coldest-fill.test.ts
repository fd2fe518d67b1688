// A fill made colder than the lab profile's coldest wetted temperature: the condensation check takes the
// colder of the two (the gas and the tank are at the fill temperature). n-heptane's vapour pressure at
// -15 degC from the Antoine equation, log10(P/mmHg) = 6.89385 - 1264.37 / (216.64 + t/degC) (constants from
// memory: NIST-type values for n-heptane): 4.20 Torr; the planner's Lee-Kesler estimate within 6 % of it.
import { describe, expect, it } from 'vitest';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planFill, type Finding } from '../../src/core/index.js';

type Condensation = Extract<Finding, { code: 'condensation' }>;

describe('a fill colder than the lab profile says', () => {
  it('n-C7H16 filled at -15 degC (profile coldest 18 degC): condensation judged at -15 degC', () => {
    const rs = readRecipe('recipes/nc7h16-o2-ar.yaml');
    const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, temperature: '-15 degC' } });
    expect(req.input.safety?.coldestK).toBeCloseTo(291.15, 9);
    const plan = planFill(req.input);
    const found = plan.findings.filter((f): f is Condensation => f.code === 'condensation');
    expect(found.length).toBeGreaterThan(0);
    const antoineTorr = 10 ** (6.89385 - 1264.37 / (216.64 - 15));
    for (const f of found) {
      expect(f.coldestK).toBeCloseTo(258.15, 9);
      expect(Math.abs(f.psatPa / (101325 / 760) - antoineTorr) / antoineTorr).toBeLessThan(0.06);
      expect(f.partialPa).toBeGreaterThan(0.5 * f.psatPa);
    }
    // at the profile's 18 degC the same partial pressure (about 3 Torr) is far below half of its ~37 Torr
    const warm = planFill(buildPlanRequest(rs).input);
    expect(warm.findings.some((f) => f.code === 'condensation')).toBe(false);
  });
});
