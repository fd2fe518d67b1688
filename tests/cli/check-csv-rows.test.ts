// A planned fill with no CSV row is no fill: the demo readings (readings/ch4-phi1-ar98.csv) with their Ar
// row dropped were read as a finished batch (FAIL and DANGER IN THE RECORDED FILL, nothing saying a row
// may be missing), because the O2 cylinder's Ar impurity counted as a fill of Ar. A design species is
// filled only by a row whose source is named by it. Wording and verdict only: no computed number is
// checked here (the re-check's numbers are tests/io's).
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const DEMO = readFileSync('readings/ch4-phi1-ar98.csv', 'utf8').split('\n');

function without(species: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'mw-missing-row-'));
  const f = join(dir, `no-${species}.csv`);
  writeFileSync(f, DEMO.filter((l) => !l.startsWith(`${species},`)).join('\n'));
  return f;
}

describe('check of CSV readings with a planned fill missing', () => {
  // each missing gas named once, with its cylinder and the plan's fills of it (the plan: CH4, Ar 1/2,
  // O2, Ar 2/2); the demo readings filled Ar in one charge, so no Ar row leaves both plan charges unread
  it.each([
    ['Ar', "Ar (cyl-Ar charges 1 and 2 of 2, the plan's fills 2 and 4)"],
    ['O2', "O2 (cyl-O2, the plan's fill 3)"],
    ['CH4', "CH4 (cyl-CH4, the plan's fill 1)"],
  ])('no %s row: INCOMPLETE, naming it once as %s, saying a row may be missing', async (sp, named) => {
    const r = await runCli(['check', without(sp), '--recipe', RECIPE]);
    const verdict = r.stdout.split('\n').find((l) => l.startsWith('Verdict '))!;
    expect(
      verdict.startsWith(`Verdict     INCOMPLETE - no reading for ${named}: no row of the CSV fills it`),
    ).toBe(true);
    expect(verdict).toContain('a row is missing, or the batch is not finished');
    expect(verdict).not.toMatch(/PASS|FAIL - out of tolerance/);
    expect(r.stdout).toContain(`warning: no row fills ${named}: a row is missing from the CSV`);
    const json = JSON.parse((await runCli(['check', without(sp), '--recipe', RECIPE, '--json'])).stdout);
    expect(json.incomplete).toEqual([named]);
  });

  it("the recorded fill of the rows given is not said to be the tank's states", async () => {
    const r = await runCli(['check', without('Ar'), '--recipe', RECIPE]);
    // CH4 then O2 as the rows stand: the review's dangers are still said, as the rows stand
    expect(r.stdout).toContain('DANGER IN THE RECORDED FILL, as the rows stand');
    expect(r.stdout).toContain(
      "a planned fill has no row, so the tank's states are not known from these rows",
    );
    expect(r.stdout).not.toContain('the tank went through states the planner reviews as dangerous');
  });

  it('the full demo readings are not incomplete', async () => {
    const json = JSON.parse(
      (await runCli(['check', 'readings/ch4-phi1-ar98.csv', '--recipe', RECIPE, '--json'])).stdout,
    );
    expect(json.incomplete).toEqual([]);
  });
});

// a wrong unit on one row was blamed on the next ("not above the previous one", no cause, no fix)
describe('check of CSV readings with a wrong unit on a row', () => {
  it('Ar,1480.02 kPa on line 3 (Torr meant): line 3 is named, past head-10kT and MT-1, with what to do', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-wrong-unit-'));
    const f = join(dir, 'kpa.csv');
    writeFileSync(f, DEMO.map((l) => l.replace(/^Ar,1480\.02 Torr/, 'Ar,1480.02 kPa')).join('\n'));
    const r = await runCli(['check', f, '--recipe', RECIPE]);
    expect(r.code).toBe(2);
    const err = r.stderr.replace(/\n +/g, ' ');
    expect(err).toContain('kpa.csv:4 pressure: the reading 1500.0 Torr is not above the previous one');
    expect(err).toContain(
      "Likely cause: line 3's value or unit (1480.02 kPa): it is past the range of head-10kT",
    );
    expect(err).toContain("and tank MT-1's working limit");
    expect(err).toContain('Correct line 3 from the paper record');
  });
});
