// check of a folder: a file that cannot be checked (exit 2) never hides a failed (4) or dangerous (3) batch
import { copyFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

describe('check FOLDER with an unreadable file', () => {
  it('the demo Ar overshoot (FAIL) beside a file that is not a log: exit 4, the file named on stderr', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-folder-exit-'));
    copyFileSync('batches/demo-c2h4-phi05-ar-overshoot.jsonl', join(dir, 'a.jsonl'));
    writeFileSync(join(dir, 'b.jsonl'), 'not a log\n');
    const r = await runCli(['check', dir]);
    expect(r.code).toBe(4);
    expect(r.stderr).toContain('1 of 2 files');
  });

  it('a passing log beside a file that is not a log: exit 2, as before', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-folder-exit-'));
    copyFileSync('batches/demo-premix-o2-ar-mt2.jsonl', join(dir, 'a.jsonl'));
    writeFileSync(join(dir, 'b.jsonl'), 'not a log\n');
    const r = await runCli(['check', dir]);
    expect(r.code).toBe(2);
  });

  // the summary table was as wide as the longest refusal (a unit slip's words made it 500 columns): the
  // refused file's row says REFUSED, and why is said under it in rows of 80 columns, without its file name
  it('a refused CSV: the reason under its row, within 80 columns; the table as wide as without it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-folder-wide-'));
    copyFileSync('batches/demo-ch4-phi1-ar98.jsonl', join(dir, 'a.jsonl'));
    const alone = (await runCli(['check', dir])).stdout.split('\n');
    const csv =
      'species,pressure,temperature\nCH4,10.0126 Torr,25.0 degC\nAr,1480.02 Torr,25.0 degC\nO2,1500.0 kPa,25.0 degC\n';
    writeFileSync(join(dir, 'b.csv'), csv);
    const r = await runCli(['check', dir]);
    expect(r.code).toBe(2);
    const lines = r.stdout.split('\n');
    const row = lines.findIndex((l) => l.startsWith(join(dir, 'b.csv')));
    expect(lines[row]).toMatch(/ REFUSED \(why: below\) +- +-$/);
    expect(lines[row + 1]).toMatch(/^ {4}line 4: no gauge in the lab profile reads 1\.50000e\+6 Pa;/);
    const why = lines.slice(row + 1).filter((l) => /^ {4}/.test(l));
    expect(why.length).toBeGreaterThan(3);
    expect(why.filter((l) => l.length > 80)).toEqual([]);
    expect(why.join(' ')).toContain('LIKELY UNIT SLIP on line 4');
    // the table's own rows are as wide as the folder's without the refused file
    expect(lines[0].length).toBe(alone[0].length);
  });
});
