/**
 * Every `Example:` of a doc comment under src/core runs: the call is made on the module's
 * export, and the stated value is checked within half a unit of its last written digit
 * (the grammar and the tolerance rule: tests/core/doc-examples.ts). Each example names its
 * outside reference in the comment, in parentheses after the value; an example this test
 * cannot parse fails, naming its file and line.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';
import * as core from '../../src/core/index.js';
import {
  at,
  evaluate,
  ExampleError,
  findExamples,
  parseExample,
  type Example,
  type RawExample,
} from './doc-examples.js';

const CORE = join(import.meta.dirname, '../../src/core');

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sourceFiles(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : [],
  );
}

const files = sourceFiles(CORE).map((path) => ({
  path,
  name: `src/core/${relative(CORE, path)}`,
  source: readFileSync(path, 'utf8'),
}));
const raws: RawExample[] = files.flatMap((f) => findExamples(f.name, f.source));

function describeCheck(e: Example): string {
  const call = `${e.fn}(...)${e.resultPath.map((k) => `.${k}`).join('')}`;
  const values = e.checks.map(({ path, expected: x }) => {
    const name = path.length ? `${path.join('.')} ` : '';
    return x.kind === 'number' ? `${name}${x.text} ${x.toleranceText}` : `${name}${x.text}`;
  });
  return `${e.file}:${e.line} ${call} -> ${values.join(', ')}`;
}

async function run(e: Example): Promise<void> {
  const where = `${e.file}:${e.line}`;
  const file = files.find((f) => f.name === e.file)!;
  const mod = (await import(file.path)) as Record<string, unknown>;
  const fn = mod[e.fn];
  if (typeof fn !== 'function')
    throw new ExampleError(`${where}: ${e.fn} is no function exported by ${e.file}`);
  const lib = core as unknown as Record<string, unknown>;
  const result = at(fn(...e.args.map((a) => evaluate(a, lib, where))), e.resultPath);
  for (const { path, expected } of e.checks) {
    const actual = at(result, path);
    const what = `${where} ${[e.fn, ...e.resultPath, ...path].join('.')}`;
    if (expected.kind === 'literal') {
      expect(actual, what).toBe(expected.value);
      continue;
    }
    expect(typeof actual === 'number' && Number.isFinite(actual), `${what} is a finite number`).toBe(true);
    // 1e-9 relative slack: the tolerance itself is a decimal that binary floating point rounds
    const slack = expected.tolerance * (1 + 1e-9);
    expect(
      Math.abs((actual as number) - expected.value),
      `${what}: ${String(actual)} against ${expected.text} (SI ${expected.value})`,
    ).toBeLessThanOrEqual(slack);
  }
}

describe('doc-comment examples of src/core (each checked within half a unit of its last digit)', () => {
  it('the scan finds every "Example" written in src/core, and there are examples to check', () => {
    const written = files.reduce((n, f) => n + (f.source.match(/\bExample\b/g) ?? []).length, 0);
    expect(raws.length).toBe(written);
    expect(raws.length).toBeGreaterThanOrEqual(30);
  });
  for (const raw of raws) {
    let parsed: Example | undefined;
    let error: unknown;
    try {
      parsed = parseExample(raw);
    } catch (e) {
      error = e;
    }
    if (!parsed) {
      it(`${raw.file}:${raw.line} can be parsed`, () => {
        throw error;
      });
      continue;
    }
    const e = parsed;
    it(describeCheck(e), async () => {
      const documents = new RegExp(`^export (async )?(function|const) ${e.fn}\\b`);
      expect(
        raw.following.some((l) => documents.test(l)),
        `${e.file}:${e.line}: the example calls ${e.fn}, but the comment documents: ${raw.following[0]}`,
      ).toBe(true);
      await run(e);
    });
  }
});

describe('the example grammar refuses what it cannot check (tests/core/doc-examples.ts)', () => {
  const raw = (text: string): RawExample => ({ file: 'src/core/x.ts', line: 7, text, following: [] });
  for (const [why, text] of [
    ['prose instead of a call', 'Example: argon at 298.15 K gives -15.3 cm3/mol (ref).'],
    ['no reference', 'Example: f(1) -> 2 K'],
    ['an empty reference', 'Example: f(1) -> 2 K ()'],
    ['an unknown unit', 'Example: f(1) -> 2 furlongs (ref)'],
    ['words after the value', 'Example: f(1) -> about 2 K (ref)'],
    ['no arrow', 'Example: f(1) = 2 K (ref)'],
    ['an unclosed call', 'Example: f(1, {a: 2} -> 2 K (ref)'],
    ['a key given twice', "Example: f({a: 1, a: 2}) -> 'x' (ref)"],
    ['no colon', 'Example (a blend) f(1) -> 2 (ref)'],
  ] as const) {
    it(`fails on ${why}, naming file and line`, () => {
      expect(() => parseExample(raw(text))).toThrow(/^src\/core\/x\.ts:7: /);
    });
  }
  it('derives the tolerance from the digits: 565.7 K -> 0.05 K, 2.04e3 K -> 5 K, 2.51 % -> 5e-5, 262 -> 0.5', () => {
    const tol = (v: string) => {
      const x = parseExample(raw(`Example: f() -> ${v} (ref)`)).checks[0].expected;
      return x.kind === 'number' ? [x.value, x.tolerance] : [NaN, NaN];
    };
    expect(tol('565.7 K')[1]).toBeCloseTo(0.05, 12);
    expect(tol('2.04e3 K')).toEqual([2040, 5]);
    expect(tol('2.51 %')[0]).toBeCloseTo(0.0251, 12);
    expect(tol('2.51 %')[1]).toBeCloseTo(5e-5, 15);
    expect(tol('262')).toEqual([262, 0.5]);
    expect(tol('-15.55 cm3/mol')[0]).toBeCloseTo(-15.55e-6, 15);
    expect(tol('-15.55 cm3/mol')[1]).toBeCloseTo(5e-9, 18);
    expect(tol('8.799 atm')[1]).toBeCloseTo(0.0005 * 101325, 9);
    const x = parseExample(raw('Example: f() -> 1489 Torr (ref)')).checks[0].expected;
    expect(x.kind === 'number' && x.toleranceText).toBe('±0.5 Torr');
  });
  it('reads arithmetic, nested objects and arrays, quoted keys, a field path and several checked fields', () => {
    const e = parseExample(
      raw(
        "Example: f({ 'n-C7H16': 1 / 4, b: [1, -2e-3] }, 150 * (2 + 1), 'x').gas" +
          " -> { H2O: 0.645, 0.fuel: 'H2' } (r (a))",
      ),
    );
    expect(e.fn).toBe('f');
    expect(e.args).toEqual([{ 'n-C7H16': 0.25, b: [1, -0.002] }, 450, 'x']);
    expect(e.resultPath).toEqual(['gas']);
    expect(e.checks.map((c) => c.path)).toEqual([['H2O'], ['0', 'fuel']]);
    expect(e.reference).toBe('r (a)');
  });
  it('an example runs over comment lines and ends at its reference; a word "Example" in prose is found too', () => {
    const src = [
      '/**',
      ' * Something. Example: f(1,',
      ' *   2) -> 3 K (a handbook)',
      ' * and more prose.',
      ' */',
      'export function f() {}',
      '// Example of nothing',
    ].join('\n');
    const found = findExamples('src/core/y.ts', src);
    expect(found.map((r) => [r.line, r.text])).toEqual([
      [2, 'Example: f(1, 2) -> 3 K (a handbook) and more prose.'],
      [7, 'Example of nothing'],
    ]);
    expect(found[0].following[0]).toBe('export function f() {}');
    expect(parseExample(found[0]).reference).toBe('a handbook');
    expect(() => parseExample(found[1])).toThrow(ExampleError);
  });
});
