// A band in which no value the gauge displays lies: the sheet says it under the fill, in every format,
// in the words the guided fill's reading screen says it (report/format.ts noneInsideWords, one function
// for both; the screen's own test: tests/tui/fill-band-finer.test.tsx). The premise is computed here:
// the demo lab with its 10000 Torr head showing 1 Torr steps, the batch planned to 1500.5 Torr in the
// order CH4, Ar, O2: fills 2 and 3 on that head, their bands +-0.10 Torr, no whole Torr inside either.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { inwardBand, noneInsideWords } from '../../src/report/format.js';
import { runCli, sheetFlowed, TORR } from '../helpers.js';

const dir = mkdtempSync(join(tmpdir(), 'mw-none-inside-'));
const lab = join(dir, 'lab-coarse.yaml');
const coarse = DEMO_LAB_YAML.replace(
  /(full_scale: 10000 Torr\n(?: {4}.*\n)*? {4}resolution: )0\.1 Torr/,
  '$11 Torr',
);
writeFileSync(lab, coarse);
const ARGS = [
  'recipes/ch4-o2-ar-phi1.yaml',
  '--lab',
  lab,
  '--order',
  'CH4,Ar,O2',
  '--pressure',
  '1500.5 Torr',
];

describe('the sheet says when no displayed value lies inside a band', () => {
  it('noneInsideWords: undefined where a displayed value is inside, the sentence where none is', () => {
    // 1500.5 +- 0.1 Torr at 0 decimals: no whole Torr inside; 1500.0 +- 0.1: 1500 inside
    expect(inwardBand(1500.5 * TORR, 0.1 * TORR, 'Torr', 0)).toBeUndefined();
    expect(noneInsideWords('g', 1500.5 * TORR, 0.1 * TORR, 'Torr', 0)).toBe(
      'NO value g shows is inside the band: the nearest, 1501 Torr, reads ABOVE it and is logged ' +
        'outside it. Use a finer gauge if you can',
    );
    expect(noneInsideWords('g', 1500 * TORR, 0.1 * TORR, 'Torr', 0)).toBeUndefined();
  });

  it('txt, md and html: the sentence under fills 2 and 3, not under fill 1', async () => {
    expect(coarse).not.toBe(DEMO_LAB_YAML);
    const plan = JSON.parse((await runCli(['plan', ...ARGS, '--json'])).stdout);
    const steps = plan.steps as { gauge: string | null; gauge_reading_Pa: number; band_Pa: number }[];
    const said = steps.map((s) =>
      s.gauge ? noneInsideWords(s.gauge, s.gauge_reading_Pa, s.band_Pa, 'Torr', 0) : undefined,
    );
    // the premise: fills 2 and 3 on the 1 Torr head have no whole Torr inside their bands
    expect(said[1]).toMatch(/^NO value head-10kT shows is inside the band/);
    expect(said[2]).toMatch(/^NO value head-10kT shows is inside the band/);
    for (const format of ['txt', 'md', 'html']) {
      const r = await runCli(['sheet', ...ARGS, '--format', format]);
      // the text sheet wraps its prose at 80 columns: read it flowed
      const words = format === 'txt' ? sheetFlowed(r.stdout) : r.stdout;
      expect(words, format).toContain(said[1]!);
      expect(words, format).toContain(said[2]!);
      expect(r.stdout.split('NO value').length - 1, format).toBe(2);
    }
    const txt = (await runCli(['sheet', ...ARGS, '--format', 'txt'])).stdout;
    expect(sheetFlowed(txt)).toContain(`^ fill 2: ${said[1]}`);
    expect(txt).toMatch(/^ {5}\^ fill 2: NO value head-10kT shows/m);
  });
});
