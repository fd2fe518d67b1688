import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { frame80 } from './frame80.js';

// A band finer than the gauge's display step with no displayed value inside it: the fill screen says so
// before the reading. 1 psi = 6894.757 Pa (NIST SP 811, exact from the definitions); the demo's CH4 stop
// is about 10.01 Torr = 0.1936 psi with a band under 0.001 psi (computed below): on a 0.01 psi display no
// value lies inside it, the nearest (0.19 psi) reads below it.
const PSI = 6894.757293168361;

describe('a band with no displayed value inside it', () => {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, order: ['CH4', 'Ar', 'O2'] } });
  const h = headerFromPlan(planFill(req.input), req, 'p1', '2026-12-01T00:00:00Z');
  const setup = setupFromHeader(h);
  const g = setup.steps[0].gauge!;
  // the lab copy whose only gauge is a 100 psi absolute head showing 0.01 psi
  const psiGauge = { ...g, id: 'psi-100', unit: 'psi', resolutionPa: 0.01 * PSI, fullScalePa: 100 * PSI };
  const s0 = initialState({ ...setup, steps: setup.steps.map((x) => ({ ...x, gauge: psiGauge })) });

  it('the reading screen says no value the gauge shows is inside the band, the nearest and its side, within 80 x 24', () => {
    const target = s0.targetsPa[0] / PSI;
    const band = s0.setup.steps[0].bandPa / PSI;
    // the premise, computed: no multiple of 0.01 psi lies in the band, and 0.19 is the nearest, below it
    expect(Math.floor((target + band) * 100)).toBeLessThan(Math.ceil((target - band) * 100));
    expect(Math.round(target * 100) / 100).toBe(0.19);
    const f = frame80(s0);
    const flat = f.replace(/\n/g, ' ').replace(/[│ ]+/g, ' ');
    expect(flat).toMatch(/STOP AT 0\.19 psi/);
    expect(flat).toMatch(
      /finer than the display step 0\.01 psi .*! NO value psi-100 shows is inside the band/,
    );
    expect(flat).toMatch(
      /the nearest, 0\.19 psi, reads BELOW it and is logged outside it\. Use a finer gauge/,
    );
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  });
});
