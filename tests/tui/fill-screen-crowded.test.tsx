// A fill screen with two hazards accepted at a review (and the plan's warning) keeps 80 x 24 with its
// title on the first row: each hazard by its name and what to do; the whole text is on ? (the end
// screen's c, for a fill screen: no reading starts with ?), in parts that fit.
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { splitHeader } from '../split-plan.js';
import { frame80, read } from './frame80.js';
import { untilWithin } from './until.js';

const until = untilWithin(10000);

const NOW = '2026-12-01T01:00:00Z';
const flat = (f: string) => f.replace(/\s+/g, ' ');

/** the frame fits 80 x 24, the title on its first row */
function fits(f: string, title: RegExp) {
  const rows = f.split('\n');
  expect(rows.length, f).toBeLessThanOrEqual(24);
  for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  expect(rows[0], f).toMatch(title);
}

/**
 * the split demo (CH4, Ar to 400 Torr, O2, Ar) with CH4 read 40 % high: the review before fill 2 finds a
 * flammable state and a closed-vessel peak past the working limit at fill 3 (tests/tui/fill-review.test.ts),
 * accepted; the Ar read at its stop; Enter passes the reminder of fill 3
 */
function crowded(): FillState {
  const s1 = read(initialState(setupFromHeader(splitHeader())), '14.0179', 2);
  expect(s1.phase).toBe('review');
  const s2 = read(s1, 'accept TT');
  const s3 = read(s2, '400.00', 3);
  expect(s3.phase).toBe('reminder');
  const s = fillReducer(s3, { type: 'enter', now: NOW });
  expect(s.phase).toBe('reading');
  expect((s.acceptedHazards ?? []).map((h) => `${h.severity} ${h.code}@${h.step}`)).toEqual(
    expect.arrayContaining(['warning flammable-state@3', 'danger closed-vessel-pressure@3']),
  );
  return s;
}

describe('a crowded fill screen at 80 x 24', () => {
  it('two accepted hazards: the title stays, each hazard by name and what to do, ? for the whole text', async () => {
    const s = crowded();
    const f = frame80(s);
    fits(f, /^mixwright fill split-1 +fill 3 of 4$/);
    const t = flat(f);
    expect(t).toContain('STOP AT 428.02 Torr');
    expect(t).toContain(
      'WARNING flammable-state (accepted at a review, logged): choose a fill order that avoids it',
    );
    expect(t).toContain(
      'DANGER closed-vessel-pressure (accepted at a review, logged): lower the pressure of this state or change the fill order',
    );
    expect(t).toContain('?: all text');
    // the whole text on ?, in parts within 24 rows; b goes back to the fill
    const app = <FillApp initial={s} write={() => {}} logFile="b1.jsonl" />;
    const ui = render(app);
    Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
    ui.rerender(app);
    ui.stdin.write('?');
    await until(() => !!ui.lastFrame()?.includes('THE WHOLE TEXT'), 'the whole text');
    const parts = [ui.lastFrame()!];
    fits(parts[0], /^mixwright fill split-1 - fill 3 of 4: THE WHOLE TEXT$/);
    for (
      let k = 2;
      /n: next part/.test(parts[parts.length - 1]) && !/part (\d+) of \1\b/.test(parts[parts.length - 1]);
      k++
    ) {
      ui.stdin.write('n');
      await until(() => !!ui.lastFrame()?.includes(`part ${k} of`), `part ${k}`);
      parts.push(ui.lastFrame()!);
      fits(parts[parts.length - 1], /THE WHOLE TEXT$/);
    }
    const all = flat(parts.join(' '));
    // the hazards whole: the closed-vessel peak with its numbers, and the fill 2 message
    expect(all).toMatch(
      /DANGER closed-vessel-pressure \(accepted at the review of the remaining fills, logged\): ignited at 428\.02 Torr it reaches 2902\.\d+ Torr/,
    );
    expect(all).toContain('treat this state as a flammable, possibly explosive gas');
    expect(all).toContain(flat(s.message!));
    ui.stdin.write('b');
    await until(
      () => !!ui.lastFrame()?.includes('STOP AT 428.02 Torr'),
      `back to the fill: ${ui.lastFrame()}`,
    );
    // ? typed after a digit is part of the entry, not the page
    ui.stdin.write('4');
    ui.stdin.write('?');
    await new Promise((r) => setTimeout(r, 100));
    expect(ui.lastFrame()).not.toContain('THE WHOLE TEXT');
    ui.unmount();
  });

  it('a fill read below its band with hazards accepted at a review, an entry refused: the title stays', () => {
    const s1 = read(initialState(setupFromHeader(splitHeader())), '14.0179', 2);
    const below = read(read(s1, 'accept TT'), '150', 3);
    expect(below.phase).toBe('below');
    const refused = read(below, 'hello');
    expect(refused.error).toBeDefined();
    const f = frame80(refused);
    fits(f, /^mixwright fill split-1 - fill 2 of 4 \(Ar, charge 1 of 2\): BELOW ITS BAND$/);
    // the ways, each with what its review found, and the refusal
    expect(flat(f)).toContain('still passes the accepted DANGER closed-vessel-pressure (fill 3)');
    expect(flat(f)).toContain(
      '! type the new reading after adding gas and then your initials, e.g. 400.00 AB',
    );
  });
});
