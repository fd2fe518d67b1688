// The choices of the danger and review screens, each on its own row: the key to type, then what it does
// (never run together in one paragraph).
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { splitHeader } from '../split-plan.js';
import { TORR } from '../helpers.js';
import { frame80, read } from './frame80.js';

const NOW = '2026-12-01T01:00:00Z';

function demoHeader() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  return headerFromPlan(planFill(req.input), req, 'b1', '2026-12-01T00:00:00Z');
}

/** each key starts its own row, followed by what it does */
function ownRows(frame: string, keys: readonly string[]) {
  const rows = frame.split('\n');
  for (const k of keys)
    expect(
      rows.filter((r) => r.startsWith(`${k}: `)),
      `${k} in\n${frame}`,
    ).toHaveLength(1);
  expect(rows.length, frame).toBeLessThanOrEqual(24);
}

describe('the choices of a screen, one row each', () => {
  it('the danger screen of a reading past the working limit: vent, accept, edit', () => {
    // the demo recipe (CH4, Ar 1/2, O2, Ar 2/2) at its targets, then fill 4 read 2800 Torr (MT-1's limit 2700.22)
    let s = initialState(setupFromHeader(demoHeader()));
    ['10.01', '480.81', '500.82'].forEach((t, i) => (s = read(s, t, i + 2)));
    const over = read(s, '2800', 5);
    expect(over.phase).toBe('over-limit');
    ownRows(frame80(over), ['vent INITIALS', 'accept INITIALS', 'edit INITIALS']);
  });

  it('the review of the remaining fills: safer, accept, undo, fix; the reminder: Enter, Ctrl-C', () => {
    // the split demo with CH4 read 40 % high: the review finds a closed-vessel peak past the limit at fill 3
    const r = read(initialState(setupFromHeader(splitHeader())), '14.0179', 2);
    expect(r.phase).toBe('review');
    ownRows(frame80(r), [
      'safer INITIALS',
      'accept INITIALS',
      'stop INITIALS',
      'undo INITIALS',
      'fix N INITIALS',
    ]);
    const reminder = read(read(r, 'accept TT'), '400.00', 3);
    expect(reminder.phase).toBe('reminder');
    ownRows(frame80(reminder), ['Enter', 'Ctrl-C']);
    expect(fillReducer(reminder, { type: 'enter', now: NOW }).phase).toBe('reading');
  });

  it("a fill read below its band, an entry refused: the example is that fill's own target, the screen keeps 24 rows", () => {
    // the split demo (Ar charge 1 stops at 400 Torr): CH4 at its target, the Ar read at 150 Torr
    const s0 = initialState(setupFromHeader(splitHeader()));
    const s1 = read(s0, (s0.targetsPa[0] / TORR).toFixed(2), 2);
    const below = read(s1, '150', 3);
    expect(below.phase).toBe('below');
    const refused = read(below, 'hello');
    expect(refused.error).toMatch(/e\.g\. 400\.00 AB; or next, stop, undo or fix N with your initials/);
    const f = frame80(refused);
    expect(f.split('\n').length, f).toBeLessThanOrEqual(24);
    expect(f.split('\n')[0]).toMatch(/BELOW ITS BAND$/);
    ownRows(f, ['undo AB', 'fix N AB']);
  });
});
