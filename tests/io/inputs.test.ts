import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { closeSync, ftruncateSync, mkdtempSync, openSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { MAX_TEXT_BYTES, readTextFile } from '../../src/io/read-text.js';
import { parseQuantity } from '../../src/io/quantity.js';
import { parseYamlText } from '../../src/io/yaml-file.js';
import { parseReadingsCsv } from '../../src/io/readings-csv.js';
import { validateRecipeObject } from '../../src/io/load.js';
import {
  designMixture,
  describeProblemAt,
  formatNumber,
  getSpecies,
  ProblemError,
} from '../../src/core/index.js';

const dir = mkdtempSync(join(tmpdir(), 'mw-inputs-'));

/** the refusal a call raises: its code and its sentence */
function refusal(f: () => unknown): { code: string; text: string } {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError)
      return { code: e.problem.code, text: describeProblemAt(e.problem, e.where) };
    throw e;
  }
  throw new Error('no refusal');
}

describe('reading files: only regular files of a sane size', () => {
  it('a named pipe is refused at once, without waiting for a writer', () => {
    const fifo = join(dir, 'pipe.yaml');
    execFileSync('mkfifo', [fifo]);
    // a blocking open would wait here for a writer forever (the test would time out)
    const r = refusal(() => readTextFile(fifo));
    expect(r.code).toBe('file-unreadable');
    expect(r.text).toContain('named pipe');
  });
  it('/dev/zero (a device) and a folder are refused', () => {
    expect(refusal(() => readTextFile('/dev/zero')).text).toContain('device');
    expect(refusal(() => readTextFile(dir)).text).toContain('folder');
  });
  it('a file above the limit is refused by its size, before it is read', () => {
    const big = join(dir, 'big.csv');
    const fd = openSync(big, 'w');
    ftruncateSync(fd, MAX_TEXT_BYTES + 1); // sparse: no disk used
    closeSync(fd);
    const r = refusal(() => readTextFile(big));
    expect(r.code).toBe('file-too-large');
    expect(r.text).toMatch(/up to 8 MB/);
  });
  it('a file with NUL bytes is not text; a UTF-8 byte-order mark is dropped', () => {
    const bin = join(dir, 'bin.yaml');
    writeFileSync(bin, Buffer.from([0x69, 0x64, 0x00, 0x01]));
    expect(refusal(() => readTextFile(bin)).text).toContain('not a text file');
    const bom = join(dir, 'bom.csv');
    writeFileSync(bom, '\ufeffspecies,pressure,temperature\nCH4,10 Torr,25 degC\n');
    const text = readTextFile(bom);
    expect(text.startsWith('species')).toBe(true);
    expect(parseReadingsCsv(text, bom)[0].species).toBe('CH4');
  });
});

describe('quantities: finite, physical, and the spellings people type', () => {
  it('non-finite and out-of-window numbers are refused with the allowed range', () => {
    expect(refusal(() => parseQuantity('1e999 Torr', 'pressure')).text).toMatch(
      /too large to represent; the allowed range is from 1e-12 Pa/,
    );
    expect(refusal(() => parseQuantity('1e999 L', 'volume')).code).toBe('bad-quantity');
    expect(refusal(() => parseQuantity('5e-324 Pa', 'pressure')).text).toContain('too small to be measured');
    expect(refusal(() => parseQuantity('1e11 Pa', 'pressure')).code).toBe('out-of-range');
    const zero = refusal(() => parseQuantity('-273.15 degC', 'temperature'));
    expect(zero.code).toBe('out-of-range');
    expect(zero.text).toContain('absolute zero');
    expect(refusal(() => parseQuantity('-10 K', 'temperature')).text).toContain('below absolute zero');
  });
  it('a bare C or F is refused with the degree unit meant (mathjs reads C as the coulomb)', () => {
    expect(refusal(() => parseQuantity('22 C', 'temperature')).text).toMatch(/coulomb.*did you mean degC\?/);
    expect(refusal(() => parseQuantity('72 F', 'temperature')).text).toMatch(/did you mean degF\?/);
  });
  it('°C, ℃ and °F are the degree units: 22 °C = 295.15 K, 71.6 °F = 295.15 K (ISO 80000-5 offsets, exact)', () => {
    expect(parseQuantity('22 °C', 'temperature')).toBeCloseTo(295.15, 10);
    expect(parseQuantity('22℃', 'temperature')).toBeCloseTo(295.15, 10);
    expect(parseQuantity('71.6 °F', 'temperature')).toBeCloseTo(295.15, 10);
  });
  it('gauge pressures: absolute = gauge + barometric (definition of gauge pressure); refused without a barometer', () => {
    const psi = 6894.757293168; // lb x g_n / in^2, exact chain of definitions
    expect(parseQuantity('15 psig', 'pressure', {}, { barometricPa: 101325 })).toBeCloseTo(
      15 * psi + 101325,
      6,
    );
    expect(parseQuantity('1.2 barg', 'pressure', {}, { barometricPa: 100000 })).toBeCloseTo(220000, 6);
    expect(parseQuantity('1.2 bar(g)', 'pressure', {}, { barometricPa: 100000 })).toBeCloseTo(220000, 6);
    expect(parseQuantity('29.7 psia', 'pressure')).toBeCloseTo(29.7 * psi, 6);
    expect(parseQuantity('2 bar(a)', 'pressure')).toBe(2e5);
    const r = refusal(() => parseQuantity('15 psig', 'pressure', { field: '--pressure' }));
    expect(r.code).toBe('needs-barometer');
    expect(r.text).toMatch(/--pressure.*gauge pressure.*--barometer/);
    expect(refusal(() => parseQuantity('15 psig', 'volume')).code).toBe('wrong-dimension');
  });
  it('inherited object names are no units', () => {
    expect(refusal(() => parseQuantity('1 constructor', 'pressure')).code).toMatch(
      /bad-quantity|wrong-dimension/,
    );
    expect(refusal(() => parseQuantity('1 toString', 'pressure')).code).toMatch(
      /bad-quantity|wrong-dimension/,
    );
  });
  it('numbers in messages: six significant digits, no float noise', () => {
    expect(formatNumber(1000.0000000000001)).toBe('1000');
    expect(formatNumber(205050)).toBe('205050');
    expect(formatNumber(2.0505e17)).toBe('2.0505e17');
    expect(formatNumber(99999999999)).toBe('99999999999');
    expect(formatNumber(1.5e-7)).toBe('1.5e-7');
    expect(formatNumber(Number.NaN)).toBe('not a number');
    expect(formatNumber(-666.6118421052631)).toBe('-666.612');
  });
});

describe('YAML: aliases', () => {
  it('an alias bomb is refused before it expands', () => {
    const bomb = [
      'a: &a [1,1,1,1,1,1,1,1,1]',
      'b: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]',
      'c: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]',
      'd: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]',
      'e: [*d,*d,*d,*d,*d,*d,*d,*d,*d]',
    ].join('\n');
    const r = refusal(() => parseYamlText(bomb, 'bomb.yaml'));
    expect(r.code).toBe('yaml-syntax');
    expect(r.text).toContain('aliases');
  });
  it('an alias without its anchor is refused, naming the alias', () => {
    const r = refusal(() => parseYamlText('id: x\ntank: *nope\n', 'u.yaml'));
    expect(r.code).toBe('yaml-syntax');
    expect(r.text).toContain('*nope');
  });
  it('an ordinary anchor and alias still work', () => {
    expect(parseYamlText('a: &x 5\nb: *x\n', 'ok.yaml').data).toEqual({ a: 5, b: 5 });
  });
});

describe('schema messages in our words', () => {
  const base = { id: 'x', tank: 'MT-1', pressure: '1000 Torr', temperature: '25 degC' };
  const locate = () => ({ file: 'r.yaml' });
  it('a misspelled key beside the missing one: both named, with the suggestion', () => {
    const r = refusal(() =>
      validateRecipeObject({ ...base, mixture: { fuel: 'CH4', oxidiser: 'O2', phi: 1 } }, 'r.yaml', locate),
    );
    expect(r.text).toMatch(
      /mixture.oxidizer: this required field is missing.*"oxidiser".*did you mean "oxidizer"\?/,
    );
  });
  it('a bare number for a quantity: says a unit is needed, with an example', () => {
    const r = refusal(() =>
      validateRecipeObject({ ...base, pressure: 1500, mixture: { fractions: 'Ar' } }, 'r.yaml', locate),
    );
    expect(r.text).toMatch(
      /pressure: the value is the bare number 1500; it needs a unit .*e\.g\. "1000 Torr"/,
    );
    expect(r.text).not.toMatch(/Invalid input|expected string/);
  });
  it('a number out of range: the allowed range in plain words', () => {
    const r = refusal(() =>
      validateRecipeObject(
        { ...base, mixture: { fractions: 'Ar' }, tolerance: { relative: 5 } },
        'r.yaml',
        locate,
      ),
    );
    expect(r.text).toMatch(/tolerance.relative: the value 5 is too large; the allowed range is at most 0.5/);
  });
});

describe('designs and names at the edge', () => {
  it('phi outside 0.001-1000 is refused with the range (phi 1e300 used to hang)', () => {
    for (const phi of [1e300, 1e-300, 1e30, 1001]) {
      const r = refusal(() =>
        designMixture({
          kind: 'phi',
          fuel: { CH4: 1 },
          oxidizer: { O2: 1 },
          diluent: {},
          phi,
          basis: { kind: 'dilution', value: 0 },
        }),
      );
      expect(r.code).toBe('out-of-range');
      expect(r.text).toContain('0.001 to 1000');
    }
  });
  it('a trace below 1 ppb is refused (it cannot be metered by partial pressure)', () => {
    const r = refusal(() => designMixture({ kind: 'fractions', fractions: { CH4: 1e-300, Ar: 1 } }));
    expect(r.text).toContain('1 ppb');
  });
  it('a species name longer than 64 characters is refused before any edit-distance hint (whose cost grows with the square of the length)', () => {
    const r = refusal(() => getSpecies('x'.repeat(100000)));
    expect(r.code).toBe('name-too-long');
    expect(getSpecies('methane').key).toBe('CH4');
  });
});
