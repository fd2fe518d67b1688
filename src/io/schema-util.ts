/** Turn zod issues into our Problems, with file, line and field. */
import type { z } from 'zod';
import { fail } from '../core/index.js';
import type { YamlSource } from './yaml-file.js';

export function fieldName(path: readonly PropertyKey[]): string {
  return path.map((p) => (typeof p === 'number' ? `[${p}]` : String(p))).join('.').replace(/\.\[/g, '[');
}

/** validate data against a schema; on failure raise one Problem naming the first issue's place */
function depth(issues: readonly z.core.$ZodIssue[]): number {
  const i = issues[0];
  // an unknown key means the form was wrong, not that a field inside it was
  return i.code === 'unrecognized_keys' ? 0 : i.path.length + 1;
}

export function validate<T>(schema: z.ZodType<T>, src: YamlSource, allowedKeysAt: (path: readonly PropertyKey[]) => readonly string[]): T {
  const r = schema.safeParse(src.data);
  if (r.success) return r.data;
  let issue: z.core.$ZodIssue = r.error.issues[0];
  let prefix: PropertyKey[] = [];
  // a union (two forms of the mixture, a string or a map): follow the branch that got furthest
  while (issue.code === 'invalid_union' && issue.errors.length) {
    const branches = issue.errors.filter((b) => b.length > 0);
    const best = branches.sort((a, b) => depth(b) - depth(a) || a.length - b.length)[0];
    if (!best || depth(best) === 0) break;
    prefix = [...prefix, ...issue.path];
    issue = best[0];
  }
  const fullPath = [...prefix, ...issue.path];
  const path = fullPath.filter((p): p is string | number => typeof p !== 'symbol');
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0];
    const where = src.locate(path, key);
    return fail({ code: 'unknown-key', key, allowed: allowedKeysAt(path) }, { ...where, field: fieldName([...path, key]) });
  }
  const where = src.locate(path);
  const field = fieldName(path) || '(top level)';
  let reason = issue.message;
  if (issue.code === 'invalid_type' && reason.includes('received undefined')) reason = `the required field "${field}" is missing`;
  else if (issue.code === 'invalid_union') reason = `${field} has neither accepted form; see \`mixwright schema recipe\``;
  return fail({ code: 'schema', reason }, { ...where, field });
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

/** the keys allowed by a schema at a data path (for "allowed here: ..." messages) */
export function keysAt(schema: z.ZodType, path: readonly PropertyKey[]): string[] {
  let cur: ZodLike[] = [schema as unknown as ZodLike];
  for (const p of path) {
    const next: ZodLike[] = [];
    for (const s of cur) {
      const u = unwrap(s);
      if (u.def.type === 'array' && u.def.element && typeof p === 'number') next.push(u.def.element);
      for (const o of objectsOf(u)) {
        const child = o.def.shape?.[String(p)];
        if (child) next.push(child);
      }
    }
    cur = next;
  }
  return [...new Set(cur.flatMap(objectsOf).flatMap((o) => Object.keys(o.def.shape ?? {})))];
}
