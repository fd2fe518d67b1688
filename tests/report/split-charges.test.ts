import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { planToText } from '../../src/report/plan-text.js';
import { planToJson } from '../../src/report/plan-json.js';
import { buildSheetModel } from '../../src/report/sheet-model.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../../src/report/sheet-render.js';
import { chargesOf, chargeName, siblingWords } from '../../src/report/charges.js';
import { buildCertificateModel } from '../../src/report/label-certificate.js';
import { appendEvent, createLog, readLog } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { splitHeader, splitPlan } from '../split-plan.js';
import { sheetFlowed, TORR } from '../helpers.js';

const META = { recipeId: 'ch4-phi1-ar98', labName: 'demo', orderRecommended: false, version: 'test' };

function splitSheet() {
  const { plan, req } = splitPlan();
  return {
    plan,
    model: buildSheetModel(plan, {
      recipe: req.recipe,
      labName: req.lab.name,
      orderRecommended: false,
      unit: 'Torr',
      batchId: 'split-001',
      version: 'test',
      paper: 'a4',
    }),
  };
}

describe('charges in words', () => {
  it('the k-th fill from a source is its charge k of as many as the list holds; a source filled once is named alone', () => {
    const fills = ['CH4', 'Ar', 'O2', 'Ar'].map((source) => ({ source }));
    expect(chargesOf(fills)).toEqual([
      { number: 1, of: 1 },
      { number: 1, of: 2 },
      { number: 1, of: 1 },
      { number: 2, of: 2 },
    ]);
    expect(chargeName('Ar', { number: 1, of: 2 })).toBe('Ar, charge 1 of 2');
    expect(chargeName('O2', { number: 1, of: 1 })).toBe('O2');
    const indexed = fills.map((f, i) => ({ ...f, index: i + 1, charge: chargesOf(fills)[i] }));
    expect(siblingWords(indexed, 1)).toBe('charge 2 of 2 follows at fill 4');
    expect(siblingWords(indexed, 3)).toBe('charge 1 of 2 was fill 2');
    expect(siblingWords(indexed, 2)).toBe('');
  });
});

describe('a plan with a split diluent: CH4, Ar to 400 Torr, O2, Ar to 1500 Torr', () => {
  it('the planner numbers the charges and stops the first Ar charge at its stop reading', () => {
    const { plan } = splitPlan();
    expect(plan.steps.map((s) => [s.species, s.charge.number, s.charge.of])).toEqual([
      ['CH4', 1, 1],
      ['Ar', 1, 2],
      ['O2', 1, 1],
      ['Ar', 2, 2],
    ]);
    // the stop reading of a charge that is not its source's last is its target (an absolute reading)
    expect(plan.steps[1].targetPa / TORR).toBeCloseTo(400, 6);
    expect(plan.steps[3].targetPa / TORR).toBeCloseTo(1500, 6);
  });

  it('plan text: the order, one table row per charge with the charge named, and where each charge stops', () => {
    const { plan } = splitPlan();
    const text = planToText(plan, META, 'Torr');
    expect(text).toMatch(/^Order {7}CH4 -> Ar 1\/2 -> O2 -> Ar 2\/2 /m);
    const rows = text.split('\n').filter((l) => /^\s*\d\s{2}/.test(l));
    const manifold = rows.slice(0, 4);
    expect(manifold[1]).toMatch(/^\s*2\s+Ar, charge 1 of 2\s+cyl-Ar\s/);
    expect(manifold[3]).toMatch(/^\s*4\s+Ar, charge 2 of 2\s+cyl-Ar\s/);
    expect(manifold[2]).toMatch(/^\s*3\s+O2\s+cyl-O2\s/);
    expect(text).toContain(
      'Split       Ar from cyl-Ar goes in 2 charges: charge 1 of 2 (fill 2) stops at 400.000 Torr absolute, ' +
        'then charge 2 of 2 (fill 4) ends at 1500.00 Torr absolute.',
    );
  });

  it('plan --json: every step carries its charge (number, of); the documented step keys stay', () => {
    const { plan } = splitPlan();
    const j = planToJson(plan, META) as {
      steps: { step: number; species: string; charge: { number: number; of: number }; target_Pa: number }[];
      order: { fills: string[] };
    };
    expect(j.steps.map((s) => [s.step, s.species, s.charge])).toEqual([
      [1, 'CH4', { number: 1, of: 1 }],
      [2, 'Ar', { number: 1, of: 2 }],
      [3, 'O2', { number: 1, of: 1 }],
      [4, 'Ar', { number: 2, of: 2 }],
    ]);
    expect(j.order.fills).toEqual(['CH4', 'Ar', 'O2', 'Ar']);
    for (const k of ['step', 'species', 'source', 'target_Pa', 'band_Pa', 'gauge', 'gauge_reading_Pa'])
      expect(Object.keys(j.steps[1])).toContain(k);
  });

  it('the sheet: one row per charge, the charge named, a non-last charge stops at its target, the other charge pointed to', () => {
    const { plan, model } = splitSheet();
    expect(model.rows.map((r) => [r.n, r.fill, r.charge ?? null])).toEqual([
      [1, 'CH4', null],
      [2, 'Ar', { number: 1, of: 2 }],
      [3, 'O2', null],
      [4, 'Ar', { number: 2, of: 2 }],
    ]);
    const r2 = model.rows[1];
    const r4 = model.rows[3];
    // the stop reading of the first charge is the row's target, on its gauge (head-1kT reads to 0.01 Torr)
    expect(plan.steps[1].gauge?.id).toBe(r2.gauge);
    expect(r2.chargeNote).toBe(
      `Ar, charge 1 of 2 - stop at ${r2.target} Torr on ${r2.gauge}, then close the cylinder valve; ` +
        'charge 2 of 2 follows at fill 4',
    );
    expect(Number(r2.target)).toBeCloseTo(400, 2);
    expect(r4.chargeNote).toBe(
      `Ar, charge 2 of 2 - fill on to ${r4.target} Torr on ${r4.gauge}; charge 1 of 2 was fill 2`,
    );
    expect(model.rows[0].chargeNote).toBeUndefined();
    expect(model.design.find(([k]) => k === 'order')?.[1]).toBe('CH4 -> Ar 1/2 -> O2 -> Ar 2/2');
    expect(model.diagram?.legend).toContain('(1 CH4, 2 Ar 1/2, 3 O2, 4 Ar 2/2)');

    const text = sheetToText(model);
    expect(text).toMatch(/^\s+2\s+Ar 1\/2\s+cyl-Ar\s/m);
    // the text sheet wraps its prose at 80 columns: read it flowed
    expect(sheetFlowed(text)).toContain(`^ fill 2: ${r2.chargeNote}`);
    expect(sheetFlowed(text)).toContain(`^ fill 4: ${r4.chargeNote}`);
    expect(text).toMatch(/^ {5}\^ fill 2: Ar, charge 1 of 2 - stop at /m);
    const md = sheetToMarkdown(model);
    expect(md).toContain('| 2 | **Ar**, charge 1 of 2 (cyl-Ar) |');
    expect(md).toContain(`| | ${r2.chargeNote} | | | | | | | |`);
    const html = sheetToHtml(model);
    expect(html).toContain('<b>Ar</b>, charge 1 of 2<br>');
    expect(html).toContain(
      `<tr class="charge" data-fill="2"><td></td><td colspan="8">${r2.chargeNote}</td></tr>`,
    );
  });

  it('the certificate names the charge of each logged reading, and check re-checks the split batch', async () => {
    const h = splitHeader();
    const f = join(mkdtempSync(join(tmpdir(), 'mw-split-')), 'split.jsonl');
    createLog(f, h);
    for (const s of h.steps)
      appendEvent(f, {
        kind: 'reading',
        step: s.step,
        source: s.source,
        charge: s.charge,
        gauge: s.gauge!,
        reading: `${(s.target_Pa / TORR).toFixed(4)} Torr`,
        pressure_Pa: Number((s.target_Pa / TORR).toFixed(4)) * TORR,
        temperature: '25.0 degC',
        temperature_K: 298.15,
        time: '2026-12-01T01:00:00Z',
      });
    appendEvent(f, { kind: 'close', time: '2026-12-01T01:30:00Z' });
    const log = readLog(f);
    const report = await checkLog(log, { trials: 0, seed: 1 });
    // readings at the targets: the design comes back (phi 1 in 98 % Ar by construction of the plan)
    expect(report.verdict.deviations.every((d) => d.within)).toBe(true);
    const cert = buildCertificateModel(report, log, {
      version: 'test',
      paper: 'a4',
      generated: '2026-12-01 10:00 UTC',
    });
    expect(cert.readings.map((r) => r.fill)).toEqual([
      'cyl-CH4',
      'cyl-Ar (charge 1 of 2)',
      'cyl-O2',
      'cyl-Ar (charge 2 of 2)',
    ]);
  });
});
