// The filled tank as it warms to the warmest temperature it reaches (tank-warms-past-limit): the same gas at
// constant density holds P2 = P1 T2 / T1 (Gay-Lussac's law, ideal gas; the virial terms of this 98 % Ar
// mixture change Z by < 2e-4 between 18 and 25 degC at 3.6 bar, so the check's tolerance is 0.1 %), against
// the tank's working limit (warning) and rating (danger). Standard ambient 298.15 K (IUPAC SATP) is the
// default warmest temperature (common practice for "room temperature").
import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction } from '../../src/io/plan-predict.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { planFill, type Finding, type PlanInput } from '../../src/core/index.js';
import { runCli } from '../helpers.js';

type Warm = Extract<Finding, { code: 'tank-warms-past-limit' }>;

function planAt(pressure: string, temperature: string, warmestK?: number) {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, pressure, temperature } });
  const input: PlanInput = warmestK ? { ...req.input, safety: { ...req.input.safety, warmestK } } : req.input;
  const plan = planWithPrediction(planFill(input), { ...req, input });
  return { plan, warm: plan.findings.find((f): f is Warm => f.code === 'tank-warms-past-limit') };
}

describe('the filled tank as it warms', () => {
  it('filled at 18 degC to 2680 Torr: at 25 degC above the working limit (warning), by Gay-Lussac within 0.1 %', () => {
    const { plan, warm } = planAt('2680 Torr', '18 degC');
    expect(warm).toBeDefined();
    expect(warm!.severity).toBe('warning');
    expect(warm!.assumed).toBe(true);
    expect(warm!.warmK).toBeCloseTo(298.15, 9);
    const last = plan.steps[plan.steps.length - 1];
    expect(warm!.pressurePa).toBeCloseTo(last.targetPa + last.bandPa, 6);
    const gayLussac = (warm!.pressurePa * 298.15) / 291.15;
    expect(Math.abs(warm!.warmPa - gayLussac) / gayLussac).toBeLessThan(1e-3);
    expect(warm!.warmPa).toBeGreaterThan(warm!.limitPa);
    expect(warm!.warmPa).toBeLessThan(warm!.ratedPa);
    // the highest band top that stays at the limit when warm: the same law, inverted
    expect(Math.abs(warm!.maxFillPa - (warm!.limitPa * 291.15) / 298.15) / warm!.maxFillPa).toBeLessThan(
      1e-3,
    );
    // the final pressure it says to plan below: planned 0.1 % under it, the warm check passes
    const torr = 101325 / 760;
    expect(planAt(`${((warm!.maxFinalPa * 0.999) / torr).toFixed(2)} Torr`, '18 degC').warm).toBeUndefined();
  });

  it('filled at -10 degC: warmed past the rating, a danger (stated beside tank-over-rating)', () => {
    const { plan, warm } = planAt('2690 Torr', '-10 degC');
    expect(warm?.severity).toBe('danger');
    expect(warm!.warmPa).toBeGreaterThan(warm!.ratedPa);
    expect(plan.findings.some((f) => f.code === 'tank-over-rating')).toBe(true);
  });

  it('no finding at or above the warmest temperature, nor far from the limit', () => {
    expect(planAt('1500 Torr', '25 degC').warm).toBeUndefined();
    expect(planAt('2600 Torr', '25 degC').warm).toBeUndefined();
    // 2500 Torr at 18 degC warms to about 2560 Torr: below the 2700 Torr limit
    expect(planAt('2500 Torr', '18 degC').warm).toBeUndefined();
  });

  it("the lab profile's warmest temperature is used where given (30 degC: 2660 Torr filled at 25 degC passes the limit)", () => {
    const { warm } = planAt('2660 Torr', '25 degC', 303.15);
    expect(planAt('2660 Torr', '25 degC').warm).toBeUndefined();
    expect(warm?.assumed).toBe(false);
    const gayLussac = (warm!.pressurePa * 303.15) / 298.15;
    expect(Math.abs(warm!.warmPa - gayLussac) / gayLussac).toBeLessThan(1e-3);
  });

  it('the lab profile takes `warmest`; the plan text says what it found and what to do', async () => {
    const r = await runCli([
      'plan',
      'recipes/ch4-o2-ar-phi1.yaml',
      ...['--pressure', '2680 Torr', '--temperature', '18 degC'],
    ]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(
      /warning tank-warms-past-limit \(fill \d.*\): filled to 2693\.\d Torr .* at 291\.15 K \(18\.0 degC\), the tank warms to 298\.15 K \(25\.0 degC\) \(standard ambient: the lab profile gives no warmest temperature\) and holds 27\d\d\.\d Torr there, above the allowed working pressure 2700\.2 Torr/,
    );
    expect(r.stdout).toMatch(/keep the band's top at or below 26\d\d\.\d Torr/);
    // a lab profile with `warmest: 20 degC` (Gay-Lussac): filled to 2650 Torr at 18 degC, band top about
    // 2663 Torr, warmed to 20 degC 2663 x 293.15 / 291.15 = 2681 Torr, under the 2700 Torr limit
    const dir = mkdtempSync(join(tmpdir(), 'mw-warm-'));
    const lab = join(dir, 'lab.yaml');
    const cool = DEMO_LAB_YAML.replace('coldest: 18 degC', 'coldest: 18 degC\nwarmest: 20 degC');
    expect(cool).not.toBe(DEMO_LAB_YAML);
    writeFileSync(lab, cool);
    const at = ['--pressure', '2650 Torr', '--temperature', '18 degC'];
    const withLab = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--lab', lab, ...at]);
    expect(withLab.code).toBe(0);
    expect(withLab.stdout).not.toMatch(/tank-warms-past-limit/);
    // without it, standard ambient: 2663 x 298.15 / 291.15 = 2727 > 2700
    const without = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', ...at]);
    expect(without.stdout).toMatch(/warning tank-warms-past-limit/);
    rmSync(dir, { recursive: true });
  });
});
