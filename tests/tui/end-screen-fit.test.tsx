// The end screens of the fill fit an 80 x 24 terminal (ink-testing-library's frame, 24 rows assumed):
// the verdict and the commands to run next are on the first page; the label is on it when there is
// room, else its own page (l), and a long message is cut (m shows it whole).
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { readLog } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { premixTargets, writePremixLog } from '../stage-logs.js';

async function until(cond: () => boolean, what: string, ms = 15000): Promise<void> {
  const t0 = Date.now();
  while (!cond()) {
    if (Date.now() - t0 > ms) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

/** rows of a frame (ink-testing-library draws 100 columns; the tmux test holds 80 x 24) */
const rowsOfFrame = (frame: string) => frame.split('\n').length;

describe('the end screen fits 80 x 24', () => {
  it('stage 1 closed at its targets: verdict, the premix as filled and the stage-2 command on the first page; the label on l', async () => {
    const { file } = writePremixLog(mkdtempSync(join(tmpdir(), 'mw-end-fit-')), premixTargets, {
      close: true,
    });
    const log = readLog(file);
    const s = initialState(setupFromHeader(log.header), log, '');
    expect(s.phase).toBe('done');
    const recheck = async () => ({ report: await checkLog(readLog(file), { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile={file} recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('Re-check of the log (mixwright check): PASS');
    expect(f.replace(/\s+/g, ' ')).toContain('mixwright fill X'); // the stage-2 command the header records
    expect(f).toContain('l: the tank label');
    expect(f).not.toContain('Tank label (as filled');
    ui.stdin.write('l');
    await until(
      () => !!ui.lastFrame()?.includes('Tank label (as filled'),
      `the label page in ${ui.lastFrame()}`,
      3000,
    );
    expect(rowsOfFrame(ui.lastFrame()!)).toBeLessThanOrEqual(24);
    ui.stdin.write('b');
    await until(() => !!ui.lastFrame()?.includes('l: the tank label'), 'back');
    ui.unmount();
  });

  it('a single-tank batch: the label on the first page, within 24 rows', async () => {
    const log = readLog('batches/demo-ch4-phi1-ar98.jsonl');
    const s = initialState(setupFromHeader(log.header), log, '');
    const recheck = async () => ({ report: await checkLog(log, { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile="demo.jsonl" recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('Tank label (as filled');
    expect(f).toContain('`mixwright check demo.jsonl`');
    ui.unmount();
  });

  it('a long message is cut on the first page (m shows it whole), the verdict and the log line stay', async () => {
    const log = readLog('batches/demo-ch4-phi1-ar98.jsonl');
    const long = `stopped after fill 2: ${'the tank read 1498.2 Torr after venting, and more words '.repeat(20)}END`;
    const s = { ...initialState(setupFromHeader(log.header), log, ''), message: long };
    const recheck = async () => ({ report: await checkLog(log, { trials: 0, seed: 1 }), log });
    const ui = render(<FillApp initial={s} write={() => {}} logFile="demo.jsonl" recheck={recheck} />);
    await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check');
    const f = ui.lastFrame()!;
    expect(rowsOfFrame(f)).toBeLessThanOrEqual(24);
    expect(f).toContain('(m: the whole message)');
    expect(f).not.toContain('END');
    expect(f).toContain('`mixwright check demo.jsonl`');
    ui.stdin.write('m');
    await until(() => !!ui.lastFrame()?.includes('END'), 'the whole message');
    ui.unmount();
  });
});
