// A reading past its gauge's full scale is not trustworthy (a danger of the record, exit 3), and no
// composition rests on it: the fractions that depend on it are not shown within tolerance, in the text
// (rows and verdict line), in --json and on the label. Which fractions depend on a reading follows from
// the partial-pressure method (common practice): fill k's amount is the difference of readings k - 1 and
// k, and every fraction is an amount over the total (the last reading), so reading k concerns the gases
// of fills k and k + 1, the last reading every gas. No computed number is checked here.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { labelBoxText, runCli } from '../helpers.js';
import { logLines, rechain } from '../relog.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-range-'));

/** the split demo readings with one row's gauge changed */
function splitCsv(from: string, to: string): string {
  const f = join(tmp(), 'r.csv');
  const text = readFileSync('readings/ch4-phi1-ar98-split.csv', 'utf8');
  expect(text).toContain(from);
  writeFileSync(f, text.replace(from, to));
  return f;
}

describe('a reading past its gauge range under a composition', () => {
  it('the last reading (1500 Torr on the 1000 Torr head): every fraction not shown, exit 3, JSON agrees', async () => {
    const f = splitCsv('head-10kT,10:52', 'head-1kT,10:52');
    const r = await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(3);
    expect(r.stdout).toContain('gauge head-1kT shows 1500 Torr, above its full scale of 1000 Torr');
    for (const sp of ['Ar', 'O2', 'CH4'])
      expect(r.stdout).toMatch(new RegExp(`^${sp} .*NOT SHOWN \\(line 5: past gauge range\\)$`, 'm'));
    expect(r.stdout).not.toMatch(/ ok\??$/m);
    expect(r.stdout).not.toContain('the readings put every design fraction inside its tolerance');
    expect(r.stdout).toMatch(
      /^Verdict {5}NOT SHOWN WITHIN TOLERANCE - the composition rests on a reading past its gauge's range \(line 5, head-1kT\)/m,
    );
    const j = JSON.parse(
      (await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000', '--json'])).stdout,
    );
    expect([j.verdict, j.composition_verdict]).toEqual(['danger', 'pass-uncertain']);
    expect(j.outcomes).toEqual(['danger', 'not-shown-within-tolerance']);
    expect(j.readings_past_gauge_range).toEqual([{ line: 5, step: 4, gauge: 'head-1kT' }]);
    for (const d of j.deviations)
      expect([d.species, d.proven_within, d.past_gauge_range_lines]).toEqual([d.species, false, [5]]);
  });

  it('an earlier reading: only the gases of its fill and the next are marked', async () => {
    // CH4 10.0126 Torr on the 10 Torr head (fill 1): CH4 and the first Ar charge (fill 2) rest on it
    const f = splitCsv('head-1kT,10:02', 'head-10T,10:02');
    const r = await runCli(['check', f, '--recipe', RECIPE, '--trials', '100000', '--json']);
    expect(r.code, r.stderr).toBe(3);
    const j = JSON.parse(r.stdout);
    const marked = Object.fromEntries(
      j.deviations.map((d: { species: string; past_gauge_range_lines: number[] }) => [
        d.species,
        d.past_gauge_range_lines,
      ]),
    );
    expect(marked).toEqual({ CH4: [2], O2: [], Ar: [2] });
    expect(j.composition_verdict).toBe('pass-uncertain');
  });

  it('a log whose last reading is past its gauge range: check and the label say not shown, not the uncertainty', async () => {
    const { header, events } = logLines('batches/demo-ch4-phi1-ar98.jsonl');
    const f = rechain(
      join(tmp(), 'b.jsonl'),
      header,
      events.map((e) => (e.kind === 'reading' && e.step === 3 ? { ...e, gauge: 'head-1kT' } : e)),
    );
    const r = await runCli(['check', f, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(3);
    expect(r.stdout).toMatch(
      /^Verdict {5}NOT SHOWN WITHIN TOLERANCE - the composition rests on a reading past/m,
    );
    const label = await runCli(['label', f, '--trials', '100000']);
    expect(label.code, label.stderr).toBe(3);
    expect(labelBoxText(label.stdout)).toContain(
      'NOT SHOWN WITHIN TOLERANCE (a reading past its gauge range)',
    );
    expect(label.stdout).not.toContain('the uncertainty reaches past it');
  });
});
