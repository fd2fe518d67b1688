import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { buildSheetModel, designTitle } from '../../src/report/sheet-model.js';
import { sheetToHtml, sheetToText } from '../../src/report/sheet-render.js';
import { detailSvg, diagramData, diagramSvg, niceStep, placeNumbers } from '../../src/report/diagram.js';
import { findChromium, writePdf } from '../../src/io/pdf.js';
import { designOptions, runCli, sheetFlowed, TORR } from '../helpers.js';
import { splitPlan } from '../split-plan.js';

const PSI = 6894.757293168361; // Pa per psi (NIST SP 811, B.8: 1 psi = 6.894 757 E+03 Pa)

/** the demo lab without its 10 000 Torr absolute head, so the gauge-referenced psi transducer reads the high fills */
function gaugeRefLab(): string {
  const dir = mkdtempSync(join(tmpdir(), 'mw-lab-'));
  const a = DEMO_LAB_YAML.indexOf('  - id: head-10kT');
  const b = DEMO_LAB_YAML.indexOf('  - id: xdcr-100g');
  const f = join(dir, 'lab.yaml');
  writeFileSync(f, DEMO_LAB_YAML.slice(0, a) + DEMO_LAB_YAML.slice(b));
  return f;
}

function topUpRecipe(): string {
  const dir = mkdtempSync(join(tmpdir(), 'mw-tu-'));
  const f = join(dir, 'topup.yaml');
  writeFileSync(
    f,
    [
      'id: ch4-topup',
      'title: CH4/O2 phi 1 in 98 % Ar, topped up from Ar in MT-1',
      'tank: MT-1',
      'mixture: { fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1.0, dilution: 0.98 }',
      'in_tank: { composition: "Ar", pressure: "700 Torr" }',
      'pressure: 1500 Torr',
      'temperature: 25 degC',
      '',
    ].join('\n'),
  );
  return f;
}

// the three-fill order the advice gives (the sequence search would split the Ar): the barometer rule per reading
describe('the barometric pressure behind gauge-referenced targets', () => {
  it('plan says which value its gauge-referenced targets assume, and --json carries it', async () => {
    const lab = gaugeRefLab();
    const t = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--order', 'CH4,Ar,O2', '--lab', lab]);
    expect(t.code, t.stderr).toBe(0);
    expect(t.stdout).toMatch(
      /Barometer {3}760\.00 Torr assumed by the gauge-referenced readings of fill 2, 3 \(lab profile value, not today's: give --barometer\)/,
    );
    const j = JSON.parse(
      (
        await runCli([
          'plan',
          'recipes/ch4-o2-ar-phi1.yaml',
          '--order',
          'CH4,Ar,O2',
          '--lab',
          lab,
          '--json',
          '--barometer',
          '745 Torr',
        ])
      ).stdout,
    );
    expect(j.barometer.pressure_Pa).toBeCloseTo(745 * TORR, 9);
    expect(j.barometer.source).toBe('option');
    expect(j.barometer.gauge_referenced_steps).toEqual([2, 3]);
    // an all-absolute plan has no such line: its targets do not depend on the barometer
    expect((await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml'])).stdout).not.toContain('Barometer ');
  });

  it('the sheet gives the correction rule, and following it lands on the target a plan for that barometer prints', async () => {
    const lab = gaugeRefLab();
    const at760 = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--order',
      'CH4,Ar,O2',
      '--lab',
      lab,
      '--format',
      'txt',
      '--batch',
      'b',
    ]);
    // the text sheet wraps its prose at 80 columns: read it flowed
    const words760 = sheetFlowed(at760.stdout);
    expect(words760).toContain(
      "assume a barometric pressure of 760.00 Torr (the lab profile value, not today's",
    );
    expect(words760).toContain(
      "Target to stop at today = printed target + (760.00 Torr - today's barometer), in the gauge's unit (1 Torr = 0.019337 psi)",
    );
    // the example on the sheet: 10 Torr lower -> the printed target plus 10 Torr in psi
    const ex =
      /Example: fill 2 printed ([\d.]+) psi; with today's barometer 10 Torr lower \(750\.00 Torr\) stop at ([\d.]+) psi/.exec(
        words760,
      )!;
    expect(ex).not.toBeNull();
    // the same design planned for a 750 Torr barometer: its gauge target (absolute target - barometer) is the corrected one,
    // to the 0.01 psi display step (the identity p_gauge = p_abs - p_baro is the definition of a gauge reading)
    const j = JSON.parse(
      (
        await runCli([
          'plan',
          'recipes/ch4-o2-ar-phi1.yaml',
          '--order',
          'CH4,Ar,O2',
          '--lab',
          lab,
          '--json',
          '--barometer',
          '750 Torr',
        ])
      ).stdout,
    );
    const planned750 = (j.steps[1].target_Pa - 750 * TORR) / PSI;
    expect(Math.abs(Number(ex[2]) - planned750)).toBeLessThanOrEqual(0.01);
    expect(Math.abs(Number(ex[2]) - Number(ex[1]) - (10 * TORR) / PSI)).toBeLessThanOrEqual(0.01);
    const given = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--order',
      'CH4,Ar,O2',
      '--lab',
      lab,
      '--format',
      'txt',
      '--batch',
      'b',
      '--barometer',
      '750 Torr',
    ]);
    expect(sheetFlowed(given.stdout)).toContain(
      'assume a barometric pressure of 750.00 Torr (given for this sheet',
    );
  });
});

describe('a top-up sheet', () => {
  it('reads and confirms the starting pressure first, and asks for no leak-up test under vacuum', () => {
    const req = buildPlanRequest(readRecipe(topUpRecipe()));
    const plan = planFill(req.input);
    const m = buildSheetModel(plan, {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: req.orderRecommended,
      unit: 'Torr',
      batchId: 'tu',
      version: 'test',
      paper: 'a4',
    });
    const checks = m.preChecks.join('\n');
    expect(checks).not.toMatch(/under vacuum/);
    expect(checks).not.toMatch(/Base vacuum before the first fill/);
    expect(m.preChecks[0]).toMatch(/^Gas already in the tank \(top-up\): do NOT evacuate the tank/);
    expect(checks).toMatch(
      /Starting pressure, read before any fill on head-1kT: ________ at ________ degC, time ______, initials ____\. The targets assume 700\.000 Torr absolute of Ar 1\.000; if the reading differs by more than the band of fill 1 \(\+-0\.050 Torr\), stop and re-plan/,
    );
    // the starting pressure comes before any fill-related check
    expect(m.preChecks.findIndex((c) => c.startsWith('Starting pressure'))).toBeLessThan(
      m.preChecks.findIndex((c) => c.startsWith('Before each fill')),
    );
  });
  it('an ordinary fill keeps the leak-up test under vacuum and the base vacuum', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const m = buildSheetModel(planFill(req.input), {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: true,
      unit: 'Torr',
      batchId: 'x',
      version: 'test',
      paper: 'a4',
    });
    expect(m.preChecks[0]).toMatch(/^Leak-up test of tank and manifold under vacuum/);
  });
});

describe('the printed sheet holds together', () => {
  it('a design from the command line gets a title from its gases, not "inline"', async () => {
    const r = await runCli([
      'sheet',
      ...designOptions({ dilution: '0.9', volume: undefined, pressure: '1500 Torr', temperature: '25 degC' }),
      ...['--tank', 'MT-1', '--format', 'txt'],
    ]);
    expect([0, 3], r.stderr).toContain(r.code); // 10 % CH4+O2 may carry a danger finding; the sheet is printed either way
    expect(r.stdout).toContain('FILL SHEET  CH4/O2 phi 1 in 90 % Ar, 1500 Torr in MT-1');
    expect(r.stdout).toMatch(/Batch ch4-o2-ar-\d{4}-\d\d-\d\d /);
    expect(r.stdout).not.toMatch(/\binline\b/);
    const f = await runCli([
      'sheet',
      '--fractions',
      'CH4:0.05,O2:0.10,Ar:0.85',
      '--pressure',
      '1500 Torr',
      '--temperature',
      '25 degC',
      '--tank',
      'MT-1',
      '--format',
      'txt',
    ]);
    expect(f.stdout).toContain('FILL SHEET  CH4/O2 phi 1 in 85 % Ar, 1500 Torr in MT-1'); // fractions of a fuel, O2 and a diluent: phi 1 by their stoichiometry
  });

  it('designTitle of a recipe design reads like the recipe titles', () => {
    const req = buildPlanRequest(readRecipe('recipes/c2h4-o2-ar-phi05.yaml'));
    expect(designTitle(planFill(req.input), 'Torr')).toBe('C2H4/O2 phi 0.5 in 95 % Ar, 1500 Torr in MT-2');
  });

  it('round tick steps: 1, 2, 2.5 or 5 times a power of ten (common practice for axis scales)', () => {
    expect(niceStep(0.066)).toBe(0.02);
    expect(niceStep(0.14)).toBeCloseTo(0.05, 15);
    expect(niceStep(0.0104)).toBe(0.005);
    expect(niceStep(1)).toBe(0.25);
    expect(niceStep(0.4)).toBeCloseTo(0.1, 15);
  });

  it('the detail axes carry round ticks from 0 to a whole step', () => {
    for (const recipe of [
      'recipes/ch4-o2-ar-phi1.yaml',
      'recipes/c2h4-o2-ar-phi05.yaml',
      'recipes/nc7h16-o2-ar.yaml',
      'recipes/ng-blend-air.yaml',
    ]) {
      const plan = planFill(buildPlanRequest(readRecipe(recipe)).input);
      const svg = detailSvg(diagramData(plan)!, 'detail');
      const labels = [...svg.matchAll(/class="lab" text-anchor="(?:middle|end)">([\d.]+)<\/text>/g)].map(
        (m) => Number(m[1]),
      );
      expect(labels.length, recipe).toBeGreaterThanOrEqual(6);
      expect(labels.filter((v) => v === 0).length, recipe).toBe(2);
      for (const v of labels) {
        // every label is a whole multiple of a 1/2/2.5/5 step: at most two significant digits, last digit 0, 2, 5
        expect(Number(v.toPrecision(2)), `${recipe}: ${v}`).toBe(v);
        expect(String(v), recipe).not.toMatch(/\.\d{3,}/);
      }
    }
  });

  it('the triangle has a scale on its fuel and O2 axes', () => {
    const svg = diagramSvg(
      diagramData(planFill(buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml')).input))!,
      't',
    );
    const ticks = [...svg.matchAll(/class="tick"[^>]*>(\d+)<\/text>/g)].map((m) => m[1]);
    expect(ticks.filter((t) => ['20', '40', '60', '80'].includes(t)).length).toBe(7);
    expect(svg).toContain('fuel, %');
    expect(svg).toContain('O2, %');
  });

  it('state numbers never overlap each other or a reserved label; points on top of each other share one label', () => {
    const spots = placeNumbers(
      [
        { label: '1', x: 220, y: 58 },
        { label: '2', x: 42, y: 366 },
        { label: '3', x: 50, y: 366 },
        { label: '4', x: 100, y: 200 },
        { label: '5', x: 106, y: 212 },
      ],
      [{ x0: 164, y0: 50, x1: 212, y1: 66 }],
    );
    expect(spots.map((s) => s.text)).toEqual(['1', '2,3', '', '4', '5']);
    const boxes = spots
      .filter((s) => s.text)
      .map((s) => ({ x0: s.x, x1: s.x + 8 * s.text.length, y0: s.y - 11, y1: s.y + 2 }));
    boxes.push({ x0: 164, y0: 50, x1: 212, y1: 66 });
    for (let i = 0; i < boxes.length; i++)
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i];
        const b = boxes[j];
        expect(a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1, `${i} ${j}`).toBe(false);
      }
  });

  it('the apex: the "fuel" label sits left of the vertex, clear of the number of a pure first fill', () => {
    const svg = diagramSvg(
      diagramData(planFill(buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml')).input))!,
      't',
    );
    const fuel = /<text x="([\d.]+)" y="([\d.]+)" class="lab" text-anchor="end">fuel, %<\/text>/.exec(svg)!;
    const one = /<text x="([\d.]+)" y="([\d.]+)" class="num">1<\/text>/.exec(svg)!;
    // the fuel label ends left of the apex (x 220); the number starts right of it
    expect(Number(fuel[1])).toBeLessThan(220);
    expect(Number(one[1])).toBeGreaterThan(220);
  });

  it('a limit shown pressure-corrected says so, with the listed value', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const m = buildSheetModel(planFill(req.input), {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: true,
      unit: 'Torr',
      batchId: 'x',
      version: 'test',
      paper: 'a4',
    });
    // CH4 UFL 17.0 % in air at 25 degC, 1 atm (the project's flammability table); raised at 1500 Torr by Zabetakis' rule
    expect(m.diagram!.legend).toContain('UFL 23.1 % in air');
    expect(m.diagram!.legend).toContain(
      'Limits shown pressure/temperature-corrected: UFL raised for 1500.0 Torr (Zabetakis); listed values at 25 degC and 1 atm: LFL 4.40 %, UFL 17.0 %.',
    );
  });

  it('HTML: the label box, each finding and each short section are kept whole; headings keep with what follows', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const html = sheetToHtml(
      buildSheetModel(planFill(req.input), {
        recipe: req.recipe,
        labName: req.lab.name,
        orderRecommended: true,
        unit: 'Torr',
        batchId: 'x',
        version: 'test',
        paper: 'a4',
      }),
    );
    expect(html).toMatch(/h2 \{[^}]*break-after: avoid/);
    expect(html).toMatch(/\.label \{[^}]*break-inside: avoid/);
    expect(html).toMatch(/\.findings li \{[^}]*break-inside: avoid/);
    expect(html).toContain('<section class="block"><h2>Tank label</h2>');
  });

  it('the sheet label is marked as the design, not the tank', () => {
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const txt = sheetToText(
      buildSheetModel(planFill(req.input), {
        recipe: req.recipe,
        labName: req.lab.name,
        orderRecommended: true,
        unit: 'Torr',
        batchId: 'x',
        version: 'test',
        paper: 'a4',
      }),
    );
    expect(sheetFlowed(txt)).toContain(
      '| x - DESIGN, NOT YET CONFIRMED: after the fill, label the tank with `mixwright label` of its log',
    );
  });
});

const chromium = findChromium();
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const hasPoppler = spawnSync('sh', ['-c', 'command -v pdftotext'], { encoding: 'utf8' }).status === 0;
describe.runIf((chromium && hasPoppler) || required)(
  'page breaks of a printed sheet in a real browser',
  () => {
    it(
      'no page ends on a heading; the tank label and each finding are on one page',
      { timeout: 120000 },
      () => {
        mkdirSync('artifacts', { recursive: true });
        const lab = gaugeRefLab();
        const headings = [
          'Design',
          'Before filling',
          'Fills (target = reading to stop at, on that gauge)',
          'After filling',
          'Tank label',
          'Findings',
          'Fuel / O2 / inert diagram',
        ];
        // the gauge-referenced lab and a top-up make long sheets with the barometer box and more findings
        for (const [name, paper, args] of [
          ['gref', 'letter', ['recipes/ch4-o2-ar-phi1.yaml', '--lab', lab]],
          ['topup', 'a4', [topUpRecipe()]],
          ['danger', 'a4', ['recipes/ch4-o2-ar-phi1.yaml', '--pressure', '2900 Torr', '--lab', lab]],
        ] as const) {
          {
            const pdf = join('artifacts', `sheet-breaks-${name}-${paper}.pdf`);
            const r = spawnSync(
              process.execPath,
              [
                'dist/mixwright.mjs',
                'sheet',
                ...args,
                '--batch',
                'b',
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
            expect([0, 3], r.stderr).toContain(r.status);
            const pages = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' })
              .split('\f')
              .filter((p) => p.trim());
            for (const [i, page] of pages.entries()) {
              const lines = page
                .split('\n')
                .map((l) => l.trim())
                .filter(Boolean);
              expect(headings, `${name} ${paper}: page ${i + 1} ends on a heading`).not.toContain(
                lines[lines.length - 1],
              );
            }
            const labelPage = pages.find((p) => p.includes('DESIGN, NOT YET CONFIRMED'))!;
            expect(labelPage, `${name} ${paper}`).toContain('re-check verdict');
            expect(labelPage).toMatch(/Tank label/);
            // each finding's first and last words are on one page (the findings of the same design, from plan --json)
            const plan = spawnSync(process.execPath, ['dist/mixwright.mjs', 'plan', ...args, '--json'], {
              encoding: 'utf8',
            });
            const findings = (JSON.parse(plan.stdout).findings as { code: string; message: string }[]).filter(
              (f) => f.code !== 'isolate-gauge',
            );
            expect(findings.length).toBeGreaterThan(2);
            const re = (ws: string[]) =>
              new RegExp(ws.map((w) => w.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('\\s+'));
            for (const f of findings) {
              // three words in a row with no number in them (numbers are formatted per document), first and last such run
              const ws = f.message.split(/\s+/);
              const plain = (w: string) => /^[A-Za-z][A-Za-z-]*[,;:]?$/.test(w);
              const runs = ws
                .map((_, i) => i)
                .filter((i) => i + 2 < ws.length && plain(ws[i]) && plain(ws[i + 1]) && plain(ws[i + 2]));
              const head = pages.findIndex((p) => re(ws.slice(runs[0], runs[0] + 3)).test(p));
              const last = runs[runs.length - 1];
              const tail = pages.findIndex((p, i) => i >= head && re(ws.slice(last, last + 3)).test(p));
              expect(head, `${name}: ${f.code}`).toBeGreaterThanOrEqual(0);
              expect(tail, `${name} ${paper}: ${f.code} split across pages`).toBe(head);
            }
          }
        }
        expect(readFileSync(join('artifacts', 'sheet-breaks-gref-letter.pdf')).length).toBeGreaterThan(1000);
      },
    );

    it(
      'a split charge prints as its own row, the charge named, with its stop reading as the target',
      { timeout: 120000 },
      async () => {
        mkdirSync('artifacts', { recursive: true });
        const { plan, req } = splitPlan();
        const model = buildSheetModel(plan, {
          recipe: req.recipe,
          labName: req.lab.name,
          orderRecommended: false,
          unit: 'Torr',
          batchId: 'split-001',
          version: 'test',
          paper: 'a4',
        });
        const pdf = join('artifacts', 'sheet-split-a4.pdf');
        await writePdf(sheetToHtml(model), pdf, true);
        const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
        const lines = text.split('\n').map((l) => l.replace(/\s+/g, ' ').trim());
        // the fills table (pdftotext sets a row's cells on several lines: the gas, its number, the
        // cylinder, then gauge, target and band): rows 1 to 4 in order, each Ar charge a row of its own
        const table = lines.slice(
          lines.findIndex((l) => l.startsWith('Fills (target')),
          lines.findIndex((l) => l.startsWith('After filling')),
        );
        const gasAt = (gas: string) => table.findIndex((l) => l === gas);
        const rows = [gasAt('CH4'), gasAt('Ar, charge 1 of 2'), gasAt('O2'), gasAt('Ar, charge 2 of 2')];
        expect(
          rows.every((i) => i >= 0),
          text,
        ).toBe(true);
        expect([...rows].sort((a, b) => a - b)).toEqual(rows);
        const r2 = model.rows[1];
        const r4 = model.rows[3];
        // each row's number beside its gas, and its target (the first gauge line after it) is the model's
        const targetAfter = (i: number) => table.slice(i).find((l) => / Torr /.test(l)) ?? '';
        expect(table.slice(rows[1], rows[1] + 3)).toContain('2');
        expect(table.slice(rows[3], rows[3] + 3)).toContain('4');
        expect(targetAfter(rows[1])).toContain(`${r2.gauge} ${r2.target} Torr`);
        expect(targetAfter(rows[3])).toContain(`${r4.gauge} ${r4.target} Torr`);
        expect(Number(r2.target)).toBeCloseTo(400, 2);
        // the charge's words under its row, before the next fill's row
        const note2 = table.findIndex((l) => l.startsWith('Ar, charge 1 of 2 - stop at'));
        expect(note2).toBeGreaterThan(rows[1]);
        expect(note2).toBeLessThan(rows[2]);
        expect(table.slice(note2, note2 + 2).join(' ')).toContain('charge 2 of 2 follows at fill 4');
        const note4 = table.findIndex((l) => l.startsWith('Ar, charge 2 of 2 - fill on to'));
        expect(note4).toBeGreaterThan(rows[3]);
        expect(table.slice(note4, note4 + 2).join(' ')).toContain('charge 1 of 2 was fill 2');
        expect(text).toContain('CH4 -> Ar 1/2 -> O2 -> Ar 2/2');
      },
    );
  },
);
