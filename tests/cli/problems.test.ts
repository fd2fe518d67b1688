import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describeProblem, type Problem } from '../../src/core/index.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { runCli, STACK_LINE } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-cli-problems-'));

/** exit 2 with the code and the message, no stack */
async function refusedWith(argv: string[], code: string, message: string | RegExp, isTTY = false) {
  const r = await runCli(argv, isTTY);
  expect(r.code, r.stderr).toBe(2);
  expect(r.stderr).toContain(`(error code: ${code})`);
  if (typeof message === 'string') expect(r.stderr).toContain(message);
  else expect(r.stderr).toMatch(message);
  expect(r.stderrShown).not.toMatch(STACK_LINE);
  expect(r.stderr).not.toMatch(/undefined|\[object/);
}

describe('each condition of the command line and recipe has its own code and typed fields', () => {
  it('the interactive commands outside a terminal: needs-terminal, naming what to use instead', async () => {
    await refusedWith(['fill', RECIPE], 'needs-terminal', 'the guided fill needs a terminal');
    await refusedWith(['wizard'], 'needs-terminal', 'the wizard needs a terminal');
  });
  it('a pressure and an experiment count together; neither; a number option that is no number', async () => {
    const d = tmp();
    const f = join(d, 'r.yaml');
    writeFileSync(
      f,
      'id: x\ntank: MT-1\nmixture: { fractions: Ar }\npressure: 1 bar\nexperiments: { count: 3 }\ntemperature: 25 degC\n',
    );
    await refusedWith(
      ['plan', f],
      'pressure-and-count',
      /r\.yaml:5:\d+ experiments\.count: give the final pressure or the number of experiments, not both/,
    );
    writeFileSync(f, 'id: x\ntank: MT-1\nmixture: { fractions: Ar }\ntemperature: 25 degC\n');
    await refusedWith(
      ['plan', f],
      'pressure-missing',
      'give the final pressure, or the number of experiments',
    );
    await refusedWith(
      ['plan', RECIPE, '--tolerance', '0.0x'],
      'not-a-number',
      '--tolerance: "0.0x" is not a number',
    );
    await refusedWith(
      ['plan', RECIPE, '--phi', '1e999'],
      'number-too-large',
      '"1e999" is too large a number',
    );
  });
  it('two dilution measures, and a diluent without an amount', async () => {
    const d = tmp();
    const f = join(d, 'r.yaml');
    writeFileSync(
      f,
      'id: x\ntank: MT-1\nmixture: { fuel: CH4, oxidizer: O2, phi: 1, diluent: Ar, dilution: 0.9, fuel_fraction: 0.01 }\npressure: 1 bar\ntemperature: 25 degC\n',
    );
    await refusedWith(
      ['plan', f],
      'dilution-measures',
      'give only one of dilution, diluent_ratio, fuel_fraction (got dilution and fuel_fraction)',
    );
    writeFileSync(
      f,
      'id: x\ntank: MT-1\nmixture: { fuel: CH4, oxidizer: O2, phi: 1, diluent: Ar }\npressure: 1 bar\ntemperature: 25 degC\n',
    );
    await refusedWith(['plan', f], 'diluent-amount-missing', 'a diluent is named but not how much');
  });
  it('a lab profile with an id used twice, and a thermometer in degC: their own codes, with the line', async () => {
    const d = tmp();
    const lab = join(d, 'lab.yaml');
    writeFileSync(lab, DEMO_LAB_YAML.replace(/- id: MT-2\b/, '- id: MT-1'));
    await refusedWith(
      ['plan', RECIPE, '--lab', lab],
      'duplicate-id',
      /lab\.yaml:\d+:\d+ id: the id "MT-1" is used twice/,
    );
    writeFileSync(lab, DEMO_LAB_YAML.replace('uncertainty: 0.3 K', 'uncertainty: 0.3 degC'));
    await refusedWith(
      ['plan', RECIPE, '--lab', lab],
      'bad-temperature-difference',
      'cannot read "0.3 degC" as a temperature difference: give it in K or mK',
    );
  });
  it('a recipe field its format refuses: invalid-field, worded as before', async () => {
    const d = tmp();
    const f = join(d, 'r.yaml');
    writeFileSync(f, 'id: x\ntank: MT-1\nmixture: { fractions: Ar }\npressure: 1500\ntemperature: 25 degC\n');
    await refusedWith(
      ['plan', f],
      'invalid-field',
      /r\.yaml:4:\d+ pressure: the value is the bare number 1500; it needs a unit/,
    );
  });
  it('a list with an empty entry or a species twice: bad-list with the fault', async () => {
    await refusedWith(
      [
        'plan',
        '--fractions',
        'CH4:0.5,,Ar:0.5',
        '--volume',
        '1 L',
        '--pressure',
        '1 bar',
        '--temperature',
        '25 degC',
      ],
      'bad-list',
      'cannot read "CH4:0.5,,Ar:0.5": an empty entry. Write species',
    );
    await refusedWith(
      [
        'plan',
        '--fractions',
        'Ar:0.5,Ar:0.5',
        '--volume',
        '1 L',
        '--pressure',
        '1 bar',
        '--temperature',
        '25 degC',
      ],
      'bad-list',
      'Ar appears twice',
    );
  });
  it('the wording of a typed write-failed cause names the code once', () => {
    const p: Problem = {
      code: 'write-failed',
      cause: {
        kind: 'system',
        errno: 'ENOSPC',
        message: 'the disk is full (ENOSPC); free some space and try again',
      },
    };
    expect(describeProblem(p)).toBe('not written: the disk is full (ENOSPC); free some space and try again');
    expect(
      describeProblem({
        code: 'write-failed',
        cause: { kind: 'system', errno: 'EIO', message: 'the device failed' },
      }),
    ).toBe('not written: the device failed (EIO)');
  });
});
