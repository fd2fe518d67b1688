// label of a batch log changed after it was written (a line off its hash chain): never a PASS headline,
// the same exit as `check` (5); the composition is shown as computed from the numbers as they stand.
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const TRIALS = ['--trials', '100000'];

describe('label of an altered log', () => {
  it('a changed reading text (1890.2 -> 1891.2 Torr) on a log check passes: RECORD ALTERED headline, no PASS, status "not shown (record)", exit 5 as check', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-label-record-'));
    const file = join(dir, 'demo-premix-o2-ar-mt2.jsonl');
    copyFileSync(PREMIX, file);
    const before = await runCli(['label', file, ...TRIALS]);
    expect(before.code, before.stderr).toBe(0);
    expect(before.stdout).toContain('PASS - as filled');
    writeFileSync(
      file,
      readFileSync(file, 'utf8').replace('"reading":"1890.2 Torr"', '"reading":"1891.2 Torr"'),
    );
    const check = await runCli(['check', file, ...TRIALS]);
    expect(check.code).toBe(5);
    const r = await runCli(['label', file, ...TRIALS]);
    expect(r.code).toBe(5);
    expect(r.stdout).toContain('RECORD ALTERED AFTER WRITING: NOT A PASS');
    expect(r.stdout).not.toContain('PASS - as filled');
    expect(r.stdout).not.toContain('VERDICT  PASS');
    expect(r.stdout).toContain('not shown (record)');
    expect(r.stdout).toContain('DO NOT USE AS THE DESIGN MIXTURE');
    expect(r.stderr).toContain('changed after it was written');
  });
});

describe('the verdict in a few words (the fill end screen): never "pass" where check says it is not one', () => {
  it('pass-uncertain reads "NOT SHOWN WITHIN TOLERANCE - not a pass"; an altered record "RECORD ALTERED - not a pass"', async () => {
    const { verdictWord } = await import('../../src/report/check-report.js');
    const { checkFile } = await import('../../src/io/check.js');
    const uncertain = await checkFile('batches/demo-ch4-phi1-ar98.jsonl', { trials: 0, seed: 1 });
    expect(uncertain.verdict.verdict).toBe('pass-uncertain');
    expect(verdictWord(uncertain)).toBe('NOT SHOWN WITHIN TOLERANCE - not a pass');
    const passed = await checkFile(PREMIX, { trials: 0, seed: 1 });
    expect(verdictWord(passed)).toBe('PASS');
    expect(verdictWord({ ...passed, record: { alteredLines: [3], closed: true } })).toBe(
      'RECORD ALTERED - not a pass',
    );
  });
});
