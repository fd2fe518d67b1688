// A zero tolerance is refused at input (a trial found `tolerance: relative: 0` planned with bands of
// 0.000 Torr, "NO value ... inside the band" and every re-check failing): what, where (file:line:col
// or the option), why and what to give, exit 2, as a negative tolerance is. A small positive tolerance
// is planned and said not meetable (CANNOT MEET ITS TOLERANCE), and a relative 0 with an absolute
// floor is a tolerance (max(relative x, absolute), core/verdict.ts): planned.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli, STACK_LINE } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const demo = readFileSync(RECIPE, 'utf8');

function recipeWith(tolerance: string): string {
  const f = join(mkdtempSync(join(tmpdir(), 'mw-tol0-')), 'r.yaml');
  writeFileSync(f, demo.replace(/tolerance:\n {2}relative: 0\.005\n/, tolerance));
  return f;
}

async function refused(argv: string[], where: RegExp) {
  const r = await runCli(argv);
  expect(r.code, r.stderr).toBe(2);
  const text = r.stderr.replace(/\s+/g, ' ');
  expect(text).toMatch(where);
  // the field is said once, in the location (it was also repeated at the head of the message)
  const field = /(--tolerance|tolerance\.relative): /.exec(text)![1];
  expect(text.split(`${field}:`)).toHaveLength(2);
  expect(text).toContain('a tolerance of 0 allows no deviation of any mole fraction');
  expect(text).toContain('no reading can meet it');
  expect(text).toContain('give the relative deviation you accept, such as 0.005 (0.5 %)');
  expect(text).toContain('(error code: invalid-field)');
  expect(r.stderrShown).not.toMatch(STACK_LINE);
}

describe('a zero tolerance is refused at input', () => {
  it('in a recipe (plan, sheet): the file, line and column of tolerance.relative', async () => {
    expect(demo).toMatch(/tolerance:\n {2}relative: 0\.005\n/);
    const f = recipeWith('tolerance:\n  relative: 0\n');
    const line = readFileSync(f, 'utf8').split('\n').indexOf('  relative: 0') + 1;
    for (const cmd of ['plan', 'sheet'])
      await refused([cmd, f], new RegExp(`r\\.yaml:${line}:13 tolerance\\.relative: `));
    // -0 is zero too; so is an absolute floor of 0
    await refused(['plan', recipeWith('tolerance:\n  relative: -0\n')], /tolerance\.relative: /);
    await refused(
      ['plan', recipeWith('tolerance:\n  relative: 0\n  absolute: 0\n')],
      /tolerance\.relative: /,
    );
  });

  it('as --tolerance 0: the option named', async () => {
    await refused(['plan', RECIPE, '--tolerance', '0'], /--tolerance: /);
  });

  it('a small positive tolerance is planned and said not meetable; relative 0 with an absolute floor is planned', async () => {
    const small = await runCli(['plan', RECIPE, '--tolerance', '0.00001']);
    expect(small.code, small.stderr).toBe(0);
    expect(small.stdout).toContain('CANNOT MEET ITS TOLERANCE');
    const floor = await runCli(['plan', recipeWith('tolerance:\n  relative: 0\n  absolute: 0.0001\n')]);
    expect(floor.code, floor.stderr).toBe(0);
    expect(floor.stdout).toMatch(/^Fill plan/);
  });
});
