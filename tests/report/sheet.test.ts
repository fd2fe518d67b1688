import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { blendLimits, diagramPoint, envelopePolygon, planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { buildSheetModel } from '../../src/report/sheet-model.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../../src/report/sheet-render.js';
import { diagramData, ternaryXY } from '../../src/report/diagram.js';
import { findChromium } from '../../src/io/pdf.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { runCli } from '../helpers.js';

function demoSheet(recipe = 'recipes/ch4-o2-ar-phi1.yaml', paper: 'a4' | 'letter' = 'a4') {
  const req = buildPlanRequest(readRecipe(recipe));
  const plan = planFill(req.input);
  return {
    plan,
    model: buildSheetModel(plan, {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: req.orderRecommended,
      unit: 'Torr',
      batchId: 'demo-001',
      version: 'test',
      paper,
    }),
  };
}

describe('diagram geometry', () => {
  it('vertices: inert (0,0), O2 (1,0), fuel (1/2, sqrt(3)/2); a point sits at x = o + f/2, y = f sqrt(3)/2', () => {
    expect(ternaryXY(0, 0)).toEqual({ x: 0, y: 0 });
    expect(ternaryXY(0, 1)).toEqual({ x: 1, y: 0 });
    const top = ternaryXY(1, 0);
    expect(top.x).toBeCloseTo(0.5, 15);
    expect(top.y).toBeCloseTo(Math.sqrt(3) / 2, 15);
    const c = ternaryXY(1 / 3, 1 / 3);
    expect(c.x).toBeCloseTo(0.5, 15);
    expect(c.y).toBeCloseTo(Math.sqrt(3) / 6, 15); // the centroid
  });

  it('the flammable zone meets the air line at the LFL and UFL the safety review uses', () => {
    const { plan } = demoSheet();
    const d = diagramData(plan)!;
    const fuel = diagramPoint(plan.steps[2].compositionAfter).fuelBlend;
    const limits = blendLimits(fuel, plan.temperatureK, plan.final.pressurePa);
    const env = envelopePolygon(limits);
    expect(d.envelope).toEqual(env);
    // the two envelope vertices on the air line o = 0.21 (1 - f)
    const onAir = env.filter(([f, o]) => Math.abs(o - 0.21 * (1 - f)) < 1e-12).map(([f]) => f);
    expect(onAir).toEqual([limits.lfl, limits.ufl]);
    expect(d.lfl).toBe(limits.lfl);
  });

  it('the fill path has one point per tank state, at its N2-equivalent coordinates', () => {
    const { plan } = demoSheet();
    const d = diagramData(plan)!;
    // one point per fill (the demo's recommended sequence splits the Ar charge: four fills)
    expect(d.path.map((p) => p.label)).toEqual(plan.steps.map((s) => String(s.index)));
    const p3 = diagramPoint(plan.steps[2].compositionAfter).point;
    expect(d.path[2].fuel).toBe(p3.fuel);
    expect(d.path[2].oxygen).toBe(p3.oxygen);
  });
});

describe('renderings of the demo sheet', () => {
  it('Markdown snapshot', () => {
    expect(sheetToMarkdown(demoSheet().model)).toMatchSnapshot();
  });
  it('plain-text snapshot', () => {
    expect(sheetToText(demoSheet().model)).toMatchSnapshot();
  });
  it('HTML is self-contained: inline CSS and SVG, no external references', () => {
    const html = sheetToHtml(demoSheet().model);
    expect(html).toContain('<style>');
    expect(html).toContain('<svg');
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    expect(html).not.toMatch(/<link /);
    expect(html).toContain('@page { size: A4');
    expect(sheetToHtml(demoSheet(undefined, 'letter').model)).toContain('@page { size: letter');
  });
  it('a plan with a danger finding carries the banner', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const plan = planFill({ ...req.input, finalPressurePa: 3.8e5 });
    const m = buildSheetModel(plan, {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: true,
      unit: 'Torr',
      batchId: 'x',
      version: 'test',
      paper: 'a4',
    });
    expect(sheetToText(m)).toContain('*** DANGER findings stand');
  });

  it("a fill's own warning is on its row (html, md, text), not only in the findings at the end", () => {
    // O2 first, then Ar onto it: the review warns of the compression of oxygen at fill 2
    // (safety.test.ts checks the temperature against its reference); the sheet must say it at fill 2
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const by = (k: string) => req.input.sources.find((s) => s.mainSpecies === k)!;
    const plan = planFill({ ...req.input, order: 'given', sources: [by('O2'), by('Ar'), by('CH4')] });
    const m = buildSheetModel(plan, {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: false,
      unit: 'Torr',
      batchId: 'x',
      version: 'test',
      paper: 'a4',
    });
    const own = plan.findings.filter((f) => f.step !== undefined && f.severity !== 'note');
    expect(own.map((f) => [f.code, f.step])).toContainEqual(['oxygen-compression', 2]);
    for (const f of own) {
      const row = m.rows.find((r) => r.n === f.step)!;
      expect(row.cautions.map((c) => c.code)).toContain(f.code);
    }
    // the other rows carry none of it
    expect(m.rows.filter((r) => r.n !== 2).flatMap((r) => r.cautions.map((c) => c.code))).not.toContain(
      'oxygen-compression',
    );
    const html = sheetToHtml(m);
    const at = html.indexOf('Fill 2: WARNING oxygen-compression: this fill compresses oxygen-rich gas');
    // above fill 2's own row, after fill 1's
    expect(at).toBeGreaterThan(html.indexOf('<tr><td>1</td>'));
    expect(at).toBeLessThan(html.indexOf('<tr><td>2</td>'));
    expect(html.slice(at, html.indexOf('</tr>', at))).toContain('throttle this fill');
    expect(sheetToMarkdown(m)).toMatch(
      /\| \| \*\*fill 2: WARNING oxygen-compression:\*\* this fill compresses/,
    );
    expect(sheetToText(m)).toContain('  >> fill 2: WARNING oxygen-compression: this fill compresses');
  });
});

describe('mixwright sheet', () => {
  it('writes a file atomically and refuses to overwrite it without --force (exit 2)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const f = join(dir, 'fill.md');
    expect(
      (await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'md', '-o', f, '--batch', 'b1']))
        .code,
    ).toBe(0);
    const first = readFileSync(f, 'utf8');
    const again = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'md', '-o', f]);
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('add --force');
    expect(readFileSync(f, 'utf8')).toBe(first);
    expect(
      (await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'txt', '-o', f, '--force'])).code,
    ).toBe(0);
  });
  it('the printed sheet carries the diffusion mixing estimate of the lab tank', async () => {
    // the demo's tanks are both stirred (MT-1 has a magnetic stirrer): an unstirred MT-1 in a copy of the profile
    const lab = join(mkdtempSync(join(tmpdir(), 'mw-unstirred-')), 'lab.yaml');
    const unstirred = DEMO_LAB_YAML.replace(/(id: MT-1\n(?: {4}.*\n)*? {4}stirred: )true/, '$1false');
    expect(unstirred).not.toBe(DEMO_LAB_YAML);
    writeFileSync(lab, unstirred);
    const args = ['--format', 'txt', '--batch', 'b2'];
    const r = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--lab', lab, ...args]);
    expect(r.stdout).toMatch(/Mixing: unstirred tank, diffusion alone: about \d+ min to 1 %/);
    const m = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', ...args]);
    expect(m.stdout).toMatch(/Mixing: stirrer on ________ min \(diffusion alone/);
    const s = await runCli(['sheet', 'recipes/nc7h16-o2-ar.yaml', '--format', 'txt', '--batch', 'b3']);
    expect(s.stdout).toMatch(/Mixing: stirrer on ________ min \(diffusion alone/);
  });
  it('without Chromium on the PATH, --format pdf says how to print the HTML instead (exit 2)', () => {
    const r = spawnSync(
      process.execPath,
      [
        'dist/mixwright.mjs',
        'sheet',
        'recipes/ch4-o2-ar-phi1.yaml',
        '--format',
        'pdf',
        '-o',
        join(tmpdir(), 'x.pdf'),
      ],
      { encoding: 'utf8', env: { ...process.env, PATH: '/nonexistent' } },
    );
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--format html and print it from any browser');
  });
});

// the real-browser test: Chromium prints the HTML sheet, poppler reads the PDF back
const chromium = findChromium();
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const hasPoppler =
  spawnSync('sh', ['-c', 'command -v pdftotext && command -v pdftoppm'], { encoding: 'utf8' }).status === 0;
if (!chromium || !hasPoppler) {
  const msg = `the real-browser sheet test needs chromium and poppler-utils (apt-get install -y chromium poppler-utils); ${required ? 'required here' : 'skipped here'}`;
  console.warn(msg);
}
describe.runIf((chromium && hasPoppler) || required)('the HTML sheet in a real browser', () => {
  for (const paper of ['a4', 'letter'] as const) {
    it(`${paper}: prints to at most 2 pages, the step table whole on page 1, every word and the diagram inside the printable area`, () => {
      const out = 'artifacts';
      mkdirSync(out, { recursive: true });
      const pdf = join(out, `demo-sheet-${paper}.pdf`);
      const r = spawnSync(
        process.execPath,
        [
          'dist/mixwright.mjs',
          'sheet',
          'recipes/ch4-o2-ar-phi1.yaml',
          // the three-fill order the advice gives, whose readings the checks below name
          '--order',
          'CH4,Ar,O2',
          '--batch',
          'demo-001',
          '--format',
          'pdf',
          '--paper',
          paper,
          '-o',
          pdf,
          '--force',
        ],
        { encoding: 'utf8' },
      );
      expect(r.status, r.stderr).toBe(0);
      const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
      const pages = Number(/Pages:\s+(\d+)/.exec(info)![1]);
      expect(pages).toBeLessThanOrEqual(2);
      const [w, h] = /Page size:\s+([\d.]+) x ([\d.]+)/.exec(info)!.slice(1).map(Number);
      expect(Math.round(w)).toBe(paper === 'a4' ? 595 : 612);
      // word boxes per page: all inside the 12 mm margins (34 pt) less a little
      const bbox = join(out, `demo-sheet-${paper}.bbox.html`);
      execFileSync('pdftotext', ['-bbox', pdf, bbox]);
      const xml = readFileSync(bbox, 'utf8');
      const pageBlocks = xml.split('<page ').slice(1);
      const words = (i: number) =>
        [
          ...pageBlocks[i].matchAll(
            /<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g,
          ),
        ].map((m) => ({ x0: +m[1], y0: +m[2], x1: +m[3], y1: +m[4], t: m[5] }));
      for (let i = 0; i < pages; i++) {
        for (const wd of words(i)) {
          expect(wd.x0, wd.t).toBeGreaterThanOrEqual(30);
          expect(wd.x1, wd.t).toBeLessThanOrEqual(w - 30);
          expect(wd.y1, wd.t).toBeLessThanOrEqual(h - 30);
        }
      }
      const page1 = words(0).map((x) => x.t);
      for (const t of ['cyl-CH4', 'cyl-Ar', 'cyl-O2', '10.01', '1480.0', '1500.0', 'actual'])
        expect(page1, t).toContain(t);
      const all = pageBlocks.flatMap((_, i) => words(i).map((x) => x.t));
      expect(all).toContain('inert');
      expect(all).toContain('fuel');
      // a PNG of each page for a person to look at (git-ignored)
      execFileSync('pdftoppm', ['-png', '-r', '80', pdf, join(out, `demo-sheet-${paper}`)]);
      expect(existsSync(join(out, `demo-sheet-${paper}-1.png`))).toBe(true);
    });
  }
});
