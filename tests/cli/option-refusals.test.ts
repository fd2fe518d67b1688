// Refusals of options read as our own refusals do (what, where, why, what to do): the --trials range
// read "is outside the allowed range a whole number from 100000 to 10000000"; the parser's refusal of a
// choice (--units kpa) was its own "error: option ... is invalid", with no hint that kPa was meant; and
// a stop refused on "charge 2 of the fill order" meant the order's entry 2, where elsewhere "charge 2 of
// 2" is the source's own charge. Wording and exit codes only.
import { describe, expect, it } from 'vitest';
import { runCli } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';

describe('option refusals in the house form', () => {
  it('label --trials 20000: the range first, then what to do', async () => {
    const r = await runCli(['label', 'batches/demo-ch4-phi1-ar98.jsonl', '--trials', '20000']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      '--trials: Monte Carlo trials = 20000 is outside the allowed range 100000 to 10000000, a whole ' +
        'number: give one in that range, or leave --trials out for the default 200000',
    );
    expect(r.stderr).not.toContain('range a whole');
  });

  it('check of a folder --trials 5: leaving it out means no Monte Carlo, said so', async () => {
    const r = await runCli(['check', 'batches', '--trials', '5']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('or leave --trials out (no Monte Carlo then)');
  });

  it('--units kpa: not a choice, kPa suggested (the case counts), exit 2, error code', async () => {
    const r = await runCli(['plan', RECIPE, '--units', 'kpa']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'mixwright: --units: "kpa" is not one of the choices: Torr, kPa, bar, psi, mbar, Pa, atm; did you ' +
        'mean kPa? The case counts: give one exactly as listed',
    );
    expect(r.stderr).toContain('(error code: usage)');
    expect(r.stderr).not.toMatch(/^error: /m);
  });

  it('--paper a5: the choices, and no guess at a size that is not one', async () => {
    const r = await runCli(['sheet', RECIPE, '--paper', 'a5']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('mixwright: --paper: "a5" is not one of the choices: a4, letter; give one');
    expect(r.stderr).not.toContain('did you mean');
  });

  it("a stop below the reading before it names the order's entry, not a charge number", async () => {
    const r = await runCli(['plan', RECIPE, '--order', 'CH4,Ar@5 Torr,O2,Ar']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("the stop reading of the fill order's entry 2 (cyl-Ar), 666.612 Pa (5 Torr)");
    expect(r.stderr).not.toContain('charge 2 of the fill order');
  });
});
