// On an incomplete batch (a log with 2 of its 4 fills; a CSV with its O2 row removed) no composition row
// may read "ok" or "within" as if the batch had passed, nor "OUT" as if it were a final judgement: a
// fraction is judged on the readings given only, and the text, the certificate and --json say so. Wording only: the readings are
// the plan's own targets (tests/log-at-targets.ts); no computed number is checked.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const TRIALS = ['--trials', '100000'];
const dir = mkdtempSync(join(tmpdir(), 'mw-incomplete-'));

/** the status column of the composition table's row of `species` */
const statusOf = (text: string, species: string) =>
  new RegExp(`^${species} .*  (ok\\?? so far|ok\\??|OUT so far|OUT)$`, 'm').exec(text)?.[1];

describe('composition rows on an incomplete batch', () => {
  it('a log with 2 of 4 fills: Ar reads "ok so far" (text), "within so far" (certificate), JSON marks it', async () => {
    const req = buildPlanRequest(readRecipe(RECIPE));
    const full = logAtTargets(join(dir, 'full.jsonl'), planFill(req.input), req, 'inc2', undefined);
    const f = join(dir, 'two.jsonl');
    // the header and the first two readings: fills 3 and 4 not yet made
    writeFileSync(f, readFileSync(full, 'utf8').split('\n').slice(0, 3).join('\n') + '\n');
    const r = await runCli(['check', f, ...TRIALS]);
    expect(r.code, r.stderr).toBe(4);
    expect(statusOf(r.stdout, 'Ar')).toBe('ok so far');
    // CH4 without the gas after it is far above its design fraction: outside, but not a final judgement
    expect(statusOf(r.stdout, 'CH4')).toBe('OUT so far');
    expect(r.stdout).not.toMatch(/ (ok\??|OUT)$/m);
    expect(r.stdout).toContain(
      '"so far": the batch is incomplete - no reading for step 3, step 4; each fraction is judged on the ' +
        'fills logged so far only: "ok so far" is inside its tolerance, not passed; "OUT so far" is ' +
        'outside its tolerance, not a final judgement',
    );
    expect(r.stdout).toContain('on the recorded states and fill paths so far (the batch is incomplete');
    const label = await runCli(['label', f, ...TRIALS]);
    expect(label.stdout).toMatch(/^ {2}Ar .* within so far$/m);
    expect(label.stdout).toMatch(/^ {2}CH4 .* OUT so far$/m);
    expect(label.stdout).not.toMatch(/ (within|OUT)$/m);
    const j = JSON.parse((await runCli(['check', f, ...TRIALS, '--json'])).stdout);
    const ar = j.deviations.find((d: { species: string }) => d.species === 'Ar');
    expect([ar.within, ar.batch_incomplete]).toEqual([true, true]);
  });

  it('a CSV with its O2 row removed: CH4 reads "ok so far", the review "as the rows stand"', async () => {
    const text = readFileSync('readings/ch4-phi1-ar98-split.csv', 'utf8');
    const f = join(dir, 'no-o2.csv');
    writeFileSync(f, text.replace(/^O2,.*\n/m, ''));
    expect(readFileSync(f, 'utf8')).not.toMatch(/^O2,/m);
    const r = await runCli(['check', f, '--recipe', RECIPE, ...TRIALS]);
    expect(r.code, r.stderr).toBe(4);
    expect(statusOf(r.stdout, 'CH4')).toBe('ok so far');
    expect(r.stdout).not.toMatch(/ ok\??$/m);
    expect(r.stdout).toContain('on the recorded states and fill paths as the rows stand');
    const j = JSON.parse((await runCli(['check', f, '--recipe', RECIPE, ...TRIALS, '--json'])).stdout);
    expect(j.deviations.every((d: { batch_incomplete: boolean }) => d.batch_incomplete)).toBe(true);
    // a complete batch is not marked
    const whole = await runCli(['check', 'readings/ch4-phi1-ar98-split.csv', '--recipe', RECIPE, ...TRIALS]);
    expect(whole.stdout).not.toContain('so far');
  });
});
