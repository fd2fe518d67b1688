// A reading typed as a gauge pressure ("14.5 psig") at the guided fill is made absolute with a
// measured barometer only (today's, logged, else the lab profile's or --barometer's as the plan
// recorded it), and the screen's message and the log entry's note say with which; the default a profile
// without a barometer leaves is refused. Reference: 1 psi = 6894.757293 Pa (NIST SP 811, exact from
// the pound-force and the inch), 1 Torr = 101325/760 Pa (exact).
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog, type LogHeader, type LogReading, type NewLogEvent } from '../../src/io/batch-log.js';
import { auditLog } from '../../src/io/log-audit.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

const PSI = 6894.757293168361;
const NOW = '2026-12-01T01:00:00Z';
const read = (s: FillState, text: string) =>
  fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });

function header(): LogHeader {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({
    ...rs,
    recipe: { ...(rs.recipe as unknown as Record<string, unknown>), order: ['CH4', 'Ar', 'O2'] } as never,
  });
  return headerFromPlan(planFill(req.input), req, 'g1', '2026-12-01T00:00:00Z');
}

/** fills 1 and 2 read at their targets (absolute, Torr), then the last fill typed as `typed(target)` */
function lastTyped(h: LogHeader, typed: (targetPa: number) => string) {
  let s = initialState(setupFromHeader(h));
  const events: NewLogEvent[] = [];
  for (let i = 0; i < 2; i++) {
    s = read(s, (s.targetsPa[i] / TORR).toFixed(2));
    events.push(...s.effects);
    s = fillReducer(s, { type: 'logged', step: i + 1, line: i + 2 });
  }
  const target = s.targetsPa[2];
  const next = read(s, typed(target));
  return { target, text: typed(target), next, events: [...events, ...next.effects] };
}
const psig = (pa: number, baroPa = 760 * TORR) => `${((pa - baroPa) / PSI).toFixed(4)} psig`;

describe('a gauge pressure typed at the fill', () => {
  const h = header();

  it('the header says the plan took the barometer from the lab profile (760 Torr in the demo profile)', () => {
    expect(h.barometer.from).toBe('lab-profile');
    expect(h.barometer.pressure_Pa / TORR).toBeCloseTo(760, 9);
  });

  it("the last fill typed in psig: logged absolute (0.34 Pa: the typed 4 decimals), the note and the message say it was read with the lab profile's barometer", () => {
    const { target, text, next, events } = lastTyped(h, (t) => psig(t));
    const ev = next.effects.find((e): e is LogReading => e.kind === 'reading')!;
    expect(ev.reading).toBe(text);
    // the typed value rounds the target to 1e-4 psi = 0.69 Pa: within half of it
    expect(Math.abs(ev.pressure_Pa - target)).toBeLessThan(0.35);
    const note = `gauge pressure ${text} read as ${(ev.pressure_Pa / TORR).toFixed(1)} Torr absolute with the lab profile's barometer 760.0 Torr`;
    expect(ev.note).toBe(note);
    expect(next.message).toContain(`(${note})`);
    // check reads the typed text back with the same barometer: no unreadable or mismatched text
    const log = parseLog([h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n', 'g1.jsonl');
    expect(log.readings.map((r) => r.reading).at(-1)).toBe(text);
    const found = auditLog(log).filter(
      (f) => f.code === 'text-unreadable' || f.code === 'text-number-mismatch',
    );
    expect(found).toEqual([]);
  });

  it("with today's barometer logged (752.0 Torr), that one, named so", () => {
    let s = initialState(setupFromHeader(h));
    s = { ...s, barometerPa: 752 * TORR, barometerToday: true };
    for (let i = 0; i < 2; i++) {
      s = read(s, (s.targetsPa[i] / TORR).toFixed(2));
      s = fillReducer(s, { type: 'logged', step: i + 1, line: i + 2 });
    }
    const text = psig(s.targetsPa[2], 752 * TORR);
    const ev = read(s, text).effects.find((e): e is LogReading => e.kind === 'reading')!;
    expect(Math.abs(ev.pressure_Pa - s.targetsPa[2])).toBeLessThan(0.35);
    expect(ev.note).toMatch(/with today's \(logged\) barometer 752\.0 Torr$/);
  });

  it('a plan whose lab profile gives no barometer (the default assumed): refused, nothing logged, what to type instead', () => {
    const noBaro = { ...h, barometer: { ...h.barometer, from: 'default' as const } };
    const { next } = lastTyped(noBaro, (t) => psig(t));
    expect(next.effects).toEqual([]);
    expect(next.current).toBe(2);
    expect(next.error).toMatch(
      /^reading refused: ".* psig" is a gauge pressure .* needs a measured barometric pressure, which this batch does not have \(the lab profile gives no barometer; the plan assumed 760\.00 Torr\)\. Nothing is logged\. Type the absolute reading instead/,
    );
    // an older log that does not say where its barometer came from: refused too
    const older = { ...h, barometer: { pressure_Pa: h.barometer.pressure_Pa, u_Pa: h.barometer.u_Pa } };
    expect(lastTyped(older, (t) => psig(t)).next.error).toMatch(
      /the log does not say where its barometer came from/,
    );
  });

  it('an absolute reading has no such note', () => {
    const { next } = lastTyped(h, (t) => `${(t / TORR).toFixed(2)} Torr`);
    const ev = next.effects.find((e): e is LogReading => e.kind === 'reading')!;
    expect(ev.note).toBeUndefined();
  });
});
