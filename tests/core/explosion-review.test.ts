import { describe, expect, it } from 'vitest';
import { describeFinding, reviewState, type Finding } from '../../src/core/index.js';
import { fixture } from '../helpers.js';

const ref = fixture('equilibrium-cantera.json');
const refCase = (name: string) =>
  (ref.cases as { name: string; uv_P_Pa: number; cj_P_Pa?: number; hp_T_K?: number }[]).find((c) =>
    c.name.startsWith(name),
  )!;
const bar = (pa: number) => `${(pa / 1e5).toFixed(3)} bar`;

function review(composition: Record<string, number>, pressurePa: number, workingLimitPa?: number) {
  return reviewState(
    { step: 1, composition, pressurePa, final: true },
    { temperatureK: 298.15, tankId: 'T', workingLimitPa },
  ).findings;
}
const find = (fs: Finding[], code: string) => fs.find((f) => f.code === code);

describe('closed-vessel finding: constant-volume equilibrium, complete combustion as a labelled cross-check', () => {
  it(`the issue's rich C2H4/O2/N2 24/24/52 % at 0.95 bar in a tank with a 10 bar working limit: equilibrium ${bar(refCase('rich C2H4/O2/N2').uv_P_Pa)} (${ref.library}) is above the limit - danger, not a note`, () => {
    const f = find(review({ C2H4: 0.24, O2: 0.24, N2: 0.52 }, 95000, 10e5), 'closed-vessel-pressure')!;
    expect(f.severity).toBe('danger');
    if (f.code !== 'closed-vessel-pressure') throw new Error('unreachable');
    expect(Math.abs(f.peakPa / refCase('rich C2H4/O2/N2').uv_P_Pa - 1)).toBeLessThan(1e-3);
    expect(f.method).toBe('equilibrium');
    expect(f.completePa!).toBeLessThan(f.peakPa);
    const text = describeFinding(f, bar);
    expect(text).toMatch(/constant-volume adiabatic equilibrium/);
    expect(text).toMatch(/complete combustion, a cross-check, gives 8\.9\d\d bar/);
  });
  it('a state the review calls non-flammable (2 % CH4 in air) or near-flammable (3 %) gets no closed-vessel or detonation finding', () => {
    for (const x of [0.02, 0.03]) {
      const fs = review({ CH4: x, O2: 0.21 * (1 - x), N2: 0.79 * (1 - x) }, 1e5, 1e6);
      expect(fs.map((f) => f.code)).not.toContain('closed-vessel-pressure');
      expect(fs.map((f) => f.code)).not.toContain('detonable-state');
    }
  });
  it('a state without equilibrium data (CH4/O2 in SF6) falls back to complete combustion and says why', () => {
    const f = find(review({ CH4: 0.2, O2: 0.4, SF6: 0.4 }, 1e5, 1e6), 'closed-vessel-pressure');
    if (f?.code !== 'closed-vessel-pressure') return expect(f).toBeDefined();
    expect(f.method).toBe('complete-combustion');
    expect(describeFinding(f, bar)).toMatch(/no equilibrium can be computed for SF6/);
  });
});

describe('detonation finding: published limits, CJ and reflected pressure, severity', () => {
  it(`undiluted stoichiometric CH4/O2 at 1 bar is a danger even in a tank with a 100 bar working limit (common practice), with P_CJ from the equilibrium Hugoniot (${ref.library} minimum-velocity CJ, within 1 %)`, () => {
    const f = find(review({ CH4: 1 / 3, O2: 2 / 3 }, 1e5, 100e5), 'detonable-state')!;
    expect(f.severity).toBe('danger');
    if (f.code !== 'detonable-state') throw new Error('unreachable');
    expect(f.undiluted).toBe(true);
    expect(Math.abs(f.cjPa! / refCase('stoichiometric CH4-O2').cj_P_Pa! - 1)).toBeLessThan(0.01);
    expect(describeFinding(f, bar)).toMatch(/not made in a mixing tank/);
  });
  it('stoichiometric H2-air at 1 bar in a tank with a 10 bar working limit: reflected about 2.5 x 15.6 bar = 39 bar - danger (it was only a warning under the old inert rule)', () => {
    const f = find(
      review({ H2: 0.2958, O2: 0.21 * 0.7042, N2: 0.79 * 0.7042 }, 1e5, 10e5),
      'detonable-state',
    )!;
    expect(f.severity).toBe('danger');
    if (f.code !== 'detonable-state') throw new Error('unreachable');
    expect(f.basis).toBe('published-limits');
    expect(Math.abs(f.reflectedPa! / 39e5 - 1)).toBeLessThan(0.01);
  });
  it('the same H2-air at 0.1 bar: reflected about 3.9 bar, under the 10 bar limit - a warning that gives the numbers', () => {
    const f = find(
      review({ H2: 0.2958, O2: 0.21 * 0.7042, N2: 0.79 * 0.7042 }, 1e4, 10e5),
      'detonable-state',
    )!;
    expect(f.severity).toBe('warning');
    const text = describeFinding(f, bar);
    expect(text).toMatch(/Chapman-Jouguet/);
    expect(text).toMatch(/2\.5 x P_CJ, common practice/);
  });
  it('70 % H2 in air is flammable but outside the published detonation limits (18.3-59 %, from memory): no detonation finding (the old rule made it a danger)', () => {
    const fs = review({ H2: 0.7, O2: 0.063, N2: 0.237 }, 1e5, 10e5);
    expect(fs.map((f) => f.code)).toContain('flammable-mixture');
    expect(fs.map((f) => f.code)).not.toContain('detonable-state');
  });
  it('a fuel without published limits says it was judged by the conservative rule', () => {
    const f = find(review({ C2H6: 2 / 9, O2: 7 / 9 }, 0.2e5, 10e5), 'detonable-state')!;
    expect(describeFinding(f, bar)).toMatch(/conservative rule/);
  });
});

describe('flame temperatures shown are equilibrium values; complete combustion is labelled a cross-check', () => {
  it(`undiluted CH4/O2: the message shows the equilibrium flame (about 3000 K, not the 5166 K of complete combustion) and labels the complete-combustion figure`, () => {
    const f = find(review({ CH4: 1 / 3, O2: 2 / 3 }, 1e5, 100e5), 'flammable-mixture')!;
    const text = describeFinding(f, bar);
    const eq = Number(/flame (\d+) K \(equilibrium\)/.exec(text)![1]);
    expect(eq).toBeGreaterThan(2900);
    expect(eq).toBeLessThan(3200);
    expect(text).toMatch(/\d+ K by complete combustion \(a cross-check/);
  });
  it(`stoichiometric CH4-air: equilibrium flame within 1 K of ${ref.library} (HP)`, () => {
    const f = find(
      review({ CH4: 0.0950226, O2: 0.1900452, N2: 0.7149321 }, 101325, 100e5),
      'flammable-mixture',
    )!;
    if (f.code !== 'flammable-mixture') throw new Error('unreachable');
    expect(Math.abs(f.flameEquilibriumK! - refCase('stoichiometric CH4-air').hp_T_K!)).toBeLessThan(1);
  });
});
