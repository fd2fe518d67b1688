// The flammability data's uncertainty margin (thresholds.ts FLAMMABILITY_DATA_MARGIN, 10 %: handbook
// LFL and LOC values scatter by around 10 %, common practice): a tank state or a fill path's state
// outside the listed limits but inside them lowered by 10 % is a warning that says how close it is,
// not a note. References: CH4 LFL in air 4.4 % (IEC 60079-20-1, the lower of the two listed; the
// review's blend limits return it) and CH4 LOC 10.7 % in N2 (ASTM E2079), both read from the data
// with blendLimits and checked against those values here; distances are geometry on the diagram.
import { describe, expect, it } from 'vitest';
import {
  assessFlammability,
  blendLimits,
  describeFinding,
  reviewFillPath,
  reviewState,
  THRESHOLDS,
  type Fractions,
} from '../../src/core/index.js';
import { FLAMMABILITY_DATA_MARGIN } from '../../src/core/thresholds.js';

const T = 298.15;
const P = 101325;
const ctx = { temperatureK: T, tankId: 'T' };
const ch4 = blendLimits({ CH4: 1 }, T, P);
/** x of CH4 in air */
const inAir = (x: number): Fractions => ({ CH4: x, O2: 0.21 * (1 - x), N2: 0.79 * (1 - x) });
const state = (y: Fractions, final = false) =>
  reviewState({ step: 2, composition: y, pressurePa: P, final }, ctx).findings;

describe('the margin itself', () => {
  it('is a named 10 % threshold on common practice, with its reason', () => {
    expect(FLAMMABILITY_DATA_MARGIN).toBe(0.1);
    expect(THRESHOLDS.flammabilityDataMargin.basis).toBe('common-practice');
    expect(THRESHOLDS.flammabilityDataMargin.note).toMatch(/scatter by around 10 %/);
  });
  it('the data the cases below rest on: CH4 LFL 4.4 % (IEC 60079-20-1), LOC 10.7 % (ASTM E2079), exact', () => {
    expect(ch4.lfl).toBeCloseTo(0.044, 12);
    expect(ch4.loc).toBeCloseTo(0.107, 12);
  });
});

describe('a state just below the LFL is a warning inside the margin, not a note', () => {
  it('CH4 in air at 0.99 x LFL: warning near-flammable, 1.0 % from the LFL (bisection, 1e-5), its flame rise 0.99 x the limit (0.005)', () => {
    const a = assessFlammability(inAir(0.99 * ch4.lfl), T, P);
    expect(a.verdict).toBe('within-margin');
    // on the air line the lowered LFL-in-air corner reaches the state when LFL x (1 - s) = 0.99 LFL
    expect(a.distance!.limitsLowerBy!).toBeCloseTo(0.01, 5);
    // the limit flame is calibrated at the LFL in air (DEVELOPERS.md: CH4 1359 K); a lean rise is about
    // proportional to the fuel: 0.99 within 0.005 (complete combustion, cp changes little)
    expect(Math.abs(a.distance!.flameRiseShare! - 0.99)).toBeLessThan(0.005);
    const f = state(inAir(0.99 * ch4.lfl)).filter((x) => x.code === 'near-flammable');
    expect(f.map((x) => x.severity)).toEqual(['warning']);
    const text = describeFinding(f[0], (pa) => `${pa} Pa`);
    expect(text).toMatch(
      /^this state is NOT shown non-flammable: it lies inside the 10 % uncertainty margin/,
    );
    expect(text).toContain('with the LFL (4.40 %) and the LOC (10.7 %) 1.0 % lower');
    expect(text).toContain("its flame temperature rise is 0.99 x the limit flame's");
    expect(text).toContain('Handbook LFL and LOC values scatter by around 10 % (common practice)');
  });

  it('the finished batch at 0.95 x LFL: a warning too (the margin does not depend on the step)', () => {
    const f = state(inAir(0.95 * ch4.lfl), true).filter((x) => x.code === 'near-flammable');
    expect(f.map((x) => x.severity)).toEqual(['warning']);
    expect(f[0]).toMatchObject({ withinMargin: 0.1 });
    expect((f[0] as { limitsLowerBy?: number }).limitsLowerBy).toBeCloseTo(0.05, 5);
  });

  it('at 0.92 x LFL a warning, at 0.88 x LFL the NFPA 69 note (outside the 10 % margin)', () => {
    const sev = (x: number) => state(inAir(x * ch4.lfl)).find((f) => f.code === 'near-flammable')?.severity;
    expect(sev(0.92)).toBe('warning');
    expect(sev(0.88)).toBe('note');
    expect(assessFlammability(inAir(0.88 * ch4.lfl), T, P).verdict).toBe('near-limit');
  });

  it('stoichiometric CH4/O2 in N2 with O2 at 0.95 x LOC: a warning, 5.0 % from the LOC (1e-5)', () => {
    // the nose of the envelope is at fuel LOC / 2, O2 LOC on the stoichiometric line (z = 2 for CH4)
    const o2 = 0.95 * ch4.loc;
    const y = { CH4: o2 / 2, O2: o2, N2: 1 - 1.5 * o2 };
    const a = assessFlammability(y, T, P);
    expect(a.byEnvelope).toBe('within-margin');
    expect(a.distance!.limitsLowerBy!).toBeCloseTo(0.05, 5);
    expect(state(y).find((f) => f.code === 'near-flammable')?.severity).toBe('warning');
    // at 0.85 x LOC the state is outside the margin of both limits by the envelope
    const o85 = 0.85 * ch4.loc;
    expect(assessFlammability({ CH4: o85 / 2, O2: o85, N2: 1 - 1.5 * o85 }, T, P).byEnvelope).toBe(
      'near-limit',
    );
  });

  it('the rich side keeps its wording: 20 % CH4 in air (1.18 x the UFL 17 %, IEC 60079-20-1) is a note', () => {
    const f = state(inAir(0.2)).find((x) => x.code === 'near-flammable');
    expect(f?.severity).toBe('note');
  });
});

describe('a fill path that passes inside the margin where neither end state is', () => {
  // the tank holds CH4 in N2; the gas let in is O2 in N2 (no fuel). The bulk path is the straight line
  // fuel = F (1 - w), O2 = O w on the diagram. With O = 2 F it touches the envelope with the LFL and the
  // LOC lowered by 5 % exactly at its nose (0.95 LOC / 2, 0.95 LOC) and stays outside the listed envelope
  // (geometry: the line fuel + O2 / 2 = F runs below the nose and both edges that meet there).
  const nose = [(0.95 * ch4.loc) / 2, 0.95 * ch4.loc] as const;
  const F = nose[0] + nose[1] / 2;
  const O = 2 * F;
  const before: Fractions = { CH4: F, N2: 1 - F };
  const source: Fractions = { O2: O, N2: 1 - O };
  const w1 = 0.9;
  const after: Fractions = { CH4: F * (1 - w1), O2: O * w1, N2: 1 - F * (1 - w1) - O * w1 };
  const event = {
    step: 2,
    sourceId: 'cyl-synth',
    sourceComposition: source,
    before: { step: 1, composition: before, pressurePa: 10000, final: false },
    after: { step: 2, composition: after, pressurePa: 100000, final: true },
  };

  it('neither end state is flammable or inside the margin', () => {
    for (const y of [before, after])
      expect(['non-flammable', 'near-limit']).toContain(assessFlammability(y, T, P).verdict);
  });

  it('near-flammable-fill-path (warning), its closest point 5 % from the limits (golden-section search: 0.002)', () => {
    const found = reviewFillPath(event, ctx);
    expect(found.map((f) => [f.code, f.severity])).toEqual([['near-flammable-fill-path', 'warning']]);
    const f = found[0] as Extract<(typeof found)[number], { code: 'near-flammable-fill-path' }>;
    expect(Math.abs(f.limitsLowerBy! - 0.05)).toBeLessThan(0.002);
    expect(describeFinding(f, (pa) => `${(pa / 133.322).toFixed(0)} Torr`)).toMatch(
      /^while cyl-synth is filled the tank passes, at about \d+ Torr, a composition that is NOT shown non-flammable: it lies inside the 10 % uncertainty margin/,
    );
  });

  it('the same fill 15 % from the limits at its nose (outside the margin) gets no path finding', () => {
    const far = (0.85 * ch4.loc) / 2 + (0.85 * ch4.loc) / 2 / 1;
    const y0 = { CH4: far, N2: 1 - far };
    const s = { O2: 2 * far, N2: 1 - 2 * far };
    const y1 = { CH4: far * 0.1, O2: 2 * far * 0.9, N2: 1 - far * 0.1 - 1.8 * far };
    const found = reviewFillPath(
      {
        ...event,
        sourceComposition: s,
        before: { ...event.before, composition: y0 },
        after: { ...event.after, composition: y1 },
      },
      ctx,
    );
    expect(found).toEqual([]);
  });
});
