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
    expect(record.rows.length).toBe(69);
  });

  it(`Ar- and N2-diluted designs up to 3 bar, 250-350 K: every target within ${TARGET} (a tenth of a 0.12 %-of-reading gauge) of the reference EOS`, () => {
    const rows = record.rows.filter((r) => ['Ar', 'N2'].includes(r.bath) && r.final_bar <= 3);
    expect(rows.length).toBeGreaterThan(20);
    for (const r of rows) expect(r.model_error, r.id).toBeLessThanOrEqual(TARGET);
  });

  it('measured worst cases on record (bounds, not the target): Ar 10 bar 2.0e-4, N2 10 bar 3.2e-4, He baths 3.1e-3, CO2-rich 2.4e-3, heavy fuel 3.2e-5; the ideal-gas plan is off by 2e-3 to 4e-2 there', () => {
    const worst = (bath: string) => Math.max(...record.rows.filter((r) => r.bath === bath).map((r) => r.model_error));
    expect(worst('Ar')).toBeLessThan(2.5e-4);
    expect(worst('N2')).toBeLessThan(4e-4);
    expect(worst('He')).toBeLessThan(3.5e-3);
    expect(worst('CO2')).toBeLessThan(3e-3);
    expect(worst('heavy')).toBeLessThan(5e-5);
    // the real-gas model beats the ideal-gas plan in every case but He-Ar at 350 K, where the two models'
    // He-Ar cross coefficients (+18.5 here, +7.4 in the reference mixture model at 298 K) differ by more
    // than the whole non-ideality there
    const heAr350 = (x: RecordRow) => x.id.startsWith('ch4-o2-he-ar') && x.temperature_K === 350;
    for (const r of record.rows.filter((x) => !heAr350(x))) expect(r.model_error, r.id).toBeLessThan(r.ideal_error);
    for (const r of record.rows.filter(heAr350)) expect(r.model_error / r.ideal_error, r.id).toBeLessThan(1.6);
  });
});
