import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { frame80, read } from './frame80.js';

// The review screen offers "continue fill N to its target" as the safer way only where a value the fill's
// gauge displays lies inside that fill's band. The demo recipe with tolerance 0.0002, its log header with
// fill 2 (the Ar stop 480.81 Torr, band +-0.0040 Torr) read on head-10kT, which shows 0.1 Torr steps:
// 480.8 and 480.9 Torr both lie outside 480.806 - 480.814 Torr (arithmetic). Fill 2 read at 150 Torr and
// `next`: O2 onto it makes a detonable state (the review of tests/tui/fill-incomplete.test.ts).
const flat = (f: string) => f.replace(/\n/g, ' ').replace(/[│ ]+/g, ' ');

function reviewOn(gauge: string) {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, tolerance: { relative: 0.0002 } } });
  const h0 = headerFromPlan(planFill(req.input), req, 'p1', '2026-12-01T00:00:00Z');
  const h = { ...h0, steps: h0.steps.map((st, i) => (i === 1 ? { ...st, gauge } : st)) };
  const s0 = initialState(setupFromHeader(h));
  return read(read(read(s0, '10.013', 2), '150', 3), 'next JD');
}

describe('the review screen offers continuing a fill only where its gauge can show its band', () => {
  it('fill 2 on head-10kT: no "Safer: continue", the computed reason instead, and safer refused with it', () => {
    const rv = reviewOn('head-10kT');
    expect(rv.phase).toBe('review');
    expect(rv.review!.continuation).toMatchObject({ step: 2, clean: true });
    const f = frame80(rv);
    const text = flat(f);
    expect(text).not.toMatch(/Safer: continue/);
    expect(text).not.toMatch(/VALUE INITIALS/);
    expect(text).toMatch(
      /Continuing fill 2 \(Ar, charge 1 of 2\) to its target 480\.81 Torr is not offered: NO value head-10kT shows is inside the band: the nearest, 480\.8 Torr, reads BELOW it/,
    );
    // the stop search then runs, and says what it found
    expect(rv.review!.noAlternative).toMatch(/^no safer stop can be offered/);
    expect(read(rv, 'safer JD').error).toMatch(/^no safer stop can be offered/);
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  });

  it('fill 2 on head-1kT (0.01 Torr steps, 480.81 inside its band): continuing stays the safer way offered', () => {
    const text = flat(frame80(reviewOn('head-1kT')));
    expect(text).toMatch(/Safer: continue fill 2 \(Ar, charge 1 of 2\) to its target 480\.81 Torr/);
    expect(text).toMatch(/VALUE INITIALS: the fill continued/);
    expect(text).not.toMatch(/is not offered/);
  });
});
