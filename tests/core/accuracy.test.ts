import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { accuracyRows, TARGET, type GridCase, type RecordRow } from '../../scripts/accuracy-lib.js';
import { fixture } from '../helpers.js';

// reference: readings from the CoolProp 8.0 HEOS mixture model (scripts/reference/gen_accuracy_grid.py)
const grid = fixture('accuracy-grid-coolprop.json') as { cases: GridCase[] };
const record = JSON.parse(readFileSync('docs/accuracy-record.json', 'utf8')) as { rows: RecordRow[] };

describe('accuracy record (docs/accuracy-record.json, written by npm run accuracy)', () => {
  it('the committed record is what the model computes now (rerun npm run accuracy after a model change)', () => {
    expect(accuracyRows(grid.cases)).toEqual(record.rows);
    expect(record.rows.length).toBe(78);
  });

  it(`Ar- and N2-diluted designs, 1-10 bar, 250-350 K: every target within ${TARGET} (a tenth of a 0.12 %-of-reading gauge) of the reference EOS`, () => {
    const rows = record.rows.filter((r) => ['Ar', 'N2'].includes(r.bath));
    expect(rows.length).toBe(36);
    expect(rows.filter((r) => r.final_bar === 10).length).toBe(12);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
  });

  it(`He baths: the He-rich He-Ar design within ${TARGET} everywhere; every He row over it involves a He pair whose reference cross coefficient is unfitted or not virial-consistent`, () => {
    const he = record.rows.filter((r) => r.bath === 'He');
    expect(he.length).toBe(27);
    for (const r of he.filter((x) => x.id.startsWith('ch4-o2-he90-ar'))) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
    for (const r of he.filter((x) => x.model_error > TARGET)) {
      expect(r.pairs_not_from_reference.some((p) => /He/.test(p) && /unfitted|not virial-consistent/.test(p)), r.id).toBe(true);
    }
    // at 1 bar all He designs but the Ar-rich He-Ar one meet the target
    for (const r of he.filter((x) => x.final_bar === 1 && !x.id.startsWith('ch4-o2-he-ar-'))) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
  });

  it('measured worst cases on record (bounds, not the target): Ar 4.9e-5, N2 6.5e-5, He 3.1e-3, CO2-rich 2.4e-3, heavy fuel 3.1e-5; the ideal-gas plan is off by 2e-3 to 4e-2 there', () => {
    const worst = (bath: string) => Math.max(...record.rows.filter((r) => r.bath === bath).map((r) => r.model_error));
    expect(worst('Ar')).toBeLessThan(6e-5);
    expect(worst('N2')).toBeLessThan(8e-5);
    expect(worst('He')).toBeLessThan(3.5e-3);
    expect(worst('CO2')).toBeLessThan(3e-3);
    expect(worst('heavy')).toBeLessThan(4e-5);
    // the real-gas model beats the ideal-gas plan in every case but the Ar-rich He-Ar design at 350 K: there the
    // reference mixture model's zero-density B_He-Ar at that composition (about +2 cm3/mol; +18 at the He-rich
    // end) and the combining rule's +19.8 differ by more than the whole non-ideality
    const heAr350 = (x: RecordRow) => x.id.startsWith('ch4-o2-he-ar-') && x.temperature_K === 350;
    for (const r of record.rows.filter((x) => !heAr350(x))) expect(r.model_error, r.id).toBeLessThan(r.ideal_error);
    for (const r of record.rows.filter(heAr350)) expect(r.model_error / r.ideal_error, r.id).toBeLessThan(1.6);
  });
});
