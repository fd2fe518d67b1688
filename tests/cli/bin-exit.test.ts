import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { runCli } from '../helpers.js';

// The built command ends its process as soon as the command returns when nothing is pending
// (scripts/cli-bin.mjs). Whatever the command printed must still arrive whole, through a pipe and
// into a file, with the command's own exit code: the same bytes and code as the command run in
// this process (runCli), which never ends a process.
const bin = resolve('dist/mixwright.mjs');
const CASES: (readonly string[])[] = [
  ['plan', 'recipes/ch4-o2-ar-phi1.yaml', '--json'],
  ['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'html', '--batch', 'exit-test'],
  ['check', 'batches/demo-ch4-phi1-ar98.jsonl'],
  ['plan', 'recipes/no-such-recipe.yaml'],
];

describe('the built command ends with its whole output and its exit code', { timeout: 240_000 }, () => {
  for (const args of CASES) {
    it(args.join(' '), async () => {
      const here = await runCli([...args]);
      // through a pipe
      const piped = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });
      expect(piped.status).toBe(here.code);
      expect(piped.stdout).toBe(here.stdout);
      // stderr too (the refusal), compared word by word: its lines are wrapped for the terminal
      const words = (t: string) => t.split(/\s+/).join(' ').trim();
      expect(words(piped.stderr)).toBe(words(here.stderr));
      expect(piped.stdout.length + piped.stderr.length).toBeGreaterThan(100);
      // into a file (a synchronous stream of another kind)
      const dir = mkdtempSync(join(tmpdir(), 'mw-exit-'));
      const file = join(dir, 'out.txt');
      const shell = spawnSync('sh', ['-c', `"$0" "$@" > "${file}"`, process.execPath, bin, ...args], {
        encoding: 'utf8',
      });
      expect(shell.status).toBe(here.code);
      expect(readFileSync(file, 'utf8')).toBe(here.stdout);
      rmSync(dir, { recursive: true });
    });
  }
});
