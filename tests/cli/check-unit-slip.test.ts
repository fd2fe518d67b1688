// A unit slip on a CSV row past a limit: "1500.0 kPa" typed for the "1500.0 Torr" the gauge showed. As
// typed (1 kPa = 7.50062 Torr, by the definitions of the units) it is past the gauge's range and the
// tank's limit: a danger of the record that stays one. Read in the unit of the other rows and of its
// gauge it would fit the fill (above the row before, within range and limit, at the plan's 1500 Torr),
// so the finding, the verdict and --json name the likely slip and how to correct the row.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, stderrWords } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';

/** the split demo readings with the last row's pressure typed as `typed` */
function lastRow(typed: string): string {
  const f = join(mkdtempSync(join(tmpdir(), 'mw-slip-')), 'r.csv');
  const text = readFileSync('readings/ch4-phi1-ar98-split.csv', 'utf8');
  expect(text).toContain('Ar,1500.0 Torr');
  writeFileSync(f, text.replace('Ar,1500.0 Torr', `Ar,${typed}`));
  return f;
}

describe('a likely unit slip on the last CSV row', () => {
  it('1500.0 kPa: the dangers stand, and the findings, verdict and JSON name the slip and the fix', async () => {
    const f = lastRow('1500.0 kPa');
    const r = await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(4);
    // the dangers of the record as typed stay dangers
    expect(r.stdout).toMatch(/danger: line 5, fill 4: the tank reading 11250\.9 Torr \(absolute\) is above/);
    expect(r.stdout).toMatch(
      /danger: line 5, fill 4: gauge head-10kT shows 11250\.9 Torr, above its full scale/,
    );
    expect(r.stdout).toContain('DANGER IN THE RECORDED FILL');
    // and the first names the likely slip: what, where, why, what to do
    expect(r.stdout).toContain(
      'LIKELY UNIT SLIP on line 5: as typed, 1500.0 kPa is past the range of head-10kT (10000.0 Torr) and ' +
        "tank MT-1's working limit (2700.22 Torr); read as 1500.0 Torr, the unit of lines 2, 3, 4 and gauge " +
        "head-10kT's readout, it would be 1500.00 Torr absolute: above line 4, within the range of head-10kT " +
        "and tank MT-1's working limit, 0.00 % from the plan's 1500.00 Torr after its fill 4. If the gauge " +
        'showed 1500.0 Torr, correct line 5 to "1500.0 Torr" from the paper record and check again',
    );
    expect(r.stdout).toMatch(/^ {12}LIKELY UNIT SLIP: line 5 as typed goes past a limit/m);
    const j = JSON.parse(
      (await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000', '--json'])).stdout,
    );
    const slips = j.record_findings.filter((x: { likely_unit_slip?: string }) => x.likely_unit_slip);
    expect(slips.length).toBe(2);
    expect(slips.map((x: { severity: string }) => x.severity)).toEqual(['danger', 'danger']);
    expect(j.verdict_caveats.some((c: string) => c.startsWith('LIKELY UNIT SLIP: line 5'))).toBe(true);
  });

  it('1200.0 kPa: read as Torr it is nowhere near the plan, so no slip is named (only the dangers)', async () => {
    const r = await runCli(['check', lastRow('1200.0 kPa'), '--recipe', RECIPE, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(4);
    expect(r.stdout).toMatch(/danger: line 5, fill 4: the tank reading 9000\.74 Torr/);
    expect(r.stdout).not.toContain('UNIT SLIP');
  });

  // a row that names no gauge: the re-check chooses the gauge that reads it, and none reads 11250.9 Torr
  // (the widest demo head reads 10000 Torr), so the CSV is refused; the refusal names the slip by the
  // other rows' unit, as a row on a named gauge does, and never says the record stands (nothing was checked)
  it("1500.0 kPa on rows that name no gauge: refused, and the refusal names the slip by the other rows' unit", async () => {
    const f = lastRow('1500.0 kPa');
    const text = readFileSync(f, 'utf8');
    // the gauge column dropped (the 4th of 7)
    const noGauge = text
      .trim()
      .split('\n')
      // the first three cells hold no comma
      .map((l) => l.replace(/^((?:[^,]*,){3})[^,]*,/, '$1'))
      .join('\n');
    expect(noGauge.split('\n')[0]).toBe('species,pressure,temperature,time,by,note');
    writeFileSync(f, `${noGauge}\n`);
    for (const args of [['--recipe', RECIPE], []]) {
      const r = await runCli(['check', f, ...args]);
      expect(r.code, r.stderr).toBe(2);
      const said = stderrWords(r.stderrShown);
      expect(said).toContain(
        'no gauge in the lab profile reads 1.50000e+6 Pa; name the gauge in a "gauge" column. ',
      );
      expect(said).toContain(
        'LIKELY UNIT SLIP on line 5: as typed, 1500.0 kPa is past the range of every gauge of the lab ' +
          'profile (the highest any reads is 10000.0 Torr absolute)',
      );
      expect(said).toContain(
        'read as 1500.0 Torr, the unit of lines 2, 3, 4, it would be 1500.00 Torr absolute: above line 4, ' +
          'within the range of a gauge of the lab profile',
      );
      expect(said).toContain(
        'correct line 5 to "1500.0 Torr" from the paper record and check again; nothing is checked until then',
      );
      expect(said).not.toContain('stands as typed');
    }
  });
});
