/**
 * Reads and parses the `Example:` lines of the doc comments under src/core, for
 * tests/core/examples.test.ts. The grammar is small and strict: anything it does not
 * know is an error naming the file and line, so no example can be skipped silently.
 *
 *   Example: CALL -> EXPECTED (REFERENCE)
 *
 *   CALL      name(ARG, ...) optionally followed by .path (a field of the result)
 *   ARG       a number or arithmetic on numbers (+ - * / and parentheses: 150 * 133.322368),
 *             'a string', true, false, [ARG, ...], { key: ARG, ... } (keys bare or quoted),
 *             or a nested call name(ARG, ...) of an export of src/core/index.ts.
 *             Arguments are in the function's own units (SI).
 *   EXPECTED  VALUE, or { path: VALUE, ... } for several fields of the result
 *             (path: field names and indices joined by dots, e.g. gas.H2O, 0.fuel)
 *   VALUE     a number with an optional unit from UNITS (565.7 K, -393.5 kJ/mol, 2.06e-5 m2/s),
 *             true, false, undefined or 'a string'
 *   REFERENCE required: the outside reference the value was checked against
 *
 * The tolerance of a number is half a unit in its last written digit, in its stated unit
 * ("565.7 K" -> 0.05 K; "2.04e3 K" -> 5 K; "262" -> 0.5): write only the digits that hold.
 * The example may run over several comment lines; it ends with the reference's closing
 * parenthesis, and prose may follow it.
 */

/** SI factor of each unit an expected value may carry (the result is in SI) */
export const UNITS: Readonly<Record<string, number>> = {
  K: 1,
  Pa: 1,
  kPa: 1e3,
  MPa: 1e6,
  bar: 1e5,
  atm: 101325,
  Torr: 101325 / 760,
  'J/(mol K)': 1,
  'J/mol': 1,
  'kJ/mol': 1e3,
  'kg/mol': 1,
  'g/mol': 1e-3,
  'm3/mol': 1,
  'cm3/mol': 1e-6,
  'm2/s': 1,
  'cm2/s': 1e-4,
  'm/s': 1,
  s: 1,
  min: 60,
  '%': 0.01,
};

export type Arg = number | string | boolean | Arg[] | { [key: string]: Arg } | CallArg;
/** a nested call name(args) inside the arguments */
export class CallArg {
  constructor(
    readonly call: string,
    readonly args: readonly Arg[],
  ) {}
}
export type Expected =
  | {
      readonly kind: 'number';
      /** in SI */
      readonly value: number;
      /** in SI: half a unit of the last written digit */
      readonly tolerance: number;
      /** as written, and the tolerance in the written unit */
      readonly text: string;
      readonly toleranceText: string;
    }
  | { readonly kind: 'literal'; readonly value: string | boolean | undefined; readonly text: string };

export interface Example {
  readonly file: string;
  readonly line: number;
  readonly text: string;
  readonly fn: string;
  readonly args: readonly Arg[];
  /** path into the result of the call (empty: the result itself) */
  readonly resultPath: readonly string[];
  /** each checked field: its path below resultPath, and the stated value */
  readonly checks: readonly { readonly path: readonly string[]; readonly expected: Expected }[];
  readonly reference: string;
}

export class ExampleError extends Error {}

/** one `Example` occurrence in a comment: where it is and its text (continuation lines joined) */
export interface RawExample {
  readonly file: string;
  readonly line: number;
  readonly text: string;
  /** the source lines after the comment that holds it (to see which declaration it documents) */
  readonly following: readonly string[];
}

const COMMENT_LINE = /^\s*(\/\*\*?|\*(?!\/)|\/\/)/;

/** every comment line of `source` that names an Example, with its continuation lines */
export function findExamples(file: string, source: string): RawExample[] {
  const lines = source.split('\n');
  const out: RawExample[] = [];
  for (let i = 0; i < lines.length; i++) {
    if (!COMMENT_LINE.test(lines[i])) continue;
    const at = lines[i].search(/\bExample\b/);
    if (at < 0) continue;
    const parts = [lines[i].slice(at)];
    let j = i;
    while (!lines[j].includes('*/') && j + 1 < lines.length && /^\s*\*(?!\/)/.test(lines[j + 1])) {
      j++;
      parts.push(lines[j].replace(/^\s*\*/, ''));
    }
    while (j < lines.length && !lines[j].includes('*/') && !/^\s*\/\//.test(lines[j])) j++;
    const text = parts
      .map((p) => p.replace(/\*\/.*$/, '').trim())
      .join(' ')
      .trim();
    const following = lines.slice(j + 1, j + 4);
    out.push({ file, line: i + 1, text, following });
  }
  return out;
}

class Parser {
  private pos = 0;
  constructor(
    private readonly s: string,
    private readonly where: string,
  ) {}

  fail(what: string): never {
    throw new ExampleError(
      `${this.where}: ${what} at "${this.s.slice(this.pos, this.pos + 30)}" (grammar: tests/core/doc-examples.ts)`,
    );
  }
  ws(): void {
    while (this.pos < this.s.length && /\s/.test(this.s[this.pos])) this.pos++;
  }
  peek(t: string): boolean {
    this.ws();
    return this.s.startsWith(t, this.pos);
  }
  eat(t: string): void {
    if (!this.peek(t)) this.fail(`expected "${t}"`);
    this.pos += t.length;
  }
  rest(): string {
    return this.s.slice(this.pos);
  }
  ident(): string {
    this.ws();
    const m = /^[A-Za-z_][A-Za-z0-9_]*/.exec(this.rest());
    if (!m) this.fail('expected a name');
    this.pos += m[0].length;
    return m[0];
  }
  string(): string {
    this.ws();
    const q = this.s[this.pos];
    if (q !== "'" && q !== '"') this.fail('expected a quoted string');
    const end = this.s.indexOf(q, this.pos + 1);
    if (end < 0) this.fail('unterminated string');
    const v = this.s.slice(this.pos + 1, end);
    this.pos = end + 1;
    return v;
  }
  numberToken(): string {
    this.ws();
    const m = /^-?\d+(\.\d+)?(e[+-]?\d+)?/.exec(this.rest());
    if (!m) this.fail('expected a number');
    this.pos += m[0].length;
    return m[0];
  }

  // ARG
  value(): Arg {
    this.ws();
    const c = this.s[this.pos];
    if (c === "'" || c === '"') return this.string();
    if (c === '{') return this.object(() => this.value());
    if (c === '[') {
      this.eat('[');
      const items: Arg[] = [];
      while (!this.peek(']')) {
        items.push(this.value());
        if (!this.peek(']')) this.eat(',');
      }
      this.eat(']');
      return items;
    }
    if (/^(true|false)\b/.test(this.rest())) return this.ident() === 'true';
    if (/^[A-Za-z_]/.test(c ?? '')) {
      const name = this.ident();
      this.eat('(');
      return new CallArg(name, this.args());
    }
    return this.sum();
  }
  /** arguments up to and including the closing parenthesis */
  args(): Arg[] {
    const out: Arg[] = [];
    while (!this.peek(')')) {
      out.push(this.value());
      if (!this.peek(')')) this.eat(',');
    }
    this.eat(')');
    return out;
  }
  object<T>(item: () => T): { [key: string]: T } {
    this.eat('{');
    const o: { [key: string]: T } = {};
    while (!this.peek('}')) {
      const key = this.key();
      if (key in o) this.fail(`key "${key}" given twice`);
      this.eat(':');
      o[key] = item();
      if (!this.peek('}')) this.eat(',');
    }
    this.eat('}');
    return o;
  }
  key(): string {
    this.ws();
    const c = this.s[this.pos];
    if (c === "'" || c === '"') return this.string();
    const m = /^[A-Za-z0-9_]+(\.[A-Za-z0-9_]+)*/.exec(this.rest());
    if (!m) this.fail('expected a key');
    this.pos += m[0].length;
    return m[0];
  }
  sum(): number {
    let v = this.product();
    for (;;) {
      if (this.peek('+')) {
        this.eat('+');
        v += this.product();
      } else if (this.peek('-') && !this.peek('->')) {
        this.eat('-');
        v -= this.product();
      } else return v;
    }
  }
  product(): number {
    let v = this.factor();
    for (;;) {
      if (this.peek('*')) {
        this.eat('*');
        v *= this.factor();
      } else if (this.peek('/')) {
        this.eat('/');
        v /= this.factor();
      } else return v;
    }
  }
  factor(): number {
    if (this.peek('(')) {
      this.eat('(');
      const v = this.sum();
      this.eat(')');
      return v;
    }
    if (this.peek('-')) {
      this.eat('-');
      return -this.factor();
    }
    return Number(this.numberToken());
  }

  // EXPECTED
  expectedValue(): Expected {
    this.ws();
    const start = this.pos;
    const c = this.s[this.pos];
    if (c === "'" || c === '"') {
      const v = this.string();
      return { kind: 'literal', value: v, text: this.s.slice(start, this.pos) };
    }
    const word = /^(true|false|undefined)\b/.exec(this.rest());
    if (word) {
      this.pos += word[0].length;
      const value = word[0] === 'undefined' ? undefined : word[0] === 'true';
      return { kind: 'literal', value, text: word[0] };
    }
    const num = this.numberToken();
    const m = /^(-?)(\d+)(?:\.(\d+))?(?:e([+-]?\d+))?$/.exec(num)!;
    const decimals = m[3]?.length ?? 0;
    const exponent = Number(m[4] ?? 0);
    let factor = 1;
    let unit = '';
    if (this.s[this.pos] === ' ') {
      const after = this.s.slice(this.pos + 1);
      const found = Object.keys(UNITS)
        .sort((a, b) => b.length - a.length)
        .find((u) => after.startsWith(u) && /^($|[\s,}])/.test(after.slice(u.length)));
      if (found) {
        unit = found;
        factor = UNITS[found];
        this.pos += 1 + found.length;
      }
    }
    const half = 0.5 * 10 ** (exponent - decimals);
    const text = unit ? `${num} ${unit}` : num;
    const toleranceText = `±${Number(half.toPrecision(6))}${unit ? ` ${unit}` : ''}`;
    return { kind: 'number', value: Number(num) * factor, tolerance: half * factor, text, toleranceText };
  }
  path(): string[] {
    return this.key().split('.');
  }
  reference(): string {
    this.eat('(');
    let depth = 1;
    const start = this.pos;
    while (this.pos < this.s.length && depth > 0) {
      if (this.s[this.pos] === '(') depth++;
      if (this.s[this.pos] === ')') depth--;
      this.pos++;
    }
    if (depth > 0) this.fail('the reference in parentheses is not closed');
    const ref = this.s.slice(start, this.pos - 1).trim();
    if (!ref) this.fail('the reference in parentheses is empty');
    return ref;
  }
}

/** parse one example; throws ExampleError naming file and line */
export function parseExample(raw: RawExample): Example {
  const where = `${raw.file}:${raw.line}`;
  if (!raw.text.startsWith('Example:'))
    throw new ExampleError(
      `${where}: an example is written "Example: call -> value (reference)": ${raw.text}`,
    );
  const p = new Parser(raw.text.slice('Example:'.length), where);
  const fn = p.ident();
  p.eat('(');
  const args = p.args();
  const resultPath: string[] = [];
  while (p.peek('.')) {
    p.eat('.');
    resultPath.push(...p.path());
  }
  p.eat('->');
  const checks: { path: string[]; expected: Expected }[] = [];
  if (p.peek('{')) {
    const o = p.object(() => p.expectedValue());
    for (const [k, e] of Object.entries(o)) checks.push({ path: k.split('.'), expected: e });
    if (!checks.length) p.fail('no value to check');
  } else checks.push({ path: [], expected: p.expectedValue() });
  if (!p.peek('(')) p.fail('the value must be followed by its outside reference in parentheses');
  const reference = p.reference();
  return { file: raw.file, line: raw.line, text: raw.text, fn, args, resultPath, checks, reference };
}

/** the value at `path` inside `v` (field names and array indices) */
export function at(v: unknown, path: readonly string[]): unknown {
  let cur = v;
  for (const k of path) {
    if (cur === null || cur === undefined || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[k];
  }
  return cur;
}

/** evaluate an argument: nested calls go to `lib` (the exports of src/core/index.ts) */
export function evaluate(a: Arg, lib: Record<string, unknown>, where: string): unknown {
  if (Array.isArray(a)) return a.map((x) => evaluate(x, lib, where));
  if (a instanceof CallArg) {
    const f = lib[a.call];
    if (typeof f !== 'function')
      throw new ExampleError(`${where}: ${a.call} is no function of src/core/index.ts`);
    return f(...a.args.map((x) => evaluate(x, lib, where)));
  }
  if (a !== null && typeof a === 'object') {
    return Object.fromEntries(Object.entries(a).map(([k, v]) => [k, evaluate(v as Arg, lib, where)]));
  }
  return a;
}
