// Readings inside every printed band, taken together, for each stage of a two-stage plan and for a batch
// planned from a premix log (band-edges-past-tolerance, as for a single tank: tests/io/band-edges.test.ts).
// Stage 1 (Ar to P1, then O2 onto it to P2) is checked against a hand calculation: x(O2) = 1 - P1 / P2
// (ideal gas, Dalton's law), first-order propagation of each reading at its band edge (JCGM 100:2008
// eq. 10, the sensitivity coefficients written out: dx/dP1 = -1 / P2, dx/dP2 = P1 / P2^2), worst way:
// sum of magnitudes. Tolerance 1 % of the stack (the real-gas terms of O2 and Ar at 2.5 bar move it ~1e-3).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planTwoStageFrom, twoStageInputOf } from '../../src/io/two-stage-request.js';
import { bandEdgeStacks, type Finding, type Plan } from '../../src/core/index.js';
import { runCli } from '../helpers.js';

type Edges = Extract<Finding, { code: 'band-edges-past-tolerance' }>;
const edgesOf = (p: Plan) => p.findings.find((x): x is Edges => x.code === 'band-edges-past-tolerance');

/** the demo recipe at 1.5 % relative tolerance (room beside U: the finding can be given), with a premix block */
function recipeAt15(dir: string, premix = ''): string {
  const text = readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8');
  expect(text).toMatch(/relative: 0\.005/);
  const file = join(dir, 'ch4-tol15.yaml');
  writeFileSync(file, text.replace('relative: 0.005', 'relative: 0.015') + premix);
  return file;
}

describe('readings at the band edges, taken together, in two stages', () => {
  it('each stage of --premix-tank carries its own finding; stage 1 against the hand stack of x(O2)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-bands2-'));
    const rs = readRecipe(recipeAt15(dir, '\npremix:\n  tank: MT-2\n'));
    const req = buildPlanRequest(rs);
    const two = twoStageInputOf(req, rs);
    expect(two).toBeDefined();
    const plan = planTwoStageFrom(two!, rs);
    const premix = plan.twoStage!.premix;
    // stage 1: Ar, then O2 onto it
    expect(premix.steps.map((s) => s.source.mainSpecies)).toEqual(['Ar', 'O2']);
    const [a, b] = premix.steps;
    const hand = a.bandPa / b.targetPa + (b.bandPa * a.targetPa) / b.targetPa ** 2;
    const row = bandEdgeStacks(premix, premix.predicted!)!.find((x) => x.r.name === 'O2')!;
    expect(Math.abs(row.stack - hand) / hand).toBeLessThan(0.01);
    const f1 = edgesOf(premix);
    expect(f1?.species).toBe('O2');
    expect(f1!.stack).toBeCloseTo(row.stack, 12);
    // the share said keeps every quantity inside its room (tolerance less U), with our 10 % margin
    expect(f1!.share * row.stack).toBeLessThanOrEqual(0.9 * (row.r.tolerance - row.r.expandedU));
    // stage 2 (the batch, the premix at its predicted composition) has its own, from its own model
    const f2 = edgesOf(plan);
    expect(f2).toBeDefined();
    const rows2 = bandEdgeStacks(plan, plan.predicted!)!;
    const worst2 = rows2.find((x) => x.r.name === f2!.species)!;
    expect(worst2.stack).toBeGreaterThan(worst2.room);
    expect(f2!.bands.map((x) => x.step)).toEqual(plan.steps.map((s) => s.index));
    rmSync(dir, { recursive: true });
  }, 180_000);

  it('the text names the batch (stage 2) in the headline above both stages, and stage 1 under its own line', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-bands2-'));
    const file = recipeAt15(dir);
    const r = await runCli(['plan', file, '--premix-tank', 'MT-2']);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toMatch(/^Two-stage preparation/);
    expect(lines[1]).toMatch(/^READINGS INSIDE EVERY BAND OF STAGE 2 \(THE BATCH\) CAN STILL FAIL TOGETHER/);
    const s1 = lines.findIndex((l) => l.startsWith('Fill plan') && l.includes('(stage 1: premix)'));
    expect(lines[s1 + 1]).toMatch(/^READINGS INSIDE EVERY BAND CAN STILL FAIL TOGETHER/);
    expect(r.stdout.match(/warning band-edges-past-tolerance/g)).toHaveLength(2);
    // a single-tank plan of the same recipe names no stage
    const single = await runCli(['plan', file]);
    expect(single.stdout.split('\n')[1]).toMatch(/^READINGS INSIDE EVERY BAND CAN STILL FAIL TOGETHER/);
    rmSync(dir, { recursive: true });
  }, 180_000);

  it('a batch planned from a premix log (--premix-log) carries it too', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-bands2-'));
    const file = recipeAt15(dir);
    const r = await runCli(['plan', file, '--premix-log', 'batches/demo-premix-o2-ar-mt2.jsonl', '--json']);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout) as { findings: { code: string; share?: number }[] };
    const f = json.findings.find((x) => x.code === 'band-edges-past-tolerance');
    expect(f?.share).toBeGreaterThan(0);
    expect(f!.share).toBeLessThan(1);
    rmSync(dir, { recursive: true });
  }, 180_000);

  it('check judges the mole fractions only: phi and the dilution neither set the share nor hold the finding back', () => {
    // verdict.ts judge(): pass or fail from the design mole fractions; phi and the dilution are shown only
    const run = (recipe: string, tank: string) => {
      const dir = mkdtempSync(join(tmpdir(), 'mw-bands2-'));
      const file = join(dir, 'r.yaml');
      writeFileSync(file, readFileSync(recipe, 'utf8') + `\npremix:\n  tank: ${tank}\n`);
      const rs = readRecipe(file);
      const plan = planTwoStageFrom(twoStageInputOf(buildPlanRequest(rs), rs)!, rs);
      rmSync(dir, { recursive: true });
      const rows = bandEdgeStacks(plan, plan.predicted!)!;
      return { f: edgesOf(plan), rows, phi: rows.find((x) => x.r.kind === 'phi')! };
    };
    // nc7h16-o2-ar in two stages: phi's U (0.53 %) is past the relative tolerance (0.5 %), every fraction has room
    const n = run('recipes/nc7h16-o2-ar.yaml', 'MT-1');
    expect(n.phi.r.expandedU).toBeGreaterThan(n.phi.r.tolerance);
    expect(n.f).toBeDefined();
    for (const x of n.rows.filter((r) => r.r.kind === 'fraction'))
      expect(n.f!.share * x.stack).toBeLessThanOrEqual(0.9 * x.room * (1 + 1e-12));
    // c2h4-o2-ar-phi05 in two stages: phi's stack would narrow the share (to a few %); the share is the fractions'
    const c = run('recipes/c2h4-o2-ar-phi05.yaml', 'MT-1');
    expect(c.f).toBeDefined();
    expect(['C2H4', 'O2', 'Ar']).toContain(c.f!.species);
    expect(c.f!.share * c.phi.stack).toBeGreaterThan(c.phi.room);
    const fractions = c.rows.filter((r) => r.r.kind === 'fraction' && r.stack > 0);
    const exact = 0.9 * Math.min(...fractions.map((x) => x.room / x.stack));
    // rounded down to two significant digits, as printed
    expect(c.f!.share).toBeLessThanOrEqual(exact);
    expect(c.f!.share).toBeGreaterThan(exact * 0.9);
  }, 180_000);

  it('a shared half-width at most half a display step is named: no reading from the sheet can keep to it', async () => {
    // the demo recipe in two stages (MT-2), tolerance 0.5 %: the batch's fill 1 (CH4, about 10 Torr on head-1kT,
    // display step 0.01 Torr in the demo lab) gets a shared half-width of a few thousandths of a Torr
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--premix-tank', 'MT-2', '--json']);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout) as {
      findings: {
        code: string;
        bands?: {
          step: number;
          half_width_Pa: number;
          gauge?: string;
          display_step_Pa?: number;
          finer_than_display: boolean;
        }[];
      }[];
    };
    const f = json.findings.find((x) => x.code === 'band-edges-past-tolerance')!;
    const TORR = 101325 / 760;
    for (const b of f.bands!) {
      expect(b.finer_than_display).toBe(
        b.display_step_Pa !== undefined && b.half_width_Pa <= b.display_step_Pa / 2,
      );
    }
    const one = f.bands!.find((b) => b.step === 1)!;
    expect(one.gauge).toBe('head-1kT');
    expect(one.display_step_Pa! / TORR).toBeCloseTo(0.01, 9);
    expect(one.finer_than_display).toBe(true);
    const text = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--premix-tank', 'MT-2']);
    expect(text.stdout.split('\n')[1]).toMatch(
      /finer than the gauge displays for fill 1: fill with the guided fill/,
    );
    expect(text.stdout).toMatch(/fill 1's is finer than head-1kT displays \(step 0\.01\d* Torr\)/);
    // the sheet says the same of its shared-band cell and note: never "only X reads inside it" there
    const sheet = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--premix-tank',
      'MT-2',
      '--format',
      'md',
    ]);
    const stage2 = sheet.stdout.slice(sheet.stdout.lastIndexOf('Stage 2 of 2'));
    const row1 = stage2.split('\n').find((l) => /^\| 1 \| \*\*CH4\*\*/.test(l))!;
    expect(row1).toMatch(/finer than the display step 0\.01: guided fill only/);
    expect(row1).not.toMatch(/reads inside it/);
    expect(stage2).toMatch(
      /Fill 1: finer than the gauge displays, no reading from this sheet can keep to it/,
    );
  }, 180_000);
});
