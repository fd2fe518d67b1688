// `fill` exits as `check` of its closed log would (README "Exit codes"): the end screen's re-check is
// check's own, and the exit code comes from check's own function (checkExit), so a fill that went on
// through an accepted review hazard exits 6 like `check`, not 0.
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { appendEvent, readLog, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { checkExit } from '../../src/cli/commands/check.js';
import { ExitSignal, EXIT } from '../../src/cli/context.js';
import { fillEnded } from '../../src/cli/fill-ended.js';
import { outcomeOfReport } from '../../src/tui/run.js';
import { runCli } from '../helpers.js';

const DEMO = 'batches/demo-ch4-phi1-ar98.jsonl';
const accepted: NewLogEvent = {
  kind: 'acknowledge',
  code: 'remainder-review',
  step: 3,
  by: 'QX',
  time: '2026-12-01T10:42:00Z',
  review: {
    trigger: 'reading',
    outcome: 'accepted',
    hazards: [{ code: 'flammable-state', step: 3, severity: 'warning' }],
  },
};

function exitOf(outcome: Parameters<typeof fillEnded>[1]): { code: number; err: string } {
  let err = '';
  const cli = { out: () => {}, err: (t: string) => (err += t), isTTY: true } as never;
  try {
    fillEnded(cli, outcome, 'b.jsonl');
    return { code: 0, err };
  } catch (e) {
    if (!(e instanceof ExitSignal)) throw e;
    return { code: e.code, err };
  }
}

describe('fill exits as check of its log', () => {
  it('a log that went on through an accepted review hazard: check exits 6, and so does fill', async () => {
    const f = join(mkdtempSync(join(tmpdir(), 'mw-fill-exit-')), 'b.jsonl');
    copyFileSync(DEMO, f);
    appendEvent(f, accepted);
    const report = await checkLog(readLog(f), { trials: 0, seed: 1 });
    expect(checkExit(report)).toBe(EXIT.acceptedHazard);
    const r = exitOf({ interrupted: false, logged: 3, steps: 3, ...outcomeOfReport(report) });
    expect(r.code).toBe(6);
    // the plan's dangers accepted on the danger screen exit 6 too: the message names both kinds
    expect(r.err).toMatch(
      /ACCEPTED HAZARD: the fill went on through hazards accepted at the manifold \(the plan's dangers, or what its review .* found\): not a pass/,
    );
  });

  it('the demo log as it is (NOT SHOWN WITHIN TOLERANCE, not a pass): 7 for both', async () => {
    const report = await checkLog(readLog(DEMO), { trials: 0, seed: 1 });
    expect(checkExit(report)).toBe(EXIT.notShown);
    const r = exitOf({ interrupted: false, logged: 3, steps: 3, ...outcomeOfReport(report) });
    expect(r.code).toBe(7);
    expect(r.err).toMatch(/NOT SHOWN WITHIN TOLERANCE .*not a pass/);
  });

  it('precedence 4, 3, 6, 5 as check; Ctrl-C 130; a batch left open (no re-check) 0', () => {
    const base = { interrupted: false, logged: 3, steps: 3 };
    const hazard = { alteredLines: [], acceptedHazards: [{}] };
    expect(exitOf({ ...base, verdict: 'fail', danger: true, record: hazard }).code).toBe(4);
    expect(exitOf({ ...base, verdict: 'pass', danger: true, record: hazard }).code).toBe(3);
    expect(
      exitOf({ ...base, verdict: 'pass', danger: false, record: { ...hazard, alteredLines: [4] } }).code,
    ).toBe(6);
    expect(
      exitOf({ ...base, verdict: 'pass', record: { alteredLines: [4], acceptedHazards: [] } }).code,
    ).toBe(5);
    // a plan danger the log records no acknowledgement of: 6, with its own words
    const unacked = exitOf({
      ...base,
      verdict: 'pass',
      record: { alteredLines: [], acceptedHazards: [] },
      planDangersNotAcknowledged: [{ code: 'detonable-state', step: 3 }],
    });
    expect(unacked.code).toBe(6);
    expect(unacked.err).toContain(
      "PLAN DANGER NOT ACKNOWLEDGED: the plan's danger findings have no acknowledgement",
    );
    expect(exitOf({ ...base, interrupted: true }).code).toBe(130);
    expect(exitOf({ ...base }).code).toBe(0);
  });

  it('the tank left above its working limit or holding a hazard: each line is said before the exit reason', () => {
    const r = exitOf({
      interrupted: false,
      logged: 4,
      steps: 4,
      verdict: 'fail',
      danger: true,
      tankNow: 'the tank MT-1 is STILL ABOVE its working limit: 5000.00 Torr absolute logged\nsecond line',
    });
    expect(r.code).toBe(EXIT.outOfTolerance);
    const lines = r.err.trim().split('\n');
    expect(lines[0]).toBe(
      'mixwright: b.jsonl: the tank MT-1 is STILL ABOVE its working limit: 5000.00 Torr absolute logged',
    );
    expect(lines[1]).toBe('mixwright: b.jsonl: second line');
    // a FAIL that hides the danger exit code still says the danger stands
    expect(lines[2]).toMatch(/FAIL .*a danger finding stands in the record as well/);
  });
});

describe('fill --resume of a closed log', () => {
  it('closed before its last fill: says so (incomplete, fill N of K) and points to the top-up route of the README', async () => {
    const f = join(mkdtempSync(join(tmpdir(), 'mw-fill-closed-')), 'b.jsonl');
    // the demo log's header and its first two readings (a prefix of its hash chain), then a close line
    writeFileSync(f, readFileSync(DEMO, 'utf8').split('\n').slice(0, 3).join('\n') + '\n');
    appendEvent(f, {
      kind: 'close',
      time: '2026-11-30T10:00:00Z',
      note: 'stopped by QX: the O2 cylinder is empty',
    });
    const before = readFileSync(f, 'utf8');
    const r = await runCli(['fill', '--resume', f], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'this batch log was closed before fill 3 of 3: the batch is INCOMPLETE (2 of 3',
    );
    expect(r.stderr).toContain('closed: stopped by QX: the O2 cylinder is empty');
    expect(r.stderr).not.toContain('the fill is finished');
    expect(r.stderr).toMatch(
      /top-up batch in a new log: add the `in_tank` line .* `mixwright plan` and `mixwright fill`/,
    );
    expect(readFileSync(f, 'utf8')).toBe(before);
  });

  it('closed after its last fill: the fill is finished', async () => {
    const f = join(mkdtempSync(join(tmpdir(), 'mw-fill-closed-')), 'b.jsonl');
    copyFileSync(DEMO, f);
    const r = await runCli(['fill', '--resume', f], true);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('this batch log is closed: the fill is finished');
  });
});

describe('Ctrl-C', () => {
  it('says the tank was left above its working limit when the fill says so, beside the count; else the count alone', () => {
    const left = 'the tank MT-1 is LEFT LOGGED ABOVE ITS WORKING LIMIT with no choice made';
    const r = exitOf({ interrupted: true, logged: 4, steps: 4, left });
    expect(r.code).toBe(EXIT.interrupted);
    expect(r.err).toMatch(/4 of 4 readings are logged in b\.jsonl\. Resume with/);
    expect(r.err).toContain(`mixwright: b.jsonl: ${left}\n`);
    const plain = exitOf({ interrupted: true, logged: 2, steps: 4 });
    expect(plain.err).not.toMatch(/WORKING LIMIT/);
  });
});
