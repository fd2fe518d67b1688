// Readings inside every printed band, taken together (a paper fill reads each later fill to its printed
// target): the plan's band-edges-past-tolerance finding against (1) a hand calculation for two fills
// (ideal gas, Dalton's law, first-order propagation: JCGM 100:2008 eq. 10 with the sensitivity
// coefficients written out; tolerance 1 % of the stack, the real-gas terms at 100 Torr being ~3e-4), and
// (2) the re-check itself (`check --recipe` of a CSV): readings anywhere inside the shared band it gives
// pass, and readings at the full band edges the worst way do not.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPlanRequest, readRecipe, validateRecipeObject } from '../../src/io/load.js';
import { planWithPrediction } from '../../src/io/plan-predict.js';
import { bandEdgeStacks, nominalOutputs, planFill, type Finding } from '../../src/core/index.js';
import { runCli } from '../helpers.js';
import { toleranceHeadline } from '../../src/report/headlines.js';

const TORR = 101325 / 760;

describe('readings at the band edges, taken together', () => {
  it('two fills (CH4 to P1, then Ar to P2 = 100 Torr): the stack of x(CH4) is b1 / P2 + b2 P1 / P2^2', () => {
    const recipe = validateRecipeObject(
      {
        id: 'two-fills',
        tank: 'MT-1',
        mixture: { fractions: { CH4: 0.1, Ar: 0.9 } },
        pressure: '100 Torr',
        temperature: '25 degC',
        tolerance: { relative: 0.01 },
      },
      'test',
      () => ({}),
    );
    const req = buildPlanRequest({ recipe, locate: () => ({}), baseDir: process.cwd(), origin: 'test' });
    const plan = planWithPrediction(planFill(req.input), req);
    expect(plan.steps.map((s) => s.source.mainSpecies)).toEqual(['CH4', 'Ar']);
    const [a, b] = plan.steps;
    const hand = a.bandPa / b.targetPa + (b.bandPa * a.targetPa) / b.targetPa ** 2;
    const row = bandEdgeStacks(plan, plan.predicted!)!.find((x) => x.r.name === 'CH4')!;
    expect(Math.abs(row.stack - hand) / hand).toBeLessThan(0.01);
    // each band alone is the fill's own tolerance: together they take x(CH4) past it
    expect(row.stack).toBeGreaterThan(row.r.tolerance - row.r.expandedU);
    const f = plan.findings.find((x) => x.code === 'band-edges-past-tolerance');
    expect(f).toBeDefined();
  });

  it('ch4-o2-ar-phi1 at 1.5 %: at the shared band the plan says, every way passes check; the full bands the worst way do not', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-bands-'));
    const src = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
    const text = (await import('node:fs')).readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8');
    expect(text).toMatch(/relative: 0\.005/);
    const recipeFile = join(dir, 'ch4-tol15.yaml');
    writeFileSync(recipeFile, text.replace('relative: 0.005', 'relative: 0.015'));
    const req = buildPlanRequest(readRecipe(recipeFile));
    const plan = planWithPrediction(planFill(req.input), req);
    expect(src.recipe.id).toBe(req.recipe.id);
    const f = plan.findings.find(
      (x): x is Extract<Finding, { code: 'band-edges-past-tolerance' }> =>
        x.code === 'band-edges-past-tolerance',
    );
    expect(f?.share).toBeGreaterThan(0);
    expect(f!.share).toBeLessThan(1);
    // the plan and the sheet say it under their first line, with the share
    const share = `${Number((f!.share * 100).toPrecision(2))} %`;
    expect(toleranceHeadline(plan, 'Torr', true).join(' ')).toContain(
      `read each fill within ${share} of its band`,
    );
    // the worst signs for the quantity named: each reading's own effect on it, from the model
    const { readings, settings, diluent, initial } = plan.predicted!.model;
    const out = (ps: readonly number[]) =>
      nominalOutputs(
        readings.map((r, i) => ({ ...r, pressurePa: ps[i] })),
        settings,
        diluent,
        initial,
      );
    const targets = plan.steps.map((s) => s.targetPa);
    const sign = plan.steps.map((s, i) => {
      const up = out(targets.map((t, j) => (j === i ? t + s.bandPa : t)));
      const down = out(targets.map((t, j) => (j === i ? t - s.bandPa : t)));
      return Math.sign(up[f!.species] - down[f!.species]) || 1;
    });
    const csv = (ps: readonly number[]) =>
      'species,pressure,temperature,gauge\n' +
      plan.steps
        .map((s, i) => `${s.source.mainSpecies},${(ps[i] / TORR).toFixed(6)} Torr,25.0 degC,${s.gauge!.id}`)
        .join('\n') +
      '\n';
    const check = async (ps: readonly number[], name: string) => {
      const file = join(dir, `${name}.csv`);
      writeFileSync(file, csv(ps));
      return (await runCli(['check', file, '--recipe', recipeFile])).code;
    };
    // exactly the share the plan says (a fresh-eyes trial found the computed share itself, unmargined and
    // rounded up in print, NOT SHOWN the worst way: the share said carries a margin and is rounded down)
    const within = f!.share;
    const patterns: Record<string, number[]> = {
      worst: sign,
      opposite: sign.map((x) => -x),
      up: sign.map(() => 1),
      down: sign.map(() => -1),
      alternating: sign.map((_, i) => (i % 2 ? 1 : -1)),
    };
    for (const [name, sg] of Object.entries(patterns)) {
      const ps = plan.steps.map((s, i) => s.targetPa + sg[i] * within * s.bandPa);
      expect([name, await check(ps, name)]).toEqual([name, 0]);
    }
    // the finding's premise: the full bands, the worst way, do not make a pass (exit 4 fail or 7 not shown)
    const edges = plan.steps.map((s, i) => s.targetPa + sign[i] * s.bandPa);
    expect(await check(edges, 'edges')).not.toBe(0);
    rmSync(dir, { recursive: true });
  }, 180_000);
});
