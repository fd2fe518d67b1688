// A CSV row may name the premix of an earlier stage by its gases, as the plan labels its fill
// (core/supply.ts fillLabel: "Ar+O2" for 0.12 % O2 in Ar, largest first), or by its source id
// premix-MT-2: the names a row may give are the plan's step labels, by the same function
// (io/csv-names.ts). Reference: the demo CSV readings/ch4-phi1-from-premix.csv, whose premix row names
// premix-MT-2; the same readings with the row named by the label give the same re-check, number for
// number (the same inputs: tolerance 0).
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { fillLabel } from '../../src/core/index.js';
import { checkCsv } from '../../src/io/check-csv.js';
import { readPremixLog } from '../../src/io/premix-check.js';
import { runCli } from '../helpers.js';

const DEMO = 'readings/ch4-phi1-from-premix.csv';
const PREMIX_LOG = 'batches/demo-premix-o2-ar-mt2.jsonl';
const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const dir = mkdtempSync(join(tmpdir(), 'mw-csv-label-'));
const named = (name: string) => {
  const f = join(dir, `${name.replace(/\W/g, '_')}.csv`);
  writeFileSync(f, readFileSync(DEMO, 'utf8').replace(/^premix-MT-2,/m, `${name},`));
  return f;
};
const opts = { trials: 0, seed: 1, recipeFile: RECIPE, premixLog: PREMIX_LOG };

describe('a CSV row naming the premix of an earlier stage by its fill label', () => {
  const label = fillLabel(readPremixLog(PREMIX_LOG, PREMIX_LOG, 'demo').source);

  it('the label is the plan\'s: "Ar+O2" (README two-stage section)', () => {
    expect(label).toBe('Ar+O2');
  });

  it.each([['the label'], ['its gases in the other order']])(
    '%s: accepted, the same re-check as premix-MT-2',
    async (which) => {
      const name = which === 'the label' ? label : label.split('+').reverse().join('+');
      const byId = await checkCsv(DEMO, opts);
      const byLabel = await checkCsv(named(name), opts);
      expect(byLabel.readings.map((r) => r.source.id)).toEqual(byId.readings.map((r) => r.source.id));
      expect(byLabel.readings[2].source.id).toBe('premix-MT-2');
      for (const [k, st] of Object.entries(byId.result.composition))
        expect(byLabel.result.composition[k].value, k).toBe(st.value);
      expect(byLabel.verdict.verdict).toBe(byId.verdict.verdict);
    },
  );

  it('without --premix-log: refused at its row, saying that such a row needs --premix-log (exit 2)', async () => {
    const r = await runCli(['check', named(label), '--recipe', RECIPE]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(':4 species: Ar+O2 is not filled in the design of');
    expect(r.stderr).toContain(
      'a premix filled in an earlier stage is named by its gases (or premix-<tank>) only with --premix-log LOG',
    );
  });
});
