import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';

// every `$ mixwright ...` line of the README's console blocks runs against the built bundle
const readme = readFileSync('README.md', 'utf8');
const blocks = [...readme.matchAll(/```console\n([\s\S]*?)```/g)].map((m) => m[1]);
const commands = blocks.flatMap((b) => b.split('\n').filter((l) => l.startsWith('$ mixwright')).map((l) => l.slice(2)));

function run(cmd: string): { code: number; out: string } {
  try {
    const out = execFileSync('bash', ['-c', cmd.replace(/^mixwright/, 'node dist/mixwright.mjs')], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
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
