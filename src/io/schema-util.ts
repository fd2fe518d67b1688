/** Turn zod issues into our Problems, with file, line and field. */
import type { z } from 'zod';
import { fail, type FieldIssue, type ShownValue } from '../core/index.js';
import type { YamlSource } from './yaml-file.js';

export function fieldName(path: readonly PropertyKey[]): string {
  return path
    .map((p) => (typeof p === 'number' ? `[${p}]` : String(p)))
    .join('.')
    .replace(/\.\[/g, '[');
}

/** validate data against a schema; on failure raise one Problem naming the first issue's place */
function depth(issues: readonly z.core.$ZodIssue[]): number {
  const i = issues[0];
  // an unknown key means the form was wrong, not that a field inside it was
  return i.code === 'unrecognized_keys' ? 0 : i.path.length + 1;
}

/** how far apart two short words are (for "did you mean" on a misspelled key) */
function distance(a: string, b: string): number {
  if (Math.abs(a.length - b.length) > 3) return 99;
  const d = Array.from({ length: a.length + 1 }, (_, i) => [i, ...Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++)
    for (let j = 1; j <= b.length; j++)
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  return d[a.length][b.length];
}

/** the allowed key closest to a misspelled one, if it is close */
export function closestKey(key: string, allowed: readonly string[]): string | undefined {
  if (key.length > 64) return undefined;
  const k = key.toLowerCase();
  const best = allowed.map((a) => ({ a, d: distance(k, a.toLowerCase()) })).sort((x, y) => x.d - y.d)[0];
  return best && best.d <= Math.max(1, Math.floor(k.length / 3)) ? best.a : undefined;
}

/** a value as a message shows it: short, a number as it is */
function shown(v: unknown): ShownValue {
  if (typeof v === 'number') return { type: 'number', value: v };
  if (typeof v === 'string') return { type: 'text', value: v.length > 40 ? `${v.slice(0, 40)}...` : v };
  if (v === null) return { type: 'null' };
  if (Array.isArray(v)) return { type: 'list' };
  if (typeof v === 'object') return { type: 'map' };
  return { type: 'other', value: String(v) };
}

/** what is wrong with the field, as a typed issue (worded by describeProblem) */
function issueOf(issue: z.core.$ZodIssue, hint: string | undefined): FieldIssue {
  const input = (issue as { input?: unknown }).input;
  switch (issue.code) {
    case 'invalid_type':
      if (input === undefined) return { kind: 'missing', hint };
      if (
        issue.expected === 'string' &&
        typeof input === 'number' &&
        hint &&
        /a number and a unit/.test(hint)
      )
        return { kind: 'bare-number', value: input, hint };
      return { kind: 'wrong-type', expected: issue.expected, got: shown(input), hint };
    case 'too_big':
      return {
        kind: 'too-large',
        got: shown(input),
        limit: Number(issue.maximum),
        inclusive: Boolean(issue.inclusive),
        hint,
      };
    case 'too_small':
      if (issue.origin === 'string' || issue.origin === 'array') return { kind: 'empty', hint };
      return {
        kind: 'too-small',
        got: shown(input),
        limit: Number(issue.minimum),
        inclusive: Boolean(issue.inclusive),
        hint,
      };
    case 'invalid_value':
      return { kind: 'not-a-choice', got: shown(input), choices: issue.values.map((v) => String(v)) };
    case 'invalid_union':
      return { kind: 'no-form' };
    default:
      return { kind: 'library', message: issue.message };
  }
}

export function validate<T>(
  schema: z.ZodType<T>,
  src: YamlSource,
  allowedKeysAt: (path: readonly PropertyKey[]) => readonly string[],
): T {
  const r = schema.safeParse(src.data, { reportInput: true });
  if (r.success) return r.data;
  let issue: z.core.$ZodIssue = r.error.issues[0];
  let prefix: PropertyKey[] = [];
  // every level of issues passed on the way down, with the path it is relative to
  const levels: { prefix: PropertyKey[]; issues: readonly z.core.$ZodIssue[] }[] = [
    { prefix: [], issues: r.error.issues },
  ];
  // a union (two forms of the mixture, a string or a map): follow the branch that got furthest
  while (issue.code === 'invalid_union' && issue.errors.length) {
    const branches = issue.errors.filter((b) => b.length > 0);
    const best = branches.sort((a, b) => depth(b) - depth(a) || a.length - b.length)[0];
    if (!best || depth(best) === 0) break;
    prefix = [...prefix, ...issue.path];
    issue = best[0];
    levels.push({ prefix, issues: best });
  }
  const fullPath = [...prefix, ...issue.path];
  const path = fullPath.filter((p): p is string | number => typeof p !== 'symbol');
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0];
    const where = src.locate(path, key);
    return fail(
      { code: 'unknown-key', key, allowed: allowedKeysAt(path) },
      { ...where, field: fieldName([...path, key]) },
    );
  }
  const where = src.locate(path);
  // the field as the user knows it: the option (--tolerance) on the command line, the key path in a file
  const field = where.field ?? (fieldName(path) || '(top level)');
  let fieldIssue = issueOf(issue, hintAt(schema, path));
  // a missing field next to an unknown key is most often a misspelling: name both
  if (fieldIssue.kind === 'missing') {
    const parent = fullPath.slice(0, -1);
    const same = (a: readonly PropertyKey[]) =>
      a.length === parent.length && a.every((p, k) => p === parent[k]);
    const keys = levels.flatMap((l) =>
      l.issues
        .filter((i) => i.code === 'unrecognized_keys' && same([...l.prefix, ...i.path]))
        .flatMap((i) => (i.code === 'unrecognized_keys' ? i.keys : [])),
    );
    if (keys.length) {
      const wanted = String(path[path.length - 1]);
      const close = keys.find((k) => closestKey(k, [wanted]) !== undefined);
      fieldIssue = close
        ? { ...fieldIssue, misspelled: { key: close, wanted } }
        : { ...fieldIssue, unknown: { key: keys[0], allowed: allowedKeysAt(path.slice(0, -1)) } };
    }
  }
  return fail(
    { code: 'invalid-field', field, issue: fieldIssue },
    { ...where, field: where.field ?? fieldName(path) },
  );
}

interface AnyDef {
  type: string;
  innerType?: ZodLike;
  shape?: Record<string, ZodLike>;
  element?: ZodLike;
  options?: ZodLike[];
  in?: ZodLike;
}
interface ZodLike {
  def: AnyDef;
}

function unwrap(s: ZodLike): ZodLike {
  let cur = s;
  for (let i = 0; i < 10; i++) {
    const d = cur.def;
    if (d.innerType) cur = d.innerType;
    else if (d.type === 'pipe' && d.in) cur = d.in;
    else break;
  }
  return cur;
}

function objectsOf(s: ZodLike): ZodLike[] {
  const u = unwrap(s);
  if (u.def.type === 'object') return [u];
  if (u.def.type === 'union' && u.def.options) return u.def.options.flatMap(objectsOf);
  return [];
}

/** the schemas a data path can lead to (through objects, unions and arrays) */
function schemasAt(schema: z.ZodType, path: readonly PropertyKey[]): ZodLike[] {
  let cur: ZodLike[] = [schema as unknown as ZodLike];
  for (const p of path) {
    const next: ZodLike[] = [];
    for (const s of cur) {
      const u = unwrap(s);
      if (u.def.type === 'array' && u.def.element && typeof p === 'number') next.push(u.def.element);
      for (const o of objectsOf(u)) {
        const shape = o.def.shape;
        if (shape && Object.prototype.hasOwnProperty.call(shape, String(p))) next.push(shape[String(p)]);
      }
    }
    cur = next;
  }
  return cur;
}

/** the keys allowed by a schema at a data path (for "allowed here: ..." messages) */
export function keysAt(schema: z.ZodType, path: readonly PropertyKey[]): string[] {
  const cur = schemasAt(schema, path);
  return [...new Set(cur.flatMap(objectsOf).flatMap((o) => Object.keys(o.def.shape ?? {})))];
}

/** the description of the field at a data path (its unit and example), for messages */
export function hintAt(schema: z.ZodType, path: readonly PropertyKey[]): string | undefined {
  const cur = schemasAt(schema, path);
  for (const s of cur) {
    const d =
      (s as unknown as { description?: string }).description ??
      (unwrap(s) as unknown as { description?: string }).description;
    if (d) return d;
  }
  return undefined;
}
