// Prints the accuracy record and writes docs/accuracy-record.json (run: npm run accuracy).
import { readFileSync, writeFileSync } from 'node:fs';
import { accuracyRows, TARGET, type GridCase } from './accuracy-lib.js';

const grid = JSON.parse(readFileSync('tests/fixtures/reference/accuracy-grid-coolprop.json', 'utf8')) as { library: string; cases: GridCase[] };
const rows = accuracyRows(grid.cases);
console.log(`real-gas targets against ${grid.library}; largest relative error in a target reading (target ${TARGET} for Ar/N2/He baths)`);
console.log(`${'case'.padEnd(28)} ${'model'.padStart(10)} ${'ideal gas'.padStart(10)}`);
for (const r of rows) {
  const over = ['Ar', 'N2', 'He'].includes(r.bath) && r.model_error > TARGET;
  const note = over && r.pairs_not_from_reference.length ? `  over target; not from the reference: ${r.pairs_not_from_reference.join(', ')}` : over ? '  over target' : '';
  console.log(`${r.id.padEnd(28)} ${r.model_error.toExponential(2).padStart(10)} ${r.ideal_error.toExponential(2).padStart(10)}${note}`);
}
const byBath = new Map<string, { model: number; ideal: number }>();
for (const r of rows) {
  const b = byBath.get(r.bath) ?? { model: 0, ideal: 0 };
  byBath.set(r.bath, { model: Math.max(b.model, r.model_error), ideal: Math.max(b.ideal, r.ideal_error) });
}
for (const [b, v] of byBath) console.log(`bath ${b.padEnd(6)} worst model ${v.model.toExponential(2)}  worst ideal ${v.ideal.toExponential(2)}`);
writeFileSync('docs/accuracy-record.json', JSON.stringify({ reference: grid.library, target: TARGET, rows }, null, 1) + '\n');
console.log('wrote docs/accuracy-record.json');
