import { describe, expect, it } from 'vitest';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
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

  it('ink and react are not imported by the non-interactive commands', () => {
    for (const f of ['src/cli', 'src/report', 'src/io'].flatMap(files)) {
      for (const spec of importsOf(f))
        expect(['ink', 'react'].includes(spec), `${f} imports ${spec}`).toBe(false);
    }
  });
});
