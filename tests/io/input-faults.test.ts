/**
 * Input faults that reassured falsely or confused: an implausible tank or reactor volume, a
 * quantity of the wrong kind without an example, a duplicate lab id naming one line only, and
 * the two ways a write failure's cause is worded (one function). Exact problems asserted.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describeProblem, ProblemError, type Problem, type Where } from '../../src/core/index.js';
import { buildPlanRequest, loadLab, readRecipe } from '../../src/io/load.js';
import { parseQuantity, PLAUSIBLE_VOLUME_M3 } from '../../src/io/quantity.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';
import { ShortWriteError, writeCauseOf } from '../../src/io/atomic.js';
import { mergeOptions } from '../../src/cli/design-options.js';
import { runCli } from '../helpers.js';

const dir = mkdtempSync(join(tmpdir(), 'mw-faults-'));
function refused(f: () => unknown): { problem: Problem; where: Where } {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return { problem: e.problem, where: e.where };
    throw e;
  }
  throw new Error('not refused');
}
const labFile = (text: string) => {
  const f = join(dir, `lab${Math.random().toString(36).slice(2)}.yaml`);
  writeFileSync(f, text);
  return f;
};
/** the 1-based line of the first occurrence of `needle` in a text */
const lineOf = (text: string, needle: string) => text.slice(0, text.indexOf(needle)).split('\n').length;

describe('implausible volumes are refused with the range and why', () => {
  it('--volume "1e9 L" (1e6 m^3, inside the physical window) is refused as a lab tank', () => {
    const r = refused(() =>
      buildPlanRequest(mergeOptions(readRecipe('recipes/ch4-o2-ar-phi1.yaml'), { volume: '1e9 L' })),
    );
    expect(r.problem).toEqual({
      code: 'out-of-range',
      what: 'tank volume',
      value: 1e6,
      text: '1e9 L',
      allowed: PLAUSIBLE_VOLUME_M3.text,
    });
    expect(r.where).toEqual({ field: '--volume' });
    expect(describeProblem(r.problem)).toBe(
      'tank volume = "1e9 L" is outside the allowed range 1 mL to 10 m^3 (10000 L), the sizes of lab ' +
        'mixing tanks and reactors (our limit, so that a slip of unit or exponent is caught); check the ' +
        'number and the unit',
    );
  });
  it('the edges: 1 mL and 10 m^3 are accepted, 0.5 mL and 10001 L refused', () => {
    const plan = (volume: string) =>
      buildPlanRequest(mergeOptions(readRecipe('recipes/ch4-o2-ar-phi1.yaml'), { volume }));
    expect(plan('1 mL').input.tank.volumeM3).toBeCloseTo(1e-6, 15);
    expect(plan('10 m^3').input.tank.volumeM3).toBe(10);
    expect(refused(() => plan('0.5 mL')).problem).toMatchObject({ code: 'out-of-range', text: '0.5 mL' });
    expect(refused(() => plan('10001 L')).problem).toMatchObject({ code: 'out-of-range', text: '10001 L' });
  });
  it('a lab tank and a lab reactor of 1e9 L: refused at their line', () => {
    const tankText = DEMO_LAB_YAML.replace('volume: 10.0 L', 'volume: 1e9 L');
    const t = refused(() => loadLab(labFile(tankText)));
    expect(t.problem).toEqual({
      code: 'out-of-range',
      what: 'volume of tank MT-1',
      value: 1e6,
      text: '1e9 L',
      allowed: PLAUSIBLE_VOLUME_M3.text,
    });
    expect(t.where).toMatchObject({ line: lineOf(tankText, 'volume: 1e9 L'), field: 'tanks[0].volume' });
    const reactorText = DEMO_LAB_YAML.replace('volume: 8.25 L', 'volume: 1e9 L');
    const r = refused(() => loadLab(labFile(reactorText)));
    expect(r.problem).toMatchObject({ code: 'out-of-range', what: 'volume of reactor ST-A', text: '1e9 L' });
    expect(r.where).toMatchObject({
      line: lineOf(reactorText, 'volume: 1e9 L'),
      field: 'reactors[0].volume',
    });
  });
  it('--reactor-volume "1e9 L": refused as the reactor volume', async () => {
    const r = await runCli(['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--reactor-volume', '1e9 L']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      '--reactor-volume: reactor volume = "1e9 L" is outside the allowed range 1 mL',
    );
  });
});

describe('a quantity of the wrong kind gets an example of the accepted form', () => {
  it('"1500 Torr" as a temperature: wrong-dimension, with temperature examples', () => {
    const r = refused(() => parseQuantity('1500 Torr', 'temperature'));
    expect(r.problem).toEqual({
      code: 'wrong-dimension',
      text: '1500 Torr',
      expected: 'temperature',
      got: 'pressure',
    });
    expect(describeProblem(r.problem)).toBe(
      '"1500 Torr" is a pressure, but a temperature is needed here; give a number and a temperature unit, ' +
        'e.g. "22 degC", "22 °C", "71.6 degF" or "295.15 K"',
    );
  });
  it('"1500 C" and "1500 deg C": what C is to a unit library, and what to write', () => {
    expect(describeProblem(refused(() => parseQuantity('1500 C', 'temperature')).problem)).toContain(
      'Write "1500 degC" or "1500 °C"',
    );
    const r = refused(() => parseQuantity('1500 deg C', 'temperature'));
    expect(r.problem).toEqual({
      code: 'bad-quantity',
      text: '1500 deg C',
      expected: 'temperature',
      fault: {
        kind: 'ambiguous-unit',
        unit: 'deg C',
        means: 'two words, not a unit',
        meant: 'degC',
        number: '1500',
      },
    });
    expect(describeProblem(r.problem)).toContain('did you mean degC? Write "1500 degC" or "1500 °C"');
  });
  it('a length given as a volume gets a length example, not a pressure one', () => {
    const r = refused(() => parseQuantity('2 L', 'length'));
    expect(describeProblem(r.problem)).toBe(
      '"2 L" is a volume, but a length is needed here; give a number and a length unit, e.g. "0.32 m" or "320 mm"',
    );
  });
});

describe('a lab id used twice names both lines', () => {
  it('MT-2 renamed MT-1: the problem carries the first line and field, the message says both', () => {
    const text = DEMO_LAB_YAML.replace(/- id: MT-2\b/, '- id: MT-1');
    const f = labFile(text);
    const r = refused(() => loadLab(f));
    const first = lineOf(text, '- id: MT-1');
    const second = text.split('\n').findIndex((l, i) => i + 1 > first && l.includes('- id: MT-1')) + 1;
    expect(r.problem).toEqual({
      code: 'duplicate-id',
      id: 'MT-1',
      first: { line: first, field: 'tanks[0].id' },
    });
    expect(r.where).toMatchObject({ file: f, line: second, field: 'id' });
    expect(describeProblem(r.problem)).toBe(
      `the id "MT-1" is used twice (first at line ${first}, tanks[0].id, again here); ids of tanks, reactors, ` +
        'gauges and cylinders must be unique - rename one of them',
    );
  });
});

describe('one writeCauseOf for file writes and the batch log', () => {
  const enospc = Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
  it('the code inside the account (file writes) or after it (the batch log); the same typed cause otherwise', () => {
    expect(writeCauseOf(enospc)).toEqual({
      kind: 'system',
      errno: 'ENOSPC',
      message: 'the disk is full (ENOSPC); free some space and try again',
    });
    expect(writeCauseOf(enospc, 'after')).toEqual({
      kind: 'system',
      errno: 'ENOSPC',
      message: 'the disk is full; free some space and try again',
    });
    expect(describeProblem({ code: 'write-failed', cause: writeCauseOf(enospc, 'after') })).toBe(
      'not written: the disk is full; free some space and try again (ENOSPC)',
    );
    const other = Object.assign(new Error('cross-device link not permitted'), { code: 'EXDEV' });
    expect(writeCauseOf(other)).toMatchObject({ message: 'EXDEV: cross-device link not permitted' });
    expect(writeCauseOf(other, 'after')).toMatchObject({ message: 'cross-device link not permitted' });
    expect(writeCauseOf(new ShortWriteError(3, 10), 'after')).toEqual({
      kind: 'short-write',
      written: 3,
      expected: 10,
    });
    expect(writeCauseOf(new Error('odd'))).toEqual({
      kind: 'system',
      errno: 'no error code',
      message: 'odd',
    });
  });
});
