// The guided fill's last fill, where the plan warns that readings inside every band can fail together
// (band-edges-past-tolerance): the readings before it are known, so the range of the last reading that
// the re-check passes is computed and said on the screen when it is narrower than the band. Outside
// reference: `check` of the log itself (checkLog), with the last reading at the ends of the range said
// (pass) and one display step outside them (no pass). The plan: the demo recipe at 1.5 % (its O2 fill, 3,
// read near the top of its band, 501.11 Torr for 500.82 +- 0.30: the last fill, Ar, cannot undo it).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planWithPrediction } from '../../src/io/plan-predict.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import type { NewLogEvent } from '../../src/io/batch-log.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { lastFillRange } from '../../src/tui/last-fill.js';
import { FillApp } from '../../src/tui/fill-app.js';
import { fromPa } from '../../src/report/units.js';
import { demoHeader, entry, logOf } from './logged-entry.js';
import { untilWithin } from './until.js';

const until = untilWithin(15000);

function headerAt(relative: string) {
  const text = readFileSync('recipes/ch4-o2-ar-phi1.yaml', 'utf8');
  expect(text).toMatch(/relative: 0\.005/);
  const file = join(mkdtempSync(join(tmpdir(), 'mw-last-')), 'r.yaml');
  writeFileSync(file, text.replace('relative: 0.005', `relative: ${relative}`));
  const req = buildPlanRequest(readRecipe(file));
  return headerFromPlan(planWithPrediction(planFill(req.input), req), req, 'l1', '2026-12-01T00:00:00Z');
}

/** fills 1-3 typed as given; the state at the last fill and the events so far */
function toLastFill(header: ReturnType<typeof headerAt>, typed: readonly string[]) {
  const events: NewLogEvent[] = [];
  let s: FillState = initialState(setupFromHeader(header));
  for (const t of typed) s = entry(s, t, events);
  expect(s.current).toBe(3);
  return { s, events };
}

/** check's verdict of the log with the last fill read at `torr` */
async function verdictAt(
  header: ReturnType<typeof headerAt>,
  s: FillState,
  events: NewLogEvent[],
  torr: number,
) {
  const all = [...events];
  const done = entry(s, torr.toFixed(1), all);
  expect(done.phase).toBe('done');
  const r = await checkLog(logOf(header, all, 'l1.jsonl'), { trials: 0, seed: 1 });
  return r.verdict.verdict;
}

describe("the last fill's passing range (band-edges-past-tolerance)", () => {
  const header = headerAt('0.015');

  it('narrower than the band after fill 3 read near its top; its ends pass check, a display step out does not', async () => {
    expect((header.findings ?? []).map((f) => f.code)).toContain('band-edges-past-tolerance');
    const { s, events } = toLastFill(header, ['10.01', '480.81', '501.11']);
    const r = lastFillRange(s);
    expect(r?.kind).toBe('range');
    if (r?.kind !== 'range') return;
    const step = s.setup.steps[3];
    const target = s.targetsPa[3];
    expect(r.lowPa).toBeGreaterThanOrEqual(target - step.bandPa);
    expect(r.highPa).toBeLessThanOrEqual(target + step.bandPa);
    expect(r.highPa - r.lowPa).toBeLessThan(2 * step.bandPa);
    // the ends as the screen shows them (head-10kT: 0.1 Torr), rounded inward
    const low = Math.ceil(fromPa(r.lowPa, 'Torr') * 10 - 1e-7) / 10;
    const high = Math.floor(fromPa(r.highPa, 'Torr') * 10 + 1e-7) / 10;
    expect(await verdictAt(header, s, events, low)).toBe('pass');
    expect(await verdictAt(header, s, events, high)).toBe('pass');
    expect(await verdictAt(header, s, events, low - 0.1)).not.toBe('pass');
    expect(await verdictAt(header, s, events, high + 0.1)).not.toBe('pass');

    // on the screen, in the box under the band
    const ui = render(<FillApp initial={s} write={() => {}} logFile="l1.jsonl" />);
    Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
    ui.rerender(<FillApp initial={s} write={() => {}} logFile="l1.jsonl" />);
    await until(() => !!ui.lastFrame()?.includes('STOP AT'), 'the last fill');
    const flat = ui.lastFrame()!.replace(/[│\s]+/g, ' ');
    expect(flat).toContain(
      `! The re-check passes only a reading from ${low.toFixed(1)} to ${high.toFixed(1)} Torr (at 25.0 degC): ` +
        'narrower than the band, as the readings before it leave less room (band-edges-past-tolerance)',
    );
    const rows = ui.lastFrame()!.split('\n');
    expect(rows.length).toBeLessThanOrEqual(24);
    for (const row of rows) expect(row.length, row).toBeLessThanOrEqual(80);
    ui.unmount();
  });

  it('not said before the last fill, nor where the plan has no such finding', () => {
    const first = initialState(setupFromHeader(header));
    expect(lastFillRange(first)).toBeUndefined();
    const demo = demoHeader('d1');
    expect((demo.findings ?? []).map((f) => f.code)).not.toContain('band-edges-past-tolerance');
    const { s } = toLastFill(demo, ['10.01', '480.81', '501.11']);
    expect(lastFillRange(s)).toBeUndefined();
  });
});
