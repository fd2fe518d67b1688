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

// reference: readings from the CoolProp 8.0 HEOS mixture model (scripts/reference/gen_accuracy_grid.py)
const grid = fixture('accuracy-grid-coolprop.json') as { cases: GridCase[] };
const record = JSON.parse(readFileSync('docs/accuracy-record.json', 'utf8')) as { rows: RecordRow[] };

describe('accuracy record (docs/accuracy-record.json, written by npm run accuracy)', () => {
  it('the committed record is what the model computes now (rerun npm run accuracy after a model change)', () => {
    expect(accuracyRows(grid.cases)).toEqual(record.rows);
    expect(record.rows.length).toBe(119);
  });

  it(`Ar- and N2-diluted designs, 1-10 bar, 250-350 K: every target within ${TARGET} (a tenth of a 0.12 %-of-reading gauge) of the reference EOS`, () => {
    const rows = record.rows.filter((r) => ['Ar', 'N2'].includes(r.bath));
    expect(rows.length).toBe(36);
    expect(rows.filter((r) => r.final_bar === 10).length).toBe(12);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
  });

  it(`heavy fuels (C3H8, n-C4H10, n-C7H16) with N2 or CO2, 250-350 K up to 10 bar: every target within ${TARGET_HEAVY}`, () => {
    const rows = record.rows.filter((r) => r.bath === 'heavy');
    expect(rows.length).toBe(30);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_HEAVY);
  });

  it(`CO2-containing designs: within ${TARGET_CO2} up to 3 bar everywhere and up to 10 bar at 300-350 K; measured worst 9.1e-4 (C2H6-O2-CO2, 250 K, 10 bar) - the target does not hold at 250 K and 10 bar`, () => {
    const rows = record.rows.filter((r) => r.bath === 'CO2');
    expect(rows.length).toBe(26);
    for (const r of rows.filter((x) => x.final_bar <= 3))
      expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_CO2);
    const over = rows.filter((r) => r.model_error > TARGET_CO2).map((r) => r.id);
    expect(over.sort()).toEqual(['c2h6-o2-co2-250K-10bar', 'co2-rich-250K-10bar']);
    for (const r of rows.filter((x) => x.temperature_K >= 300))
      expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET_CO2);
    expect(Math.max(...rows.map((r) => r.model_error))).toBeLessThan(1e-3);
  });

  it('every judged row within 2 of its own predicted standard uncertainty, but for C3H8-O2-CO2 at 250 K (2.1); He rows are judged only where the reference is virial-consistent (none is)', () => {
    const judged = record.rows.filter((r) => r.bath !== 'He' || r.reference_virial_consistent);
    expect(judged.length).toBe(92);
    const over = judged.filter((r) => r.error_over_u > 2).map((r) => r.id);
    expect(over.sort()).toEqual(['c3h8-o2-co2-250K-1bar', 'c3h8-o2-co2-250K-3bar']);
    for (const r of judged) expect(r.error_over_u, r.id).toBeLessThan(2.2);
    // every He row is left unjudged because a He pair of the reference spreads over composition by more than our u
    for (const r of record.rows.filter((x) => x.bath === 'He')) {
      expect(r.reference_virial_consistent, r.id).toBe(false);
      expect(
        r.pairs_not_from_reference.some((p) => /He/.test(p) && /not virial-consistent/.test(p)),
        r.id,
      ).toBe(true);
    }
  });

  it('each row names the method of each cross B; CO2 pairs with hydrocarbons come from the composition averages', () => {
    const r = record.rows.find((x) => x.id === 'c2h6-o2-co2-300K-10bar')!;
    expect(r.cross_methods).toContain('C2H6-CO2: reference-mixture-average');
    for (const x of record.rows) expect(x.cross_methods.length, x.id).toBeGreaterThan(0);
  });

  it('measured worst cases on record (bounds, not the target): Ar 4.9e-5, N2 6.5e-5, He 3.1e-3, CO2 9.1e-4, heavy 2.9e-4; the ideal-gas plan is off by 2e-3 to 5e-2 there', () => {
    const worst = (bath: string) =>
      Math.max(...record.rows.filter((r) => r.bath === bath).map((r) => r.model_error));
    expect(worst('Ar')).toBeLessThan(6e-5);
    expect(worst('N2')).toBeLessThan(8e-5);
    expect(worst('He')).toBeLessThan(3.5e-3);
    expect(worst('CO2')).toBeLessThan(1e-3);
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
