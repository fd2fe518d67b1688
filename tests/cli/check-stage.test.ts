// check of a stage log: a stage-1 log says it is stage 1 of 2 (the premix of its batch) and gives the
// stage-2 command, in text and JSON (`stage`); the exit codes stay those of any batch log.
import { createHash } from 'node:crypto';
import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { premixTargets, writePremixLog } from '../stage-logs.js';
import { runCli } from '../helpers.js';
import { appendEvent, createLog, readLog, type NewLogEvent } from '../../src/io/batch-log.js';

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
    // as any batch log never closed (README: marked NOT CLOSED, not a pass: exit 7)
    expect(r.code).toBe(7);
    expect(plain.code).toBe(7);
    expect(r.stdout).toContain('NOT CLOSED');
    expect(r.stdout).toContain('Stage 1 of 2: the premix of batch b1');
    expect(r.stdout).toMatch(/Stage 2 will refuse this premix log: its re-check is not a pass \(not-closed/);
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

// a folder of logs: each stage log's row says which stage it is, as check of that log alone does
describe('check of a folder with stage logs', () => {
  /** a stage-2 log: the demo batch from the demo premix (beside it), its header with the stage fill writes */
  function writeStage2Log(dir: string): string {
    const premix = 'demo-premix-o2-ar-mt2.jsonl';
    copyFileSync(join('batches', premix), join(dir, premix));
    const demo = readLog('batches/demo-ch4-phi1-from-premix.jsonl');
    const file = join(dir, 'b1.jsonl');
    const sha256 = createHash('sha256')
      .update(readFileSync(join(dir, premix)))
      .digest('hex');
    createLog(file, {
      ...demo.header,
      id: 'b1',
      stage: {
        number: 2,
        of: 2,
        batch: 'b1',
        premix_log: { file: premix, id: 'demo-premix-o2-ar-mt2', sha256 },
      },
    });
    for (const l of readFileSync('batches/demo-ch4-phi1-from-premix.jsonl', 'utf8')
      .trim()
      .split('\n')
      .slice(1)) {
      const { chain: _c, ...e } = JSON.parse(l) as Record<string, unknown>;
      void _c;
      appendEvent(file, e as NewLogEvent);
    }
    return file;
  }

  it('the table has a stage column: 1 of 2 (premix of b1), 2 of 2 (batch b1 from its premix log), - for a single-tank batch; JSON rows carry stage', async () => {
    const dir = tmp();
    writePremixLog(dir, premixTargets);
    writeStage2Log(dir);
    copyFileSync('batches/demo-ch4-phi1-ar98.jsonl', join(dir, 'single.jsonl'));
    const r = await runCli(['check', dir]);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toMatch(/^file +batch +stage +verdict +phi +worst/);
    const row = (f: string) => lines.find((l) => l.startsWith(join(dir, f)))!;
    expect(row('b1-premix.jsonl')).toMatch(/ b1-premix +1 of 2: premix of b1 +pass /);
    expect(row('b1.jsonl')).toMatch(/ b1 +2 of 2: batch b1 from demo-premix-o2-ar-mt2\.jsonl +pass /);
    expect(row('single.jsonl')).toMatch(/ demo-ch4-phi1-ar98 +- +not shown within tolerance - not a pass /);
    const j = JSON.parse((await runCli(['check', dir, '--json'])).stdout) as {
      file: string;
      stage: unknown;
    }[];
    const stage = (f: string) => j.find((x) => x.file === join(dir, f))!.stage;
    expect(stage('b1-premix.jsonl')).toMatchObject({ number: 1, of: 2, batch: 'b1' });
    expect(stage('b1.jsonl')).toMatchObject({
      number: 2,
      batch: 'b1',
      premix_log: 'demo-premix-o2-ar-mt2.jsonl',
    });
    expect(stage('single.jsonl')).toBeNull();
  });

  it('a stage-1 log stage 2 would refuse (not closed) says so in its row', async () => {
    const dir = tmp();
    writePremixLog(dir, premixTargets, { close: false });
    const r = await runCli(['check', dir]);
    // never "pass" in the verdict column where the log is not one (exit 7)
    expect(r.stdout).toMatch(
      /b1-premix +1 of 2: premix of b1 \(stage 2 will refuse it\) +NOT A PASS \(composition alone within tolerance, which does not make the tank usable\), NOT CLOSED/,
    );
    expect(r.code).toBe(7);
  });
});
