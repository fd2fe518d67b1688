import { describe, expect, it } from 'vitest';
import {
  copyFileSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  symlinkSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { designOptions, runCli, STACK_LINE, stderrWords, TORR } from '../helpers.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-cli-inputs-'));
const PSI = 6894.757293168; // lb x g_n / in^2, exact chain of definitions

/** a refusal: exit 2, the problem code, no stack, no NaN */
function refused(
  r: { code: number; stdout: string; stderr: string; stderrShown: string },
  code: string,
): void {
  expect(r.code, r.stderr).toBe(2);
  expect(r.stderr).toContain(`(error code: ${code})`);
  expect(r.stderrShown).not.toMatch(STACK_LINE);
  expect(r.stderr).not.toMatch(/internal error|NaN|Infinity/);
}

describe('the output file of sheet', () => {
  it('-o FOLDER --force is refused (a folder is never replaced) and nothing is written', async () => {
    const d = tmp();
    mkdirSync(join(d, 'out.html'));
    refused(await runCli(['sheet', RECIPE, '-o', join(d, 'out.html'), '--force']), 'write-failed');
    expect(readdirSync(d)).toEqual(['out.html']);
    expect(readdirSync(join(d, 'out.html'))).toEqual([]);
  });
  it('a dangling symbolic link is an existing name: refused without --force', async () => {
    const d = tmp();
    symlinkSync(join(d, 'missing.md'), join(d, 'x.md'));
    const r = await runCli(['sheet', RECIPE, '-o', join(d, 'x.md')]);
    refused(r, 'write-failed');
    expect(r.stderr).toContain('symbolic link');
    expect(r.stdout).not.toContain('wrote');
  });
  it('a missing folder is named', async () => {
    const r = await runCli(['sheet', RECIPE, '-o', join(tmp(), 'nope', 's.md')]);
    refused(r, 'write-failed');
    expect(r.stderr).toContain('does not exist');
  });
  it('the format comes from the extension of -o; an unknown extension or a disagreeing --format is refused', async () => {
    const d = tmp();
    const md = await runCli(['sheet', RECIPE, '-o', join(d, 's.md')]);
    expect(md.code, md.stderr).toBe(0);
    expect(readFileSync(join(d, 's.md'), 'utf8')).not.toMatch(/^<!DOCTYPE|<html/i);
    const txt = await runCli(['sheet', RECIPE, '-o', join(d, 's.txt')]);
    expect(txt.code, txt.stderr).toBe(0);
    expect(readFileSync(join(d, 's.txt'), 'utf8')).not.toMatch(/<html/i);
    const docx = await runCli(['sheet', RECIPE, '-o', join(d, 's.docx')]);
    refused(docx, 'format-unknown');
    expect(docx.stderr).toContain('.docx');
    refused(await runCli(['sheet', RECIPE, '--format', 'html', '-o', join(d, 's.pdf')]), 'format-mismatch');
    expect(readdirSync(d).sort()).toEqual(['s.md', 's.txt']);
  });
});

describe('input people type', () => {
  it("a misspelled unit is named in one sentence (the unit library's own full stop is not doubled)", async () => {
    const r = await runCli(['plan', RECIPE, '--pressure', '1500 Tor']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'cannot read "1500 Tor" as a pressure: Unit "Tor" not found. Give a number and a unit',
    );
    expect(r.stderr).not.toContain('..');
  });
  it('a gauge pressure is converted with --barometer: 15 psig at 750 Torr = 15 psi + 750 Torr absolute (definition of gauge pressure)', async () => {
    const r = await runCli(['plan', RECIPE, '--pressure', '15 psig', '--barometer', '750 Torr', '--json']);
    expect([0, 3]).toContain(r.code);
    const j = JSON.parse(r.stdout);
    const last = j.steps[j.steps.length - 1].target_Pa;
    expect(Math.abs(last - (15 * PSI + 750 * TORR))).toBeLessThan(1e-6);
  });
  it('a gauge pressure with no barometer anywhere is refused, saying what to give', async () => {
    const d = tmp();
    const lab = join(d, 'lab.yaml');
    writeFileSync(
      lab,
      DEMO_LAB_YAML.replace(/barometer:\n {2}pressure: 760 Torr\n {2}uncertainty: 0.4 Torr\n/, ''),
    );
    const r = await runCli(['plan', RECIPE, '--lab', lab, '--pressure', '15 psig']);
    refused(r, 'needs-barometer');
    expect(r.stderr).toMatch(/--pressure.*--barometer/);
  });
  it('--barometer outside the atmosphere is refused with the range', async () => {
    const r = await runCli(['plan', RECIPE, '--barometer', '7600 Torr']);
    refused(r, 'out-of-range');
    expect(r.stderr).toContain('300 hPa to 1100 hPa');
  });
  it('22 C is refused with "did you mean degC?"; 22 °C is read', async () => {
    const r = await runCli(['plan', RECIPE, '--temperature', '22 C']);
    refused(r, 'bad-quantity');
    expect(r.stderr).toContain('did you mean degC?');
    expect((await runCli(['plan', RECIPE, '--temperature', '22 °C'])).code).toBe(0);
  });
  it('--rating for a tank given by --volume: a final pressure above it is refused (exit 2), above its working limit a danger (exit 3)', async () => {
    const inline = [
      'plan',
      ...designOptions({ dilution: '0.98', pressure: '1500 Torr', temperature: '25 degC' }),
    ];
    // 1500 Torr is 2 bar: above a 1 bar rating, refused at --pressure with nothing planned
    const above = await runCli([...inline, '--rating', '1 bar', '--json']);
    refused(above, 'design-conflict');
    // --json: the refusal as its object, no plan
    expect(JSON.parse(above.stdout)).toMatchObject({ verdict: 'refused', refused: { field: '--pressure' } });
    expect(JSON.parse(above.stdout).steps).toBeUndefined();
    expect(stderrWords(above.stderrShown)).toContain(
      '--pressure: the final pressure, 199984 Pa (1500 Torr), is above the rating of the tank of the given volume',
    );
    // within a 2.2 bar rating, above its working limit (x 0.8 = 1.76 bar): planned with the danger
    const over = await runCli([...inline, '--rating', '2.2 bar', '--working-fraction', '0.8', '--json']);
    expect(over.code, over.stderr).toBe(3);
    expect(JSON.parse(over.stdout).findings.map((f: { code: string }) => f.code)).toContain(
      'tank-over-rating',
    );
    const ok = await runCli([...inline, '--rating', '45 psig', '--working-fraction', '0.9', '--json']);
    expect(ok.code, ok.stderr).toBe(0);
    expect(JSON.parse(ok.stdout).findings.map((f: { code: string }) => f.code)).not.toContain(
      'tank-rating-unknown',
    );
    refused(await runCli([...inline, '--working-fraction', '0.9']), 'working-fraction-without-rating');
    refused(await runCli(['plan', RECIPE, '--rating', '4 bar']), 'rating-with-lab-tank');
  });
  it('a final pressure above the lab tank rating is refused at its recipe line, its option, the count or premix.pressure', async () => {
    const d = tmp();
    const text = readFileSync(RECIPE, 'utf8');
    const line = text.split('\n').findIndex((l) => l.startsWith('pressure:')) + 1;
    // MT-1 is rated 4 bar (3000.25 Torr): 3500 Torr in the recipe file
    const file = join(d, 'over.yaml');
    writeFileSync(file, text.replace(/^pressure: .*$/m, 'pressure: 3500 Torr'));
    const r = await runCli(['plan', file]);
    refused(r, 'design-conflict');
    expect(r.stdout).toBe('');
    expect(stderrWords(r.stderrShown)).toContain(
      `${file}:${line}:11 pressure: the final pressure, 466628 Pa (3500 Torr), is above the rating of tank MT-1`,
    );
    expect(readFileSync(file, 'utf8')).toContain('pressure: 3500 Torr');
    // the same on the command line, and a number of experiments that needs more than the rating
    refused(await runCli(['plan', RECIPE, '--pressure', '3500 Torr']), 'design-conflict');
    const count = await runCli(['plan', RECIPE, '--experiments', '200', '--reactor', 'ST-A']);
    refused(count, 'design-conflict');
    expect(stderrWords(count.stderrShown)).toMatch(
      /^mixwright: --experiments: the final pressure, .* is above the rating/,
    );
    // a premix tank filled above its rating (MT-2, 7 bar = 5250.4 Torr): at the recipe's premix.pressure
    const pm = join(d, 'premix.yaml');
    writeFileSync(pm, `${text}premix: { tank: MT-2, pressure: 6000 Torr }\n`);
    const p = await runCli(['plan', pm]);
    refused(p, 'design-conflict');
    expect(stderrWords(p.stderrShown)).toContain(
      `premix.pressure: the premix pressure of tank MT-2, 799934 Pa (6000 Torr), is above the rating of tank MT-2`,
    );
  });
  it('a batch too small for one experiment is a warning finding', async () => {
    const r = await runCli(['plan', RECIPE, '--pressure', '42 Torr', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const f = JSON.parse(r.stdout).findings.find((x: { code: string }) => x.code === 'batch-too-small');
    expect(f?.severity).toBe('warning');
  });
});

describe('check: readings as people write them', () => {
  it('a CSV from Excel with a byte-order mark is read', async () => {
    const d = tmp();
    const f = join(d, 'bom.csv');
    writeFileSync(f, '\ufeff' + readFileSync('readings/ch4-phi1-ar98.csv', 'utf8'));
    const r = await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000']);
    // read as without the mark: the demo readings, not shown within tolerance (exit 7, README "Exit codes")
    expect(r.code, r.stderr).toBe(7);
    expect(r.stdout).toMatch(/^Verdict {5}NOT SHOWN WITHIN TOLERANCE/m);
  });
  it('a gauge-referenced sensor in the gauge column: its reading plus --barometer is the absolute pressure', async () => {
    const d = tmp();
    const f = join(d, 'g.csv');
    writeFileSync(
      f,
      'species,pressure,temperature,gauge\nCH4,50 Torr,25 degC,head-1kT\nAr,5 psi,25 degC,xdcr-100g\nO2,25 psia,25 degC,xdcr-100g\n',
    );
    const r = await runCli(['check', f, '--barometer', '750 Torr', '--json', '--trials', '100000']);
    // no recipe: no design to compare with, so no pass (exit 7)
    expect(r.code).toBe(7);
    const p = JSON.parse(r.stdout).readings.map((x: { pressure_Pa: number }) => x.pressure_Pa);
    expect(p[0]).toBeCloseTo(50 * TORR, 9);
    expect(Math.abs(p[1] - (5 * PSI + 750 * TORR))).toBeLessThan(1e-6); // gauge reading + barometer
    expect(Math.abs(p[2] - 25 * PSI)).toBeLessThan(1e-6); // "psia" says absolute
  });
  it('--barometer on a batch log is refused (the log records its own)', async () => {
    refused(
      await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--barometer', '750 Torr']),
      'option-for-csv-only',
    );
  });
  it('a folder with a bad log: exit 2 and the refused file named on stderr', async () => {
    const d = tmp();
    copyFileSync('batches/demo-ch4-phi1-ar98.jsonl', join(d, 'a.jsonl'));
    writeFileSync(join(d, 'b.jsonl'), '{"kind": "nonsense"}\n');
    const r = await runCli(['check', d]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('b.jsonl');
    expect(r.stderr).toContain('1 of 2 files');
  });
  it('an incomplete batch says INCOMPLETE, not out of tolerance', async () => {
    const d = tmp();
    const f = join(d, 'part.csv');
    writeFileSync(f, 'species,pressure,temperature\nCH4,10.0126 Torr,25 degC\nAr,1480.02 Torr,25 degC\n');
    const r = await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000']);
    expect(r.code).toBe(4);
    expect(r.stdout).toContain('INCOMPLETE');
    expect(r.stdout).not.toContain('out of tolerance');
  });
  it('denormal pressures with many trials: a refusal naming the line, not an internal error', async () => {
    const d = tmp();
    const f = join(d, 'den.csv');
    writeFileSync(f, 'species,pressure,temperature\nCH4,5e-324 Pa,25.0 degC\n');
    const r = await runCli(['check', f, '--trials', '100000']);
    refused(r, 'out-of-range');
    expect(r.stderr).toContain('den.csv:2');
  });
});

describe('names the lookups must not find', () => {
  it('schema constructor, species constructor and --fuel __proto__ are refused as unknown', async () => {
    refused(await runCli(['schema', 'constructor']), 'unknown-schema');
    refused(await runCli(['species', 'constructor']), 'unknown-species');
    refused(await runCli(['plan', RECIPE, '--fuel', '__proto__']), 'unknown-species');
    refused(await runCli(['plan', RECIPE, '--pressure', '1 constructor']), 'bad-quantity');
  });
});
