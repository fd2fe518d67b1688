// The review and below-band screens keep 80x24 with a long message (the shell puts the log's own notes -
// a stale lock taken over, a torn last line moved aside - before the resume message): the message is cut
// to the rows left, says "(?: whole text)", and ? shows it whole (b or ? back), as on the fill screen.
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog, type NewLogEvent, type LogHeader } from '../../src/io/batch-log.js';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { read } from './frame80.js';
import { untilWithin } from './until.js';

const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';

// the notes as the log opener words them (src/io/batch-log.ts openLogForFill), for an invented host
const NOTES = [
  'took over a stale lock: the fill of process 4242 on host bay3-pc, started 2026-12-01T00:55:00Z is no ' +
    'longer running (the computer was restarted since)',
  'the last line of the log (line 4, 212 bytes) was incomplete - cut off mid-write - and was moved to ' +
    '/lab/batches/in1.jsonl.torn-20261201T010000Z; nothing in it was confirmed. The log now ends at line 3',
];

const until = untilWithin(5000);

function fits(f: string) {
  const rows = f.split('\n');
  expect(rows.length, f).toBeLessThanOrEqual(24);
  for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
}

// the demo recipe's fill 2 (Ar, charge 1 of 2) read at 150 Torr, below its band (tests/tui/fill-incomplete)
function resumedBelow(): FillState {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  const h = headerFromPlan(planFill(req.input), req, 'in1', '2026-12-01T00:00:00Z');
  let s = initialState(setupFromHeader(h));
  const events: NewLogEvent[] = [];
  for (const t of ['10.013', '150']) {
    s = read(s, t);
    events.push(...s.effects);
  }
  const r = initialState(
    setupFromHeader(h),
    parseLog(logText(h, events), 'in1.jsonl'),
    '2026-12-01T02:00:00Z',
  );
  return withNotes(r);
}

/** the log's notes before the screen's own message, as the shell joins them (src/tui/run.tsx runFill) */
const withNotes = (s: FillState): FillState => ({ ...s, message: [...NOTES, s.message].join('; ') });

describe('? on the crowded review and below-band screens', () => {
  const below = resumedBelow();

  it('the premise: the resumed below-band screen with the notes would take more than 24 rows whole', () => {
    expect(below.phase).toBe('below');
    expect(below.message!.length).toBeGreaterThan(500);
  });

  for (const [what, state] of [
    ['below-band', below],
    ['review', withNotes(read(below, 'next JD'))],
  ] as const) {
    it(`the ${what} screen: the message cut with "(?: whole text)", 80x24; ? shows it whole, b back`, async () => {
      expect(state.phase).toBe(what === 'review' ? 'review' : 'below');
      const app = () => <FillApp initial={state} write={() => {}} logFile="in1.jsonl" />;
      const ui = render(app());
      Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
      ui.rerender(app());
      // drawn once, measured, then drawn with the message cut
      await until(() => !!ui.lastFrame()?.includes('(?: whole text)'), 'the message cut');
      fits(ui.lastFrame()!);
      ui.stdin.write('?');
      await until(() => !!ui.lastFrame()?.includes('THE WHOLE TEXT'), 'the whole-text page');
      const page = ui.lastFrame()!.replace(/\s+/g, ' ');
      expect(page).toContain('The log now ends at line 3');
      expect(page).toContain('took over a stale lock');
      fits(ui.lastFrame()!);
      ui.stdin.write('b');
      await until(() => !ui.lastFrame()?.includes('THE WHOLE TEXT'), 'back');
      expect(ui.lastFrame()!.replace(/\s+/g, ' ')).toContain('(?: whole text)');
      ui.unmount();
    });
  }
});
