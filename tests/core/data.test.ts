import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import {
  ELEMENTS,
  getSource,
  lookup,
  molarMassKgPerMol,
  PROPERTY_NAMES,
  SOURCES,
  SPECIES,
  hasThermo,
  hasReferenceB,
} from '../../src/core/index.js';
import nasa from '../../src/core/data/nasa7-thermo.json' with { type: 'json' };
import virialTable from '../../src/core/data/virial-reference.json' with { type: 'json' };
import { fixture } from '../helpers.js';

const REQUIRED = [
  'H2',
  'He',
  'Ne',
  'Ar',
  'Kr',
  'Xe',
  'N2',
  'O2',
  'CO',
  'CO2',
  'H2O',
  'NH3',
  'N2O',
  'NO',
  'CH4',
  'C2H6',
  'C2H4',
  'C2H2',
  'C3H8',
  'C3H6',
  'n-C4H10',
  'i-C4H10',
  'n-C5H12',
  'n-C7H16',
  'i-C8H18',
  'C7H8',
  'CH3OH',
  'C2H5OH',
  'CH3OCH3',
  'CH2O',
  'SF6',
];

describe('species table integrity', () => {
  it('holds every required species, with unique keys and aliases', () => {
    for (const k of REQUIRED) expect(SPECIES.has(k), k).toBe(true);
    const names = [...SPECIES.values()].flatMap((s) => [s.key, ...s.aliases].map((n) => n.toLowerCase()));
    expect(new Set(names).size).toBe(names.length);
  });

  it('every source key resolves and every element has an atomic weight', () => {
    for (const sp of SPECIES.values()) {
      expect(SOURCES.has(sp.criticalSource), `${sp.key} critical source`).toBe(true);
      expect(SOURCES.has(sp.dipoleSource), `${sp.key} dipole source`).toBe(true);
      for (const el of Object.keys(sp.elements))
        expect(ELEMENTS.has(el), `${sp.key} element ${el}`).toBe(true);
    }
    for (const el of ELEMENTS.values()) expect(SOURCES.has(el.source)).toBe(true);
  });

  it('every property lookup returns a finite value, a known unit and a resolvable source', () => {
    const units = new Set(['kg/mol', 'K', 'Pa', 'm3/mol', '1', 'D']);
    for (const sp of SPECIES.values()) {
      for (const p of PROPERTY_NAMES) {
        const v = lookup(p, sp.key);
        expect(Number.isFinite(v.value), `${sp.key} ${p}`).toBe(true);
        expect(units.has(v.unit)).toBe(true);
        expect(getSource(v.source.key)).toBe(v.source);
      }
      expect(sp.Tc).toBeGreaterThan(0);
      expect(sp.Pc).toBeGreaterThan(0);
      expect(sp.Vc).toBeGreaterThan(0);
      expect(sp.dipole).toBeGreaterThanOrEqual(0);
    }
  });

  it('fingerprint: row count and a checksum of the constants (an accidental edit fails here)', () => {
    expect(SPECIES.size).toBe(31);
    const text = [...SPECIES.values()]
      .map((s) => [s.key, s.Tc, s.Pc, s.Vc, s.omega, s.dipole, s.polarClass].join('|'))
      .join('\n');
    const sum = createHash('sha256').update(text).digest('hex').slice(0, 16);
    expect(sum).toMatchInlineSnapshot(`"9729144c6c6aa6c2"`);
  });

  it('NASA fits: 39 species, each with 7 coefficients per range, and every species has one', () => {
    const sp = nasa.species as Record<string, { coefficients: number[][]; temperatureRanges: number[] }>;
    expect(Object.keys(sp).length).toBe(39);
    for (const [k, v] of Object.entries(sp)) {
      expect(v.coefficients.length, k).toBe(v.temperatureRanges.length - 1);
      for (const row of v.coefficients) expect(row.length).toBe(7);
    }
    for (const k of SPECIES.keys()) expect(hasThermo(k), k).toBe(true);
  });

  it('virial reference table: known species only, aligned columns, generator and library named', () => {
    expect(virialTable.library).toMatch(/CoolProp 8\.0\.0/);
    expect(virialTable.generator).toBe('scripts/reference/gen_virial.py');
    const n = virialTable.temperatures_K.length;
    for (const [k, v] of Object.entries(
      virialTable.species as Record<string, { B: number[]; C: number[] }>,
    )) {
      expect(SPECIES.has(k), k).toBe(true);
      expect(v.B.length).toBe(n);
      expect(v.C.length).toBe(n);
    }
    for (const q of ['He', 'H2', 'Ne']) expect(hasReferenceB(q)).toBe(true);
  });
});

describe('molar masses', () => {
  const ref = fixture('molar-mass.json');
  it('match the IUPAC 2021 conventional atomic weights to 0.0015 g/mol (rounding of the table)', () => {
    for (const [k, m] of Object.entries(ref.values as Record<string, number>)) {
      expect(molarMassKgPerMol(SPECIES.get(k)!.elements) * 1000, k).toBeCloseTo(m, 2);
      expect(Math.abs(molarMassKgPerMol(SPECIES.get(k)!.elements) * 1000 - m), k).toBeLessThan(0.0015);
    }
  });
  it('agree with ISO 6976:2016 Table A.2 (older atomic weights) within 0.01 g/mol', () => {
    for (const [k, m] of Object.entries(ref.iso6976.values as Record<string, number>)) {
      expect(Math.abs(molarMassKgPerMol(SPECIES.get(k)!.elements) * 1000 - m), k).toBeLessThan(0.01);
    }
  });
});

describe('safety, vapour and transport tables: integrity', () => {
  it('every key is a known species, every source resolves, every value is in its physical range', async () => {
    const {
      FUEL_SAFETY,
      INERT_K,
      ANTOINE,
      WAGNER,
      LENNARD_JONES,
      FULLER_VOLUMES,
      SOURCES: S,
      oxygenDemand,
    } = await import('../../src/core/index.js');
    for (const [k, r] of FUEL_SAFETY) {
      expect(SPECIES.has(k), k).toBe(true);
      expect(oxygenDemand(SPECIES.get(k)!.elements), `${k} is a fuel`).toBeGreaterThan(0);
      for (const v of [...r.lflAir, ...r.uflAir, ...(r.uflO2 ? [r.uflO2] : []), ...(r.loc ? [r.loc] : [])]) {
        expect(S.has(v.source), `${k} ${v.source}`).toBe(true);
        expect(v.value).toBeGreaterThanOrEqual(0);
        expect(v.value).toBeLessThanOrEqual(1);
      }
      expect(Math.min(...r.lflAir.map((v) => v.value))).toBeLessThan(
        Math.max(...r.uflAir.map((v) => v.value)),
      );
      if (r.ait) expect(r.ait.value).toBeGreaterThan(400);
      for (const v of r.aitListed ?? []) expect(S.has(v.source), `${k} ${v.source}`).toBe(true);
    }
    // every fuel of the species table has limits on file
    for (const sp of SPECIES.values())
      if (oxygenDemand(sp.elements) > 0) expect(FUEL_SAFETY.has(sp.key), sp.key).toBe(true);
    for (const [k, v] of INERT_K) {
      expect(SPECIES.has(k)).toBe(true);
      expect(S.has(v.source)).toBe(true);
    }
    for (const [k, a] of ANTOINE) {
      expect(SPECIES.has(k)).toBe(true);
      expect(S.has(a.source)).toBe(true);
      expect(a.TminK).toBeLessThan(a.TmaxK);
    }
    for (const [k, w] of WAGNER) expect(SPECIES.has(k) && S.has(w.source)).toBe(true);
    for (const [k, l] of LENNARD_JONES)
      expect(SPECIES.has(k) && S.has(l.source) && l.sigmaA > 0 && l.epsK > 0).toBe(true);
    for (const [k, f] of FULLER_VOLUMES) expect(SPECIES.has(k) && S.has(f.source) && f.volume > 0).toBe(true);
    expect(FUEL_SAFETY.size).toBe(19);
    expect(ANTOINE.size).toBe(11);
    expect(LENNARD_JONES.size).toBe(29);
    expect(FULLER_VOLUMES.size).toBe(30);
  });

  it('fingerprint of the fire data: every limit, AIT and source key (an accidental edit fails here; update deliberately)', async () => {
    const { FUEL_SAFETY } = await import('../../src/core/index.js');
    const f = (v?: { value: number; source: string }) => (v ? `${v.value}@${v.source}` : '-');
    const text = [...FUEL_SAFETY.values()]
      .map((r) =>
        [
          r.key,
          r.lflAir.map(f).join(','),
          r.uflAir.map(f).join(','),
          f(r.uflO2),
          f(r.loc),
          f(r.ait),
          (r.aitListed ?? []).map(f).join(','),
        ].join('|'),
      )
      .join('\n');
    expect(createHash('sha256').update(text).digest('hex').slice(0, 16)).toMatchInlineSnapshot(
      `"126ca59f166598e6"`,
    );
  });
});
