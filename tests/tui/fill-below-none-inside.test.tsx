import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { frame80 } from './frame80.js';

// A fill read below a band with no displayed value inside it: continuing cannot complete that fill, so it is
// not offered as a way that could. The demo recipe with tolerance 0.0002: the CH4 target 10.0128 Torr with
// a band of +-0.0020 Torr (computed below) on head-1kT, which shows 0.01 Torr steps: 10.01 reads below the
// band, 10.02 above it (1 Torr = 101325/760 Pa, NIST SP 811, exact).
const NOW = '2026-12-01T01:00:00Z';
const TORR = 101325 / 760;
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const read = (s: FillState, text: string) => enter(type(s, text));
const flat = (f: string) => f.replace(/\n/g, ' ').replace(/[│ ]+/g, ' ');

describe('below a band no displayed value is inside', () => {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, tolerance: { relative: 0.0002 } } });
  const h = headerFromPlan(planFill(req.input), req, 'p1', '2026-12-01T00:00:00Z');
  const s0 = initialState(setupFromHeader(h));
  const s1 = read(s0, '10.01');

  it('the premise: no multiple of 0.01 Torr lies in the band, and 10.01 Torr is logged below it', () => {
    const t = s0.targetsPa[0] / TORR;
    const b = s0.setup.steps[0].bandPa / TORR;
    expect(s0.setup.steps[0].gauge?.id).toBe('head-1kT');
    expect(Math.floor((t + b) * 100)).toBeLessThan(Math.ceil((t - b) * 100));
    expect(s1.phase).toBe('below');
    expect(s1.effects.some((e) => e.kind === 'reading')).toBe(true);
  });

  it('the screen offers no continue to a stop (no "STOP AT 10.01"), says why, and offers next, stop, undo', () => {
    const f = frame80(s1);
    const text = flat(f);
    expect(text).not.toMatch(/STOP AT/);
    expect(text).not.toMatch(/fill on from cyl-CH4 to/);
    expect(text).toMatch(/TARGET 10\.0128 Torr \(no stop to read\)/);
    expect(text).toMatch(
      /- continue: cannot complete this fill: no value head-1kT shows is inside its band, so a further reading \(more gas\) is logged outside it too/,
    );
    expect(text).toMatch(/- next AB \(go on from 10\.01 Torr/);
    expect(text).toMatch(/- stop AB/);
    expect(text).toMatch(/undo AB: withdraw it/);
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  });

  it("with the plan's own tolerance (0.005) the same screen still offers continue to its stop", () => {
    const p = buildPlanRequest(rs);
    const s = read(initialState(setupFromHeader(headerFromPlan(planFill(p.input), p, 'p2', NOW))), '9.90');
    expect(s.phase).toBe('below');
    expect(flat(frame80(s))).toMatch(/STOP AT 10\.01 Torr .*- continue: fill on from cyl-CH4 to 10\.01 Torr/);
  });
});
