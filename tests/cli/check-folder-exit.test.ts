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
});
