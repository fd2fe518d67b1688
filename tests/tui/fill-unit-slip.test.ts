import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog, type LogReading, type NewLogEvent } from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

// A reading typed in another unit than the target's and far from it (a unit slip) is asked about
// before it is logged, never converted. Unit factors: 1 kPa = 7.500617 Torr (1 Torr = 101325/760 Pa,
// NIST SP 811, exact from the definitions).
function header() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({
    ...rs,
    recipe: { ...(rs.recipe as unknown as Record<string, unknown>), order: ['CH4', 'Ar', 'O2'] } as never,
  });
  const plan = planFill(req.input);
  return headerFromPlan(plan, req, 'u1', '2026-12-01T00:00:00Z');
}
const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const read = (s: FillState, text: string) => enter(type(s, text));

describe('unit slip at a fill step', () => {
  const h = header();
  const s0 = initialState(setupFromHeader(h));
  const target = Number((s0.targetsPa[0] / TORR).toFixed(2)); // 10.01 Torr (the plan's CH4 stop on head-1kT)

  it('the target number typed in kPa (7.5 x the target) is asked about: what was typed, what it is in Torr, the target; nothing logged', () => {
    expect(target).toBe(10.01);
    const c = read(s0, '10.02 kPa');
    expect(c.phase).toBe('unit-check');
    expect(c.effects).toEqual([]);
    expect(c.current).toBe(0);
    // 10.02 kPa = 75.156 Torr (x 7.500617), 7.51 x the 10.01 Torr target
    expect(c.pending!.reason).toContain('typed "10.02 kPa" = 75.16 Torr on head-1kT');
    expect(c.pending!.reason).toContain('the target is 10.01 Torr');
    expect(c.pending!.reason).toMatch(/7\.5\d x the target/);
    expect(c.pending!.reason).toMatch(/the target's number in another unit/);
    // n re-types: nothing logged, the field empty, still fill 1
    const n = read(c, 'n');
    expect(n.phase).toBe('reading');
    expect(n.effects).toEqual([]);
    expect(n.input).toBe('');
    expect(n.message).toMatch(/10\.02 kPa is not logged/);
    const esc = fillReducer(c, { type: 'escape' });
    expect(esc.phase).toBe('reading');
    expect(esc.effects).toEqual([]);
    // anything else is refused with what to type
    const what = read(c, 'y');
    expect(what.phase).toBe('unit-check');
    expect(what.error).toMatch(/type log and your initials/);
  });

  it('log INITIALS logs it as typed (not converted), with the initials and the question in its note; the log reads back', () => {
    const c = read(s0, '10.02 kPa');
    const logged = read(c, 'log AB');
    expect(logged.current).toBe(1);
    const ev = logged.effects.find((e) => e.kind === 'reading') as LogReading;
    expect(ev.reading).toBe('10.02 kPa');
    expect(ev.pressure_Pa).toBeCloseTo(10020, 6);
    expect(ev.by).toBe('AB');
    expect(ev.note).toMatch(
      /unit checked at the manifold: typed "10\.02 kPa" = 75\.16 Torr.*confirmed by AB/,
    );
    const events: NewLogEvent[] = [...logged.effects];
    const log = parseLog([h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n', 'u1.jsonl');
    expect(log.readings[0]).toMatchObject({ reading: '10.02 kPa', by: 'AB' });
  });

  it('the ratio of two units (kPa/Torr) with another number asks too; within the band, in the gauge unit, or far but no unit ratio: no question', () => {
    const r = read(s0, '1.0 psi'); // 51.7 Torr: 5.17 x the target, not a unit ratio, another number
    expect(r.phase).not.toBe('unit-check');
    const f = read(s0, '75.1 mbar'); // 56.3 Torr = 5.63 x: neither the number nor a ratio
    expect(f.phase).not.toBe('unit-check');
    const k = read(s0, '10.011 kPa');
    expect(k.phase).toBe('unit-check');
    const ratio = read(s0, '10.45 kPa'); // 78.38 Torr: 7.83 x; the number 10.45 is 4.4 % off 10.01
    expect(ratio.phase).toBe('unit-check');
    const psi = read(s0, '1.45 psi'); // 75.0 Torr: 7.49 x the target = kPa/Torr within 5 %
    expect(psi.phase).toBe('unit-check');
    expect(psi.pending!.reason).toMatch(/the ratio of two pressure units/);
    // in the band, typed in kPa: 1.3346 kPa = 10.010 Torr
    const inBand = read(s0, '1.3346 kPa');
    expect(inBand.phase).toBe('reading');
    expect(inBand.current).toBe(1);
    // a bare number is in the gauge's unit: 75.16 is off target but not a unit question
    expect(read(s0, '75.16').phase).not.toBe('unit-check');
    expect(read(s0, '75.16 Torr').phase).not.toBe('unit-check');
  });
});
