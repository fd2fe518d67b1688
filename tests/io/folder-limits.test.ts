import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { checkFile } from '../../src/io/check.js';
import { folderSummary } from '../../src/report/check-report.js';
import { distinct } from '../../src/io/log-audit.js';

// `check FOLDER` must not read as "within the tank's limits" for a log that has none to check against
describe('check of a folder: a log without the tank limits says so', () => {
  it('the demo log (rated 4 bar) has no caveat; the same log with its rating removed says "tank limits NOT checked"', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-limits-'));
    const lines = readFileSync('batches/demo-ch4-phi1-ar98.jsonl', 'utf8').split('\n');
    const h = JSON.parse(lines[0]) as { tank: Record<string, unknown> };
    h.tank.rated_pressure_Pa = null;
    h.tank.working_limit_Pa = null;
    const bare = join(dir, 'no-rating.jsonl');
    writeFileSync(bare, [JSON.stringify(h), ...lines.slice(1)].join('\n'));
    const rated = await checkFile('batches/demo-ch4-phi1-ar98.jsonl', { trials: 0, seed: 1 });
    const unrated = await checkFile(bare, { trials: 0, seed: 1 });
    const text = folderSummary([
      { file: 'rated.jsonl', report: rated },
      { file: 'no-rating.jsonl', report: unrated },
    ]);
    const row = (f: string) => text.split('\n').find((l) => l.startsWith(f))!;
    expect(row('rated.jsonl')).not.toMatch(/NOT checked/);
    // the header edited by hand is off its hash chain, and the summary says so beside the verdict
    expect(row('no-rating.jsonl')).toMatch(
      /RECORD ALTERED AFTER WRITING \(line 1\) - not a pass; the numbers alone: not shown within tolerance, the 95 % uncertainty of some fraction reaching past it, tank limits NOT checked/,
    );
    // a row that is not a pass never says "pass" or "pass-uncertain" as a judgement (only "not a pass")
    expect(row('no-rating.jsonl').replace(/not a pass/gi, '')).not.toMatch(/\bpass(-uncertain)?\b/i);
    expect(unrated.warnings.join('\n')).toMatch(
      /no pressure rating for tank MT-1: the readings were NOT checked against a working limit/,
    );
    expect(rated.warnings.join('\n')).not.toMatch(/NOT checked/);
  });
});

describe('check of a folder: an incomplete batch is not given a worst |dev|/tol number', () => {
  it('the demo log cut after its first reading says "incomplete" in the verdict and in the worst column', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-incomplete-'));
    const lines = readFileSync('batches/demo-ch4-phi1-ar98.jsonl', 'utf8').split('\n');
    const cut = join(dir, 'cut.jsonl');
    writeFileSync(cut, lines.slice(0, 2).join('\n') + '\n');
    const rep = await checkFile(cut, { trials: 0, seed: 1 });
    expect(rep.incomplete.length).toBeGreaterThan(0);
    const row = folderSummary([{ file: 'cut.jsonl', report: rep }])
      .split('\n')
      .find((l) => l.startsWith('cut.jsonl'))!;
    const cells = row.trim().split(/\s{2,}/);
    // file, batch, stage (- for a single-tank batch), verdict
    expect(cells[2]).toBe('-');
    expect(cells[3]).toMatch(/^incomplete/);
    expect(cells[cells.length - 1]).toBe('incomplete');
    expect(row).not.toMatch(/\d+\.\d\d\s*$/);
  });
});

describe('a typed-vs-logged mismatch shows enough digits to show the difference', () => {
  it('252059.27 Pa against 252059.2700004 Pa: 9 significant digits would print the same number twice', () => {
    expect(Number((252059.27).toPrecision(9))).toBe(Number((252059.2700004).toPrecision(9)));
    const [a, b] = distinct(252059.27, 252059.2700004);
    expect(a).not.toBe(b);
    expect(a).toBe('252059.27');
    expect(b).toBe('252059.2700004');
    // numbers that differ at 9 digits keep 9
    expect(distinct(1480, 1480.3)).toEqual(['1480', '1480.3']);
  });
});
