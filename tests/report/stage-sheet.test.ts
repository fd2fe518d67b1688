// the sheets of a two-stage preparation and of a batch drawn from a premix log: the premix tank's
// reading as a row of the Fills table (gauge, minimum, tick box), the premix one gas a line, and the
// stage-1 page's mixing time with what it was computed on.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  gaugeTopAbsolutePa,
  mixingEstimate,
  premixDelivery,
  premixStartForEndPa,
  type Plan,
} from '../../src/core/index.js';
import { planFrom } from '../../src/cli/plan-from.js';
import { findChromium } from '../../src/io/pdf.js';
import { duration } from '../../src/report/ready-report.js';
import { buildSheetModel, type SheetModel } from '../../src/report/sheet-model.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../../src/report/sheet-render.js';
import { stageSheets } from '../../src/report/two-stage-sheet.js';
import { TORR } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const PREMIX_LOG = 'batches/demo-premix-o2-ar-mt2.jsonl';

function sheetsOf(extra: Record<string, string>): { plan: Plan; sheets: SheetModel[] } {
  const { plan, req, unit, meta } = planFrom(RECIPE, extra);
  const sheets = stageSheets(
    plan,
    {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: req.orderRecommended,
      unit,
      batchId: 'b1',
      version: 'test',
      paper: 'a4',
      lab: { gauges: req.input.gauges, reading: req.input.reading, tanks: req.lab.tanks },
      barometer: meta.barometer,
    },
    buildSheetModel,
  );
  return { plan, sheets };
}

const two = sheetsOf({ premixTank: 'MT-2' });
const fromLog = sheetsOf({ premixLog: PREMIX_LOG });

describe("the premix tank's reading is a row of the stage-2 Fills table", () => {
  for (const [name, { plan, sheets }] of [
    ['two-stage plan', two],
    ['premix log', fromLog],
  ] as const) {
    it(`${name}: a check row above the premix fill, on a gauge that covers it, with a minimum on the safe side`, () => {
      const sheet = sheets[sheets.length - 1];
      const premixFill = plan.steps.find((s) => s.source.id === 'premix-MT-2')!;
      const withCheck = sheet.rows.filter((r) => r.check);
      expect(withCheck.map((r) => r.n)).toEqual([premixFill.index]);
      const c = withCheck[0].check!;
      expect(c.what).toBe('Premix tank MT-2');
      expect(c.when).toBe(`before fill ${premixFill.index}`);
      // the premix tank reads about 1841-1891 Torr: only the 10 000 Torr head covers it (1000 Torr head: too low)
      expect(c.gauge).toBe('head-10kT');
      expect(c.unit).toBe('Torr');
      const d = plan.twoStage?.delivery ?? plan.premixLog!.delivery;
      const composition = (plan.twoStage?.source ?? plan.premixLog!.source).composition;
      expect(Number(c.planned)).toBeCloseTo(d.startPa / TORR, 1);
      // the minimum, to the head's 0.1 Torr step: delivering the batch's premix from it ends at or above the
      // required pressure (target + 10 %), and one display step below it ends under it (premixDelivery,
      // checked against CoolProp in tests/core/premix-tank.test.ts)
      const deliver = (startPa: number) =>
        premixDelivery({
          composition,
          volumeM3: 0.0302,
          temperatureK: plan.temperatureK,
          startPa,
          deliveredMol: d.deliveredMol,
        }).endPa;
      const min = Number(c.minimum) * TORR;
      expect(deliver(min)).toBeGreaterThanOrEqual(d.requiredPa);
      expect(deliver(min - 0.1 * TORR)).toBeLessThan(d.requiredPa);
      expect(min / TORR - 0.1).toBeLessThan(
        premixStartForEndPa({
          composition,
          volumeM3: 0.0302,
          temperatureK: plan.temperatureK,
          endPa: d.requiredPa,
          deliveredMol: d.deliveredMol,
        }) / TORR,
      );
      // the demo: 572.30 Torr required after 0.0802 mol from 30.2 L, about 49.4 Torr more before (n R T / V)
      expect(c.minimum).toBe('621.7');
      expect(c.note).toContain(`at least 621.7 Torr`);
      expect(c.note).toContain('572.30 Torr');
      expect(c.note).toMatch(/do not fill from it/);
    });

    it(`${name}: every format prints the check row in the table, with a tick box, before the premix fill`, () => {
      const sheet = sheets[sheets.length - 1];
      const txt = sheetToText(sheet);
      const rows = txt.split('\n');
      const check = rows.findIndex((l) =>
        /^ {5}check +MT-2 +head-10kT +>= 621\.7 Torr +plan 18\d\d\.\d$/.test(l),
      );
      const fill3 = rows.findIndex((l) => /^ {2}3 +Ar\+O2 +premix-MT-2 +head-1kT/.test(l));
      const fill2 = rows.findIndex((l) => /^ {2}2 +Ar 1\/2/.test(l));
      expect(check, txt).toBeGreaterThan(fill2);
      expect(fill3).toBeGreaterThan(check);
      // its blanks and tick box on the line under it, as under every fill row
      expect(rows[check + 1]).toMatch(/^ {5}actual _+ {3}time _+ {3}init _+ {3}done \[ \]$/);
      // the table's columns line up: the check row is as wide as the fill rows (padded together)
      expect(rows[check].indexOf('head-10kT')).toBe(rows[fill3].indexOf('head-1kT'));
      const md = sheetToMarkdown(sheet);
      // (with the shared-band column when the stage's band-edges-past-tolerance finding gives it: one more cell)
      expect(md).toMatch(
        /\| \| \*\*Premix tank MT-2\*\* \(before fill 3\) \| head-10kT \| \*\*at least 621\.7 Torr\*\* \| planned 18\d\d\.\d \| (\| )?\| \| \| \[ \] \|/,
      );
      expect(md.match(/^\| # \|.*$/m)![0].includes('shared band')).toBe(
        sheet.findings.some((f) => f.code === 'band-edges-past-tolerance'),
      );
      const html = sheetToHtml(sheet);
      const row = /<tr class="check">(.*?)<\/tr>/.exec(html)?.[1] ?? '';
      expect(row).toContain('head-10kT');
      expect(row).toContain('621.7');
      expect(row).toContain('&#9744;');
      expect(html.indexOf('<tr class="check">')).toBeLessThan(html.indexOf('premix-MT-2</span>'));
    });

    it(`${name}: the heads still open below the premix tank's pressure are closed off before the line is filled from it`, () => {
      const sheet = sheets[sheets.length - 1];
      const c = sheet.rows.find((r) => r.check)!.check!;
      // common practice: a capacitance head is not taken past its full scale. Before fill 3 the plan has
      // closed head-10T (before fill 1); head-1kT (1000 Torr) is open, MT-2 reads about 1841-1891 Torr,
      // and fill 3 itself is read on head-1kT, so it is opened again once the line is back in range
      expect(c.note).toMatch(
        /^Close off head-1kT \(it reads only up to 1000\.0 Torr absolute\) before the line is filled from MT-2; open head-1kT again for the fill only once the line is back below its range/,
      );
      expect(c.note).not.toMatch(/close off head-10T/i);
    });

    it(`${name}: the Premix cell gives one gas a line, each with its U`, () => {
      const sheet = sheets[sheets.length - 1];
      const premix = sheet.design.find(([k]) => k === 'Premix')![1].split('\n');
      const gases = premix.filter((l) => /^(Ar|O2) 0\.\d{6} (±|\+-) 0\.00035$/.test(l));
      expect(gases.map((l) => l.split(' ')[0]).sort()).toEqual(['Ar', 'O2']);
      expect(premix.length).toBe(3);
      // text: each gas on its own line under the label's column
      const txt = sheetToText(sheet);
      expect(txt).toMatch(/^ {2}Premix {5}(O2|Ar) .*\n {13}(O2|Ar) .*\n {13}\(/m);
      expect(sheetToHtml(sheet)).toMatch(/<td>Premix<\/td><td>(O2|Ar) [^<]*<br>(O2|Ar) [^<]*<br>\(/);
    });
  }
});

describe('the stage-1 plan and page close off the heads its fills pass', () => {
  it('the premix read on head-10kT alone still closes off head-10T and head-1kT before Ar fills MT-2 to about 1637 Torr', () => {
    const stage1 = two.plan.twoStage!.premix;
    expect(stage1.steps.map((s) => s.gauge?.id)).toEqual(['head-10kT', 'head-10kT']);
    // every head of the lab whose top is below a fill's band is closed off at or before that fill
    const { req } = planFrom(RECIPE, { premixTank: 'MT-2' });
    const closed = new Set<string>();
    for (const s of stage1.steps) {
      for (const g of s.isolateBefore) closed.add(g.id);
      for (const g of req.input.gauges)
        if (gaugeTopAbsolutePa(g, req.input.reading) < s.targetPa + s.bandPa) expect(closed).toContain(g.id);
    }
    expect(stage1.steps[0].isolateBefore.map((g) => g.id)).toEqual(['head-10T', 'head-1kT']);
    expect(stage1.findings.filter((f) => f.code === 'isolate-gauge')).toHaveLength(2);
    const txt = sheetToText(two.sheets[0]);
    expect(txt).toMatch(/before fill 1: close off head-10T/);
    expect(txt).toMatch(/before fill 1: close off head-1kT/);
  });
});

describe("the stage-1 page: the premix's mixing time and its basis", () => {
  it('the mixing estimate of MT-2 (lab profile: 0.55 m, stirred) at the premix pressure, before stage 2 draws from it', () => {
    const [one] = two.sheets;
    const p = two.plan.twoStage!.premix;
    const m = mixingEstimate(p.composition, p.temperatureK, p.final.pressurePa, 0.55, true);
    const line = one.postChecks.find((c) => c.startsWith('Premix uniform before stage 2 (b1)'));
    expect(line, one.postChecks.join('\n')).toBeDefined();
    // the times the end screen of `fill --premix-tank` gives for the same tank and gas (README: 5.0 h, 7.5 h)
    expect(duration(m.to1PercentS!)).toBe('5.0 h');
    expect(duration(m.to01PercentS!)).toBe('7.5 h');
    expect(line).toContain('stirrer on ________ min');
    expect(line).toContain('rest at least 7.5 h');
    const basis = line!.split('\n')[1];
    expect(basis).toContain('over the 55.0 cm height of MT-2 (lab profile) at 1890.2 Torr and 25.0 degC');
    expect(basis).toContain('5.0 h to 1 %, 7.5 h to 0.1 % residual non-uniformity');
    expect(basis).toContain(`D ${m.pair!.governingM2s.toExponential(2)} m2/s`);
    // stage 2 asks for it before the premix is drawn
    const [, second] = two.sheets;
    expect(
      second.preChecks.some((c) => c.startsWith('Premix in MT-2 uniform before the batch draws from it')),
    ).toBe(true);
  });
});

const chromium = findChromium();
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const hasPoppler = spawnSync('sh', ['-c', 'command -v pdftotext'], { encoding: 'utf8' }).status === 0;
describe.runIf((chromium && hasPoppler) || required)('the two-stage sheet printed in a real browser', () => {
  it(
    'the check row sits in the stage-2 Fills table and no gauge, target or band cell wraps',
    { timeout: 120000 },
    () => {
      mkdirSync('artifacts', { recursive: true });
      const pdf = join('artifacts', 'sheet-two-stage-a4.pdf');
      const r = spawnSync(
        process.execPath,
        [
          'dist/mixwright.mjs',
          'sheet',
          RECIPE,
          '--premix-tank',
          'MT-2',
          '--batch',
          'b1',
          '-o',
          pdf,
          '--force',
        ],
        { encoding: 'utf8' },
      );
      expect(r.status, r.stderr).toBe(0);
      execFileSync('pdftoppm', ['-r', '60', '-png', pdf, join('artifacts', 'sheet-two-stage-a4')]);
      const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
      const stage2 = text.slice(text.indexOf('Stage 2 of 2'));
      const table = stage2.slice(stage2.indexOf('Fills (target'), stage2.indexOf('After filling'));
      const lines = table.split('\n').map((l) => l.replace(/\s+/g, ' ').trim());
      // the row (pdftotext sets a row's cells on a few lines): what, gauge, the minimum, the plan's reading,
      // between fill 2 and fill 3
      const at = lines.findIndex((l) => l.startsWith('Premix tank MT-2'));
      expect(lines.slice(at, at + 3).join(' '), table).toMatch(
        /Premix tank MT-2 at least planned head-10kT .*☐ before fill 3 621\.7 Torr 1890\.2/,
      );
      expect(at, table).toBeGreaterThan(lines.findIndex((l) => /371\.20 Torr/.test(l)));
      expect(at).toBeLessThan(lines.findIndex((l) => /520\.28 Torr/.test(l)));
      // every gauge id and band whole on its line: none broken at its hyphen or dash
      expect(table).not.toMatch(/head-\s*\n/);
      // bands rounded inward (low end up, high end down; an end on a display step one step in)
      for (const band of ['370.46 – 371.94', '519.54 – 521.02', '1492.6 – 1507.4'])
        expect(lines.join('\n')).toContain(band);
    },
  );
});
