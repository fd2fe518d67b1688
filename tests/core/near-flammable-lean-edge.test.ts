// A near-flammable state above the LFL and the LOC yet outside the envelope lies lean of the edge from
// the LFL in air to the nose at the LOC: the finding names that boundary at the state's O2 (as the
// "0.93 x LFL" of a state below the LFL), not an LFL the state is already above (a trial read "inside
// the flammable region with the LFL (2.30 %) ... lower. Diagram point: fuel 2.38 %" as above the LFL
// yet not flammable). Reference: the straight edge between the two vertices, interpolated by hand
// (exact arithmetic, 1e-12); the C2H4 limits LFL 2.3 %, LOC 8.5 % are from memory (data/safety-data).
import { describe, expect, it } from 'vitest';
import { leanLimitAtOxygen, type BlendLimits } from '../../src/core/index.js';
import { runCli } from '../helpers.js';

const L: BlendLimits = {
  lfl: 0.023,
  ufl: 0.36,
  uflO2: 0.8,
  loc: 0.085,
  z: 3,
  estimated: [],
  missing: [],
  sources: [],
};

describe('the lean limit at a state O2 on the edge to the nose', () => {
  it('at 14.2 % O2: on the line from (2.3 %, 0.21 x 0.977) to (8.5 % / 3, 8.5 %)', () => {
    const airO2 = 0.21 * (1 - 0.023);
    const nose = 0.085 / 3;
    const hand = 0.023 + ((airO2 - 0.142) / (airO2 - 0.085)) * (nose - 0.023);
    expect(Math.abs(leanLimitAtOxygen(L, 0.142)! - hand)).toBeLessThan(1e-12);
    expect(hand).toBeCloseTo(0.0258, 4);
  });
  it('above the air line the LFL is the boundary, below the LOC there is none: undefined', () => {
    expect(leanLimitAtOxygen(L, 0.3)).toBeUndefined();
    expect(leanLimitAtOxygen(L, 0.05)).toBeUndefined();
  });
  it('the plan names it for the trial order, with the LFL and the LOC it runs between', async () => {
    const r = await runCli(['plan', 'recipes/c2h4-o2-ar-phi05.yaml', '--order', 'C2H4,Ar@695.20 Torr,O2,Ar']);
    const line = r.stdout.split('\n').find((l) => l.includes('near-flammable (fill 3)'))!;
    expect(line).toContain(
      "fuel at 0.92 x the lean limit at 14.2 % O2: 2.38 % against 2.58 % on the envelope's edge from " +
        'the LFL in air (2.30 %) to the LOC (8.50 %), so above the LFL yet outside the region',
    );
    expect(line).toContain('it would be inside the region with both 7.4 % lower');
  });
});
