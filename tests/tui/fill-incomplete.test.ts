import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import { checkOutcomes } from '../../src/report/check-outcome.js';
import { parseLog, type NewLogEvent, type LogHeader } from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

// A fill read below its band is incomplete: the reducer stays on it and offers to continue it first.
// The recommended order of the demo recipe: CH4, Ar 1/2 (stop 480.81 Torr), O2, Ar 2/2. O2 onto the Ar
// charge read at 150 Torr makes a flammable and detonable state (LFL of CH4 4.4 %, IEC 60079-20-1; LOC
// 10.7 %, ASTM E2079; by hand in tests/core/remainder-review.test.ts).
const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const read = (s: FillState, text: string) => enter(type(s, text));
const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';

function header() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  return headerFromPlan(planFill(req.input), req, 'in1', '2026-12-01T00:00:00Z');
}

describe('a fill read below its band (incomplete)', () => {
  const h = header();
  const s0 = initialState(setupFromHeader(h));
  const s1 = fillReducer(read(s0, '10.013'), { type: 'logged', step: 1, line: 2 });
  const low = read(s1, '150');
  const below = fillReducer(low, { type: 'logged', step: 2, line: 3 });

  it('the reading is logged and the fill stays on its screen: continue it, with what going on would pass', () => {
    expect(low.effects.map((e) => e.kind)).toEqual(['reading']);
    expect(low.phase).toBe('below');
    expect(low.current).toBe(2);
    expect(low.message).toMatch(
      /^fill 2 \(Ar, charge 1 of 2\) logged: .*BELOW the target 480\.810 Torr by more/,
    );
    expect(low.message).toMatch(/the fill is incomplete/);
    // every way on is reviewed: continuing passes nothing new, going on passes the detonable state, the
    // tank now (CH4 in Ar, no oxidizer) holds no hazard
    expect(low.belowWays!.continuing).toEqual({
      toPa: expect.closeTo(480.81 * TORR, 3),
      still: [],
      stillAccepted: [],
    });
    expect(low.belowWays!.goingOn.map((z) => z.key)).toContain('detonable-state@3');
    expect(low.belowWays!.tankNow).toEqual([]);
    // close is the last fill's
    expect(read(below, 'close JD').error).toMatch(/not the last fill/);
  });

  it('resumed after Ctrl-C there: the same screen comes back', () => {
    // the log as written: the CH4 reading (line 2) and the short Ar reading (line 3)
    const all = [...read(s0, '10.013').effects, ...low.effects];
    const r = initialState(setupFromHeader(h), parseLog(logText(h, all), 'x.jsonl'), NOW);
    expect(r.phase).toBe('below');
    expect(r.current).toBe(2);
    expect(r.targetsPa[1] / TORR).toBeCloseTo(480.81, 6);
    expect(r.message).toMatch(/^resumed: fill 2 \(Ar, charge 1 of 2\) logged at 150 Torr/);
  });

  it('next: the review offers continuing the fill, never "no safer stop"; safer points to it; a reading continues it', () => {
    const rv = read(below, 'next JD');
    expect(rv.phase).toBe('review');
    expect(rv.review!.hazards.map((x) => x.key)).toContain('detonable-state@3');
    expect(rv.review!.continuation).toMatchObject({ step: 2, clean: true, sourceId: 'cyl-Ar' });
    expect(rv.review!.continuation!.toPa / TORR).toBeCloseTo(480.81, 6);
    expect(rv.review!.noAlternative).toBeUndefined();
    expect(read(rv, 'safer JD').error).toMatch(/the safer way is to continue fill 2/);
    // a reading not above the logged one is refused and the review stands
    const no = read(rv, '140 JD');
    expect(no.phase).toBe('review');
    expect(no.effects).toEqual([]);
    expect(no.error).toMatch(/not above the logged reading/);
    const on = read(rv, '480.81 JD');
    expect(on.effects).toEqual([
      expect.objectContaining({ kind: 'correction', step: 2, by: 'JD', replaces_line: 3 }),
    ]);
    expect(on.phase).toBe('reading');
    expect(on.current).toBe(2);
    expect(on.review).toBeUndefined();
  });

  it('a further reading still short keeps the screen; fix 2 from it comes back to it on Esc and goes on once complete', () => {
    const more = read(below, '300 JD');
    expect(more.phase).toBe('below');
    expect(more.effects).toEqual([
      expect.objectContaining({ kind: 'correction', reason: expect.stringMatching(/more gas added/) }),
    ]);
    const fix = read(below, 'fix 2 JD');
    expect(fix.phase).toBe('correct');
    expect(fillReducer(fix, { type: 'escape' }).phase).toBe('below');
    const typed = read(fix, '480.81');
    const done = read(typed, 'misread the head');
    expect(done.effects).toEqual([
      expect.objectContaining({ kind: 'correction', step: 2, replaces_line: 3 }),
    ]);
    expect(done.phase).toBe('reading');
    expect(done.current).toBe(2);
  });

  it('stop INITIALS: the batch is closed here (logged, incomplete) and says what the review found in the tank', () => {
    expect(read(below, 'stop').effects).toEqual([]);
    const st = read(below, 'stop JD');
    expect(st.phase).toBe('ended');
    expect(st.effects).toEqual([
      expect.objectContaining({
        kind: 'close',
        note: expect.stringMatching(
          /^stopped by JD with fill 2 \(Ar, charge 1 of 2\) below its band at 150 Torr .*fills 3, 4 not made/,
        ),
      }),
    ]);
    expect(st.message).toMatch(
      /INCOMPLETE \(not a pass\); the review finds no flammable, detonable or danger state/,
    );
  });

  describe('next INITIALS: going on from the short reading is a logged choice', () => {
    const next = read(below, 'next JD');
    const ack = next.effects[0];

    it('bare next is refused (nothing logged); next JD logs the reading left, its target and band', () => {
      const bare = read(below, 'next');
      expect(bare.effects).toEqual([]);
      expect(bare.phase).toBe('below');
      expect(bare.error).toMatch(/type next and your initials \(e\.g\. next AB\)/);
      expect(next.effects).toEqual([
        expect.objectContaining({
          kind: 'acknowledge',
          code: 'went-on-below-band',
          step: 2,
          by: 'JD',
          time: NOW,
        }),
      ]);
      // the reading in force and the target of fill 2 then (the plan's 480.81 Torr, the split stop)
      expect(ack.kind === 'acknowledge' && ack.below!.pressure_Pa / TORR).toBeCloseTo(150, 9);
      expect(ack.kind === 'acknowledge' && ack.below!.target_Pa / TORR).toBeCloseTo(480.81, 6);
    });

    // the log as written: CH4 (line 2), the short Ar (line 3), the choice to go on (line 4)
    const all = [...read(s0, '10.013').effects, ...low.effects, ...next.effects];
    const log = parseLog(logText(h, all), 'x.jsonl');

    it('resumed after it: the below screen does not come back; the review of going on does', () => {
      const r = initialState(setupFromHeader(h), log, NOW);
      expect(r.phase).toBe('review');
      expect(r.current).toBe(2);
      expect(r.review!.hazards.map((x) => x.key)).toContain('detonable-state@3');
      // a further reading of fill 2 after the choice (still short) brings the below screen back
      const more = [
        ...all,
        {
          ...low.effects[0],
          kind: 'correction',
          pressure_Pa: 300 * TORR,
          reading: '300 Torr',
          by: 'JD',
          reason: 'more gas added',
          replaces_line: 3,
        },
      ];
      const again = initialState(
        setupFromHeader(h),
        parseLog(logText(h, more as NewLogEvent[]), 'y.jsonl'),
        NOW,
      );
      expect(again.phase).toBe('below');
    });

    it('check lists the choice (who, when, the reading and target) and is no pass: the batch is incomplete', async () => {
      const r = await checkLog(log, { trials: 0, seed: 1 });
      expect(r.warnings.join('\n')).toMatch(
        /fill 2 was read below its band \(150 Torr, 150\.00 Torr absolute against its target 480\.81 Torr\): JD at 2026-12-01T01:00:00Z went on from that reading/,
      );
      // a choice, not an accepted hazard
      expect(r.record?.acceptedHazards).toEqual([]);
      expect(checkOutcomes(r)[0]).toBe('incomplete');
    });
  });
});
