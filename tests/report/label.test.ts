import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { checkLog } from '../../src/io/check.js';
import { appendEvent, createLog, readLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { describeLogFinding } from '../../src/io/log-audit.js';
import {
  DANGER_HEADLINE,
  labelLines,
  labelModel,
  renderLabelText,
  withU,
  wrapLine,
} from '../../src/report/label-model.js';
import { buildCertificateModel } from '../../src/report/label-certificate.js';
import {
  certificateToHtml,
  certificateToMarkdown,
  certificateToText,
} from '../../src/report/label-render.js';
import { findChromium } from '../../src/io/pdf.js';
import { runCli, TORR } from '../helpers.js';

const PASSING = 'batches/demo-ch4-phi1-ar98.jsonl';
const FAILING = 'batches/demo-c2h4-phi05-ar-overshoot.jsonl';
const META = { version: 'test', paper: 'a4' as const, generated: '2026-12-01 10:00 UTC' };

/** the demo log's readings as events to append (their chain is recomputed by the writer) */
const demoReadings = readFileSync(PASSING, 'utf8')
  .trim()
  .split('\n')
  .slice(1, 4)
  .map((l) => {
    const { chain: _c, ...e } = JSON.parse(l) as Record<string, unknown>;
    void _c;
    return { ...e, by: 'QX' } as Extract<NewLogEvent, { kind: 'reading' }>;
  });

/** a new log with a demo log's header (changed by `header`), its events written through the log API */
function rebuilt(
  from: string,
  write: (file: string) => void,
  header: (h: LogHeader) => LogHeader = (h) => h,
): string {
  const f = join(mkdtempSync(join(tmpdir(), 'mw-label-')), 'rebuilt.jsonl');
  createLog(f, header(readLog(from).header));
  write(f);
  return f;
}

describe('expanded uncertainty as printed', () => {
  // GUM (JCGM 100:2008) 7.2.6: U to at most two significant digits, the value rounded to the same place
  it('U to two significant digits, the value to the same decimal place', () => {
    expect(withU(0.666871, 0.001534, '%')).toBe('0.6669 % +- 0.0015 %');
    expect(withU(97.99812, 0.02811, '%')).toBe('97.998 % +- 0.028 %');
    expect(withU(1.00031, 0.0213)).toBe('1.000 +- 0.021');
    expect(withU(1516.2, 12.6)).toBe('1516 +- 13');
  });
  it('no U is said in words, not printed as zero', () => {
    expect(withU(0.5, 0)).toBe('0.500000 (U not computed)');
  });
});

describe('label and check agree (same log, same computation)', () => {
  for (const log of [PASSING, FAILING]) {
    it(`${log}: every mole fraction and U (k = 2) on the label is the one check --json gives`, async () => {
      const j = JSON.parse((await runCli(['check', log, '--json', '--trials', '100000'])).stdout);
      const m = labelModel(await checkLog(readLog(log), { trials: 100000, seed: 1 }), readLog(log));
      expect(m.composition.map((c) => c.species).sort()).toEqual(Object.keys(j.composition).sort());
      for (const c of m.composition) {
        expect(c.value).toBe(j.composition[c.species].value);
        expect(c.expandedU).toBe(2 * j.composition[c.species].u);
      }
      // and the printed label of `mixwright label` carries exactly those numbers
      const printed = await runCli(['label', log, '--trials', '100000']);
      for (const [k, st] of Object.entries(j.composition) as [string, { value: number; u: number }][]) {
        const text =
          st.value < 1e-3
            ? withU(st.value * 1e6, 2 * st.u * 1e6, 'ppm')
            : withU(st.value * 100, 2 * st.u * 100, '%');
        expect(printed.stdout, k).toContain(`${k.padEnd(8)} ${text}`);
      }
      expect(printed.stdout).toContain(`phi ${withU(j.phi.value, 2 * j.phi.u)}`);
      // the composition's judgement and the overall verdict, each as check --json gives it
      expect(m.verdict).toBe(j.composition_verdict);
      expect(m.outcome).toBe(j.verdict);
    });
  }
});

describe('the label says what the readings say', () => {
  it('a failed re-check: FAIL first and last, what is off, exit 4; the design fractions are not on the label', async () => {
    const log = readLog(FAILING);
    const m = labelModel(await checkLog(log, { trials: 0, seed: 1 }), log);
    const lines = labelLines(m);
    expect(lines[0]).toBe('*** FAIL - OUT OF TOLERANCE: NOT THE DESIGN MIXTURE ***');
    expect(lines[lines.length - 1]).toBe('*** DO NOT USE AS THE DESIGN MIXTURE ***');
    expect(m.offDesign.join('\n')).toMatch(/C2H4 1\.1 % \(relative\) below design; tolerance 0\.50 %/);
    // design: C2H4 0.714286 %, O2 4.28571 % - neither appears on the label
    const text = renderLabelText(m);
    expect(text).not.toMatch(/0\.714/);
    expect(text).not.toMatch(/4\.285/);
    expect(text).toMatch(/C2H4\s+0\.7068 % \+- 0\.0016 %/);
    const r = await runCli(['label', FAILING, '--trials', '100000']);
    expect(r.code).toBe(4);
    expect(r.stderr).toContain('the re-check FAILED');
    expect(r.stdout).toContain('# *** FAIL - OUT OF TOLERANCE');
  });

  it('a pass the uncertainty cannot prove is said in words, with the species whose U reaches past the tolerance', async () => {
    const log = readLog(PASSING);
    const m = labelModel(await checkLog(log, { trials: 0, seed: 1 }), log);
    expect(m.status).toBe('pass-uncertain');
    // the headline whole (wide lines); at 76 columns it wraps (tests/report/label-width.test.ts)
    expect(labelLines(m, 200)[0]).toBe(
      'NOT SHOWN WITHIN TOLERANCE - inside on the readings, but the uncertainty reaches past it',
    );
    expect(m.offDesign).toEqual([
      expect.stringMatching(
        /^O2 0\.11 % \(relative\) above design, but U 2\.9 % reaches past the tolerance 0\.50 %$/,
      ),
    ]);
    expect(m.finalPressure).toBe('1500.0 Torr absolute');
    expect(m.finalTemperature).toBe('25.0 degC');
    expect(m.filledOn).toBe('2026-11-30');
  });

  it('a log without its last fill: FAIL - INCOMPLETE, naming the missing step (exit 4)', async () => {
    const f = rebuilt(PASSING, (file) => {
      appendEvent(file, demoReadings[0]);
      appendEvent(file, demoReadings[1]);
    });
    const log = readLog(f);
    const m = labelModel(await checkLog(log, { trials: 0, seed: 1 }), log);
    expect(m.status).toBe('incomplete');
    expect(labelLines(m)[0]).toBe('*** FAIL - INCOMPLETE BATCH: NOT THE DESIGN MIXTURE ***');
    expect(m.offDesign).toContain('no reading for step 3');
    const c = buildCertificateModel(await checkLog(log, { trials: 0, seed: 1 }), log, META);
    expect(c.closed).toContain('NOT CLOSED');
    expect((await runCli(['label', f, '--trials', '100000'])).code).toBe(4);
  });

  it('a correction written through the log API (by, reason, replaces_line): the label uses it; the certificate lists who, when, old, new, why', async () => {
    const f = rebuilt(PASSING, (file) => {
      appendEvent(file, demoReadings[0]);
      // read by RB, corrected by QX: the row names the reader, its note the corrector
      const at = appendEvent(file, { ...demoReadings[1], by: 'RB' }).line;
      appendEvent(file, {
        ...demoReadings[1],
        kind: 'correction',
        reading: '1481 Torr',
        pressure_Pa: 1481 * TORR,
        time: '2026-11-30T09:50:00Z',
        by: 'QX',
        reason: 'digit misread',
        replaces_line: at,
      });
      appendEvent(file, demoReadings[2]);
    });
    const log = readLog(f);
    const report = await checkLog(log, { trials: 0, seed: 1 });
    expect(report.readings[1].pressurePa).toBeCloseTo(1481 * TORR, 9);
    expect(report.amendments).toHaveLength(1);
    const c = buildCertificateModel(report, log, META);
    expect(c.corrections).toEqual([
      'fill 2: 1480 Torr (line 3) corrected to 1481 Torr (line 4), by QX at 2026-11-30 09:50:00 UTC - digit misread; the original stays in the log',
    ]);
    expect(c.readings[1].note).toBe('corrected by QX (replaces line 3)');
    expect(c.readings[1].typed).toBe('1481 Torr');
    expect(c.readings[1].by).toBe('RB');
    // a correction is not an edit of the record: no caveat, no record finding
    expect(report.caveats).toEqual([]);
    expect(report.findings).toEqual([]);
    expect(certificateToText(c)).toContain(
      'CORRECTIONS\n  fill 2: 1480 Torr (line 3) corrected to 1481 Torr (line 4), by QX',
    );
  });

  it('a withdrawal is listed with who, when and why', async () => {
    const f = rebuilt(PASSING, (file) => {
      appendEvent(file, demoReadings[0]);
      appendEvent(file, demoReadings[1]);
      const at = appendEvent(file, demoReadings[2]).line;
      appendEvent(file, {
        kind: 'withdraw',
        step: 3,
        withdraws_line: at,
        by: 'RB',
        time: '2026-11-30T10:05:00Z',
        reason: 'valve left open to the vent',
      });
    });
    const log = readLog(f);
    const report = await checkLog(log, { trials: 0, seed: 1 });
    const c = buildCertificateModel(report, log, META);
    expect(c.corrections).toEqual([
      'fill 3: 1500 Torr (line 4) withdrawn (line 5), by RB at 2026-11-30 10:05:00 UTC - valve left open to the vent; the original stays in the log',
    ]);
    expect(c.label.status).toBe('incomplete');
  });

  it('acknowledgements and the initials of each reading, from the log', async () => {
    const f = rebuilt(PASSING, (file) => {
      appendEvent(file, {
        kind: 'acknowledge',
        code: 'gauge-coarser-than-band',
        step: 2,
        by: 'QX',
        time: '2026-11-30T09:15:00Z',
        note: 'wider band agreed',
      });
      appendEvent(file, demoReadings[0]);
      appendEvent(file, { ...demoReadings[1], by: 'RB' });
      appendEvent(file, demoReadings[2]);
    });
    const log = readLog(f);
    const c = buildCertificateModel(await checkLog(log, { trials: 0, seed: 1 }), log, META);
    expect(c.acknowledgements).toEqual([
      'gauge-coarser-than-band (fill 2): accepted by QX at 2026-11-30T09:15:00Z - wider band agreed',
    ]);
    expect(c.readings.map((r) => r.by)).toEqual(['QX', 'RB', 'QX']);
  });
});

describe('a log that records a danger', () => {
  // the demo readings in a log whose tank has a working limit of 1495 Torr: the last (1500 Torr) goes past it
  const pastLimit = () =>
    rebuilt(
      PASSING,
      (file) => {
        for (const e of demoReadings) appendEvent(file, e);
      },
      (h) => ({ ...h, tank: { ...h.tank, working_limit_Pa: 1495 * TORR } }),
    );

  it('a composition within tolerance never reads as fit: DANGER first, the caveat beside the verdict, the finding worded once, exit 3', async () => {
    const f = pastLimit();
    const log = readLog(f);
    const report = await checkLog(log, { trials: 0, seed: 1 });
    expect(['pass', 'pass-uncertain']).toContain(report.verdict.verdict);
    const m = labelModel(report, log);
    expect(m.danger).toBe(true);
    const lines = labelLines(m, 200);
    expect(lines[0]).toBe(`*** ${DANGER_HEADLINE} ***`);
    expect(lines[1]).toBe(
      'composition only: NOT SHOWN WITHIN TOLERANCE - inside on the readings, but the uncertainty reaches past it',
    );
    expect(lines.join(' ')).toContain("! DANGER: a logged reading went past the tank's working limit");
    expect(lines[lines.length - 1]).toBe(
      '*** DO NOT USE THIS TANK UNTIL IT AND ITS GAUGES HAVE BEEN INSPECTED ***',
    );
    // every line is wrapped for the boxed text label (76 columns inside an 80-column box)
    for (const l of labelLines(m)) expect(l.length, l).toBeLessThanOrEqual(76);
    const c = buildCertificateModel(report, log, META);
    expect(c.caveats).toEqual(report.caveats);
    expect(c.caveats[0]).toMatch(/^DANGER: a logged reading went past the tank's working limit/);
    expect(c.verdictText).toMatch(/the log records a danger \(below\), and the tank is not fit to use\.$/);
    expect(c.findings[0]).toEqual({ severity: 'danger', text: describeLogFinding(report.findings[0]) });
    expect(c.findings[0].text).toContain(
      "line 4, fill 3: the tank reading 1500 Torr (absolute) is above the tank's working limit of 1495 Torr",
    );
    expect(c.readings[2].note).toContain('DANGER');
    for (const doc of [certificateToText(c), certificateToMarkdown(c), certificateToHtml(c)])
      expect(doc).toContain("DANGER: a logged reading went past the tank's working limit");
    expect(certificateToHtml(c)).toContain('class="labelbox fail"');
    const cli = await runCli(['label', f, '--trials', '100000']);
    expect(cli.code).toBe(3);
    expect(cli.stderr).toContain('the log records a danger');
    expect(cli.stdout).toContain(`# *** ${DANGER_HEADLINE} ***`);
    expect((await runCli(['check', f, '--trials', '100000'])).code).toBe(3);
  });

  it('an acknowledgement at the manifold does not lift it: still DANGER, still exit 3', async () => {
    const f = pastLimit();
    appendEvent(f, {
      kind: 'acknowledge',
      code: 'above-working-limit',
      step: 3,
      by: 'QX',
      time: '2026-11-30T10:20:00Z',
    });
    const log = readLog(f);
    const m = labelModel(await checkLog(log, { trials: 0, seed: 1 }), log);
    expect(labelLines(m)[0]).toBe(`*** ${DANGER_HEADLINE} ***`);
    expect((await runCli(['label', f, '--trials', '100000'])).code).toBe(3);
  });

  it('the same readings under the demo working limit: no danger, no caveat, exit 0', async () => {
    const f = rebuilt(PASSING, (file) => {
      for (const e of demoReadings) appendEvent(file, e);
    });
    const log = readLog(f);
    const m = labelModel(await checkLog(log, { trials: 0, seed: 1 }), log);
    expect(m.danger).toBe(false);
    expect(m.caveats).toEqual([]);
    // the headline whole (wide lines); at 76 columns it wraps (tests/report/label-width.test.ts)
    expect(labelLines(m, 200)[0]).toBe(
      'NOT SHOWN WITHIN TOLERANCE - inside on the readings, but the uncertainty reaches past it',
    );
  });
});

describe('certificate documents', () => {
  const model = async (f: string) => {
    const log = readLog(f);
    return buildCertificateModel(await checkLog(log, { trials: 0, seed: 1 }), log, META);
  };
  it('Markdown snapshot (failing batch)', async () => {
    expect(certificateToMarkdown(await model(FAILING))).toMatchSnapshot();
  });
  it('the text certificate: every row within 80 columns (its tables, paragraphs and findings), no word lost', async () => {
    for (const f of [PASSING, FAILING, 'batches/demo-ch4-phi1-from-premix.jsonl']) {
      const m = await model(f);
      const text = certificateToText(m);
      const wide = text.split('\n').filter((l) => l.length > 80);
      expect(wide, f).toEqual([]);
      // the paragraphs wrap, the words stay: the verdict and every finding read whole once flowed
      const flowed = text.replace(/\s+/g, ' ');
      expect(flowed).toContain(`VERDICT ${m.verdictText.replace(/\s+/g, ' ')}`);
      for (const x of m.findings) expect(flowed).toContain(x.text.replace(/\s+/g, ' '));
      // each reading's note under the readings table, by its fill number
      for (const r of m.readings.filter((x) => x.note))
        expect(flowed).toContain(`#${r.step} ${r.fill}: ${r.note.replace(/\s+/g, ' ')}`);
    }
  });

  it('plain-text snapshot (passing batch)', async () => {
    const text = certificateToText(await model(PASSING));
    // the wrapper keeps "(k = 2)" and a number with its unit on one row (report/wrap.ts `bound`)
    expect(text).not.toMatch(/\(k =?\n|\d\n +(%|ppm|Torr)/);
    expect(text).toMatch(/\n +\(k = 2\) reaches past it/);
    expect(text).toMatchSnapshot();
  });
  it('HTML snapshot and self-contained: inline CSS, no external references, the paper size asked for', async () => {
    const m = await model(FAILING);
    const html = certificateToHtml(m);
    expect(html).toMatchSnapshot();
    expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
    expect(html).not.toMatch(/<link /);
    expect(html).toContain('@page { size: A4');
    expect(certificateToHtml({ ...m, paper: 'letter' })).toContain('@page { size: letter');
    expect(html).toContain('class="labelbox fail"');
  });
});

describe('mixwright label', () => {
  it('writes a file atomically, refuses to overwrite it without --force (exit 2), and writes over it with --force', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const f = join(dir, 'cert.md');
    // the demo is not shown within tolerance (exit 7 as check); the file is written all the same
    expect((await runCli(['label', PASSING, '--format', 'md', '-o', f, '--trials', '100000'])).code).toBe(7);
    const first = readFileSync(f, 'utf8');
    expect(first).toContain('# Batch certificate');
    const again = await runCli(['label', PASSING, '--format', 'html', '-o', f, '--trials', '100000']);
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('add --force');
    expect(readFileSync(f, 'utf8')).toBe(first);
    expect(
      (await runCli(['label', PASSING, '--format', 'html', '-o', f, '--force', '--trials', '100000'])).code,
    ).toBe(7);
    expect(readFileSync(f, 'utf8')).toMatch(/^<!DOCTYPE html>/);
  });
  it('refuses what is not one batch log, and a PDF without a file (exit 2)', async () => {
    const csv = await runCli(['label', 'readings/ch4-phi1-ar98.csv']);
    expect(csv.code).toBe(2);
    expect(csv.stderr).toContain('a label is made from one batch log');
    const pdf = await runCli(['label', PASSING, '--format', 'pdf']);
    expect(pdf.code).toBe(2);
    expect(pdf.stderr).toContain('give -o label.pdf');
    expect((await runCli(['label', PASSING, '--trials', '10'])).code).toBe(2);
  });
});

// the real-browser test: Chromium prints the HTML certificate, poppler reads the PDF back
const chromium = findChromium();
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const hasPoppler =
  spawnSync('sh', ['-c', 'command -v pdftotext && command -v pdftoppm'], { encoding: 'utf8' }).status === 0;
if (!chromium || !hasPoppler)
  console.warn(
    `the real-browser label test needs chromium and poppler-utils; ${required ? 'required here' : 'skipped here'}`,
  );
describe.runIf((chromium && hasPoppler) || required)(
  'the HTML certificate and label in a real browser',
  () => {
    for (const [log, paper] of [
      [FAILING, 'a4'],
      [FAILING, 'letter'],
      [PASSING, 'letter'],
    ] as const) {
      it(
        `${log} on ${paper}: one page, every word inside the printable area, the label whole with its verdict`,
        { timeout: 120000 },
        () => {
          mkdirSync('artifacts', { recursive: true });
          const base = join('artifacts', `label-${log.includes('overshoot') ? 'fail' : 'pass'}-${paper}`);
          const pdf = `${base}.pdf`;
          const r = spawnSync(
            process.execPath,
            [
              'dist/mixwright.mjs',
              'label',
              log,
              '--format',
              'pdf',
              '--paper',
              paper,
              '-o',
              pdf,
              '--force',
              '--trials',
              '100000',
            ],
            { encoding: 'utf8' },
          );
          // the passing demo is not shown within tolerance: exit 7 (README "Exit codes"), the PDF written
          expect(r.status, r.stderr).toBe(log === FAILING ? 4 : 7);
          const info = execFileSync('pdfinfo', [pdf], { encoding: 'utf8' });
          expect(Number(/Pages:\s+(\d+)/.exec(info)![1])).toBe(1);
          const [w, h] = /Page size:\s+([\d.]+) x ([\d.]+)/.exec(info)!.slice(1).map(Number);
          expect(Math.round(w)).toBe(paper === 'a4' ? 595 : 612);
          execFileSync('pdftotext', ['-bbox', pdf, `${base}.bbox.html`]);
          const words = [
            ...readFileSync(`${base}.bbox.html`, 'utf8').matchAll(
              /<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g,
            ),
          ].map((m) => ({ x0: +m[1], x1: +m[3], y1: +m[4], t: m[5] }));
          for (const wd of words) {
            expect(wd.x0, wd.t).toBeGreaterThanOrEqual(28);
            expect(wd.x1, wd.t).toBeLessThanOrEqual(w - 28);
            expect(wd.y1, wd.t).toBeLessThanOrEqual(h - 28);
          }
          const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
          if (log === FAILING) {
            expect(text).toContain('FAIL - OUT OF TOLERANCE: NOT THE DESIGN MIXTURE');
            expect(text).toContain('DO NOT USE AS THE DESIGN MIXTURE');
            expect(text).toMatch(/C2H4 0\.7068 % ± 0\.0016 %/);
          } else expect(text).toMatch(/NOT SHOWN\s+WITHIN\s+TOLERANCE/);
          expect(text).toContain('Checked by');
          execFileSync('pdftoppm', ['-png', '-r', '80', pdf, base]);
          expect(existsSync(`${base}-1.png`)).toBe(true);
        },
      );
    }
  },
);

describe('label lines at 80 columns', () => {
  it('a long line wraps at words within the width, continuations indented as its text, no stranded last word', () => {
    // 31 words of 4 letters: 15 fill the first row of 76 exactly, 14 the next (indented 4): greedy wrapping
    // leaves 2 words (9 characters) on the last row
    const text = `! ${Array.from({ length: 31 }, (_, i) => `w${String(i).padStart(3, '0')}`).join(' ')}`;
    const rows = wrapLine(text, 76);
    expect(rows.length).toBeGreaterThan(1);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(76);
    expect(rows[0].startsWith('! w000 ')).toBe(true);
    // a hanging indent: two columns deeper than the text of the first row
    for (const r of rows.slice(1)) expect(r).toMatch(/^ {4}\S/);
    // the words all kept, in order
    expect(rows.map((r) => r.trim()).join(' ')).toBe(text);
    // the last row takes words from the row before it (one word, or under 12 characters, is stranded)
    expect(rows).toHaveLength(3);
    expect(rows[2]).toBe('    w028 w029 w030');
    expect(
      wrapLine('  CH4 0.31 % (relative) above design, but U 0.23 % reaches past the tolerance 0.50 %', 76),
    ).toEqual([
      '  CH4 0.31 % (relative) above design, but U 0.23 % reaches past the',
      '    tolerance 0.50 %',
    ]);
    expect(wrapLine('short', 76)).toEqual(['short']);
  });
});
