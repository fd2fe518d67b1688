// `check` lists who took each reading: the `by` the guided fill writes on every reading line (the
// session's operator), in the readings table (a `by` column) and on each reading of `--json`. A log
// line without `by` (logs written before readings carried initials) is read as before: no column
// where no reading names anyone, `(not named)` beside readings that do, `by: null` in the JSON. A
// corrected reading stays the reading of who took it (`corrected_by` the corrector); a CSV names
// its readers in an optional `by` column.
// No computed number is checked here; only what is said of who read the tank.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { appendEvent, readLog } from '../../src/io/batch-log.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

const TRIALS = ['--trials', '100000'];
const dir = mkdtempSync(join(tmpdir(), 'mw-read-by-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** the demo recipe's plan read at its targets, each reading by `byOf(step)` */
function log(name: string, byOf: (step: number) => string | undefined): string {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  return logAtTargets(join(dir, name), planFill(req.input), req, 'by1', undefined, { byOf });
}

/** the readings table of the text report: its header and one row per reading */
function table(stdout: string): string[] {
  const lines = stdout.split('\n');
  const head = lines.findIndex((l) => l.startsWith('#  fill'));
  expect(head).toBeGreaterThan(0);
  const end = lines.findIndex((l, i) => i > head && l.trim() === '');
  return lines.slice(head, end);
}

/**
 * `check ARGS` as text and --json: the by column's cells (the header ends in it) and each JSON
 * reading's [step, by, corrected_by]
 */
async function whoRead(args: readonly string[]): Promise<{ cells: string[]; json: unknown[][] }> {
  const rows = table((await runCli(['check', ...args, ...TRIALS])).stdout);
  expect(rows[0]).toMatch(/T degC {2}by$/);
  const j = JSON.parse((await runCli(['check', ...args, '--json', ...TRIALS])).stdout);
  type Row = { step: number; by: string | null; corrected_by: string | null };
  return {
    cells: rows.slice(1).map((l) => l.replace(/.*\d\.\d\d {2}/, '')),
    json: j.readings.map((x: Row) => [x.step, x.by, x.corrected_by]),
  };
}

describe('check: who took each reading', () => {
  it('a log whose readings name their operators: a by column and by in --json, reading by reading', async () => {
    const who: Record<number, string | undefined> = { 1: 'TT', 2: 'AB', 3: undefined, 4: 'TT' };
    const f = log('mixed.jsonl', (s) => who[s]);
    const w = await whoRead([f]);
    expect(w.cells).toEqual(['TT', 'AB', '(not named)', 'TT']);
    expect(w.json).toEqual([
      [1, 'TT', null],
      [2, 'AB', null],
      [3, null, null],
      [4, 'TT', null],
    ]);
  });

  it('a corrected reading: by names who read the gauge, not the corrector; corrected_by names the corrector', async () => {
    const file = join(dir, 'corrected.jsonl');
    const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
    const who: Record<number, string | undefined> = { 1: 'TT', 2: 'AB', 3: undefined, 4: 'TT' };
    logAtTargets(file, planFill(req.input), req, 'by2', undefined, { byOf: (s) => who[s], close: false });
    const log = readLog(file);
    // step 2 (read by AB) corrected by CD, then corrected again by EF; step 3 (nobody named) by CD
    const fix = (step: number, by: string, minute: number) => {
      const old = readLog(file).readings.find((r) => r.step === step)!;
      const { line: _l, chain: _c, ...fields } = old as typeof old & { chain?: string };
      void _l;
      void _c;
      appendEvent(file, {
        ...fields,
        kind: 'correction',
        by,
        reason: 'mistyped',
        replaces_line: old.line,
        time: `2026-12-02T09:4${minute}:00Z`,
      });
    };
    expect(log.readings).toHaveLength(4);
    fix(2, 'CD', 1);
    fix(2, 'EF', 2);
    fix(3, 'CD', 3);
    appendEvent(file, { kind: 'close', time: '2026-12-02T09:50:00Z' });
    const w = await whoRead([file]);
    expect(w.cells).toEqual(['TT', 'AB; corrected by EF', '(not named); corrected by CD', 'TT']);
    expect(w.json).toEqual([
      [1, 'TT', null],
      [2, 'AB', 'EF'],
      [3, null, 'CD'],
      [4, 'TT', null],
    ]);
  });

  it('a log with no initials on its readings (as older logs): no by column, by null in --json', async () => {
    const f = log('none.jsonl', () => undefined);
    const rows = table((await runCli(['check', f, ...TRIALS])).stdout);
    expect(rows[0]).toMatch(/T degC$/);
    expect(rows.join('\n')).not.toMatch(/not named|\bby\b/);
    const j = JSON.parse((await runCli(['check', f, '--json', ...TRIALS])).stdout);
    expect(j.readings).toHaveLength(4);
    expect(j.readings.every((x: { by: unknown; corrected_by: unknown }) => x.by === null)).toBe(true);
    expect(j.readings.every((x: { corrected_by: unknown }) => x.corrected_by === null)).toBe(true);
  });

  it('a CSV with a by column: who read each row, as for a log; an empty cell names nobody', async () => {
    const w = await whoRead(['readings/ch4-phi1-ar98-split.csv', '--recipe', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(w.cells).toEqual(['KL', 'KL', '(not named)', 'MV']);
    expect(w.json).toEqual([
      [1, 'KL', null],
      [2, 'KL', null],
      [3, null, null],
      [4, 'MV', null],
    ]);
  });

  it('a CSV by that is not initials is refused at its line, what to do said; nothing checked', async () => {
    const f = join(dir, 'bad-by.csv');
    writeFileSync(
      f,
      'species,pressure,temperature,by\nCH4,10.0126 Torr,25 degC,KL\nO2,30.03 Torr,25 degC,K.L.\n' +
        'Ar,1500.0 Torr,25 degC,KL\n',
    );
    const r = await runCli(['check', f, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml', ...TRIALS]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('initials "K.L." must be 1-6 letters');
    expect(r.stderr).toMatch(/bad-by\.csv:3 by: /);
    expect(r.stderr).toContain('leave it empty where the record names nobody');
  });

  it('CSV readings name nobody: no by column, by null in --json', async () => {
    const csv = 'readings/ch4-phi1-ar98.csv';
    const args = [csv, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml', ...TRIALS];
    expect(table((await runCli(['check', ...args])).stdout)[0]).toMatch(/T degC$/);
    const j = JSON.parse((await runCli(['check', ...args, '--json'])).stdout);
    expect(j.readings.map((x: { by: unknown }) => x.by)).toEqual([null, null, null]);
  });
});
