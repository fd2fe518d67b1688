// The fill sheet where readings inside every band can fail together (band-edges-past-tolerance): the
// Fills table carries each fill's shared band, the finding's own half-width about the same reading,
// rounded inward at the gauge's display step as the band is (md, txt, html); and no such column where
// the finding does not fire. Against a hand rounding of the finding's numbers (the finding's message
// gives fill 1 +-0.0150187 Torr about the target 10.01276 Torr: 9.99774 - 10.02778 Torr, inward at
// head-1kT's 0.01 Torr step: 10.00 - 10.02).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { planFill, type Finding, type Plan } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction } from '../../src/io/plan-predict.js';
import { buildSheetModel } from '../../src/report/sheet-model.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../../src/report/sheet-render.js';
import { fromPa } from '../../src/report/units.js';
import { runCli, TORR } from '../helpers.js';

type BandEdges = Extract<Finding, { code: 'band-edges-past-tolerance' }>;

/** the demo recipe at a tolerance, as a file (its own tolerance is 0.005) */
function recipeAt(relative: string): string {
  const text = readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8');
  expect(text).toMatch(/relative: 0\.005/);
  const file = join(mkdtempSync(join(tmpdir(), 'mw-shared-')), `ch4-tol-${relative}.yaml`);
  writeFileSync(file, text.replace('relative: 0.005', `relative: ${relative}`));
  return file;
}

function planOf(file: string): Plan {
  const req = buildPlanRequest(readRecipe(file));
  return planWithPrediction(planFill(req.input), req);
}

const modelOf = (plan: Plan) =>
  buildSheetModel(plan, {
    recipe: { id: 'shared', title: 'CH4 test' },
    labName: 'demo',
    orderRecommended: true,
    unit: 'Torr',
    batchId: 'b1',
    version: 'test',
    paper: 'a4',
  });

const edgesOf = (plan: Plan) =>
  plan.findings.find((f): f is BandEdges => f.code === 'band-edges-past-tolerance');

describe('the shared band on the fill sheet', () => {
  const plan = planOf(recipeAt('0.015'));
  const f = edgesOf(plan)!;
  const model = modelOf(plan);

  it("every fill's shared band lies inside the finding's half-width about its reading, at most a display step in", () => {
    expect(f).toBeDefined();
    expect(f.bands.map((b) => b.step)).toEqual(plan.steps.map((s) => s.index));
    model.rows.forEach((r, i) => {
      const s = plan.steps[i];
      const g = s.gauge!;
      expect(g.unit).toBe('Torr');
      const half = f.bands[i].halfWidthPa;
      const [low, high] = r.shared!.split(' - ').map(Number);
      const lo = fromPa(g.readingPa - half, 'Torr');
      const hi = fromPa(g.readingPa + half, 'Torr');
      const step = fromPa(g.resolutionPa, 'Torr');
      // inside the shared band (never wider than the finding), and no more than a display step narrower
      expect(low).toBeGreaterThanOrEqual(lo);
      expect(high).toBeLessThanOrEqual(hi);
      expect(low - lo).toBeLessThanOrEqual(step * (1 + 1e-9));
      expect(hi - high).toBeLessThanOrEqual(step * (1 + 1e-9));
      // narrower than the fill's own band
      const [bLow, bHigh] = r.band.split(' - ').map(Number);
      expect(high - low).toBeLessThan(bHigh - bLow);
    });
    // the hand rounding of fill 1 (header comment); half-width 0.0150187 Torr as the finding says
    expect(f.bands[0].halfWidthPa / TORR).toBeCloseTo(0.0150187, 6);
    expect(model.rows[0].shared).toBe('10.00 - 10.02');
    expect(model.sharedNote).toContain(`${Math.round(f.share * 100)} % of each fill's band`);
  });

  it('md, txt and html print it as a column of the Fills table, with what it is under the table', () => {
    const md = sheetToMarkdown(model);
    expect(md).toContain('| # | gas / cylinder | gauge | target | band | shared band | actual reading |');
    expect(md).toMatch(
      /^\| 1 \| \*\*CH4\*\* .*\| 9\.87 – 10\.16 \| \*\*10\.00 – 10\.02\*\* \| \| \| \| \[ \] \|$/m,
    );
    // every row of the Fills table has the cells of its header (the rows up to the blank line after it)
    const lines0 = md.split('\n');
    const at = lines0.findIndex((l) => l.includes('| shared band |'));
    const rows = lines0.slice(at, at + lines0.slice(at).indexOf(''));
    const cells = (l: string) => l.replace(/\\\|/g, '').split('|').length;
    expect(rows.length).toBeGreaterThan(6);
    for (const l of rows) expect(cells(l)).toBe(cells(rows[0]));
    expect(md).toContain(model.sharedNote);

    const txt = sheetToText(model);
    const lines = txt.split('\n');
    expect(lines.filter((l) => l.length > 80)).toEqual([]);
    expect(lines.find((l) => /^ {2}#/.test(l))).toMatch(/band +shared band$/);
    expect(lines.find((l) => /^ {2}1 {2}CH4/.test(l))).toMatch(/9\.87-10\.16 +10\.00-10\.02$/);
    expect(txt.replace(/\n +/g, ' ')).toContain(model.sharedNote);

    const html = sheetToHtml(model);
    expect(html).toContain('<th>band</th><th>shared band</th><th>actual reading</th>');
    expect(html).toContain('<td class="band shared">10.00 &ndash; 10.02</td>');
    // the rows that span the table span its ten columns (a note under a fill: all but the first)
    expect(html).not.toMatch(/colspan="8"/);
    expect(html).toContain('<td colspan="10">Before fill 1:');
    expect(html).toContain('<td></td><td colspan="9">Ar, charge 1 of 2 - stop at 480.81 Torr');
  });

  it('no shared band where the finding does not fire', () => {
    // the demo recipe as it is (0.5 %): its U alone is over the tolerance, so no share of the bands helps
    const over = planOf('recipes/ch4-o2-ar-phi1.yaml');
    expect(edgesOf(over)).toBeUndefined();
    // and this plan with the finding taken out: the sheet follows the finding, nothing else
    const without = {
      ...plan,
      findings: plan.findings.filter((x) => x.code !== 'band-edges-past-tolerance'),
    };
    for (const p of [over, without]) {
      const m = modelOf(p);
      expect(m.rows.every((r) => r.shared === undefined && r.sharedNoneInside === undefined)).toBe(true);
      expect(m.sharedNote).toBeUndefined();
      for (const out of [sheetToMarkdown(m), sheetToText(m), sheetToHtml(m)])
        expect(out.toLowerCase()).not.toContain('shared band');
    }
  });
});

describe('mixwright sheet', () => {
  it('the shared band from the command line (txt), where `plan` says to read within a share of each band', async () => {
    const file = recipeAt('0.015');
    const plan = await runCli(['plan', file]);
    expect(plan.stdout).toContain('READINGS INSIDE EVERY BAND CAN STILL FAIL TOGETHER');
    const r = await runCli(['sheet', file, '--format', 'txt', '--batch', 'b1']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^ {2}1 {2}CH4 .* 9\.87-10\.16 +10\.00-10\.02$/m);
    expect(r.stdout).toMatch(/^ {2}4 {2}Ar 2\/2 .* 1477\.6-1522\.4 +1497\.8-1502\.2$/m);
    expect(r.stdout.replace(/\n +/g, ' ')).toContain(
      'read each fill within 10 % of its band (its shared band, a column of the Fills table)',
    );
  });

  it("carries the plan's two-stage proposal (the remedy of a plan that cannot meet its tolerance)", async () => {
    const plan = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--json']);
    const proposal = (JSON.parse(plan.stdout) as { two_stage_proposal: { message: string } | null })
      .two_stage_proposal;
    expect(proposal?.message).toMatch(/^a premix of .* --premix-tank MT-2$/);
    const md = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'md', '--batch', 'b1']);
    expect(md.stdout).toContain(`- **note** two-stage-proposed (batch): ${proposal!.message}`);
    // the headline names it beside the cause
    expect(md.stdout).toMatch(
      /CANNOT MEET ITS TOLERANCE.*A premix in another tank first .*two-stage-proposed/,
    );
    // a two-stage sheet proposes none (it is the premix plan already)
    const two = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--premix-tank',
      'MT-2',
      '--format',
      'md',
    ]);
    expect(two.stdout).not.toContain('two-stage-proposed');
  });
});
