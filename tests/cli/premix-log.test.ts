// plan / sheet / check with an existing premix tank named by its batch log (--premix-log, recipe
// premix.log): the demo premix of MT-2 and the demo batch filled from it.
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { fixture, runCli, TORR } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const dir = mkdtempSync(join(tmpdir(), 'mw-premixlog-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('plan --premix-log', () => {
  it('plans the batch from the premix log: a Premix log line, the tank before/after, the batch that drew from it', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-log', PREMIX]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(
      /^Premix log {2}batches\/demo-premix-o2-ar-mt2\.jsonl \(premix-MT-2, tank MT-2, /m,
    );
    expect(r.stdout).toMatch(/O2 0\.134230 \+- 0\.00035/);
    expect(r.stdout).toMatch(
      /1890\.2 Torr at its last reading, 1841\.0 Torr before this batch \(less 0\.0802 mol drawn by batches\/demo-ch4-phi1-from-premix\.jsonl\)/,
    );
    expect(r.stdout).toMatch(/3 {2}Ar\+O2 +premix-MT-2 +head-1kT/);
  });

  it('plan --json: premix_log with the draw and the pressures, against CoolProp 8.0.0 HEOS (fixture premix-log-coolprop.json)', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-log', PREMIX, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const p = JSON.parse(r.stdout).premix_log;
    const ref = fixture('premix-log-coolprop.json');
    expect(p.path).toBe(PREMIX);
    expect(p.last_entry_sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(p.subtracted.map((s: { log: string }) => s.log)).toEqual([BATCH]);
    // the amount the demo batch drew: our inverse model against HEOS densities before and after its
    // premix fill (1e-4 relative; measured -7e-7)
    expect(Math.abs(p.subtracted[0].drawn_mol / ref.drawn_mol - 1)).toBeLessThan(1e-4);
    // the premix tank's pressure after that draw: virial equation against HEOS (0.01 Torr; measured 0.00004 Torr)
    expect(Math.abs(p.pressure_before_Pa - ref.premix_after_draw_Pa) / TORR).toBeLessThan(0.01);
    expect(p.last_reading_Pa).toBeCloseTo(ref.premix_last_reading_Pa, 6);
    expect(p.pressure_after_Pa).toBeLessThan(p.pressure_before_Pa);
    expect(p.pressure_after_Pa).toBeGreaterThan(p.required_Pa);
    expect(p.u.O2).toBeGreaterThan(0);
  });

  it('--order naming the premix by its source id is honoured (CH4, Ar, premix: no warning)', async () => {
    const r = await runCli([
      'plan',
      RECIPE,
      '--premix-log',
      PREMIX,
      '--order',
      'CH4,Ar,premix-MT-2',
      '--json',
    ]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.steps.map((s: { source: string }) => s.source)).toEqual(['cyl-CH4', 'cyl-Ar', 'premix-MT-2']);
  });

  it('an order without the premix is refused (exit 2, names the option and the premix id)', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-log', PREMIX, '--order', 'CH4,Ar,O2']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/does not name the premix premix-MT-2/);
  });

  it("--premix-log replaces a recipe's premix.tank (stage 1's recipe serves stage 2); both in the recipe are refused", async () => {
    const f = join(dir, 'both.yaml');
    writeFileSync(f, readFileSync(RECIPE, 'utf8') + '\npremix:\n  tank: MT-2\n');
    const r = await runCli(['plan', f, '--premix-log', resolve(PREMIX), '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.premix_log.source).toBe('premix-MT-2');
    expect(j.two_stage).toBeNull();
    const g = join(dir, 'both-in-recipe.yaml');
    writeFileSync(g, readFileSync(RECIPE, 'utf8') + `\npremix:\n  tank: MT-2\n  log: ${resolve(PREMIX)}\n`);
    const q = await runCli(['plan', g]);
    expect(q.code).toBe(2);
    expect(q.stderr).toMatch(/premix/);
    expect(q.stderr).toMatch(/line \d+/);
    // a premix log with the particulars of a premix to make (its gases) is refused the same way
    const h = join(dir, 'gases.yaml');
    writeFileSync(h, readFileSync(RECIPE, 'utf8') + `\npremix:\n  log: ${resolve(PREMIX)}\n  gases: [O2]\n`);
    const r2 = await runCli(['plan', h]);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/premix\.gases \(.*line \d+\) and premix\.log \(.*line \d+\)/);
  });

  it('recipe premix.log is relative to the recipe file', async () => {
    copyFileSync(PREMIX, join(dir, 'pm.jsonl'));
    const f = join(dir, 'from-log.yaml');
    const lab = resolve('recipes', 'lab.yaml');
    const text = readFileSync(RECIPE, 'utf8').replace(/^lab: .*$/m, `lab: ${lab}`);
    writeFileSync(f, text + '\npremix:\n  log: pm.jsonl\n');
    const r = await runCli(['plan', f, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const p = JSON.parse(r.stdout).premix_log;
    expect(p.path).toBe('pm.jsonl');
    // no batch log in that folder draws from it: the last reading is the pressure before
    expect(p.subtracted).toEqual([]);
    expect(p.pressure_before_Pa).toBeCloseTo(p.last_reading_Pa, 6);
  });

  it('refuses a log that is not finished, a log with a gas not in the design, a missing log (exit 2)', async () => {
    const open = join(dir, 'open.jsonl');
    const lines = readFileSync(PREMIX, 'utf8').trimEnd().split('\n');
    writeFileSync(open, lines.slice(0, -1).join('\n') + '\n'); // the close event removed
    let r = await runCli(['plan', RECIPE, '--premix-log', open]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/is not a finished fill \(not closed\)/);
    expect(r.stderr).toMatch(/--premix-log/);
    r = await runCli(['plan', RECIPE, '--premix-log', 'batches/demo-c2h4-phi05-ar-overshoot.jsonl']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/premix-log-refused|premix log/);
    r = await runCli(['plan', RECIPE, '--premix-log', join(dir, 'none.jsonl')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/cannot be read as a batch log/);
  });

  it('refuses a premix tank drawn too low by the batches in its folder (too little gas)', async () => {
    const folder = mkdtempSync(join(dir, 'low-'));
    copyFileSync(PREMIX, join(folder, 'demo-premix-o2-ar-mt2.jsonl'));
    // 36 earlier batches of 0.0802 mol each: 1890 Torr falls to about 120 Torr, below what any fill
    // sequence needs from it (the premix read at 159 Torr or more, + 10 %); with 27 (560 Torr) the
    // sequence search still finds one that reads the premix low enough
    for (let i = 0; i < 36; i++) copyFileSync(BATCH, join(folder, `b${String(i).padStart(2, '0')}.jsonl`));
    const r = await runCli(['plan', RECIPE, '--premix-log', join(folder, 'demo-premix-o2-ar-mt2.jsonl')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/the premix tank MT-2 of premix log .* holds \d+(\.\d+)? Torr now/);
    expect(r.stderr).toMatch(/make a new premix/);
  });
});

describe('sheet and check with a premix log', () => {
  it('the sheet names the premix log, its composition and the premix tank pressures', async () => {
    const r = await runCli(['sheet', RECIPE, '--premix-log', PREMIX, '--format', 'txt']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/premix log.*demo-premix-o2-ar-mt2\.jsonl/i);
    expect(r.stdout).toMatch(/O2 0\.134230 \+- 0\.00035/);
  });

  it('check of the batch log re-checks its premix log: a Premix line, premix_logs in JSON', async () => {
    const t = await runCli(['check', BATCH, '--trials', '100000']);
    expect(t.code, t.stderr).toBe(0);
    expect(t.stdout).toMatch(
      /^Premix {6}demo-premix-o2-ar-mt2\.jsonl \(demo-premix-o2-ar-mt2, tank MT-2\): .*O2 0\.134230 \+- 0\.00035/m,
    );
    const j = JSON.parse((await runCli(['check', BATCH, '--trials', '100000', '--json'])).stdout);
    expect(j.premix_logs.map((p: { id: string }) => p.id)).toEqual(['demo-premix-o2-ar-mt2']);
    expect(j.composition.O2.u).toBeGreaterThan(0);
  });

  it('check of a batch whose premix log has gone is exit 2 and names it', async () => {
    const folder = mkdtempSync(join(dir, 'gone-'));
    copyFileSync(BATCH, join(folder, 'batch.jsonl'));
    const r = await runCli(['check', join(folder, 'batch.jsonl'), '--trials', '100000']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/premix log demo-premix-o2-ar-mt2\.jsonl cannot be read/);
  });

  it('check of CSV readings with --premix-log: a row names the premix by its source id; the same result as the log', async () => {
    const csv = 'readings/ch4-phi1-from-premix.csv';
    const args = ['--recipe', RECIPE, '--premix-log', PREMIX, '--trials', '100000', '--json'];
    const r = await runCli(['check', csv, ...args]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const log = JSON.parse((await runCli(['check', BATCH, '--trials', '100000', '--json'])).stdout);
    // identity: the CSV rows are the log's readings, read with the same model and premix budget (1e-12)
    for (const k of ['CH4', 'O2', 'Ar']) {
      expect(j.composition[k].value).toBeCloseTo(log.composition[k].value, 12);
      expect(Math.abs(j.composition[k].u / log.composition[k].u - 1)).toBeLessThan(1e-12);
    }
    expect(j.premix_logs.map((p: { id: string }) => p.id)).toEqual(['demo-premix-o2-ar-mt2']);
    // without it the row's name is not known; on a batch log the option is refused (the log names its own)
    expect((await runCli(['check', csv, '--recipe', RECIPE])).code).toBe(2);
    const onLog = await runCli(['check', BATCH, '--premix-log', PREMIX]);
    expect(onLog.code).toBe(2);
    expect(onLog.stderr).toMatch(/--premix-log is for CSV readings only/);
  });

  // a premix log named for readings that never draw from it would otherwise print its "Premix" line as
  // if the batch had been filled from it: refused (exit 2), saying which rows and how to name the premix
  it('check of CSV readings with --premix-log where no row draws from that premix: refused, not-drawn', async () => {
    const csv = 'readings/ch4-phi1-ar98.csv';
    for (const basis of [['--recipe', RECIPE], []]) {
      const r = await runCli(['check', csv, ...basis, '--premix-log', PREMIX]);
      expect(r.code, r.stderr).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('premix-log-refused');
      expect(r.stderr.replace(/\s+/g, ' ')).toMatch(
        /--premix-log: premix log .*demo-premix-o2-ar-mt2\.jsonl was given, but no row of .*ch4-phi1-ar98\.csv draws from that premix: the rows name CH4, Ar, O2, none of them premix-MT-2 or Ar\+O2.*leave --premix-log out/,
      );
      const j = JSON.parse((await runCli(['check', csv, ...basis, '--premix-log', PREMIX, '--json'])).stdout);
      expect(j.verdict).toBe('refused');
      expect(j.refused.field).toBe('--premix-log');
      expect(j.refused.premix_log.cause).toEqual({
        kind: 'not-drawn',
        file: csv,
        names: ['premix-MT-2', 'Ar+O2'],
        rows: ['CH4', 'Ar', 'O2'],
      });
    }
  });

  // a folder: the option serves the files that draw from the premix; the others are checked without it,
  // and each says so (never a Premix line of a batch that did not use it, nor a folder-wide refusal)
  it('check of a folder of CSV readings with --premix-log: used where a row draws from it, said unused elsewhere', async () => {
    const folder = mkdtempSync(join(dir, 'csv-folder-'));
    for (const f of ['ch4-phi1-ar98.csv', 'ch4-phi1-from-premix.csv'])
      copyFileSync(join('readings', f), join(folder, f));
    const args = ['--recipe', RECIPE, '--premix-log', PREMIX, '--trials', '100000'];
    const r = await runCli(['check', folder, ...args, '--json']);
    expect(r.stderr).toBe('');
    const rows: {
      file: string;
      verdict: string;
      check: { warnings: string[]; premix_logs: { id: string }[] };
    }[] = JSON.parse(r.stdout);
    const byName = (n: string) => rows.find((x) => x.file.endsWith(n))!;
    const plain = byName('ch4-phi1-ar98.csv');
    const drawn = byName('ch4-phi1-from-premix.csv');
    expect(plain.verdict).not.toBe('refused');
    expect(plain.check.premix_logs).toEqual([]);
    expect(plain.check.warnings).toContain(
      `--premix-log ${PREMIX} was not used for this file: none of its rows (CH4, Ar, O2) draws from that ` +
        'premix (premix-MT-2 or Ar+O2)',
    );
    expect(drawn.check.premix_logs.map((p) => p.id)).toEqual(['demo-premix-o2-ar-mt2']);
    expect(drawn.check.warnings.join('\n')).not.toMatch(/was not used/);
  });
});

// a premix log changed after it was written (a line off its hash chain, as `check` finds it) is not a
// source: its composition is not the one the premix was filled to. `check` of it is never a bare pass.
describe('an altered or unclosed premix log', () => {
  const altered = join(dir, 'altered', 'premix.jsonl');
  const unclosed = join(dir, 'altered', 'unclosed.jsonl');
  const lines = readFileSync(PREMIX, 'utf8').split('\n');
  // line 3 (the O2 reading): its time changed by hand, the numbers left as they were
  const edited = [...lines];
  edited[2] = edited[2].replace(/"time":"([^"]*)00Z"/, '"time":"$159Z"');
  expect(edited[2]).not.toBe(lines[2]);
  mkdirSync(join(dir, 'altered'));
  writeFileSync(altered, edited.join('\n'));
  // the close entry (the last line) cut off: the chain is whole, the fill never closed
  const body = lines.filter((l) => l.trim());
  expect(JSON.parse(body[body.length - 1]).kind).toBe('close');
  writeFileSync(unclosed, body.slice(0, -1).join('\n') + '\n');

  for (const command of ['plan', 'sheet'])
    it(`${command} --premix-log refuses it, naming the line and what to do`, async () => {
      const r = await runCli([
        command,
        RECIPE,
        '--premix-log',
        altered,
        ...(command === 'sheet' ? ['--format', 'txt'] : []),
      ]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toContain('premix-log-refused');
      expect(r.stderr).toMatch(
        /--premix-log: premix log .*premix\.jsonl was changed after it was written: line 3 does not match/,
      );
      expect(r.stderr).toMatch(/restore the log as it was written/);
    });

  it('check: the verdict leads with RECORD ALTERED AFTER WRITING (line 3) - not a pass, then the numbers as they stand; exit 5; JSON says so', async () => {
    const r = await runCli(['check', altered, '--trials', '100000']);
    expect(r.code).toBe(5);
    expect(r.stdout).toMatch(
      /^Verdict {5}RECORD ALTERED AFTER WRITING \(line 3\) - not a pass: the record was changed after it was written, .*; on the numbers as they stand every design fraction is within its tolerance, uncertainty included \(the composition alone, which does not make the tank usable\)/m,
    );
    expect(r.stdout).not.toMatch(/Verdict {5}(PASS|pass)/);
    const j = await runCli(['check', altered, '--trials', '100000', '--json']);
    expect(j.code).toBe(5);
    expect(JSON.parse(j.stdout)).toMatchObject({ record_altered_lines: [3], record_closed: true });
  });

  it('check: a log never closed is marked NOT CLOSED beside its pass, and is not a pass (exit 7)', async () => {
    const r = await runCli(['check', unclosed, '--trials', '100000']);
    expect(r.code).toBe(7);
    // the label says it on the label itself, and exits as check
    const label = await runCli(['label', unclosed, '--trials', '100000']);
    expect(label.code).toBe(7);
    expect(label.stdout.slice(0, label.stdout.indexOf('BATCH CERTIFICATE'))).toContain(
      'NOT CLOSED: the fill never ended with a close entry',
    );
    // the composition alone is within tolerance; the verdict leads with NOT A PASS (never "PASS" where exit is 7)
    expect(r.stdout).toMatch(
      /^Verdict {5}NOT A PASS - the composition alone is within tolerance .*, which does not make the tank usable: .* - NOT CLOSED: /m,
    );
    expect(label.stdout).toContain('*** NOT CLOSED - NOT A PASS ***');
    const j = JSON.parse((await runCli(['check', unclosed, '--trials', '100000', '--json'])).stdout);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual(['not-closed', 'pass', ['not-closed']]);
  });

  it('check FOLDER: neither is a bare pass in the summary; exit 5', async () => {
    const r = await runCli(['check', join(dir, 'altered')]);
    expect(r.code).toBe(5);
    expect(r.stdout).toMatch(
      /premix\.jsonl +\S+ +\S.*? +RECORD ALTERED AFTER WRITING \(line 3\) - not a pass; the numbers alone: every design fraction within tolerance, uncertainty included: the composition alone, which does not make the tank usable +/,
    );
    expect(r.stdout).toMatch(
      /unclosed\.jsonl +\S+ +\S.*? +NOT A PASS \(composition alone within tolerance, which does not make the tank usable\), NOT CLOSED/,
    );
    // neither row says "pass" as a judgement: only "not a pass"
    for (const row of r.stdout.split('\n').filter((l) => /(premix|unclosed)\.jsonl/.test(l)))
      expect(row.replace(/not a pass/gi, '')).not.toMatch(/\bpass(-uncertain)?\b/i);
  });
});
