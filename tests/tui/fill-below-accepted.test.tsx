import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { frame80, read } from './frame80.js';

// A hazard accepted at a review stands: a below-band screen that compares the ways on against the plan
// and the accepted hazards must name them, never say "no hazard the plan did not have" over them.
// Order CH4, Ar (stop 400 Torr), O2, Ar; CH4 read 40 % high (14.018 for 10.013 Torr) makes fill 3 (O2)
// flammable (LFL of CH4 4.4 %, IEC 60079-20-1; LOC 10.7 %, ASTM E2079: the core's values, by hand in
// tests/core/remainder-review.test.ts) and its closed-vessel pressure above the demo tank's working limit.

/** the fill as the header plans it: the first state */
function firstState() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({
    ...rs,
    recipe: { ...rs.recipe, order: ['CH4', 'Ar@400 Torr', 'O2', 'Ar'] },
  });
  const h = headerFromPlan(planFill(req.input), req, 'b1', '2026-12-01T00:00:00Z');
  return initialState(setupFromHeader(h));
}

describe('a fill below its band after a review whose danger was accepted', () => {
  const s0 = firstState();
  const rv = read(s0, '14.018', 2);
  const acc = read(rv, 'accept JD', 3);
  const below = read(acc, '395', 4);

  it('the review found the danger and it was accepted', () => {
    expect(rv.phase).toBe('review');
    // fill 4 (Ar) keeps the flammable tank flammable to a higher pressure: its own closed-vessel danger
    expect(rv.review!.hazards.map((z) => z.key)).toEqual([
      'flammable-state@3',
      'closed-vessel-pressure@3',
      'closed-vessel-fill-path@4',
    ]);
    expect(acc.reviewed!.accepted).toContain('closed-vessel-pressure@3');
    expect(below.phase).toBe('below');
  });

  it('the ways on name the accepted hazards they still pass, dangers first', () => {
    const w = below.belowWays!;
    expect(w.goingOn).toEqual([]);
    expect(w.goingOnAccepted.map((z) => `${z.severity} ${z.key}`)).toEqual([
      'danger closed-vessel-pressure@3',
      'danger closed-vessel-fill-path@4',
      'warning flammable-state@3',
    ]);
    expect(w.continuing!.stillAccepted).toEqual([
      'DANGER closed-vessel-pressure (fill 3)',
      'DANGER closed-vessel-fill-path (fill 4)',
      'WARNING flammable-state (fill 3)',
    ]);
  });

  it('the screen never says "no hazard the plan did not have" while the review of that choice finds a danger', () => {
    const f = frame80(below).replace(/\n/g, ' ').replace(/ +/g, ' ');
    // what `next` leads to: the danger at fill 3, as its review found it
    const next = read(below, 'next JD', 5);
    const dangers = (next.acceptedHazards ?? []).filter((z) => z.severity === 'danger');
    expect(dangers.map((z) => z.key)).toEqual(['closed-vessel-pressure@3', 'closed-vessel-fill-path@4']);
    expect(f).not.toMatch(/no hazard the plan did not have/);
    // next passes what continue passes (both reviewed): said once, on the continue line
    expect(f).toMatch(/- next AB .*passes the same hazards as continue, named above/);
    expect(f).toMatch(/- continue: .*still passes the accepted DANGER closed-vessel-pressure \(fill 3\)/);
    expect(f).toMatch(/no hazard beyond those/);
    const rows = frame80(below).split('\n');
    expect(rows.length).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  });
});

describe('a below-band screen whose ways pass the same hazards, none of them accepted', () => {
  // the view follows what the reviews of the ways found (belowWays): the same screen with the hazards
  // found not accepted must not speak of accepted ones
  const below = read(read(read(firstState(), '14.018', 2), 'accept JD', 3), '395', 4);
  const w = below.belowWays!;
  const open = {
    ...below,
    reviewed: { accepted: [], stopsPa: {} },
    belowWays: {
      ...w,
      goingOn: w.goingOnAccepted,
      goingOnAccepted: [],
      continuing: { ...w.continuing!, still: w.continuing!.stillAccepted, stillAccepted: [] },
    },
  };

  it('"passes the same hazards as continue", without "(the accepted ones stand)"; with them accepted, with it', () => {
    const f = frame80(open).replace(/\n/g, ' ').replace(/ +/g, ' ');
    expect(f).toMatch(/- next AB .*passes the same hazards as continue, named above, no hazard beyond those/);
    expect(f).not.toMatch(/accepted ones stand/);
    expect(frame80(below).replace(/\s+/g, ' ')).toMatch(/named above \(the accepted ones stand\)/);
  });
});
