// The end screen's title never reassures while check's caution of a reading logged past the tank's
// working limit (then corrected or withdrawn) stands beside the verdict: the title names it first, in
// check's words, and says "each within its band" only when the re-check found no such reading.
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { checkLog } from '../../src/io/check.js';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { FillApp, withdrawnOverLimit } from '../../src/tui/fill-app.js';
import { outcomeOfReport } from '../../src/tui/run.js';
import { fillEnded } from '../../src/cli/fill-ended.js';
import { ExitSignal } from '../../src/cli/context.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { demoHeader, entry, logOf } from './logged-entry.js';
import { untilWithin } from './until.js';

const until = untilWithin(15000);

const header = demoHeader('w1');

/** the demo recipe filled at its targets, fill 4 first typed 2800 Torr (past MT-1's limit) then withdrawn */
function withdrawnOverLimitFill() {
  const events: NewLogEvent[] = [];
  let s = initialState(setupFromHeader(header));
  for (const t of ['10.01', '480.81', '500.82']) s = entry(s, t, events);
  s = entry(s, '2800', events);
  expect(s.phase).toBe('over-limit');
  s = entry(s, 'edit JD', events);
  expect(events.map((e) => e.kind)).toContain('withdraw');
  s = entry(s, fromPa(s.targetsPa[3], 'Torr').toFixed(1), events);
  expect(s.phase).toBe('done');
  const log = logOf(header, events, 'w1.jsonl');
  return { s, log };
}

async function endFrame(s: FillState, log: ReturnType<typeof logOf>): Promise<string> {
  const report = await checkLog(log, { trials: 0, seed: 1 });
  const recheck = async () => ({ report, log });
  const app = <FillApp initial={s} write={() => {}} logFile="w1.jsonl" recheck={recheck} />;
  const ui = render(app);
  Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
  ui.rerender(app);
  await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
  const f = ui.lastFrame()!;
  ui.unmount();
  return f;
}

describe('the end screen title after a reading past the working limit was withdrawn', () => {
  it('names the withdrawn reading against the limit (as check words it), never "each within its band"', async () => {
    const { s, log } = withdrawnOverLimitFill();
    const f = await endFrame(s, log);
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
    const flat = f.replace(/\s+/g, ' ');
    // the caveat beside the verdict, as check words it (check-shared verdictCaveats)
    expect(flat).toContain('! A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn');
    // the title: the batch, then the caution, its reading against the limit (MT-1: 4 bar x 0.9 = 2700.22
    // Torr, the demo lab profile), then how the fills ended
    const title = flat.slice(0, flat.indexOf('fill 4 (Ar'));
    expect(title).toMatch(
      /^mixwright fill w1 - A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn \(fill 4: 2800 Torr vs the limit 2700\.22 Torr\): the tank may have been above its limit; all 4 fills logged $/,
    );
    expect(flat).not.toContain('each within its band');
  });

  it('the same fill without the over-limit reading: "each within its band" once the re-check is in', async () => {
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(header));
    for (const t of ['10.01', '480.81', '500.82']) s = entry(s, t, events);
    s = entry(s, fromPa(s.targetsPa[3], 'Torr').toFixed(1), events);
    const log = logOf(header, events, 'w1.jsonl');
    const f = await endFrame(s, log);
    // every band holds, but check's re-check of this log is no pass (the log here is written without its
    // hash chain: RECORD ALTERED): the title says so in the same line, never "each within its band" alone
    expect(f.split('\n')[0]).toBe(
      'mixwright fill w1 - all 4 fills logged, each within its band; not a pass (below)',
    );
    expect(f.replace(/\s+/g, ' ')).toMatch(/Re-check of the log \(mixwright check\): [A-Z ]+- not a pass/);
    expect(f).not.toContain('ABOVE THE WORKING LIMIT');
  });
});

describe('the end screen after the last fill was vented back', () => {
  it('the message of the reading after venting is whole on the first page while the rows hold it', async () => {
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(header));
    for (const t of ['10.01', '480.81', '500.82']) s = entry(s, t, events);
    s = entry(s, '2800', events);
    s = entry(s, 'vent JD', events);
    expect(s.phase).toBe('vented');
    s = entry(s, '1490 JD', events);
    expect(s.phase).toBe('done');
    const log = logOf(header, events, 'w1.jsonl');
    const f = await endFrame(s, log);
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(23);
    expect(rows[0]).toMatch(/^mixwright fill w1 - CLOSED AFTER VENTING: fill 4 of 4 read 1490 Torr/);
    // more than 4 rows of message: shown whole, not cut (m is not needed)
    expect(s.message!.length).toBeGreaterThan(4 * 72);
    expect(f.replace(/\s+/g, ' ')).toContain(s.message!.replace(/\s+/g, ' '));
    expect(f).not.toContain('m: the whole message');
  });
});

describe('the shell line after the end screen of a fill with a withdrawn reading past the working limit', () => {
  it("names it in the end title's words (withdrawnOverLimit), on stderr, whatever the exit code", async () => {
    const { log } = withdrawnOverLimitFill();
    const report = await checkLog(log, { trials: 0, seed: 1 });
    const title = withdrawnOverLimit(report)!;
    expect(title).toMatch(
      /^A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn \(fill 4/,
    );
    let err = '';
    const cli = { out: () => {}, err: (t: string) => (err += t), isTTY: true } as never;
    try {
      fillEnded(cli, { interrupted: false, logged: 4, steps: 4, ...outcomeOfReport(report) }, 'w1.jsonl');
    } catch (e) {
      if (!(e instanceof ExitSignal)) throw e;
    }
    expect(err).toContain(`mixwright: w1.jsonl: ${title}\n`);
  });
});
