// The finished tank gas released into air (core/tank-gas.ts): the mixing line tank gas -> air walked by
// the fill-path review, each point judged by assessFlammability. References, each with its tolerance:
//  - published limits in air at 25 degC, 1 atm (Zabetakis 1965, common handbook values; the table the
//    review uses takes the lower listed LFL and the higher listed UFL, IEC 60079-20-1 style, from
//    memory): CH4 5.0-15 % (listed 4.4-17 %), H2 4.0-75 % (listed up to 77 %), C2H4 2.7-36 % (listed
//    from 2.3 %). For a pure fuel the tank gas's share of the mixture IS the fuel fraction, so the
//    flammable span of the line must lie between the listed and the published limits, within 0.2 %-points;
//  - ISO 10156 (from memory): a gas mixture is classed flammable when it is flammable in air; its
//    Tci (the most fuel in N2 that is not flammable in air) is about 8.7 % for CH4 and 5.5 % for H2;
//  - the state review's oxygen-enrichment threshold, 23.5 % O2 (thresholds.ts, from memory).
import { describe, expect, it } from 'vitest';
import {
  assessFlammability,
  flammableInAir,
  inAirFinding,
  oxygenEnriched,
  oxygenEquivalent,
  RELEASE_AIR,
} from '../../src/core/index.js';

const T = 298.15;

describe('a pure fuel released into air: flammable between its limits in air', () => {
  const cases = [
    { fuel: 'CH4', lfl: [0.044, 0.05], ufl: [0.15, 0.17] },
    { fuel: 'H2', lfl: [0.04, 0.04], ufl: [0.75, 0.77] },
    { fuel: 'C2H4', lfl: [0.023, 0.027], ufl: [0.36, 0.36] },
  ];
  for (const c of cases)
    it(`${c.fuel}: the flammable share of tank gas lies between the listed and published LFL and UFL (0.2 %-points)`, () => {
      const r = flammableInAir({ [c.fuel]: 1 }, T);
      expect(r.verdict).toBe('flammable');
      const [hi, lo] = r.tankShare!;
      expect(lo).toBeGreaterThanOrEqual(c.lfl[0] - 0.002);
      expect(lo).toBeLessThanOrEqual(c.lfl[1] + 0.002);
      expect(hi).toBeGreaterThanOrEqual(c.ufl[0] - 0.002);
      expect(hi).toBeLessThanOrEqual(c.ufl[1] + 0.002);
    });
});

describe('gases that do not burn by themselves', () => {
  it('10 % H2 in Ar (no oxidizer): flammable in air, the finding with the usual caution', () => {
    const y = { H2: 0.1, Ar: 0.9 };
    expect(assessFlammability(y, T, 101325).verdict).toBe('non-flammable');
    expect(flammableInAir(y, T).verdict).toBe('flammable');
    const f = inAirFinding(y, T)!;
    expect(f.code).toBe('flammable-in-air');
    expect(f.severity).toBe('warning');
  });

  it('50 % CH4, 5 % O2, 45 % Ar (above the UFL): flammable in air; 15 % of it in air (7.5 % CH4, 18.6 % O2) lies on the span', () => {
    const y = { CH4: 0.5, O2: 0.05, Ar: 0.45 };
    expect(assessFlammability(y, T, 101325).verdict).not.toBe('flammable');
    const r = flammableInAir(y, T);
    expect(r.verdict).toBe('flammable');
    const [hi, lo] = r.tankShare!;
    expect(lo).toBeLessThan(0.15);
    expect(hi).toBeGreaterThan(0.15);
    // the point by hand: 0.15 x 50 % = 7.5 % CH4 (inside 5-15 %, published), O2 0.15 x 5 + 0.85 x 21 = 18.6 %
    const p = { CH4: 0.075, O2: 0.186, Ar: 0.0675, N2: 0.6715 };
    expect(p.O2).toBeCloseTo(0.15 * 0.05 + 0.85 * RELEASE_AIR.O2, 12);
    expect(assessFlammability(p, T, 101325).verdict).toBe('flammable');
  });

  it('99.96 % C2H4: flammable in air', () => {
    expect(flammableInAir({ C2H4: 0.9996, N2: 0.0004 }, T).verdict).toBe('flammable');
  });

  it('2 % H2 in N2: no point of the line is flammable (every mixture holds at most 2 % H2, half the LFL of 4 %)', () => {
    const r = flammableInAir({ H2: 0.02, N2: 0.98 }, T);
    expect(r.verdict).toBe('not-found');
    expect(inAirFinding({ H2: 0.02, N2: 0.98 }, T)).toBeUndefined();
  });

  it('CH4 in N2 against the ISO 10156 Tci of about 8.7 % (from memory): 8 % not flammable in air, 13 % flammable', () => {
    expect(flammableInAir({ CH4: 0.08, N2: 0.92 }, T).verdict).toBe('not-found');
    expect(flammableInAir({ CH4: 0.13, N2: 0.87 }, T).verdict).toBe('flammable');
  });

  it('8 % H2 in N2, above the ISO 10156 Tci of about 5.5 % (from memory): never said non-flammable in air', () => {
    const r = flammableInAir({ H2: 0.08, N2: 0.92 }, T);
    expect(['flammable', 'within-margin']).toContain(r.verdict);
    if (r.verdict === 'within-margin')
      expect(inAirFinding({ H2: 0.08, N2: 0.92 }, T)?.code).toBe('near-flammable-in-air');
  });

  it('a gas that burns by itself (10 % CH4 in air) is "by-itself": no in-air finding (flammable-mixture says it)', () => {
    const y = { CH4: 0.1, O2: 0.189, N2: 0.711 };
    expect(flammableInAir(y, T).verdict).toBe('by-itself');
    expect(inAirFinding(y, T)).toBeUndefined();
  });
});

describe('oxygen enrichment of a tank gas (threshold 23.5 % O2-equivalent, thresholds.ts)', () => {
  it('34 % O2 is enriched, 21 % is not; N2O counts half a mole of O2 (N2O -> N2 + 1/2 O2, exact)', () => {
    expect(oxygenEnriched({ O2: 0.34, N2: 0.65, CH4: 0.01 })).toBe(true);
    expect(oxygenEnriched({ O2: 0.21, N2: 0.79 })).toBe(false);
    expect(oxygenEquivalent({ O2: 0.2, N2O: 0.1, Ar: 0.7 })).toBeCloseTo(0.25, 12);
    expect(oxygenEnriched({ O2: 0.2, N2O: 0.1, Ar: 0.7 })).toBe(true);
  });
});
