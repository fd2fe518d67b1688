import { describe, expect, it } from 'vitest';
import {
  coverageGaps,
  describeFinding,
  FULLER_VOLUMES,
  FUEL_SAFETY,
  FUEL_TABLES,
  LENNARD_JONES,
  mixingEstimate,
  NOT_KNOWN,
  onFile,
  oxygenDemand,
  reviewFillSequence,
  SPECIES,
  SPECIES_TABLES,
  TABLE_FILE,
  type FuelSafetyRecord,
} from '../../src/core/index.js';
import { readyToText, readyToJson } from '../../src/report/ready-report.js';
import { TORR } from '../helpers.js';

const isFuel = (k: string) => oxygenDemand(SPECIES.get(k)!.elements) > 0;

/** run `f` with one row taken out of a data table, and put it back */
function without<K, V, T>(table: ReadonlyMap<K, V>, key: K, f: () => T): T {
  const m = table as Map<K, V>;
  const row = m.get(key)!;
  m.delete(key);
  try {
    return f();
  } finally {
    m.set(key, row);
  }
}

describe('data coverage: every species has each table it needs, or an explicit "not known" entry', () => {
  it('every fuel has flammability limits and an autoignition temperature; every species Lennard-Jones parameters and a diffusion volume', () => {
    const gaps: string[] = [];
    for (const k of SPECIES.keys())
      for (const t of coverageGaps(k, isFuel(k)))
        gaps.push(`${k}: no ${t} in ${TABLE_FILE[t]} and no "not known" entry in src/core/data/coverage.ts`);
    expect(gaps, gaps.join('\n')).toEqual([]);
  });

  it('the check can fail: a fuel without its autoignition temperature is named with the table', () => {
    const rec = FUEL_SAFETY.get('C2H6')!;
    const stripped: FuelSafetyRecord = { key: rec.key, lflAir: rec.lflAir, uflAir: rec.uflAir };
    const m = FUEL_SAFETY as Map<string, FuelSafetyRecord>;
    m.set('C2H6', stripped);
    try {
      expect(coverageGaps('C2H6', true)).toEqual(['autoignition temperature']);
    } finally {
      m.set('C2H6', rec);
    }
    expect(without(LENNARD_JONES, 'CH4', () => coverageGaps('CH4', true))).toEqual(['lennard-jones']);
  });

  it('every "not known" entry names a known species, says why, and is not also on file', () => {
    for (const n of NOT_KNOWN) {
      expect(SPECIES.has(n.species), n.species).toBe(true);
      expect(n.why.length, `${n.species} ${n.table}`).toBeGreaterThan(20);
      expect(onFile(n.species, n.table), `${n.species} ${n.table} is on file and "not known"`).toBe(false);
    }
    expect([...FUEL_TABLES, ...SPECIES_TABLES].every((t) => TABLE_FILE[t].length > 0)).toBe(true);
  });
});

describe('a "not known" is reported, never dropped in silence', () => {
  const y = { 'n-C7H16': 0.0025, O2: 0.0275, Ar: 0.97 };

  it('ready: a species with no diffusion data at all is a warning naming the pairs left out (the slowest pair is not silently a faster one)', () => {
    const full = mixingEstimate(y, 295.15, 1200 * TORR, 0.55, false);
    expect(full.findings).toEqual([]);
    const m = without(LENNARD_JONES, 'n-C7H16', () =>
      without(FULLER_VOLUMES, 'n-C7H16', () => mixingEstimate(y, 295.15, 1200 * TORR, 0.55, false)),
    );
    expect(m.findings).toEqual([
      {
        severity: 'warning',
        code: 'transport-data-not-known',
        species: 'n-C7H16',
        missing: ['lennard-jones', 'diffusion volume'],
        pairsLeftOut: ['n-C7H16-O2', 'n-C7H16-Ar'],
      },
    ]);
    const report = {
      id: 'B1',
      tank: 'T1',
      heightM: 0.55,
      pressurePa: 1200 * TORR,
      temperatureK: 295.15,
      mixing: m,
      contamination: {
        residualFraction: 0,
        ingressPerDay: 0,
        o2PerDay: 0,
        aboveAmbient: true,
      },
      atmosphericPa: 760 * TORR,
      days: 0,
      leakRatePaPerS: 0,
      baseVacuumPa: 0,
      notes: [],
    };
    expect(readyToText(report)).toContain('warning: no diffusion data (lennard-jones, diffusion volume)');
    expect(readyToText(report)).toContain(
      'left out of the slowest pair, so the mixing time may be too short',
    );
    const json = readyToJson(report, 'test') as { mixing: { findings: { code: string; species: string }[] } };
    expect(json.mixing.findings.map((f) => [f.code, f.species])).toEqual([
      ['transport-data-not-known', 'n-C7H16'],
    ]);
  });

  it('ready: CH2O has no Lennard-Jones parameters (declared not known): a note, and its pairs rest on Fuller alone', () => {
    const m = mixingEstimate({ CH2O: 0.01, N2: 0.99 }, 298.15, 101325, 0.5, false);
    expect(m.pair!.chapmanEnskogM2s).toBeUndefined();
    expect(m.pair!.governingM2s).toBe(m.pair!.fullerM2s);
    expect(m.findings).toEqual([
      {
        severity: 'note',
        code: 'transport-data-not-known',
        species: 'CH2O',
        missing: ['lennard-jones'],
        pairsLeftOut: [],
      },
    ]);
    expect(describeFinding(m.findings[0], String)).toContain('coefficients rest on Fuller alone');
  });

  it('review: a fuel present without an autoignition temperature is a warning, not a skipped compression check', () => {
    const states = [
      { step: 1, composition: { C2H6: 0.05, O2: 0.2, N2: 0.75 }, pressurePa: 1e5, final: true },
    ];
    const ctx = { temperatureK: 298.15, workingLimitPa: 3e5, tankId: 'T1', coldestK: 293.15 };
    expect(reviewFillSequence(states, [], ctx).some((f) => f.code === 'no-autoignition-data')).toBe(false);
    const rec = FUEL_SAFETY.get('C2H6')!;
    const m = FUEL_SAFETY as Map<string, FuelSafetyRecord>;
    m.set('C2H6', { key: rec.key, lflAir: rec.lflAir, uflAir: rec.uflAir, loc: rec.loc, uflO2: rec.uflO2 });
    try {
      const found = reviewFillSequence(states, [], ctx).filter((f) => f.code === 'no-autoignition-data');
      expect(found).toEqual([{ severity: 'warning', code: 'no-autoignition-data', species: 'C2H6' }]);
    } finally {
      m.set('C2H6', rec);
    }
  });
});
