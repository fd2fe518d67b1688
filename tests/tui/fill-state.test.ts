import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog } from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

function header(pressure?: string) {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const input = pressure ? { ...req.input, finalPressurePa: Number(pressure) } : req.input;
  const plan = planFill(input);
  return headerFromPlan(plan, { ...req, input }, 'b1', '2026-12-01T00:00:00Z');
}
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: '2026-12-01T01:00:00Z' });

describe('guided fill state machine', () => {
  it('a reading on target: one reading effect, next step, the rest re-targeted, nothing gives', () => {
    const s0 = initialState(setupFromHeader(header()));
    expect(s0.phase).toBe('reading');
    const s1 = enter(type(s0, (s0.targetsPa[0] / TORR).toFixed(4)));
    expect(s1.current).toBe(1);
    expect(s1.effects).toHaveLength(1);
    expect(s1.effects[0]).toMatchObject({ kind: 'reading', step: 1, source: 'cyl-CH4', gauge: 'head-1kT' });
    expect(s1.message).toMatch(/inside the band/);
    // the reading was typed to the gauge's 4 decimals: the rest moves by that rounding only
    expect(Math.abs(s1.targetsPa[1] / s0.targetsPa[1] - 1)).toBeLessThan(1e-4);
    expect(s1.message).toMatch(/keep phi, the dilution and the final pressure/);
  });

  it('invalid input is refused with a reason and no effect: empty, not a number, a volume, below the previous reading, past full scale, impossible temperature', () => {
    const s0 = initialState(setupFromHeader(header()));
    expect(enter(s0).error).toMatch(/type the reading first/);
    expect(enter(type(s0, 'abc')).error).toMatch(/cannot read/);
    expect(enter(type(s0, '3 L')).error).toMatch(/is a volume/);
    const s1 = enter(type(s0, '10.0128'));
    const low = enter(type(s1, '9'));
    expect(low.error).toMatch(/must be above the previous one/);
    expect(low.effects).toEqual([]);
    expect(low.current).toBe(1);
    expect(enter(type(s1, '20000')).error).toMatch(/reads only up to/);
    let t = fillReducer(s1, { type: 'tab' });
    expect(t.field).toBe('temperature');
    for (let i = 0; i < 10; i++) t = fillReducer(t, { type: 'backspace' });
    t = fillReducer(type(t, '-300 degC'), { type: 'tab' });
    expect(enter(type(t, '1480')).error).toMatch(/outside the allowed range .*below absolute zero/);
  });

  it('the last reading closes the batch: close effect and a GUM re-check summary', () => {
    let s = initialState(setupFromHeader(header()));
    for (let k = 0; k < 3; k++) s = enter(type(s, (s.targetsPa[k] / TORR).toFixed(4)));
    expect(s.phase).toBe('done');
    expect(s.effects.map((e) => e.kind)).toEqual(['reading', 'close']);
    expect(s.summary!.composition.CH4.value).toBeCloseTo(0.0066667, 5);
  });

  it('a danger finding blocks the fill until "accept INITIALS" is typed; the acknowledgement is an effect', () => {
    const s0 = initialState(setupFromHeader(header(String(3.8e5))));
    expect(s0.phase).toBe('acknowledge');
    expect(s0.setup.dangers.length).toBeGreaterThan(0);
    const no = enter(type(s0, '1500'));
    expect(no.phase).toBe('acknowledge');
    expect(no.error).toMatch(/type "accept" and your initials/);
    const yes = enter(type(s0, 'accept AB'));
    expect(yes.phase).toBe('reading');
    expect(yes.effects.every((e) => e.kind === 'acknowledge' && e.by === 'AB')).toBe(true);
  });

  it('resume: the readings in the log set the step, the acknowledgements are remembered', () => {
    const h = header();
    let s = initialState(setupFromHeader(h));
    const events: string[] = [JSON.stringify(h)];
    s = enter(type(s, (s.targetsPa[0] / TORR).toFixed(4)));
    events.push(...s.effects.map((e) => JSON.stringify(e)));
    const log = parseLog(events.join('\n') + '\n', 'x.jsonl');
    const r = initialState(setupFromHeader(log.header), log);
    expect(r.current).toBe(1);
    expect(r.message).toMatch(/resumed: 1 of 3/);
    expect(r.done[0].pressurePa).toBeCloseTo(s.done[0].pressurePa, 9);
  });
});
