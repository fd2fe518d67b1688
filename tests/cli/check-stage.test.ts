// check of a stage log: a stage-1 log says it is stage 1 of 2 (the premix of its batch) and gives the
// stage-2 command, in text and JSON (`stage`); the exit codes stay those of any batch log.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { premixTargets, writePremixLog } from '../stage-logs.js';
import { runCli } from '../helpers.js';

const TRIALS = ['--trials', '100000'];
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-check-stage-'));

describe('check of a stage-1 log', () => {
  it('at its targets and closed: stage 1 of 2, the premix of batch b1, and the stage-2 command; exit 0', async () => {
    const { file } = writePremixLog(tmp(), premixTargets);
    const r = await runCli(['check', file, ...TRIALS]);
    expect(r.code, r.stderr).toBe(0);
    const lines = r.stdout.split('\n');
    expect(lines[2]).toBe('Stage 1 of 2: the premix of batch b1; stage 2 fills batch b1 from it.');
    expect(lines[3]).toMatch(/^Stage 2, once the premix is mixed/);
    // the command the log's header records (tests/stage-logs.ts writes "mixwright fill X")
    expect(lines[4]).toBe('  mixwright fill X');
    const j = JSON.parse((await runCli(['check', file, ...TRIALS, '--json'])).stdout);
    expect(j.stage).toEqual({
      number: 1,
      of: 2,
      batch: 'b1',
      next_command: 'mixwright fill X',
      premix_log: null,
    });
    expect(j.verdict).toBe('pass');
  });

  it('not closed: stage 2 will refuse it, no command offered; the exit code is that of any batch log', async () => {
    const { file } = writePremixLog(tmp(), premixTargets, { close: false });
    const r = await runCli(['check', file, ...TRIALS]);
    const plain = await runCli(['check', file, ...TRIALS, '--json']);
    // as any batch log at its targets never closed (README: marked NOT CLOSED; no exit code of its own)
    expect(r.code).toBe(0);
    expect(plain.code).toBe(0);
    expect(r.stdout).toContain('NOT CLOSED');
    expect(r.stdout).toContain('Stage 1 of 2: the premix of batch b1');
    expect(r.stdout).toMatch(/Stage 2 will refuse this premix log: it must be closed/);
    expect(r.stdout).not.toContain('mixwright fill X');
    expect(JSON.parse(plain.stdout).stage.number).toBe(1);
  });

  it('a single-tank batch log: no stage line, JSON stage null', async () => {
    const r = await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', ...TRIALS]);
    expect(r.stdout).not.toMatch(/^Stage /m);
    const j = JSON.parse(
      (await runCli(['check', 'batches/demo-ch4-phi1-ar98.jsonl', ...TRIALS, '--json'])).stdout,
    );
    expect(j.stage).toBeNull();
  });
});
