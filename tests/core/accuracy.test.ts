import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  accuracyRows,
  TARGET,
  TARGET_CO2,
  TARGET_HEAVY,
  type GridCase,
  type RecordRow,
} from '../../scripts/accuracy-lib.js';
import { fixture } from '../helpers.js';
import crossTable from '../../src/core/data/cross-virial-reference.json' with { type: 'json' };

// reference: readings from the CoolProp 8.0 HEOS mixture model (scripts/reference/gen_accuracy_grid.py)
const grid = fixture('accuracy-grid-coolprop.json') as { cases: GridCase[] };
const record = JSON.parse(readFileSync('docs/accuracy-record.json', 'utf8')) as { rows: RecordRow[] };

describe('accuracy record (docs/accuracy-record.json, written by npm run accuracy)', () => {
  it('the committed record is what the model computes now (rerun npm run accuracy after a model change)', () => {
    expect(accuracyRows(grid.cases)).toEqual(record.rows);
    expect(record.rows.length).toBe(119);
  });

  // a tenth of a 0.12 %-of-reading gauge
  it(`Ar- and N2-diluted designs, 1-10 bar, 250-350 K: every target within ${TARGET}`, () => {
    const rows = record.rows.filter((r) => ['Ar', 'N2'].includes(r.bath));
    expect(rows.length).toBe(36);
    expect(rows.filter((r) => r.final_bar === 10).length).toBe(12);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
  });

  it(`heavy fuels (C3H8, n-C4H10, n-C7H16) with N2 or CO2, 250-350 K, to 10 bar: within ${TARGET_HEAVY}`, () => {
    const rows = record.rows.filter((r) => r.bath === 'heavy');
    expect(rows.length).toBe(30);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_HEAVY);
  });

  // the target does not hold for C2H6-O2-CO2 at 250 K and C3H8-O2-CO2 at 300 K, 10 bar (7.9e-4, 5.2e-4): see below
  it(`CO2-containing designs: within ${TARGET_CO2} up to 3 bar everywhere and at 350 K`, () => {
    const rows = record.rows.filter((r) => r.bath === 'CO2');
    expect(rows.length).toBe(26);
    for (const r of rows.filter((x) => x.final_bar <= 3 || x.temperature_K === 350))
      expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_CO2);
    const over = rows.filter((r) => r.model_error > TARGET_CO2).map((r) => r.id);
    expect(over.sort()).toEqual(['c2h6-o2-co2-250K-10bar', 'c3h8-o2-co2-300K-10bar']);
    expect(Math.max(...rows.map((r) => r.model_error))).toBeLessThan(8e-4);
  });
});

describe('accuracy record: where the error comes from (library zero-density B_mix, C_mix, pair B)', () => {
  it('the split by coefficient and pair adds up to the error (first order, within 12 %), every row', () => {
    for (const r of record.rows) {
      const p = r.error_parts;
      const sum = Object.values(p.B_pairs).reduce((x, y) => x + y, 0) + p.B_rest + p.C + p.beyond_C;
      expect(Math.abs(Math.abs(sum) - r.model_error), r.id).toBeLessThanOrEqual(0.12 * r.model_error + 2e-7);
    }
  });

  it('CO2 rows over the target: the largest share is a pair the library does not give as data', () => {
    const largest = (id: string) => {
      const r = record.rows.find((x) => x.id === id)!;
      const sorted = Object.entries(r.error_parts.B_pairs).sort((x, y) => Math.abs(y[1]) - Math.abs(x[1]));
      return { r, pair: sorted[0][0], share: sorted[0][1] };
    };
    // C2H6-O2: the library's binary parameters are its defaults (unfitted), so its B_12 (-69.8 cm3/mol at 250 K)
    // is a combining rule too; ours, -88.1, is the rule calibrated on the fitted pairs (C2H6-N2 there: -78.0
    // against the library's fitted -77.6). That pair alone is 4.3e-4 of the 7.9e-4.
    const a = largest('c2h6-o2-co2-250K-10bar');
    expect(a.pair).toBe('C2H6-O2');
    expect(a.share).toBeGreaterThan(4e-4);
    expect(a.r.pairs_not_from_reference).toContain('C2H6-O2: unfitted in the library');
    // the library's ternary B_mix is not the sum of its own binaries: 1.3e-4 more
    expect(a.r.error_parts.B_rest).toBeGreaterThan(1e-4);
    // CO2-O2 at 300 K: the library's implied B_12 runs from -38.3 (5 % O2) to -44.9 cm3/mol (95 % O2); at the
    // row's 20 % O2 it is -39.8, our composition fit -42.1: 3.0e-4 of the 5.2e-4
    const b = largest('c3h8-o2-co2-300K-10bar');
    expect(b.pair).toBe('CO2-O2');
    expect(b.share).toBeGreaterThan(2.5e-4);
    expect(b.r.cross_methods).toContain('O2-CO2: reference-mixture-average');
    // no composition-independent B_12 (what a virial expansion has) comes closer to the library's O2-CO2 than
    // 7.7e-4 in Z at 10 bar somewhere in composition (250-350 K; the generator's minimax floor): over the target
    const floor = (crossTable.averaged as Record<string, { least_Z_error_10bar: number }>)['O2|CO2'];
    expect(floor.least_Z_error_10bar).toBeGreaterThan(TARGET_CO2);
  });

  // third virial: cube-root rule plus the tabulated pair C; C_mix rho^2 is 2e-4 to 1.3e-3 of Z in the library
  it('CO2 and heavy rows, 250-300 K, 10 bar: C removes most of C_mix rho^2, leaving at most 1e-4', () => {
    const rows = record.rows.filter(
      (r) => ['CO2', 'heavy'].includes(r.bath) && r.final_bar === 10 && r.temperature_K <= 300,
    );
    expect(rows.length).toBeGreaterThanOrEqual(10);
    for (const r of rows) {
      const c = grid.cases.find((x) => x.id === r.id)!;
      const fin = c.readings[c.readings.length - 1];
      const share = fin.C_mix_cm6_per_mol2 * 1e-12 * c.final_density_mol_per_m3 ** 2;
      expect(share, r.id).toBeGreaterThan(2e-4);
      expect(Math.abs(r.error_parts.C), r.id).toBeLessThan(1e-4);
      expect(Math.abs(r.error_parts.C), r.id).toBeLessThan(0.25 * share);
    }
  });
});

describe('accuracy record: error over the predicted standard uncertainty of each target', () => {
  // He rows are judged only where the reference is virial-consistent (none is); over 2: C3H8-O2-CO2 at 250 K and
  // 3 bar (2.03), where the library's CO2-O2 is not a virial expansion
  it('every judged row within 2 of its own predicted u, but one', () => {
    const judged = record.rows.filter((r) => r.bath !== 'He' || r.reference_virial_consistent);
    expect(judged.length).toBe(92);
    const over = judged.filter((r) => r.error_over_u > 2).map((r) => r.id);
    expect(over).toEqual(['c3h8-o2-co2-250K-3bar']);
    for (const r of judged) expect(r.error_over_u, r.id).toBeLessThan(2.1);
    // there the library's CO2-O2 spreads over composition (u 7.8 cm3/mol at 250 K) by more than our u (4): at
    // the row's 20 % O2 it gives -57.0 against our -62.6; that pair is most of the error
    const r = record.rows.find((x) => x.id === 'c3h8-o2-co2-250K-3bar')!;
    expect(r.reference_virial_consistent).toBe(false);
    expect(r.error_parts.B_pairs['CO2-O2']).toBeGreaterThan(0.6 * r.model_error);
    // every He row is left unjudged: a He pair of the reference spreads over composition by more than our u
    for (const r of record.rows.filter((x) => x.bath === 'He')) {
      expect(r.reference_virial_consistent, r.id).toBe(false);
      expect(
        r.pairs_not_from_reference.some((p) => /He/.test(p) && /not virial-consistent/.test(p)),
        r.id,
      ).toBe(true);
    }
  });

  it('each row names the method of each cross B; CO2-hydrocarbon pairs from the composition averages', () => {
    const r = record.rows.find((x) => x.id === 'c2h6-o2-co2-300K-10bar')!;
    expect(r.cross_methods).toContain('C2H6-CO2: reference-mixture-average');
    for (const x of record.rows) expect(x.cross_methods.length, x.id).toBeGreaterThan(0);
  });

  // the ideal-gas plan is off by 2e-3 to 5e-2 there
  it('measured worst cases (bounds): Ar 4.9e-5, N2 6.5e-5, He 3.1e-3, CO2 7.9e-4, heavy 2.9e-4', () => {
    const worst = (bath: string) =>
      Math.max(...record.rows.filter((r) => r.bath === bath).map((r) => r.model_error));
    expect(worst('Ar')).toBeLessThan(6e-5);
    expect(worst('N2')).toBeLessThan(8e-5);
    expect(worst('He')).toBeLessThan(3.5e-3);
    expect(worst('CO2')).toBeLessThan(8e-4);
    expect(worst('heavy')).toBeLessThan(3e-4);
    // the real-gas model beats the ideal-gas plan in every case but the Ar-rich He-Ar design at 350 K: there the
    // reference mixture model's zero-density B_He-Ar at that composition (about +2 cm3/mol; +18 at the He-rich
    // end) and the combining rule's +19.8 differ by more than the whole non-ideality
    const heAr350 = (x: RecordRow) => x.id.startsWith('ch4-o2-he-ar-') && x.temperature_K === 350;
    for (const r of record.rows.filter((x) => !heAr350(x)))
      expect(r.model_error, r.id).toBeLessThan(r.ideal_error);
    for (const r of record.rows.filter(heAr350))
      expect(r.model_error / r.ideal_error, r.id).toBeLessThan(1.6);
  });
});
