// A stage-2 batch that drew from its premix before the least mixing time (confirmed `mixed early` at the
// manifold) is no pass, whatever its numbers: the re-check assumes a uniform premix, which the record
// does not show. The demo stage-2 log (its premix log beside it), made again with a premix tank that asks
// a longer rest than the 20 h it had (unstirred, 55 h: diffusion alone; the rule is the guided fill's own,
// premixMixingElapsed), is re-checked: verdict, exit, label and the fill's own exit say so.
import { describe, expect, it } from 'vitest';
import { readLog } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { checkExit } from '../../src/cli/commands/check.js';
import { EXIT, ExitSignal } from '../../src/cli/context.js';
import { fillEnded } from '../../src/cli/fill-ended.js';
import { outcomeOfReport } from '../../src/tui/run.js';
import { verdictWord } from '../../src/report/check-report.js';
import { labelModel } from '../../src/report/label-model.js';
import { premixMixingElapsed } from '../../src/core/index.js';
import { drawnEarlyLog } from '../stage-logs.js';

describe('a premix drawn before its least mixing time', () => {
  it('the demo as made (20 h of a 55 h rest): NOT A PASS - PREMIX DRAWN EARLY, exit 7, the label says so', async () => {
    const file = drawnEarlyLog(55 * 3600);
    const log = readLog(file);
    const mixed = log.premixMixed[0];
    // the premise, by the guided fill's own rule: 20 h after the premix log closed, 55 h asked
    const t = premixMixingElapsed(
      {
        premixClosed: log.header.stage!.premix_check!.premix_log_closed,
        mixing: { stirred: false, restS: 55 * 3600 },
      },
      mixed.time,
    );
    expect(t?.early).toBe(true);
    const r = await checkLog(log, { trials: 0, seed: 1 });
    expect(r.verdict.verdict).toBe('pass'); // the composition alone is within tolerance
    expect(verdictWord(r)).toBe(
      'NOT A PASS (the composition is within tolerance) - PREMIX DRAWN EARLY (see below)',
    );
    expect(checkExit(r)).toBe(EXIT.notShown);
    expect(labelModel(r).headline).toMatch(/^PREMIX DRAWN EARLY - NOT A PASS/);
    // the guided fill ends as check of its log would: exit 7, saying why
    let err = '';
    const cli = { out: () => {}, err: (t: string) => (err += t), isTTY: true } as never;
    let code = 0;
    try {
      fillEnded(cli, { interrupted: false, logged: 4, steps: 4, ...outcomeOfReport(r) }, 'b.jsonl');
    } catch (e) {
      if (!(e instanceof ExitSignal)) throw e;
      code = e.code;
    }
    expect(code).toBe(7);
    expect(err).toMatch(/PREMIX DRAWN EARLY: the batch drew from its premix before the least mixing time/);
  });

  it('the same log with a 15 h rest asked (20 h waited): PASS, exit 0 (the rule does not cry wolf)', async () => {
    const r = await checkLog(readLog(drawnEarlyLog(15 * 3600)), { trials: 0, seed: 1 });
    expect(verdictWord(r)).toBe('PASS');
    expect(checkExit(r)).toBe(EXIT.ok);
  });
});
