// Prints the accuracy record and writes docs/accuracy-record.json (run: npm run accuracy).
import { readFileSync, writeFileSync } from 'node:fs';
import {
  accuracyRows,
  TARGET,
  TARGET_CO2,
  TARGET_HEAVY,
  type GridCase,
  type RecordRow,
} from './accuracy-lib.js';
import { calibrate } from './cross-rule-lib.js';
import { VIRIAL_U } from '../src/core/index.js';

const grid = JSON.parse(readFileSync('tests/fixtures/reference/accuracy-grid-coolprop.json', 'utf8')) as {
  library: string;
  cases: GridCase[];
};
const rows = accuracyRows(grid.cases);
const limit: Record<string, number> = { Ar: TARGET, N2: TARGET, CO2: TARGET_CO2, heavy: TARGET_HEAVY };
console.log(
  `real-gas targets against ${grid.library}; largest relative error in a target reading ` +
    `(targets: Ar/N2 ${TARGET}, CO2 ${TARGET_CO2}, heavy ${TARGET_HEAVY}; He recorded, not judged)`,
);
console.log(
  `${'case'.padEnd(28)} ${'model'.padStart(10)} ${'ideal gas'.padStart(10)} ${'err/u'.padStart(7)} ` +
    `${'ref u/u'.padStart(7)}`,
);

/** the error split of a row, largest parts first: 'C2H6-O2 +4.3e-4, B rest +1.3e-4, ...' */
function split(r: RecordRow): string {
  const p = r.error_parts;
  const parts: [string, number][] = [
    ...Object.entries(p.B_pairs),
    ['B rest', p.B_rest],
    ['C', p.C],
    ['beyond C', p.beyond_C],
  ];
  return parts
    .filter(([, v]) => Math.abs(v) >= 0.1 * r.model_error)
    .sort((a, b) => Math.abs(b[1]) - Math.abs(a[1]))
    .map(([k, v]) => `${k} ${v >= 0 ? '+' : ''}${v.toExponential(1)}`)
    .join(', ');
}

for (const r of rows) {
  const over = r.model_error > (limit[r.bath] ?? TARGET);
  const notes: string[] = [];
  if (!r.reference_virial_consistent)
    notes.push(
      `reference not virial-consistent, judged by combined u: ${r.error_over_combined_u.toFixed(2)}`,
    );
  if (over) notes.push('over target');
  if (r.error_over_u > 2) notes.push('error over 2u');
  if (notes.length && r.pairs_not_from_reference.length)
    notes.push(`not from the reference: ${r.pairs_not_from_reference.join(', ')}`);
  if (notes.length) notes.push(`split: ${split(r)}`);
  console.log(
    `${r.id.padEnd(28)} ${r.model_error.toExponential(2).padStart(10)} ` +
      `${r.ideal_error.toExponential(2).padStart(10)} ${r.error_over_u.toFixed(2).padStart(7)} ` +
      `${(r.reference_u / r.predicted_u).toFixed(2).padStart(7)}` +
      (notes.length ? `  ${notes.join('; ')}` : ''),
  );
}
const byBath = new Map<string, { model: number; judged: number; ideal: number; overU: number }>();
for (const r of rows) {
  const b = byBath.get(r.bath) ?? { model: 0, judged: 0, ideal: 0, overU: 0 };
  byBath.set(r.bath, {
    model: Math.max(b.model, r.model_error),
    judged: r.reference_virial_consistent ? Math.max(b.judged, r.model_error) : b.judged,
    ideal: Math.max(b.ideal, r.ideal_error),
    overU: Math.max(b.overU, r.error_over_u),
  });
}
// rows are judged where the reference is a virial expansion at the row (its own spread within our u); the others
// are judged separately, by their error over u combined with the reference's spread
const judged = rows.filter((r) => r.reference_virial_consistent);
const apart = rows.filter((r) => !r.reference_virial_consistent);
const within = (k: number) => judged.filter((r) => r.error_over_u <= k).length;
console.log(
  `error / predicted u over the ${judged.length} judged rows: within 1 ${within(1)}, within 2 ${within(2)}, ` +
    `largest ${Math.max(...judged.map((r) => r.error_over_u)).toFixed(2)}`,
);
console.log(
  `the ${apart.length} rows judged separately (reference not virial-consistent): error / combined u within 2 ` +
    `${apart.filter((r) => r.error_over_combined_u <= 2).length}, ` +
    `largest ${Math.max(...apart.map((r) => r.error_over_combined_u)).toFixed(2)}`,
);
// the cross-B rule's calibration on the fitted pairs (leave-one-out)
const cal = calibrate(VIRIAL_U.cross.absolute * 1e6);
console.log(
  `cross-B rule fitted on ${cal.pairs} pairs: k_ij + ${cal.fit.general.toFixed(4)} ` +
    `(+ ${cal.fit.co2.toFixed(4)} with CO2); relative u ${(cal.relative * 100).toFixed(2)} %; ` +
    `leave-one-out coverage within 2u ${(cal.looCovered * 100).toFixed(1)} % (missed: ${cal.looMissed.join(', ')})`,
);
for (const [b, v] of byBath)
  console.log(
    `bath ${b.padEnd(6)} target ${String(limit[b] ?? 'none').padEnd(7)} worst model ${v.model.toExponential(2)}` +
      ` (judged rows ${v.judged.toExponential(2)})  worst ideal ${v.ideal.toExponential(2)}` +
      `  worst err/u ${v.overU.toFixed(2)}`,
  );
writeFileSync(
  'docs/accuracy-record.json',
  JSON.stringify(
    { reference: grid.library, target: TARGET, target_co2: TARGET_CO2, target_heavy: TARGET_HEAVY, rows },
    null,
    1,
  ) + '\n',
);
console.log('wrote docs/accuracy-record.json');
