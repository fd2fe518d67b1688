import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  chapmanJouguet,
  closedVesselCombustion,
  detonability,
  enthalpyMolar,
  entropyMolar,
  equilibriumHP,
  equilibriumTP,
  equilibriumUV,
  DETONATION_LIMITS,
  EQUILIBRIUM_SPECIES_COUNT,
  FUEL_SAFETY,
  getSource,
  ProblemError,
  R,
} from '../../src/core/index.js';
import base from '../../src/core/data/nasa7-thermo.json' with { type: 'json' };
import products from '../../src/core/data/nasa7-products.json' with { type: 'json' };
import { fixture } from '../helpers.js';

const ref = fixture('equilibrium-cantera.json');
const lib = ref.library as string;

interface RefCase {
  name: string;
  X0: Record<string, number>;
  T0_K: number;
  P0_Pa: number;
  uv_P_Pa: number;
  uv_T_K: number;
  uv_graphite: boolean;
  uv_graphite_mol_per_mol_initial: number;
  hp_T_K?: number;
  cj_P_Pa?: number;
  cj_T_K?: number;
  cj_velocity_m_per_s?: number;
}
const cases = ref.cases as RefCase[];

/** atoms of every species, read from the data files (independent of the solver's tables) */
const atoms: Record<string, Record<string, number>> = {};
for (const [k, v] of Object.entries({ ...base.species, ...products.species } as Record<
  string,
  { composition: Record<string, number> }
>))
  atoms[k] = v.composition;

function elementTotals(amounts: Record<string, number>): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, n] of Object.entries(amounts))
    for (const [e, c] of Object.entries(atoms[k])) out[e] = (out[e] ?? 0) + c * n;
  return out;
}

describe(`constant-volume adiabatic equilibrium (UV) against ${lib} on the same NASA data`, () => {
  it("the fixture covers lean, stoichiometric, rich and graphite-forming states, Ar/He/N2/CO2 baths and 0.1-10 bar, and the issue's rich C2H4/O2/N2 case", () => {
    expect(cases.length).toBeGreaterThanOrEqual(12);
    expect(cases.filter((c) => c.uv_graphite).length).toBeGreaterThanOrEqual(2);
    for (const bath of ['Ar', 'He', 'N2', 'CO2'])
      expect(
        cases.some((c) => (c.X0[bath] ?? 0) > 0.5),
        bath,
      ).toBe(true);
    expect(Math.min(...cases.map((c) => c.P0_Pa))).toBeLessThanOrEqual(1e4);
    expect(Math.max(...cases.map((c) => c.P0_Pa))).toBeGreaterThanOrEqual(1e6);
  });
  for (const c of cases) {
    it(`${c.name}: pressure within 0.1 % (required: 1 %), temperature within 1 K, graphite as in the reference`, () => {
      const s = equilibriumUV(c.X0, c.T0_K, c.P0_Pa);
      expect(Math.abs(s.pressurePa / c.uv_P_Pa - 1)).toBeLessThan(1e-3);
      expect(Math.abs(s.temperatureK - c.uv_T_K)).toBeLessThan(1);
      expect(s.graphiteMol > 1e-9).toBe(c.uv_graphite);
      if (c.uv_graphite)
        expect(Math.abs(s.graphiteMol / c.uv_graphite_mol_per_mol_initial - 1)).toBeLessThan(1e-3);
    });
  }
  it("the issue's case: rich C2H4/O2/N2 24/24/52 % from 0.95 bar reaches about 10.1 bar at equilibrium, 13 % above complete combustion (8.9 bar)", () => {
    const y = { C2H4: 0.24, O2: 0.24, N2: 0.52 };
    const eq = equilibriumUV(y, 298.15, 95000).pressurePa;
    const complete = 95000 * closedVesselCombustion(y, 298.15).pressureRatio;
    expect(Math.abs(eq / 10.1e5 - 1)).toBeLessThan(0.01);
    expect(eq / complete).toBeGreaterThan(1.1);
  });
});

describe(`adiabatic flame temperature at constant pressure (HP) against ${lib}`, () => {
  for (const c of cases.filter((x) => x.hp_T_K !== undefined)) {
    it(`${c.name}: within 1 K`, () => {
      expect(Math.abs(equilibriumHP(c.X0, c.T0_K, c.P0_Pa).temperatureK - c.hp_T_K!)).toBeLessThan(1);
    });
  }
});

describe(`Chapman-Jouguet detonation against the minimum-velocity computation with ${lib}`, () => {
  for (const c of cases.filter((x) => x.cj_P_Pa !== undefined)) {
    it(`${c.name}: P_CJ within 0.1 % (required: 1 %), T_CJ within 1 K, velocity within 0.1 %; reflected = 2.5 x P_CJ`, () => {
      const j = chapmanJouguet(c.X0, c.T0_K, c.P0_Pa);
      expect(Math.abs(j.pressurePa / c.cj_P_Pa! - 1)).toBeLessThan(1e-3);
      expect(Math.abs(j.temperatureK - c.cj_T_K!)).toBeLessThan(1);
      expect(Math.abs(j.velocityMPerS / c.cj_velocity_m_per_s! - 1)).toBeLessThan(1e-3);
      expect(j.reflectedPa).toBeCloseTo(2.5 * j.pressurePa, 6);
    });
  }
  it('CJ pressure ratios of stoichiometric fuel/O2 near the handbook values (properties.md 7.6, from memory): H2-O2 about 19, CH4-O2 about 29, C3H8-O2 about 36, within 10 %', () => {
    expect(chapmanJouguet({ H2: 2 / 3, O2: 1 / 3 }, 298.15, 1e5).pressurePa / 1e5 / 19).toBeGreaterThan(0.9);
    expect(chapmanJouguet({ H2: 2 / 3, O2: 1 / 3 }, 298.15, 1e5).pressurePa / 1e5 / 19).toBeLessThan(1.1);
    expect(
      Math.abs(chapmanJouguet({ CH4: 1 / 3, O2: 2 / 3 }, 298.15, 1e5).pressurePa / 1e5 / 29 - 1),
    ).toBeLessThan(0.1);
    expect(
      Math.abs(chapmanJouguet({ C3H8: 1 / 6, O2: 5 / 6 }, 298.15, 1e5).pressurePa / 1e5 / 36 - 1),
    ).toBeLessThan(0.1);
  });
});

describe('hand-checkable equilibria', () => {
  it('law of mass action at 3000 K, 1 bar: x_H2 x_O2^1/2 / x_H2O (P/P°)^1/2 = exp(-dG°/RT) from the NASA polynomials (thermo.ts, evaluated by hand here) within 1e-6', () => {
    const t = 3000;
    const s = equilibriumTP({ H2: 2 / 3, O2: 1 / 3 }, t, 1e5);
    const g = (k: string) => enthalpyMolar(k, t) - t * entropyMolar(k, t);
    const kp = Math.exp(-(g('H2') + 0.5 * g('O2') - g('H2O')) / (R * t));
    const x = s.gas;
    expect(Math.abs((x.H2 * Math.sqrt(x.O2)) / x.H2O / kp - 1)).toBeLessThan(1e-6);
    // and the pressure asked for is the pressure found
    expect(Math.abs(s.pressurePa / 1e5 - 1)).toBeLessThan(1e-9);
  });
  it('nothing to burn: argon stays at 298.15 K and its pressure; 10 ppm CH4 in air moves the state by less than 1 K', () => {
    const ar = equilibriumUV({ Ar: 1 }, 298.15, 1e5);
    expect(Math.abs(ar.temperatureK - 298.15)).toBeLessThan(1e-6);
    expect(Math.abs(ar.pressurePa / 1e5 - 1)).toBeLessThan(1e-9);
    const trace = equilibriumUV({ CH4: 1e-5, O2: 0.21, N2: 0.79 - 1e-5 }, 298.15, 1e5);
    expect(trace.temperatureK - 298.15).toBeLessThan(1);
    expect(Number.isFinite(trace.pressurePa)).toBe(true);
  });
  it('lean and cool: 10 % H2 in air burns almost completely (dissociation small at 1340 K): UV pressure within 0.5 % of complete combustion', () => {
    const y = { H2: 0.1, O2: 0.189, N2: 0.711 };
    expect(
      Math.abs(
        equilibriumUV(y, 298.15, 1e6).pressurePa / (1e6 * closedVesselCombustion(y, 298.15).pressureRatio) -
          1,
      ),
    ).toBeLessThan(0.005);
  });
  it('refuses, with a problem naming the species, a state holding a species it has no product data for (SF6: no S or F products)', () => {
    let caught: unknown;
    try {
      equilibriumUV({ CH4: 0.1, O2: 0.2, SF6: 0.7 }, 298.15, 1e5);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ProblemError);
    expect((caught as ProblemError).problem).toEqual({ code: 'no-equilibrium-data', species: ['SF6'] });
  });
});

describe('properties of the equilibrium (fast-check)', () => {
  const mixture = fc
    .record({
      fuel: fc.constantFrom('CH4', 'H2', 'C2H4', 'C3H8', 'C2H2', 'CO'),
      phi: fc.double({ min: 0.05, max: 5, noNaN: true }),
      bath: fc.constantFrom('N2', 'Ar', 'He', 'CO2'),
      dilution: fc.double({ min: 0, max: 0.95, noNaN: true }),
      pressurePa: fc.double({ min: 1e4, max: 1e6, noNaN: true }),
    })
    .map(({ fuel, phi, bath, dilution, pressurePa }) => {
      const z: Record<string, number> = { CH4: 2, H2: 0.5, C2H4: 3, C3H8: 5, C2H2: 2.5, CO: 0.5 };
      const f = phi / z[fuel];
      const s = (1 - dilution) / (f + 1);
      return { y: { [fuel]: f * s, O2: s, [bath]: dilution } as Record<string, number>, pressurePa };
    });
  it('UV: elements conserved (gas + graphite) to 1e-9, mole fractions non-negative and summing to 1, internal energy conserved, no NaN', () => {
    fc.assert(
      fc.property(mixture, ({ y, pressurePa }) => {
        const s = equilibriumUV(y, 298.15, pressurePa);
        expect(Number.isFinite(s.pressurePa) && Number.isFinite(s.temperatureK)).toBe(true);
        let sum = 0;
        for (const v of Object.values(s.gas)) {
          expect(v).toBeGreaterThanOrEqual(0);
          sum += v;
        }
        expect(Math.abs(sum - 1)).toBeLessThan(1e-9);
        const before = elementTotals(y);
        const after = elementTotals(
          Object.fromEntries(Object.entries(s.gas).map(([k, x]) => [k, x * s.gasMol])),
        );
        after.C = (after.C ?? 0) + s.graphiteMol;
        const ySum = Object.values(y).reduce((a, b) => a + b, 0);
        for (const [e, b] of Object.entries(before))
          expect(Math.abs((after[e] ?? 0) - b / ySum), e).toBeLessThan(1e-9 * Math.max(1, b));
        let u0 = 0;
        for (const [k, v] of Object.entries(y)) u0 += (v / ySum) * (enthalpyMolar(k, 298.15) - R * 298.15);
        expect(Math.abs(s.internalEnergyJ - u0)).toBeLessThan(1e-6 * Math.max(1, Math.abs(u0)) + 1e-3);
      }),
      { numRuns: 60 },
    );
  });
});

describe('detonability (data/detonation-data.ts: published limits, all recalled - from memory)', () => {
  const air = (x: number, fuel: string) => ({ [fuel]: x, O2: 0.21 * (1 - x), N2: 0.79 * (1 - x) });
  it('stoichiometric H2-air (29.6 % H2) is detonable by published limits (Lewis & von Elbe, 18.3-59 %, from memory); 70 % H2 in air is not', () => {
    const d = detonability(air(0.296, 'H2'));
    expect(d.detonable).toBe(true);
    expect(d.basis).toBe('published-limits');
    expect(d.undiluted).toBe(false);
    expect(detonability(air(0.7, 'H2')).detonable).toBe(false);
    expect(detonability(air(0.15, 'H2')).detonable).toBe(false);
  });
  it('undiluted stoichiometric CH4/O2 is detonable and undiluted (CH4-O2 8.3-55 %, Kuchta, from memory); 70 % CH4 in O2 is not', () => {
    const d = detonability({ CH4: 1 / 3, O2: 2 / 3 });
    expect(d.detonable && d.undiluted).toBe(true);
    expect(detonability({ CH4: 0.7, O2: 0.3 }).detonable).toBe(false);
  });
  it('a fuel without published limits (C2H6) falls back to the conservative rule: detonable below 50 % N2-equivalent inert, said so', () => {
    expect(detonability({ C2H6: 2 / 9, O2: 7 / 9 })).toMatchObject({ detonable: true, basis: 'inert-rule' });
    expect(detonability({ C2H6: 0.05, O2: 0.175, N2: 0.775 })).toMatchObject({
      detonable: false,
      basis: 'inert-rule',
    });
  });
  it('limits interpolate between air and O2 in the oxygen share: 50 % H2 in O2-enriched air (50 % O2 share) lies between the air and O2 limits', () => {
    const d = detonability({ H2: 0.5, O2: 0.25, N2: 0.25 });
    expect(d.limits!.phiLow).toBeGreaterThan(0);
    expect(d.oxygenShare).toBeCloseTo(0.5, 10);
    expect(d.detonable).toBe(true);
  });
});

describe('data integrity: product species and detonation limits', () => {
  it('nasa7-products.json: 15 species (14 gases and graphite), 7 coefficients per range, the TM-4513 source named; the equilibrium uses 51 (the 36 C/H/O/N/noble-gas species of nasa7-thermo, 14 product gases, graphite)', () => {
    const sp = products.species as Record<
      string,
      { coefficients: number[][]; temperatureRanges: number[]; phase: string }
    >;
    expect(Object.keys(sp).length).toBe(15);
    expect(sp['C(gr)'].phase).toBe('solid');
    for (const [k, v] of Object.entries(sp)) {
      expect(v.coefficients.length, k).toBe(v.temperatureRanges.length - 1);
      for (const row of v.coefficients) expect(row.length).toBe(7);
    }
    expect(products.source).toMatch(/NASA TM-4513/);
    expect(getSource('nasa-tm-4513-products').quality).toBe('experimental-review');
    expect(EQUILIBRIUM_SPECIES_COUNT).toBe(51);
  });
  it('detonation limits: 9 published pairs, every source resolves and is marked from memory, low < high, and inside the flammable range of the fuel (NFPA 497 / IEC LFL in air; UFL in O2)', () => {
    expect(DETONATION_LIMITS.length).toBe(9);
    for (const r of DETONATION_LIMITS) {
      for (const v of [r.low, r.high])
        expect(getSource(v.source).quality, `${r.fuel}-${r.oxidizer}`).toBe('from-memory');
      expect(r.low.value).toBeLessThan(r.high.value);
      const f = FUEL_SAFETY.get(r.fuel)!;
      expect(r.low.value).toBeGreaterThanOrEqual(Math.min(...f.lflAir.map((x) => x.value)));
      const upper = r.oxidizer === 'air' ? Math.max(...f.uflAir.map((x) => x.value)) : (f.uflO2?.value ?? 1);
      expect(r.high.value, `${r.fuel}-${r.oxidizer}`).toBeLessThanOrEqual(upper);
    }
  });
});
