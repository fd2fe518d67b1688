// Stage 2 of a two-stage fill: before the first fill from the premix, the fill asks that the premix
// was mixed (initials, a `premix-mixed` event) and for the premix tank's reading against the minimum
// the stage-2 sheet prints (a `premix-reading` event; below it the fill does not go on). Resume comes
// back to the question still open; `check` reads such a log and its composition does not change.
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { stage2Batch } from '../stage-logs.js';
import { TORR } from '../helpers.js';

const NOW = '2026-12-03T10:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
function step(s: FillState, text: string, log: NewLogEvent[]): FillState {
  const n = enter(type(s, text));
  log.push(...n.effects);
  // the shell tells the reducer the line of each reading it wrote
  return n.effects.reduce(
    (acc, e) =>
      e.kind === 'reading' ? fillReducer(acc, { type: 'logged', step: e.step, line: 2 + log.length }) : acc,
    n,
  );
}
const logOf = (h: LogHeader, events: readonly NewLogEvent[], file = 'b1.jsonl') =>
  parseLog([h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n', file);

describe('stage 2: the premix check before the first fill from the premix', () => {
  const { dir, header: h, headerAt, stage2Sheet } = stage2Batch('mw-premix-check-');

  it("the header carries the stage-2 sheet's own premix-tank row: at least 621.7 Torr on head-10kT before fill 3", () => {
    const pc = h.stage!.premix_check!;
    // README two-stage section: "at least 621.7 Torr on head-10kT before fill 3" (after the demo draw)
    expect(pc).toMatchObject({ tank: 'MT-2', minimum: '621.7 Torr', fills: [3] });
    expect(pc.gauge?.id).toBe('head-10kT');
    expect(pc.minimum_Pa / TORR).toBeCloseTo(621.7, 9);
    // the very row the sheet prints, from the same function and lab profile
    const sheet = stage2Sheet();
    const row = sheet.rows.find((r) => r.check)!;
    expect(row.n).toBe(3);
    expect(`${row.check!.minimum} ${row.check!.unit}`).toBe(pc.minimum);
    expect(row.check!.gauge).toBe(pc.gauge?.id);
  });

  it('asks mixed INITIALS, then the reading; below the minimum it is logged and refused with why and what to do; resume comes back to it', () => {
    const log: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(h));
    s = step(s, (s.targetsPa[0] / TORR).toFixed(2), log);
    s = step(s, (s.targetsPa[1] / TORR).toFixed(2), log);
    expect(s.current).toBe(2);
    expect(s.phase).toBe('premix');
    // a reading before the mixing is confirmed is not taken
    const early = step(s, '1890.2 AB', []);
    expect(early.phase).toBe('premix');
    expect(early.effects).toEqual([]);
    expect(early.error).toMatch(
      /type mixed and your initials .* stirred since its last fill .* rested at least 7\.5 h/,
    );
    s = step(s, 'mixed AB', log);
    expect(log.at(-1)).toMatchObject({ kind: 'premix-mixed', tank: 'MT-2', by: 'AB' });
    expect(s.phase).toBe('premix');
    // 600 Torr is far below what the premix log predicts: asked first, not logged; typed again, logged
    const asked = step(s, '600 CD', log);
    expect(asked.effects).toEqual([]);
    expect(asked.error).toMatch(/^NOT logged yet: 600\.000 Torr absolute is .* below the .* expected/);
    s = step(asked, '600 CD', log);
    expect(log.at(-1)).toMatchObject({
      kind: 'premix-reading',
      tank: 'MT-2',
      gauge: 'head-10kT',
      enough: false,
      by: 'CD',
    });
    expect(s.phase).toBe('premix');
    expect(s.current).toBe(2);
    expect(s.message).toMatch(
      /^REFUSED \(the reading is logged\): MT-2 reads 600\.0 Torr on head-10kT, below the minimum 621\.7 Torr/,
    );
    expect(s.message).toMatch(
      /would leave MT-2 below 572\.3\d* Torr .* make a new premix or a smaller batch/,
    );
    // Enter on a plain number: initials are asked
    expect(step(s, '700', []).error).toMatch(/and then your initials/);

    // stopped here and resumed: the mixing stays confirmed, the reading is asked again
    const r = initialState(setupFromHeader(h), logOf(h, log), NOW);
    expect(r.phase).toBe('premix');
    expect(r.premix?.mixedBy).toBe('AB');
    expect(r.premix?.reading?.enough).toBe(false);
    const ok = step(r, '1890.2 CD', log);
    expect(log.at(-1)).toMatchObject({ kind: 'premix-reading', enough: true });
    expect(ok.phase).toBe('reading');
    expect(ok.current).toBe(2);
    expect(ok.message).toMatch(/MT-2 reads 1890\.2 Torr \(logged by CD\), at least the minimum 621\.7 Torr/);
    // resumed after both: straight to fill 3
    expect(initialState(setupFromHeader(h), logOf(h, log), NOW).phase).toBe('reading');
  });

  it('stop INITIALS closes the batch before the premix fill, saying why', () => {
    const log: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(h));
    s = step(s, (s.targetsPa[0] / TORR).toFixed(2), log);
    s = step(s, (s.targetsPa[1] / TORR).toFixed(2), log);
    s = step(step(step(s, 'mixed AB', log), '600 AB', log), '600 AB', log);
    const end = step(s, 'stop AB', log);
    expect(end.phase).toBe('ended');
    expect(log.at(-1)).toMatchObject({ kind: 'close' });
    expect((log.at(-1) as { note: string }).note).toMatch(
      /before fill 3: the premix tank MT-2 read 600 Torr, below the minimum 621\.7 Torr/,
    );
  });

  it('check reads a log with the premix check: the same composition as without it', async () => {
    const log: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(h));
    for (let k = 0; k < 2; k++) s = step(s, (s.targetsPa[k] / TORR).toFixed(2), log);
    s = step(step(s, 'mixed AB', log), '1890.2 AB', log);
    for (let k = 2; k < 4; k++) s = step(s, (s.targetsPa[k] / TORR).toFixed(2), log);
    expect(s.phase).toBe('done');
    const withCheck = logOf(h, log, join(dir, 'b1.jsonl'));
    expect(withCheck.premixMixed).toHaveLength(1);
    expect(withCheck.premixReadings).toHaveLength(1);
    const without = logOf(
      h,
      log.filter((e) => e.kind !== 'premix-mixed' && e.kind !== 'premix-reading'),
      join(dir, 'b1.jsonl'),
    );
    const a = await checkLog(withCheck, { trials: 0, seed: 1 });
    const b = await checkLog(without, { trials: 0, seed: 1 });
    for (const k of a.result.species) {
      expect(a.result.composition[k].value).toBe(b.result.composition[k].value);
      expect(a.result.composition[k].u).toBe(b.result.composition[k].u);
    }
    expect(a.verdict.verdict).toBe(b.verdict.verdict);
  });

  describe('the mixing time and the premix-tank reading are checked against the premix log', () => {
    // the demo premix log closes at 09:30:00 (tests/stage-logs.ts); its last reading is the one the
    // header's planned_Pa rests on (no other batch drew from it)
    const hClosed = (closed: string, stirred = true): LogHeader => {
      const h2 = headerAt(closed);
      const pc = h2.stage!.premix_check!;
      return stirred
        ? h2
        : {
            ...h2,
            stage: { ...h2.stage!, premix_check: { ...pc, mixing: { stirred: false, rest_s: 27000 } } },
          };
    };
    const toPremix = (h2: LogHeader, now: string, log: NewLogEvent[]) => {
      let s = initialState(setupFromHeader(h2));
      for (let k = 0; k < 2; k++) s = step(s, (s.targetsPa[k] / TORR).toFixed(2), log);
      expect(s.phase).toBe('premix');
      return { s, at: (t: FillState, text: string) => fillReducer(type(t, text), { type: 'enter', now }) };
    };

    it('mixed 49 s after the premix log closed (stirred, 15 min asked): said, not logged; mixed early INITIALS logs it with the time', () => {
      const log: NewLogEvent[] = [];
      const { s, at } = toPremix(hClosed('2026-12-03T09:59:11Z'), NOW, log);
      const refused = at(s, 'mixed TT');
      expect(refused.effects).toEqual([]);
      expect(refused.premix?.mixedBy).toBeUndefined();
      expect(refused.error).toMatch(
        /^only 49 s since the premix log was closed \(2026-12-03T09:59:11Z\), less than the least asked, 15 min of stirring: not logged\. .*type mixed early TT/,
      );
      const ok = at(refused, 'mixed early TT');
      expect(ok.effects).toEqual([
        expect.objectContaining({
          kind: 'premix-mixed',
          by: 'TT',
          note: expect.stringMatching(
            /49 s since the premix log was closed .* confirmed as mixed early by TT/,
          ),
        }),
      ]);
      expect(ok.message).toMatch(/mixed EARLY \(logged\)/);
    });

    it('a stirred tank 30 min after the premix log closed is not held up; the time is logged', () => {
      const log: NewLogEvent[] = [];
      const { s, at } = toPremix(hClosed('2026-12-03T09:30:00Z'), NOW, log);
      const ok = at(s, 'mixed TT');
      expect(ok.error).toBeUndefined();
      expect(ok.effects).toEqual([
        expect.objectContaining({
          kind: 'premix-mixed',
          note: expect.stringMatching(/; 30 min since the premix log was closed \(2026-12-03T09:30:00Z\)$/),
        }),
      ]);
    });

    it('an unstirred tank (7.5 h rest asked) 30 min after: early, asked', () => {
      const { s, at } = toPremix(hClosed('2026-12-03T09:30:00Z', false), NOW, []);
      expect(at(s, 'mixed TT').error).toMatch(
        /^only 30 min since .* the least asked, 7\.5 h of rest: not logged/,
      );
    });

    it('1500 Torr where the premix log predicts 1890.2 Torr: the expected value and the difference are said; typed again it is logged with them', () => {
      const log: NewLogEvent[] = [];
      const h2 = hClosed('2026-12-03T09:30:00Z');
      const pc = h2.stage!.premix_check!;
      // nothing drawn: planned_Pa is the premix log's last reading
      expect(pc.premix_log_draws).toBe(0);
      expect(pc.planned_Pa).toBeCloseTo(pc.premix_log_last_Pa!, 6);
      const { s, at } = toPremix(h2, NOW, log);
      const mixed = at(s, 'mixed TT');
      const expected = (pc.planned_Pa / TORR).toPrecision(6);
      const short = ((pc.planned_Pa - 1500 * TORR) / TORR).toPrecision(6);
      const q = at(mixed, '1500 TT');
      expect(q.effects).toEqual([]);
      expect(q.error).toContain(
        `NOT logged yet: 1500.00 Torr absolute is ${short} Torr (${((100 * (pc.planned_Pa - 1500 * TORR)) / pc.planned_Pa).toFixed(1)} %) below the ${expected} Torr expected from the premix log's last reading ${expected} Torr, nothing drawn since: a leak, the wrong tank or the wrong gauge`,
      );
      // a different reading is judged afresh (1889.5: within 3 % + the gauge, logged at once)
      const fine = at(q, '1889.5 TT');
      expect(fine.effects).toEqual([
        expect.objectContaining({ kind: 'premix-reading', reading: '1889.5 Torr' }),
      ]);
      expect((fine.effects[0] as { note?: string }).note).toBeUndefined();
      // the same low reading twice: logged as read, the question and the answer in its note
      expect(at(q, '1500 TT').effects).toEqual([
        expect.objectContaining({
          kind: 'premix-reading',
          reading: '1500 Torr',
          enough: true,
          note: expect.stringMatching(
            new RegExp(
              `${short} Torr .* below the ${expected} Torr expected .* Read again and confirmed as read by TT$`,
            ),
          ),
        }),
      ]);
    });
  });
});
