// Stage 2 of a two-stage fill, the premix confirmed `mixed early` (49 s after the premix log closed, 15
// min of stirring asked): the checklist shows what was confirmed ("[mixed early, TT]", not "[done, TT]"),
// also on resume; the refusal before it reads as a sentence; the logged note and `check` of the log say
// the early draw once, every fact kept (the elapsed time, when the premix log closed, the least asked,
// who confirmed). Wording only; the early rule is the guided fill's own (premixMixingElapsed).
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { premixCheckText } from '../../src/report/check-types.js';
import { FillApp } from '../../src/tui/fill-app.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { stage2Batch } from '../stage-logs.js';
import { TORR } from '../helpers.js';
import { untilWithin } from './until.js';

const NOW = '2026-12-03T10:00:00Z';
const CLOSED = '2026-12-03T09:59:11Z';
const flat = (s: string | undefined) => (s ?? '').replace(/\s+/g, ' ');
const until = untilWithin(5000);

describe('stage 2: a premix confirmed mixed early', () => {
  const { dir, headerAt } = stage2Batch('mw-mixed-early-');
  const h: LogHeader = headerAt(CLOSED);
  const log: NewLogEvent[] = [];
  const enter = (s: FillState, text: string) => {
    const n = fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });
    log.push(...n.effects);
    return n.effects.reduce(
      (acc, e) =>
        e.kind === 'reading' ? fillReducer(acc, { type: 'logged', step: e.step, line: 2 + log.length }) : acc,
      n,
    );
  };
  let s = initialState(setupFromHeader(h));
  s = enter(s, (s.targetsPa[0] / TORR).toFixed(2));
  s = enter(s, (s.targetsPa[1] / TORR).toFixed(2));
  const refused = enter(s, 'mixed TT');
  const early = enter(refused, 'mixed early TT');

  it('the refusal of "mixed TT" reads as sentences: the time short of the least asked, then what the premix is to be', () => {
    expect(refused.error).toMatch(
      /^only 49 s since the premix log was closed \(2026-12-03T09:59:11Z\), less than the least asked, 15 min of stirring: not logged\. The premix is to be stirred since its last fill/,
    );
    expect(refused.error).not.toContain('asks stirred');
  });

  it('the logged note says the early confirmation once', () => {
    const note = (log.find((e) => e.kind === 'premix-mixed') as { note: string }).note;
    expect(note).toMatch(
      /; 49 s since the premix log was closed \(2026-12-03T09:59:11Z\), less than the 15 min of stirring asked: confirmed as mixed early by TT$/,
    );
    expect(note.match(/TT/g)).toHaveLength(1);
  });

  it('the checklist shows "[mixed early, TT]", on the screen and on resume', async () => {
    expect(early.premix?.mixedEarly).toBe(true);
    const resumed = initialState(
      setupFromHeader(h),
      parseLog([h, ...log].map((e) => JSON.stringify(e)).join('\n') + '\n', 'b1.jsonl'),
      NOW,
    );
    for (const st of [early, resumed]) {
      const ui = render(<FillApp initial={st} write={() => {}} logFile="b1.jsonl" />);
      // as an 80-column terminal draws it (ink-testing-library's stdout says 100 columns)
      Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
      ui.rerender(<FillApp initial={st} write={() => {}} logFile="b1.jsonl" />);
      await until(() => flat(ui.lastFrame()).includes('THE PREMIX TANK MT-2'), 'the premix screen');
      expect(flat(ui.lastFrame())).toContain('1. [mixed early, TT] The premix in MT-2 mixed:');
      expect(flat(ui.lastFrame())).not.toContain('[done, TT]');
      const lines = ui.lastFrame()!.split('\n');
      expect(lines.length).toBeLessThanOrEqual(24);
      for (const l of lines) expect(l.length, l).toBeLessThanOrEqual(80);
      ui.unmount();
    }
  });

  it('check of the log: DRAWN EARLY with each fact once', async () => {
    const text0 = [h, ...log].map((e) => JSON.stringify(e)).join('\n') + '\n';
    const r = await checkLog(parseLog(text0, join(dir, 'b1.jsonl')), { trials: 0, seed: 1 });
    const c = r.premixChecks!.find((x) => x.kind === 'mixed')!;
    const text = premixCheckText(c, () => '');
    expect(text).toMatch(
      /^premix in MT-2 confirmed mixed early by TT at 2026-12-03T10:00:00Z \(line \d+\) - DRAWN EARLY: 49 s after the premix log closed \(2026-12-03T09:59:11Z\), short of the least asked, 15 min of stirring; the re-check assumes a uniform premix, which nothing shows here; as logged: the premix in MT-2 was stirred since its last fill/,
    );
    for (const once of ['TT', '49 s', '15 min of stirring', 'premix log', '09:59:11'])
      expect(text.split(once), once).toHaveLength(2);
  });
});
