import { describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { buildPlanRequest, loadLab, parseBlend, readRecipe } from '../../src/io/load.js';
import { planFill } from '../../src/core/index.js';

describe('recipe and lab files', () => {
  it('the embedded demo lab loads: tanks, gauges, cylinders with their purities', () => {
    const lab = loadLab();
    expect(lab.tanks.map((t) => t.id)).toEqual(['MT-1', 'MT-2']);
    expect(lab.gauges.length).toBe(4);
    expect(lab.cylinders.find((c) => c.id === 'cyl-CH4')?.composition.CH4).toBe(0.99995);
    expect(lab.barometricPa).toBe(101325);
  });

  for (const f of readdirSync('recipes').filter((n) => n.endsWith('.yaml'))) {
    // the natural-gas/air batch is itself flammable, and with no detonation limits in air on
    // file the conservative rule counts it detonable (its reflected pressure is above MT-2's
    // working limit): that danger, and only that one, stands; the others plan clean
    const expected = f === 'ng-blend-air.yaml' ? ['detonable-state'] : [];
    it(`demo recipe ${f} loads and plans with dangers ${JSON.stringify(expected)} only`, () => {
      const req = buildPlanRequest(readRecipe(`recipes/${f}`));
      const plan = planFill(req.input);
      expect(plan.steps.length).toBeGreaterThan(1);
      expect(plan.findings.filter((x) => x.severity === 'danger').map((x) => x.code)).toEqual(expected);
    });
  }

  it('blends: one species, a list and a map; air from the lab profile', () => {
    expect(parseBlend('Ar', {})).toEqual({ Ar: 1 });
    expect(parseBlend('Ar:0.5, He:0.5', {})).toEqual({ Ar: 0.5, He: 0.5 });
    expect(parseBlend({ methane: 1 }, {})).toEqual({ CH4: 1 });
    expect(parseBlend('air', {}, { O2: 0.2095, N2: 0.7905 })).toEqual({ O2: 0.2095, N2: 0.7905 });
  });
});

describe('embedded demo lab', () => {
  it('the pre-parsed profile equals its YAML text (what `mixwright demo-lab` prints)', async () => {
    const { parse } = await import('yaml');
    const { DEMO_LAB_DATA, DEMO_LAB_YAML } = await import('../../src/io/demo-lab.js');
    expect(DEMO_LAB_DATA).toEqual(parse(DEMO_LAB_YAML));
  });
});
