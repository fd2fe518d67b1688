import { describe, expect, it } from 'vitest';
import { planFill, reviewRemainder } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import {
  fillReducer,
  initialState,
  retargetInput,
  setupFromHeader,
  type FillState,
} from '../../src/tui/fill-state.js';

// A safer stop is offered only when every reading it asks for is on a gauge that shows it. Path of a trial:
// CH4 read 30 Torr (three times its target 10.013), `go AB` to the capped targets, then the review. Without
// the gauges the search finds the stop 1380.41 Torr for fill 2 (Ar 1/2) with fill 3 past 1000 Torr; head-1kT,
// on which fills 1-3 are read, shows up to 1000 Torr (demo lab profile), so that stop could not be logged.
const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const read = (s: FillState, text: string) => enter(type(s, text));
const TORR = 101325 / 760;

function header() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  return headerFromPlan(planFill(req.input), req, 'pr1', '2026-12-01T00:00:00Z');
}

describe('the safer stop of the review is read on the gauges of its fills', () => {
  const s0 = initialState(setupFromHeader(header()));
  const capped = read(s0, '30');
  const review = read(capped, 'go AB');

  it('the path of the trial reaches the review (fills 1-3 on head-1kT, up to 1000 Torr)', () => {
    expect(capped.phase).toBe('capped');
    expect(review.phase).toBe('review');
    expect(review.setup.steps.slice(0, 3).map((x) => x.gauge?.id)).toEqual([
      'head-1kT',
      'head-1kT',
      'head-1kT',
    ]);
    expect(review.setup.steps[0].gauge!.fullScalePa / TORR).toBeCloseTo(1000, 6);
  });

  it('without the gauge tops the search finds a stop whose readings head-1kT cannot show (the bug it mends)', () => {
    const rv = reviewRemainder({
      retarget: retargetInput(review, review.done, review.targetTemperatureK),
      safety: { workingLimitPa: review.setup.workingLimitPa, tankId: 'MT-1' },
      planned: review.setup.header.findings ?? [],
    });
    const over =
      rv.alternative?.result.remaining.filter((x) => x.step <= 3 && x.targetPa > 1000 * TORR) ?? [];
    expect(over.length).toBeGreaterThan(0);
  });

  it('no stop is offered then, and the screen says why: the reading, the fill and the gauge', () => {
    const r = review.review!;
    expect(r.alternative).toBeUndefined();
    expect(r.noAlternative).toMatch(
      /^no safer stop can be offered: the stop that avoids it puts fill 3 at 1\d{3}\.\d\d Torr absolute, past the range of head-1kT it is read on \(up to 1000\.00 Torr absolute\)$/,
    );
    const s = read(review, 'safer AB');
    expect(s.phase).toBe('review');
    expect(s.effects).toEqual([]);
    expect(s.error).toMatch(
      /^no safer stop can be offered: .*head-1kT.*; type accept INITIALS, undo INITIALS/,
    );
  });

  it('going on through the hazard (accept AB): the next fill reads its target on a gauge that shows it', () => {
    const s = read(review, 'accept AB');
    expect(s.phase).not.toBe('review');
    const g = s.setup.steps[s.current].gauge!;
    expect(s.targetsPa[s.current]).toBeLessThanOrEqual(g.fullScalePa);
  });
});
