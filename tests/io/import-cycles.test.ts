// No module of src/ imports itself back through others (value imports; `import type` is erased).
// check.ts, premix-check.ts and check-csv.ts did: a log's re-check and a premix log's re-check call
// each other, so their shared basis lives in log-recheck.ts and the premix logs come in as a function.
import { readdirSync, readFileSync, existsSync } from 'node:fs';
import { dirname, join, normalize } from 'node:path';
import { describe, expect, it } from 'vitest';

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? files(join(dir, e.name)) : /\.tsx?$/.test(e.name) ? [join(dir, e.name)] : [],
  );
}

/** the modules a file imports or re-exports by value, as paths */
function valueImports(file: string, text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/^(?:import|export)\s+(type\s+)?[^;]*?from\s+'(\.[^']+)'/gms)) {
    if (m[1]) continue;
    const ts = normalize(join(dirname(file), m[2])).replace(/\.js$/, '.ts');
    out.push(existsSync(ts) ? ts : ts.replace(/\.ts$/, '.tsx'));
  }
  return out;
}

/** the strongly connected groups of more than one module (Tarjan) */
function importCycles(graph: ReadonlyMap<string, readonly string[]>): string[][] {
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const cycles: string[][] = [];
  let n = 0;
  const visit = (v: string) => {
    index.set(v, n);
    low.set(v, n++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!graph.has(w)) continue;
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, index.get(w)!));
    }
    if (low.get(v) === index.get(v)) {
      const group: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        group.push(w);
      } while (w !== v);
      if (group.length > 1) cycles.push(group.sort());
    }
  };
  for (const v of graph.keys()) if (!index.has(v)) visit(v);
  return cycles;
}

describe('import cycles', () => {
  it('src/ has none (check.ts, premix-check.ts and check-csv.ts were one)', () => {
    const graph = new Map(files('src').map((f) => [f, valueImports(f, readFileSync(f, 'utf8'))]));
    expect(importCycles(graph)).toEqual([]);
  });

  it('the cycle search finds a cycle (it can fail)', () => {
    const graph = new Map([
      ['a', ['b']],
      ['b', ['c']],
      ['c', ['a']],
      ['d', ['a']],
    ]);
    expect(importCycles(graph)).toEqual([['a', 'b', 'c']]);
  });
});
