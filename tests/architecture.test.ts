import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';

// the dependency rule of the house: a pure core; shells reach it only through src/core/index.ts
function files(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? files(p) : /\.(ts|tsx)$/.test(n) ? [p] : [];
  });
}
const importsOf = (file: string) =>
  [...readFileSync(file, 'utf8').matchAll(/^\s*(?:import|export)[^'"]*from\s+['"]([^'"]+)['"]/gm)].map(
    (m) => m[1],
  );

describe('architecture', () => {
  it('src/core imports no node:*, process, commander, ink, react, mathjs, yaml or zod, and nothing outside src/core', () => {
    for (const f of files('src/core')) {
      const text = readFileSync(f, 'utf8');
      for (const spec of importsOf(f)) {
        expect(spec.startsWith('.'), `${f} imports ${spec}`).toBe(true);
        expect(spec.startsWith('../..'), `${f} imports ${spec}`).toBe(false);
      }
      expect(/\bprocess\./.test(text), `${f} uses process`).toBe(false);
    }
  });

  it('shells import the core only through src/core/index.ts', () => {
    for (const dir of ['src/io', 'src/report', 'src/cli', 'src/tui']) {
      if (!existsSync(dir)) continue;
      for (const f of files(dir)) {
        for (const spec of importsOf(f)) {
          if (!spec.includes('core/')) continue;
          const rel = relative('src', join(f, '..', spec)).replace(/\\/g, '/');
          expect(rel, `${f} imports ${spec}`).toBe('core/index.js');
        }
      }
    }
  });

  it('no renderer in src/report imports the file-handling shell src/io', () => {
    for (const f of files('src/report')) {
      for (const spec of importsOf(f)) {
        const rel = relative('src', join(f, '..', spec)).replace(/\\/g, '/');
        expect(rel.startsWith('io/'), `${f} imports ${spec}`).toBe(false);
      }
    }
  });

  it('zod is imported only by src/io/zod.ts, which configures it before any schema is built', () => {
    let configured = 0;
    for (const f of files('src')) {
      const text = readFileSync(f, 'utf8');
      // a type-only import builds nothing
      const values = [...text.matchAll(/^\s*import\s+(?!type\b)[^'"]*from\s+['"]zod['"]/gm)];
      if (f.replace(/\\/g, '/') === 'src/io/zod.ts') {
        expect(values.length).toBe(1);
        expect(text).toMatch(/z\.config\(\{ jitless: true \}\)/);
        configured++;
      } else expect(values.length, `${f} imports zod itself`).toBe(0);
    }
    expect(configured).toBe(1);
  });

  it('ink and react are not imported by the non-interactive commands', () => {
    for (const f of ['src/cli', 'src/report', 'src/io'].flatMap(files)) {
      for (const spec of importsOf(f))
        expect(['ink', 'react'].includes(spec), `${f} imports ${spec}`).toBe(false);
    }
  });

  it('the shape of src/: no line over 120 characters, no function body over 100 lines', async () => {
    // scripts/check-shape.mjs is the same check run by hand; here it must find nothing
    const { shapeOffences, MAX_LINE, MAX_BODY_LINES } = await import('../scripts/check-shape.mjs');
    expect([MAX_LINE, MAX_BODY_LINES]).toEqual([120, 100]);
    expect(shapeOffences(files('src'))).toEqual([]);
  });

  it('the shape check finds a long line and a long function (it can fail)', async () => {
    const { shapeOffences } = await import('../scripts/check-shape.mjs');
    const dir = mkdtempSync(join(tmpdir(), 'shape-'));
    const file = join(dir, 'long.ts');
    const body = Array.from({ length: 101 }, (_, i) => `  const v${i} = ${i};`).join('\n');
    writeFileSync(
      file,
      `export function long(): void {\n${body}\n}\nexport const s = '${'x'.repeat(120)}';\n`,
    );
    const found = shapeOffences([file]);
    expect(found.some((o: string) => o.includes('function long has a body of 101 lines'))).toBe(true);
    expect(found.some((o: string) => /long.ts:104: line of 140 characters/.test(o))).toBe(true);
  });
});
