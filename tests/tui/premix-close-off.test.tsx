// Stage 2 of a two-stage fill, the premix tank's reading screen: before MT-2 is read at about 1890 Torr
// on head-10kT, the 1000 Torr head-1kT (still open for fill 3's reading at 520 Torr) must be closed off,
// in the stage-2 sheet's own words (premixCloseOffWords, one function), and the screen fits 80 x 24.
// Checks wording and layout only; the close-off data are the sheet's (premixTankCheck.closeOff).
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { premixCloseOffWords } from '../../src/report/two-stage-sheet.js';
import { stage2Batch } from '../stage-logs.js';
import { TORR } from '../helpers.js';
import { untilWithin } from './until.js';

const NOW = '2026-12-03T10:00:00Z';
const flat = (s: string | undefined) => (s ?? '').replace(/\s+/g, ' ');
const until = untilWithin(5000);
const enterText = (s: FillState, text: string) =>
  fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });

/** the screen as an 80-column terminal draws it (ink-testing-library's stdout says 100 columns) */
function render80(s: FillState) {
  const ui = render(<FillApp initial={s} write={() => {}} logFile="b1.jsonl" />);
  Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
  ui.rerender(<FillApp initial={s} write={() => {}} logFile="b1.jsonl" />);
  return ui;
}
const fits = (frame: string) => {
  const lines = frame.split('\n');
  expect(lines.length, frame).toBeLessThanOrEqual(24);
  for (const l of lines) expect(l.length, l).toBeLessThanOrEqual(80);
};

describe('stage 2: the premix-tank reading screen says to close off the low-range head', () => {
  const { header: h, stage2Sheet } = stage2Batch('mw-premix-close-');
  const sheetNote = stage2Sheet().rows.find((r) => r.check)!.check!.note;
  const words = premixCloseOffWords(
    h.stage!.premix_check!.close_off!.map((g) => ({ id: g.gauge, topPa: g.top_Pa, reopen: g.reopen })),
    'MT-2',
    'MT-1',
    'Torr',
  );
  /** at the premix phase: fills 1 and 2 read at their targets */
  const atPremix = (header = h) => {
    let s = initialState(setupFromHeader(header));
    s = enterText(s, (s.targetsPa[0] / TORR).toFixed(2));
    s = fillReducer(s, { type: 'logged', step: 1, line: 2 });
    s = enterText(s, (s.targetsPa[1] / TORR).toFixed(2));
    s = fillReducer(s, { type: 'logged', step: 2, line: 3 });
    expect(s.phase).toBe('premix');
    return s;
  };

  it("the header records the sheet's close-off: head-1kT (top 1000 Torr absolute), opened again for fill 3", () => {
    const co = h.stage!.premix_check!.close_off!;
    expect(co.map((g) => [g.gauge, g.reopen])).toEqual([['head-1kT', true]]);
    // the demo lab's head-1kT spans 0-1000 Torr absolute (src/io/demo-lab.ts)
    expect(co[0].top_Pa / TORR).toBeCloseTo(1000, 9);
    expect(words).toMatch(
      /^Close off head-1kT \(it reads only up to 1000\.0 Torr absolute\) before the line/,
    );
    // the sheet's row says the same words
    expect(sheetNote.startsWith(words)).toBe(true);
  });

  it('before and after "mixed AB": the close-off is on the screen, in the sheet\'s words, within 80 x 24', async () => {
    let s = atPremix();
    for (const typed of ['', 'mixed AB']) {
      if (typed) s = enterText(s, typed);
      const ui = render80(s);
      await until(() => flat(ui.lastFrame()).includes('THE PREMIX TANK MT-2'), 'the premix screen');
      const f = ui.lastFrame()!;
      expect(flat(f)).toContain(flat(words));
      // the close-off comes before the premix tank's reading
      expect(flat(f).indexOf('Close off head-1kT')).toBeLessThan(flat(f).indexOf('read MT-2 on head-10kT'));
      fits(f);
      ui.unmount();
    }
  });

  it('a reading below the minimum (REFUSED with why): the screen still fits 80 x 24', async () => {
    let s = enterText(atPremix(), 'mixed AB');
    s = enterText(enterText(s, '600 CD'), '600 CD');
    expect(s.message).toMatch(/^REFUSED/);
    const ui = render80(s);
    await until(() => flat(ui.lastFrame()).includes('REFUSED'), 'the refusal');
    const f = ui.lastFrame()!;
    expect(flat(f)).toContain(flat(words));
    fits(f);
    ui.unmount();
  });

  it('an older log without the close-off record: the screen says to close every head below the tank, not nothing', async () => {
    const pc = { ...h.stage!.premix_check! };
    delete pc.close_off;
    const old = { ...h, stage: { ...h.stage!, premix_check: pc } };
    const ui = render80(atPremix(old));
    await until(() => flat(ui.lastFrame()).includes('THE PREMIX TANK MT-2'), 'the premix screen');
    expect(flat(ui.lastFrame())).toContain(
      "Close off every head whose range ends below MT-2's pressure before the line is filled from MT-2",
    );
    fits(ui.lastFrame()!);
    ui.unmount();
  });
});
