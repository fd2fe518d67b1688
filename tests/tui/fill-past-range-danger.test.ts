import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';

// A value typed past the gauge head's range is never logged as a reading (it is logged as typed, and the
// over-range screen asks for the tank read on a gauge that covers it, or a slip); past the tank's working limit too (as typed,
// or as its bare number in the gauge's unit) the danger is said first. MT-1 of the demo lab: rated 4 bar,
// working fraction 0.9: 3.6 bar = 2700.22 Torr (1 bar = 750.0617 Torr, 1 kPa = 7.500617 Torr, 1 mbar =
// 0.7500617 Torr; 1 Torr = 101325/760 Pa, NIST SP 811, exact from the definitions; checked to 0.005 Torr
// by the printed digits). head-1kT reads up to 1000 Torr.
const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const read = (s: FillState, text: string) => enter(type(s, text));

function header() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  return headerFromPlan(planFill(req.input), req, 'pr1', '2026-12-01T00:00:00Z');
}

describe('a value past the gauge range and past the working limit says the danger first', () => {
  const h = header();
  // the recommended order CH4, Ar 1/2, O2, Ar 2/2: the O2 (fill 3) is read on head-1kT
  const s0 = initialState(setupFromHeader(h));
  const s1 = read(s0, '10.013');
  const s2 = read(fillReducer(s1, { type: 'logged', step: 1, line: 2 }), '480.81');
  const o2 = fillReducer(s2, { type: 'logged', step: 2, line: 3 });

  it('the O2 step is read on head-1kT (the setting of the trial)', () => {
    expect(o2.current).toBe(2);
    expect(o2.phase).toBe('reading');
    expect(o2.setup.steps[2]).toMatchObject({ species: 'O2' });
    expect(o2.setup.steps[2].gauge?.id).toBe('head-1kT');
  });

  for (const [typed, abs] of [
    ['2800', '2800.00 Torr'],
    ['3500 Torr', '3500.00 Torr'],
    // 501.5 kPa x 7.500617 = 3761.56 Torr
    ['501.5 kPa', '3761.56 Torr'],
  ] as const) {
    it(`"${typed}": DANGER first (stop, close the valves, the over-pressure procedure), then the range and unit; no reading logged (the value logged as typed)`, () => {
      const r = read(o2, typed);
      expect(r.phase).toBe('over-range');
      expect(r.done).toHaveLength(2);
      expect(r.effects.map((e) => e.kind)).toEqual(['acknowledge']);
      expect(r.current).toBe(2);
      expect(r.input).toBe('');
      expect(r.overRange!.words).toMatch(
        new RegExp(
          `^DANGER if the tank holds it: ${abs.replace('.', '\\.')} absolute \\(as typed\\) is past the working ` +
            `limit 2700\\.22 Torr of MT-1, rated 3000 Torr: stop adding gas, close the cylinder and tank ` +
            `valves, keep clear of the tank and follow the lab's over-pressure procedure`,
        ),
      );
      // then the range and the likely slip, still there
      const danger = r.overRange!.words.indexOf('DANGER');
      const range = r.overRange!.words.indexOf('past its range (up to 1000.00 Torr)');
      expect(range).toBeGreaterThan(danger);
      expect(r.overRange!.words).toMatch(/NOT logged as a reading\. .* Likely the unit or a typing slip/);
    });
  }

  it('"2800 mbar" (2100.17 Torr, below the limit) read as 2800 Torr, the gauge\'s unit, is past it: the danger is said for that reading', () => {
    const r = read(o2, '2800 mbar');
    expect(r.done).toHaveLength(2);
    expect(r.overRange!.words).toMatch(
      /^DANGER if the tank holds it: 2800\.00 Torr absolute \(read as 2800 Torr, the gauge's unit\) is past the working limit 2700\.22 Torr/,
    );
    expect(r.overRange!.words).toMatch(/typed "2800 mbar" = 2100\.17 Torr on head-1kT, past its range/);
  });

  it('past the range but below the limit either way ("1200", "1500 mbar" = 1125.09 Torr): no danger, the range message alone', () => {
    for (const typed of ['1200', '1500 mbar']) {
      const r = read(o2, typed);
      expect(r.done).toHaveLength(2);
      expect(r.overRange!.words).toMatch(
        new RegExp(`^typed "${typed}" = .* past its range \\(up to 1000\\.00 Torr\\)`),
      );
      expect(r.overRange!.words).not.toMatch(/DANGER/);
    }
  });
});
