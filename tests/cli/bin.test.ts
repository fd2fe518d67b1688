import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { runCli } from '../helpers.js';

describe('the built command', () => {
  it('runs the Monte Carlo streams in worker threads and gets the same numbers as the in-process run (same streams, same seeds)', async () => {
    const args = ['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--json', '--trials', '200000', '--seed', '3'];
    const run = spawnSync(process.execPath, ['dist/mixwright.mjs', ...args], { encoding: 'utf8' });
    // the demo log is not shown within tolerance: exit 7 (README "Exit codes"), the JSON printed
    expect(run.status, run.stderr).toBe(7);
    const bundled = JSON.parse(run.stdout);
    const inProcess = JSON.parse((await runCli(args)).stdout);
    for (const k of ['CH4', 'O2', 'Ar']) {
      expect(bundled.composition[k].mc.u).toBe(inProcess.composition[k].mc.u);
      expect(bundled.composition[k].mc.interval95).toEqual(inProcess.composition[k].mc.interval95);
    }
  });

  it('bare mixwright with stdin not a terminal exits 2 with a short message', () => {
    let code = 0;
    let err = '';
    try {
      execFileSync(process.execPath, ['dist/mixwright.mjs'], {
        encoding: 'utf8',
        stdio: ['pipe', 'pipe', 'pipe'],
      });
    } catch (e) {
      code = (e as { status: number }).status;
      err = (e as { stderr: string }).stderr;
    }
    expect(code).toBe(2);
    expect(err).toContain('not a terminal');
  });
});
