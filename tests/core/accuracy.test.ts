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
    expect(record.rows.length).toBe(137);
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

  // the target is judged where the reference is a virial expansion at the row; the three rows over it are judged
  // separately (below): there a pair's B_12 in the library spreads over composition by far more than our u
  it(`CO2-containing designs: within ${TARGET_CO2} wherever the reference is virial-consistent`, () => {
    const rows = record.rows.filter((r) => r.bath === 'CO2');
    expect(rows.length).toBe(35);
    const judged = rows.filter((r) => r.reference_virial_consistent);
    const at = ['300K-1bar', '300K-3bar', '300K-10bar', '350K-1bar', '350K-3bar', '350K-10bar'];
    expect(judged.map((r) => r.id).sort()).toEqual(
      [...at.map((s) => `co2-rich-${s}`), ...at.map((s) => `ch4-air-co2-${s}`)].sort(),
    );
    for (const r of judged) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_CO2);
    for (const r of rows.filter((x) => x.final_bar <= 3 || x.temperature_K === 350))
      expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_CO2);
    const over = rows.filter((r) => r.model_error > TARGET_CO2);
    expect(over.map((r) => r.id).sort()).toEqual([
      'c2h6-o2-co2-250K-10bar',
      'c3h8-o2-co2-300K-10bar',
      'ch4-air-co2-250K-10bar',
    ]);
    for (const r of over) expect(r.reference_virial_consistent, r.id).toBe(false);
    expect(Math.max(...rows.map((r) => r.model_error))).toBeLessThan(8e-4);
  });

  // CO2 in a fuel-air mixture: N2-CO2 from the library's composition average (-43.8 cm3/mol at 300 K, u 5.8), since
  // the rule (-32.1) lies more than 2u outside every value the library implies (-53.2 to -41.6); with the rule the
  // 300 K, 10 bar row was 1.35e-3 off (measured before the change), now within the CO2 target
  it('CO2 diluting air: N2-CO2 from the composition average, the 300 K and 350 K rows within the CO2 target', () => {
    const r = record.rows.find((x) => x.id === 'ch4-air-co2-300K-10bar')!;
    expect(r.cross_methods).toContain('N2-CO2: reference-mixture-average');
    expect(r.model_error).toBeLessThan(3e-4);
    expect(r.reference_virial_consistent).toBe(true);
    // at 250 K the library's N2-CO2 itself is no virial expansion: no constant B_12 comes within 1.1e-3 in Z at
    // 10 bar somewhere in composition (table), and its O2-CO2 spreads more than our u
    const floor = (crossTable.averaged as Record<string, { least_Z_error_10bar: number }>)['N2|CO2'];
    expect(floor.least_Z_error_10bar).toBeGreaterThan(1e-3);
  });

  // CoolProp 8.0.0 through the table: the library's implied B_12 of O2 with C2H6 / C3H8 (default, unfitted
  // parameters) spread over composition (u 18.6 / 57.0 cm3/mol at 250 / 300 K) against our stated u of about 4.4
  it('CO2 rows over the target: the reference spread carried to that target is comparable to or above it', () => {
    const a = record.rows.find((x) => x.id === 'c2h6-o2-co2-250K-10bar')!;
    expect(a.reference_u).toBeGreaterThan(3 * TARGET_CO2);
    const b = record.rows.find((x) => x.id === 'c3h8-o2-co2-300K-10bar')!;
    expect(b.reference_u).toBeGreaterThan(0.9 * TARGET_CO2);
    const left = crossTable.left_out as Record<string, { B_u: number[] }>;
    const t250 = crossTable.temperatures_K.indexOf(250);
    const t300 = crossTable.temperatures_K.indexOf(300);
    expect(left['O2|C2H6'].B_u[t250]).toBeGreaterThan(15);
    expect(left['O2|C3H8'].B_u[t300]).toBeGreaterThan(50);
    for (const r of [a, b]) expect(r.error_over_combined_u, r.id).toBeLessThan(1);
  });

  // a He bath whose pairs the library gives as virial expansions (He-N2, H2-N2, H2-He): judged, as Ar and N2 baths
  it(`He baths where the reference is virial-consistent (H2 in He/N2), 1-10 bar: within ${TARGET}`, () => {
    const rows = record.rows.filter((r) => r.bath === 'He' && r.reference_virial_consistent);
    expect(rows.length).toBe(9);
    for (const r of rows) {
      expect(r.id.startsWith('h2-he-n2-'), r.id).toBe(true);
      expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
      expect(r.error_over_u, r.id).toBeLessThanOrEqual(1);
    }
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
    // CO2 diluting air is the exception (next test)
    const rows = record.rows.filter(
      (r) =>
        ['CO2', 'heavy'].includes(r.bath) &&
        r.final_bar === 10 &&
        r.temperature_K <= 300 &&
        !r.id.startsWith('ch4-air-co2-'),
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
  // the library's N2-CO2 C_mix is not cubic in composition (no pair C tabulated: the cube-root rule); at 250 K C still
  // removes about 64 % of C_mix rho^2 (8.0e-4 of Z), leaving 2.9e-4 of the row's 7.3e-4; at 300 K 6.8e-5 of 4.0e-4
  it('CO2 diluting air, 10 bar: C helps (less than 40 % of C_mix rho^2 left), but leaves 2.9e-4 at 250 K', () => {
    for (const [T, most] of [
      [250, 3e-4],
      [300, 1e-4],
    ] as const) {
      const r = record.rows.find((x) => x.id === `ch4-air-co2-${T}K-10bar`)!;
      const c = grid.cases.find((x) => x.id === r.id)!;
      const fin = c.readings[c.readings.length - 1];
      const share = fin.C_mix_cm6_per_mol2 * 1e-12 * c.final_density_mol_per_m3 ** 2;
      expect(Math.abs(r.error_parts.C), r.id).toBeLessThan(0.4 * share);
      expect(Math.abs(r.error_parts.C), r.id).toBeLessThan(most);
    }
  });
});

describe('accuracy record: error over the predicted standard uncertainty of each target', () => {
  // a row is judged where no pair of it (species at 1 % or more) spreads in the library by more than our own u; the
  // others compare two estimates and are judged by u combined with the library's spread carried to the target
  it('every judged row within 2 of its own predicted u; every other row within 2 of u and the reference spread', () => {
    const judged = record.rows.filter((r) => r.reference_virial_consistent);
    expect(judged.length).toBe(69);
    for (const r of judged) expect(r.error_over_u, r.id).toBeLessThanOrEqual(2);
    const apart = record.rows.filter((r) => !r.reference_virial_consistent);
    expect(apart.length).toBe(68);
    for (const r of apart) {
      expect(r.error_over_combined_u, r.id).toBeLessThanOrEqual(2);
      // the reference's spread is the larger or a comparable share of the combined u there
      expect(r.reference_u, r.id).toBeGreaterThan(0);
    }
    // C3H8-O2-CO2 at 250 K and 3 bar: 2.03 of our u alone; the library's CO2-O2 there spreads over composition
    // (u 7.8 cm3/mol at 250 K) by more than our u (4), and its C3H8-O2 is unfitted (u 97): 0.91 of the combined u
    const r = record.rows.find((x) => x.id === 'c3h8-o2-co2-250K-3bar')!;
    expect(r.error_over_u).toBeGreaterThan(2);
    expect(r.reference_virial_consistent).toBe(false);
    expect(r.error_over_combined_u).toBeLessThan(1);
    expect(r.error_parts.B_pairs['CO2-O2']).toBeGreaterThan(0.6 * r.model_error);
    // every He row with O2, CH4 or Ar is judged apart: a He pair of the reference spreads by more than our u
    for (const x of record.rows.filter((q) => q.bath === 'He' && !q.id.startsWith('h2-he-n2-'))) {
      expect(x.reference_virial_consistent, x.id).toBe(false);
      expect(
        x.pairs_not_from_reference.some((p) => /He/.test(p) && /not virial-consistent|unfitted/.test(p)),
        x.id,
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
