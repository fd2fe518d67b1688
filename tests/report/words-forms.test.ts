// One form for a number and its uncertainty in the plain-text outputs ("+-", the ASCII the text reports
// use throughout; "±" only where a markdown or HTML renderer turns it so), and a tank-over-rating finding
// that says its pressure is the top of a fill's band, not a pressure the plan fills to (a trial read
// "pressure 2712.5 Torr exceeds ..." of a plan whose final pressure is 2699 Torr). Wording only.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

describe('number forms and the over-rating wording', () => {
  it('the two-stage txt sheet: the premix fractions with +- as the predicted U, no ±', async () => {
    const r = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--premix-tank',
      'MT-2',
      '--format',
      'txt',
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/Premix +O2 0\.13\d+ \+- 0\.000\d+/);
    expect(r.stdout).not.toContain('±');
  });

  it('a plan 1 Torr under the working limit: the top of the last fill band named as such', async () => {
    const f = join(mkdtempSync(join(tmpdir(), 'mw-over-')), 'over.yaml');
    writeFileSync(
      f,
      'id: over\ntank: MT-1\nmixture:\n  fuel: CH4\n  oxidizer: O2\n  diluent: Ar\n  phi: 1.0\n' +
        '  dilution: 0.98\npressure: 2699 Torr\ntemperature: 25 degC\n',
    );
    const r = await runCli(['plan', f]);
    const line = r.stdout.split('\n').find((l) => l.includes('DANGER  tank-over-rating'))!;
    expect(line).toMatch(
      /tank-over-rating \(fill 4, Ar charge 2 of 2\): the top of this fill's band \(its target plus the band\), [\d.]+ Torr, exceeds the allowed working pressure [\d.]+ Torr of tank MT-1/,
    );
    expect(line).not.toMatch(/: pressure [\d.]+ Torr exceeds/);
  });
});
