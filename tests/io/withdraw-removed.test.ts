// A withdrawal line removed from a hashed log leaves two readings of one step, the second off its hash
// chain: the record was altered after it was written (exit 5, RECORD ALTERED, no pass; README "Exit
// codes"), not a format error of the log (exit 2). Two readings of one step with the chain intact stay
// a format error. No computed number is checked here.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { NewLogEvent } from '../../src/io/batch-log.js';
import { runCli } from '../helpers.js';
import { logLines, rechain } from '../relog.js';

const DEMO = 'batches/demo-ch4-phi1-ar98.jsonl';

/** the demo log written again with fill 2 withdrawn and read again; lines: 1 header, 2-3 readings, 4 withdraw */
function withWithdrawal(): string {
  const { header, events } = logLines(DEMO);
  const [r1, r2, r3, close] = events;
  return rechain(join(mkdtempSync(join(tmpdir(), 'mw-withdraw-')), 'b.jsonl'), header, [
    r1,
    { ...r2, reading: '1481 Torr', pressure_Pa: (1481 * 101325) / 760 } as NewLogEvent,
    { kind: 'withdraw', step: 2, withdraws_line: 3, by: 'QX', time: 't', reason: 'mistyped' },
    r2,
    r3,
    close,
  ]);
}

function without(f: string, line: number): string {
  const lines = readFileSync(f, 'utf8').split('\n');
  lines.splice(line - 1, 1);
  const g = f.replace(/\.jsonl$/, `-no${line}.jsonl`);
  writeFileSync(g, lines.join('\n'));
  return g;
}

describe('a withdrawal line removed from a hashed log', () => {
  it('as written: the withdrawal is listed and check reads the log (not a refusal)', async () => {
    const r = await runCli(['check', withWithdrawal(), '--trials', '100000']);
    expect(r.code, r.stderr).not.toBe(2);
    expect(r.stdout).toContain('withdrawn by QX');
  });

  it('removed: RECORD ALTERED AFTER WRITING at the reading after it, exit 5 (never a schema refusal)', async () => {
    const f = without(withWithdrawal(), 4);
    const r = await runCli(['check', f, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(5);
    expect(r.stdout).toMatch(/^Verdict {5}RECORD ALTERED AFTER WRITING \(line 4\) - not a pass/m);
    const j = JSON.parse((await runCli(['check', f, '--trials', '100000', '--json'])).stdout);
    expect(j.record_altered_lines).toEqual([4]);
    // the later reading of fill 2 stands, as the removed withdrawal had it
    expect(j.readings[1].pressure_Pa).toBeCloseTo((1480 * 101325) / 760, 6);
  });

  it('two readings of one step with the chain intact stay a format error (exit 2)', async () => {
    const f = withWithdrawal();
    const lines = readFileSync(f, 'utf8').split('\n');
    // drop the withdrawal and every chain: no line is off a chain, and the log says /1
    const plain = lines
      .filter((l, i) => l && i !== 3)
      .map((l) => {
        const e = JSON.parse(l) as Record<string, unknown>;
        delete e.chain;
        if (e.kind === 'batch') e.format = 'mixwright-batch/1';
        return JSON.stringify(e);
      });
    const g = f.replace(/\.jsonl$/, '-plain.jsonl');
    writeFileSync(g, plain.join('\n') + '\n');
    const r = await runCli(['check', g, '--trials', '100000']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('second reading');
  });
});
