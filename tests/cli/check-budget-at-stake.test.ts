// The budget lines of `check` are those of the fraction the verdict is about: a trial read the budget of
// CH4 under a FAIL on O2. Readings at the demo plan's own targets (README: 10.01, 480.81, 500.82, 1500.0
// Torr) with the O2 fill read 0.30 Torr low (its band is +-0.10 Torr: three band widths) fail on O2, and the
// budget shown is u(O2)'s; a composition shown within (every fraction, ng-blend-air demo) keeps the fuel's.
// Wording only: which species' budget is shown, not its numbers (tests/core's).
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const TRIALS = ['--trials', '100000'];

function csv(o2Torr: string): string {
  const f = join(mkdtempSync(join(tmpdir(), 'mw-stake-')), 'r.csv');
  writeFileSync(
    f,
    'species,pressure,temperature,gauge\nCH4,10.01276 Torr,25.0 degC,head-1kT\n' +
      `Ar,480.81 Torr,25.0 degC,head-1kT\nO2,${o2Torr} Torr,25.0 degC,head-1kT\n` +
      'Ar,1500.0 Torr,25.0 degC,head-10kT\n',
  );
  return f;
}

const budgetHead = (text: string) => text.split('\n').find((l) => l.startsWith('Largest contributions'));

describe('check: the budget shown is that of the fraction the verdict is about', () => {
  it('O2 read three band widths low: FAIL on O2, the budget of u(O2), said why', async () => {
    const r = await runCli(['check', csv('500.52'), '--recipe', RECIPE, ...TRIALS]);
    expect(r.code, r.stderr).toBe(4);
    expect(r.stdout).toMatch(/^O2 .* OUT$/m);
    expect(r.stdout).toMatch(/^CH4 .* ok$/m);
    expect(budgetHead(r.stdout)).toBe(
      'Largest contributions to u(O2) (the fraction furthest outside its tolerance):',
    );
  });

  it('O2 at its target: not shown within on O2, whose 95 % uncertainty reaches past; the budget of u(O2)', async () => {
    const r = await runCli(['check', csv('500.82'), '--recipe', RECIPE, ...TRIALS]);
    expect(r.code, r.stderr).toBe(7);
    expect(r.stdout).toMatch(/^O2 .* ok\?$/m);
    expect(budgetHead(r.stdout)).toBe(
      'Largest contributions to u(O2) (the fraction whose 95 % uncertainty reaches furthest past its ' +
        'tolerance):',
    );
  });

  it('every fraction shown within (ng-blend-air demo): the largest fuel, CH4, without a reason', async () => {
    const r = await runCli(['check', 'readings/ng-blend-air.csv', '--recipe', 'recipes/ng-blend-air.yaml']);
    expect(r.stdout).not.toMatch(/ (ok\?|OUT)$/m);
    expect(budgetHead(r.stdout)).toBe('Largest contributions to u(CH4):');
  });
});
