import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  designMixture,
  equivalenceRatio,
  getSpecies,
  isNormalised,
  oxygenDemand,
  ProblemError,
} from '../../src/core/index.js';
import { fixture } from '../helpers.js';

const stoich = fixture('stoichiometry.json');

function problemCode(f: () => unknown): string | undefined {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return e.problem.code;
    throw e;
  }
  return undefined;
}

describe('stoichiometry and the equivalence ratio', () => {
  it('stoichiometric fuel fractions in air: CH4 9.50 %, C3H8 4.03 %, H2 29.6 % (combustion textbook, from memory) within half the last printed digit', () => {
    for (const [fuel, pct] of Object.entries(stoich.percent as Record<string, number>)) {
      const d = designMixture({
        kind: 'phi',
        fuel: { [fuel]: 1 },
        oxidizer: stoich.air,
        diluent: {},
        phi: 1,
        basis: { kind: 'dilution', value: 0 },
      });
      expect(Math.abs(d.composition[fuel] * 100 - pct), fuel).toBeLessThanOrEqual(
        stoich.tolerance_percent[fuel],
      );
    }
  });

  it('O2 demand c + h/4 - o/2: CH4 2, C7H16 11, CH3OH 1.5, N2O -0.5, CO2 0, H2O 0 (element balance of complete combustion)', () => {
    const d = (k: string) => oxygenDemand(getSpecies(k).elements);
    expect(d('CH4')).toBe(2);
    expect(d('n-C7H16')).toBe(11);
    expect(d('CH3OH')).toBe(1.5);
    expect(d('N2O')).toBe(-0.5);
    expect(d('CO2')).toBe(0);
    expect(d('H2O')).toBe(0);
    expect(d('O2')).toBe(-1);
  });

  it('N2O counts on an O-atom basis: H2 with N2O at phi 1 is 1:1 (H2 + N2O -> H2O + N2)', () => {
    const m = designMixture({
      kind: 'phi',
      fuel: { H2: 1 },
      oxidizer: { N2O: 1 },
      diluent: { Ar: 1 },
      phi: 1,
      basis: { kind: 'dilution', value: 0.9 },
    });
    expect(m.composition.H2).toBeCloseTo(0.05, 12);
    expect(m.composition.N2O).toBeCloseTo(0.05, 12);
  });

  it('the three dilution bases and explicit fractions agree for one mixture (CH4/O2/N2 like air)', () => {
    const byRatio = designMixture({
      kind: 'phi',
      fuel: { CH4: 1 },
      oxidizer: { O2: 1 },
      diluent: { N2: 1 },
      phi: 1,
      basis: { kind: 'diluent-ratio', value: 3.76 },
    });
    const xd = byRatio.composition.N2;
    const byDilution = designMixture({
      kind: 'phi',
      fuel: { CH4: 1 },
      oxidizer: { O2: 1 },
      diluent: { N2: 1 },
      phi: 1,
      basis: { kind: 'dilution', value: xd },
    });
    const byFuel = designMixture({
      kind: 'phi',
      fuel: { CH4: 1 },
      oxidizer: { O2: 1 },
      diluent: { N2: 1 },
      phi: 1,
      basis: { kind: 'fuel-fraction', value: byRatio.composition.CH4 },
    });
    for (const k of ['CH4', 'O2', 'N2']) {
      expect(byDilution.composition[k]).toBeCloseTo(byRatio.composition[k], 12);
      expect(byFuel.composition[k]).toBeCloseTo(byRatio.composition[k], 12);
    }
    expect(byRatio.composition.N2 / byRatio.composition.O2).toBeCloseTo(3.76, 12);
    expect(designMixture({ kind: 'fractions', fractions: byRatio.composition }).phi).toBeCloseTo(1, 12);
  });

  it('a fuel blend: CH4 0.8 / C2H6 0.2 at phi 0.5 needs (0.8 x 2 + 0.2 x 3.5)/0.5 = 4.6 mol O2 per mol fuel', () => {
    const m = designMixture({
      kind: 'phi',
      fuel: { CH4: 0.8, C2H6: 0.2 },
      oxidizer: { O2: 1 },
      diluent: { Ar: 0.5, He: 0.5 },
      phi: 0.5,
      basis: { kind: 'dilution', value: 0.95 },
    });
    const fuel = m.composition.CH4 + m.composition.C2H6;
    expect(m.composition.O2 / fuel).toBeCloseTo(4.6, 12);
    expect(m.composition.Ar).toBeCloseTo(0.475, 12);
    expect(m.composition.CH4 / m.composition.C2H6).toBeCloseTo(4, 12);
    expect(equivalenceRatio(m.composition)).toBeCloseTo(0.5, 12);
  });

  it('property: for any valid design the fractions are non-negative, sum to 1, and phi is recovered', () => {
    const fuels = ['CH4', 'C2H4', 'H2', 'C3H8', 'n-C7H16', 'CH3OH', 'CO'];
    fc.assert(
      fc.property(
        fc.constantFrom(...fuels),
        fc.constantFrom(...fuels),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0.05, max: 5, noNaN: true }),
        // no dilution, or one of at least 1 ppb (a smaller one is refused: it cannot be metered)
        fc.oneof(fc.constant(0), fc.double({ min: 1e-9, max: 0.999, noNaN: true })),
        fc.double({ min: 0.05, max: 1, noNaN: true }),
        (f1, f2, share, phi, dilution, o2) => {
          const fuel = f1 === f2 ? { [f1]: 1 } : { [f1]: share, [f2]: 1 - share };
          const ox: Record<string, number> = o2 === 1 ? { O2: 1 } : { O2: o2, N2: 1 - o2 };
          const m = designMixture({
            kind: 'phi',
            fuel,
            oxidizer: ox,
            diluent: { Ar: 1 },
            phi,
            basis: { kind: 'dilution', value: dilution },
          });
          return (
            isNormalised(m.composition, 1e-9) && Math.abs(equivalenceRatio(m.composition)! / phi - 1) < 1e-9
          );
        },
      ),
    );
  });

  it('property: atom balance - the O2 supplied times phi equals the O2 the fuel needs', () => {
    fc.assert(
      fc.property(
        fc.constantFrom('CH4', 'C2H6', 'C7H8', 'C2H5OH', 'CH3OCH3', 'NH3', 'i-C8H18'),
        fc.double({ min: 0.1, max: 4, noNaN: true }),
        (f, phi) => {
          const m = designMixture({
            kind: 'phi',
            fuel: { [f]: 1 },
            oxidizer: { O2: 1 },
            diluent: {},
            phi,
            basis: { kind: 'dilution', value: 0 },
          });
          const el = getSpecies(f).elements;
          const need = (el.C ?? 0) + (el.H ?? 0) / 4 - (el.O ?? 0) / 2;
          return Math.abs((m.composition[f] * need) / phi - m.composition.O2) < 1e-12;
        },
      ),
    );
  });
});

describe('bad designs are refused with a code, never clamped', () => {
  const base = { kind: 'phi' as const, fuel: { CH4: 1 }, oxidizer: { O2: 1 }, diluent: { Ar: 1 } };
  it('phi <= 0', () => {
    expect(
      problemCode(() => designMixture({ ...base, phi: 0, basis: { kind: 'dilution', value: 0.5 } })),
    ).toBe('not-positive');
    expect(
      problemCode(() => designMixture({ ...base, phi: -1, basis: { kind: 'dilution', value: 0.5 } })),
    ).toBe('not-positive');
  });
  it('dilution outside [0, 1)', () => {
    expect(problemCode(() => designMixture({ ...base, phi: 1, basis: { kind: 'dilution', value: 1 } }))).toBe(
      'out-of-range',
    );
    expect(
      problemCode(() => designMixture({ ...base, phi: 1, basis: { kind: 'dilution', value: -0.1 } })),
    ).toBe('out-of-range');
  });
  it('a fuel fraction that leaves no room for the oxidizer', () => {
    expect(
      problemCode(() => designMixture({ ...base, phi: 1, basis: { kind: 'fuel-fraction', value: 0.5 } })),
    ).toBe('design-conflict');
  });
  it('an inert named as fuel, a fuel in the oxidizer, an oxidizer as diluent', () => {
    expect(
      problemCode(() =>
        designMixture({ ...base, fuel: { Ar: 1 }, phi: 1, basis: { kind: 'dilution', value: 0.5 } }),
      ),
    ).toBe('design-conflict');
    expect(
      problemCode(() =>
        designMixture({
          ...base,
          oxidizer: { O2: 0.5, CH4: 0.5 },
          phi: 1,
          basis: { kind: 'dilution', value: 0.5 },
        }),
      ),
    ).toBe('design-conflict');
    expect(
      problemCode(() =>
        designMixture({ ...base, diluent: { O2: 1 }, phi: 1, basis: { kind: 'dilution', value: 0.5 } }),
      ),
    ).toBe('design-conflict');
  });
  it('explicit fractions that do not sum to 1, and unknown species', () => {
    expect(
      problemCode(() => designMixture({ kind: 'fractions', fractions: { CH4: 0.05, O2: 0.1, Ar: 0.8 } })),
    ).toBe('fractions-sum');
    expect(
      problemCode(() => designMixture({ kind: 'fractions', fractions: { CH5: 0.05, O2: 0.1, Ar: 0.85 } })),
    ).toBe('unknown-species');
  });
});
