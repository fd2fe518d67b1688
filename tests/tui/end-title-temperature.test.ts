// The end title judges each fill against the target it was read to: a fill re-targeted for a tank
// temperature typed on its screen (28 degC instead of the plan's 25 degC) and read at that target is
// inside its band, as its own screen said when it was logged, not "ABOVE its band" against the target at
// the plan's temperature. Demo recipe (CH4, Ar 1/2, O2, Ar 2/2 on MT-1); targets and bands are the
// plan's and the re-targeting's own, read back here, not assumed.
import { describe, expect, it } from 'vitest';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { endWords } from '../../src/tui/fill-app.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { demoHeader, entry } from './logged-entry.js';

function setTemperature(s: FillState, text: string): FillState {
  let t = fillReducer(s, { type: 'tab' });
  for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
  for (const ch of text) t = fillReducer(t, { type: 'char', text: ch });
  return fillReducer(t, { type: 'tab' });
}

/** each fill ahead read at its (re-targeted) target, to the end */
function toEnd(s: FillState, events: NewLogEvent[]): FillState {
  let t = s;
  while (t.phase === 'reading' || t.phase === 'reminder')
    t = entry(t, t.phase === 'reminder' ? '' : fromPa(t.targetsPa[t.current], 'Torr').toFixed(2), events);
  return t;
}

describe('the end title after a temperature typed on a fill', () => {
  it('fill 3 re-targeted at 28 degC and read at its new target: inside its band, "all 4 fills logged"', () => {
    const events: NewLogEvent[] = [];
    let s: FillState = initialState(setupFromHeader(demoHeader('t28')));
    s = entry(s, fromPa(s.targetsPa[0], 'Torr').toFixed(2), events);
    s = entry(s, fromPa(s.targetsPa[1], 'Torr').toFixed(2), events);
    const planned = s.targetsPa[2];
    s = setTemperature(s, '28 degC');
    const hot = s.targetsPa[2];
    // the premise: the re-targeted stop moved by more than the band (ideal gas: x 301.15 / 298.15, ~1 %)
    expect(Math.abs(hot - planned)).toBeGreaterThan(s.setup.steps[2].bandPa);
    s = entry(s, fromPa(hot, 'Torr').toFixed(2), events);
    expect(s.message ?? '').toMatch(/inside the pressure band/);
    s = toEnd(s, events);
    expect(s.phase).toBe('done');
    const t = endWords(s, { pending: true });
    expect(t).not.toMatch(/ABOVE|BELOW/);
    expect(t).toBe('all 4 fills logged (the re-check of the log follows)');
  });
});
