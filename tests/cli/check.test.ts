import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers.js';

describe('mixwright check', () => {
  it('the demo batch log: composition with u, phi, verdict; exit 7 (NOT SHOWN WITHIN TOLERANCE: not a pass)', async () => {
    const r = await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--trials', '100000']);
    // README "Exit codes": within tolerance on the readings, its 95 % interval reaching past it
    expect(r.code, r.stderr).toBe(7);
    expect(r.stdout).toMatch(/^Verdict {5}NOT SHOWN WITHIN TOLERANCE/m);
    expect(r.stdout).toMatch(/CH4\s+0\.006669/);
    expect(r.stdout).toContain('Verdict');
  });

  it('--json: composition species to {value, u}, phi, verdict (the BRIEF contract)', async () => {
    const r = await runCli([
      'check',
      'readings/ch4-phi1-ar98.csv',
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--json',
      '--trials',
      '100000',
    ]);
    const j = JSON.parse(r.stdout);
    // a verdict short of a pass is never exit 0 (README "Exit codes": 7)
    expect(r.code, r.stderr).toBe(j.verdict === 'pass' ? 0 : 7);
    for (const k of ['CH4', 'O2', 'Ar']) {
      expect(typeof j.composition[k].value).toBe('number');
      expect(j.composition[k].u).toBeGreaterThan(0);
    }
    expect(j.phi.value).toBeCloseTo(1, 1);
    // `verdict` is the overall outcome (as the exit code); the composition's own judgement beside it
    expect(['pass', 'not-shown-within-tolerance']).toContain(j.verdict);
    expect(j.composition_verdict).toBe(j.verdict === 'pass' ? 'pass' : 'pass-uncertain');
  });

  it('out of tolerance: exit 4', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const f = join(dir, 'r.csv');
    writeFileSync(
      f,
      'species,pressure,temperature\nCH4,10.4 Torr,25 degC\nAr,1480 Torr,25 degC\nO2,1500 Torr,25 degC\n',
    );
    const r = await runCli(['check', f, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml', '--trials', '100000']);
    expect(r.code).toBe(4);
    expect(r.stdout).toContain('FAIL');
  });

  it('a folder: one summary row per log; exit 4 when one fails', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    copyFileSync('batches/demo-ch4-phi1-ar98.jsonl', join(dir, 'a.jsonl'));
    const r = await runCli(['check', dir, '--trials', '100000']);
    // its one log is not shown within tolerance: the folder exits as that log does
    expect(r.code, r.stderr).toBe(7);
    // (was the bare kind "pass-uncertain": the summary says it is not a pass, as the verdict line does)
    expect(r.stdout).toMatch(/a\.jsonl\s+demo-ch4-phi1-ar98\s+-\s+not shown within tolerance - not a pass/);
  });

  it('bad input: a CSV species not in the design, too few trials - exit 2 with the place', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-'));
    const f = join(dir, 'r.csv');
    writeFileSync(f, 'species,pressure,temperature\nCH4,10 Torr,25 degC\nHe,1480 Torr,25 degC\n');
    const r = await runCli(['check', f, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/r\.csv:3 species: He is not filled in the design/);
    const t = await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--trials', '1000']);
    expect(t.code).toBe(2);
    expect(t.stderr).toContain('--trials');
  });

  it('more trials than memory allows is refused before any work, not an internal error', async () => {
    const r = await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--trials', '99999999999']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /--trials: Monte Carlo trials = 99999999999 is outside the allowed range .* to 10000000/,
    );
    expect(r.stderr).toContain('(error code: out-of-range)');
  });
});
