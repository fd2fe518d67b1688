// A CSV of the demo recipe (CH4, Ar 1/2, O2, Ar 2/2) without the row of the split diluent's last charge:
// every species has a row, yet the batch is not finished. check --recipe calls it INCOMPLETE (exit 4,
// naming the plan's fill the CSV lacks), not "out of tolerance"; the same three sources filled in one Ar
// charge to the final pressure (a complete fill in another charging) is not called incomplete. The
// plan's targets (10.01, 480.81, 500.82, 1500.0 Torr) are the demo plan's own (README); the readings are
// ours.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const HEAD = 'species,pressure,temperature,gauge\n';

async function check(rows: string): Promise<{ code: number; stdout: string }> {
  const dir = mkdtempSync(join(tmpdir(), 'mw-charge-'));
  const file = join(dir, 'r.csv');
  writeFileSync(file, HEAD + rows);
  const r = await runCli(['check', file, '--recipe', RECIPE]);
  rmSync(dir, { recursive: true });
  return r;
}

describe('a CSV without the last charge of a split diluent', () => {
  it("CH4, Ar 1/2, O2 at their targets, no Ar 2/2: INCOMPLETE naming the plan's fill 4, exit 4", async () => {
    const r = await check(
      'CH4,10.01 Torr,25.0 degC,head-1kT\nAr,480.81 Torr,25.0 degC,head-1kT\nO2,500.82 Torr,25.0 degC,head-1kT\n',
    );
    expect(r.stdout).toMatch(
      /Verdict\s+INCOMPLETE - no reading for Ar \(cyl-Ar charge 2 of 2, the plan's fill 4\): no row/,
    );
    expect(r.stdout).not.toMatch(/FAIL - out of tolerance/);
    expect(r.stdout).toContain('add the missing row (its reading from the paper record)');
    expect(r.code).toBe(4);
    // the recorded fill says which planned fill is missing, not that the rows fill "other charges"
    expect(r.stdout).toContain(
      "note: the readings are the plan's first 3 fills, in its order (cyl-CH4, cyl-Ar, cyl-O2); the " +
        "plan's fill 4 (cyl-Ar) has no row",
    );
    expect(r.stdout).not.toContain('in other charges');
    // an unfinished batch's fractions outside their tolerance are not a final judgement
    const status = r.stdout
      .match(/^(Ar|O2|CH4) .*\d {2}(\S.*)$/gm)!
      .map((l) => / {2}(OUT.*|ok.*)$/.exec(l)?.[1]);
    expect(status).toEqual(['OUT so far', 'OUT so far', 'OUT so far']);
  });

  it("a CSV of the plan's first two fills: each missing fill named once, O2 with its cylinder", async () => {
    const r = await check('CH4,10.01 Torr,25.0 degC,head-1kT\nAr,480.81 Torr,25.0 degC,head-1kT\n');
    const verdict = r.stdout.split('\n').find((l) => l.startsWith('Verdict'))!;
    expect(verdict).toContain(
      "no reading for O2 (cyl-O2, the plan's fill 3), Ar (cyl-Ar charge 2 of 2, the plan's fill 4): no row",
    );
    expect(verdict).not.toContain('O2, cyl-O2');
    expect(verdict).toContain('add the missing rows (their readings from the paper record)');
    expect(r.code).toBe(4);
  });

  it('CH4, then Ar in one charge to 1480 Torr, then O2 to 1500 Torr (complete, another charging): not incomplete', async () => {
    const r = await check(
      'CH4,10.01 Torr,25.0 degC,head-1kT\nAr,1480.0 Torr,25.0 degC,head-10kT\nO2,1500.0 Torr,25.0 degC,head-10kT\n',
    );
    expect(r.stdout).not.toMatch(/INCOMPLETE/);
    expect(r.stdout).toMatch(/Verdict\s+(PASS|NOT SHOWN WITHIN TOLERANCE|FAIL)/);
  });
});
