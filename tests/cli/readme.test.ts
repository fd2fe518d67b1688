import { describe, expect, it } from 'vitest';
import { cpSync, mkdirSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

// the examples run in a copy of the shipped demo files, so that `check batches/` never
// reads the user's own logs (fill writes them into batches/ by default)
const shipped = (dir: string): string[] => {
  try {
    return execFileSync('git', ['ls-files', '--', dir], { encoding: 'utf8' })
      .split('\n')
      .filter((f) => f.startsWith(`${dir}/`));
  } catch {
    return readdirSync(dir)
      .filter((f) => f.startsWith('demo-') || dir !== 'batches')
      .map((f) => `${dir}/${f}`);
  }
};
const work = mkdtempSync(join(tmpdir(), 'mw-readme-'));
for (const dir of ['batches', 'recipes', 'readings']) {
  mkdirSync(join(work, dir));
  for (const f of shipped(dir)) cpSync(f, join(work, f));
}
const bundle = resolve('dist/mixwright.mjs');

// every `$ mixwright ...` line of the README's console blocks runs against the built bundle
const readme = readFileSync('README.md', 'utf8');
const blocks = [...readme.matchAll(/```console\n([\s\S]*?)```/g)].map((m) => m[1]);
const commands = blocks.flatMap((b) =>
  b
    .split('\n')
    .filter((l) => l.startsWith('$ mixwright'))
    .map((l) => l.slice(2)),
);

function run(cmd: string): { code: number; out: string } {
  try {
    const out = execFileSync('bash', ['-c', cmd.replace(/^mixwright/, `node ${JSON.stringify(bundle)}`)], {
      encoding: 'utf8',
      stdio: ['ignore', 'pipe', 'pipe'],
      cwd: work,
    });
    return { code: 0, out };
  } catch (e) {
    const err = e as { status: number; stdout: string; stderr: string };
    return { code: err.status, out: err.stdout + err.stderr };
  }
}

describe('README examples', () => {
  it('there are examples to run', () => {
    expect(commands.length).toBeGreaterThanOrEqual(8);
  });
  it('they run on a copy of the shipped demo files only', () => {
    expect(readdirSync(join(work, 'batches')).sort()).toEqual(
      shipped('batches')
        .map((f) => f.slice('batches/'.length))
        .sort(),
    );
    expect(readdirSync(join(work, 'batches')).length).toBeGreaterThan(0);
  });
  for (const line of commands) {
    // a trailing "# exit N" states the exit code the example is meant to give
    const m = /\s+#\s*exit\s+(\d+)\s*$/.exec(line);
    const cmd = m ? line.slice(0, m.index) : line;
    it(line, () => {
      const r = run(cmd);
      expect(r.code, r.out).toBe(m ? Number(m[1]) : 0);
      expect(r.out.length).toBeGreaterThan(100);
      if (cmd.includes('--json')) expect(() => JSON.parse(r.out)).not.toThrow();
    });
  }
  it('the install line uses the same recipe as the first example', () => {
    expect(readme).toContain('npm ci && npx mixwright plan recipes/ch4-o2-ar-phi1.yaml');
  });
});
