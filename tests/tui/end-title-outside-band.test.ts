// The end screen's title says "all N fills logged" only where every fill was read within its band: a fill
// before the last read above or below its band is named, from the readings (fillEnding). Demo recipe (CH4,
// Ar 1/2, O2, Ar 2/2 on MT-1); the bands are the plan's, read back here (fill 2's stop 480.81 Torr), not
// assumed.
import { describe, expect, it } from 'vitest';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { endWords } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { demoHeader, entry } from './logged-entry.js';

/** the typed entries first, then each fill ahead read at its (re-targeted) target, to the end */
function drive(first: readonly string[]): FillState {
  const events: NewLogEvent[] = [];
  let s: FillState = initialState(setupFromHeader(demoHeader('o1')));
  for (const t of first) s = entry(s, t, events);
  // a reminder of a danger ahead is read and passed with Enter alone
  while (s.phase === 'reading' || s.phase === 'reminder')
    s = entry(s, s.phase === 'reminder' ? '' : fromPa(s.targetsPa[s.current], 'Torr').toFixed(2), events);
  return s;
}

const TORR = 101325 / 760;

describe('the end title names the fills read outside their band', () => {
  it('fill 2 read 700 Torr against its stop band 480.71-480.91: "fill 2 read ABOVE its band", not "all 4"', () => {
    const s = drive(['10.01', '700']);
    expect(s.phase).toBe('done');
    // the premise, from the plan: 700 Torr is past fill 2's band
    const st = s.setup.steps[1];
    expect(700 * TORR - s.setup.header.steps[1].target_Pa).toBeGreaterThan(st.bandPa);
    const t = endWords(s, { pending: true });
    expect(t).toBe('4 fills logged, the last within its band; fill 2 read ABOVE its band');
    expect(t).not.toMatch(/all 4 fills logged/);
  });

  it('fill 1 read 20 Torr above its band (30.01 for 10.01), gone on through the review: named above', () => {
    const s = drive(['30.01', 'go AB', 'accept AB']);
    expect(s.phase).toBe('done');
    const t = endWords(s, { pending: true });
    expect(t).toMatch(/; fill 1 read ABOVE its band$/);
    expect(t).not.toMatch(/all 4 fills logged|each within/);
  });

  it('every fill at its target: "all 4 fills logged" still (the phrase kept where it is true)', () => {
    const s = drive([]);
    expect(s.phase).toBe('done');
    expect(endWords(s, { pending: true })).toBe('all 4 fills logged (the re-check of the log follows)');
  });
});
