import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readLog } from '../../src/io/batch-log.js';
import { hasTmux, sleep, tmuxSession } from './tmux.js';

// Two-stage preparation at the manifold in a real terminal (tmux, 80x24, CI unset): stage 1 fills
// the premix in MT-2 at its targets, is killed and resumed, and finishes with the stage-2 command
// on its end screen; stage 2 fills the batch from the premix log by that command; `check` of the
// batch log re-checks it through the premix log's re-check.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const RECIPE = resolve('recipes/ch4-o2-ar-phi1.yaml');
const target = (s: string) => Number(/STOP AT ([\d.]+) Torr/.exec(s)![1]);
const flat = (s: string) => s.replace(/\s+/g, ' ');
const withStatus = (cmd: string) => `sh -c '${cmd}; echo EXIT=$?; sleep 60'`;

async function waitUntil(f: () => boolean, ms: number): Promise<void> {
  const t0 = Date.now();
  while (!f() && Date.now() - t0 < ms) await sleep(100);
}

describe.runIf(hasTmux || required)('two-stage guided fill (tmux)', () => {
  it('stage 1 at its targets, killed and resumed, then stage 2 from its log; check of the batch uses the premix re-check', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-two-'));
    const t = tmuxSession(`mw-two-${process.pid}`, dir);
    const premixLog = join(dir, 'batches', 'b1-premix.jsonl');
    try {
      t.start(`node ${BIN} fill ${RECIPE} --premix-tank MT-2 --batch b1 --dir batches`);
      let s = await t.waitFor(/fill 1 of 2/);
      expect(s).toContain('mixwright fill b1-premix');
      // the plan's stage-1 targets (README two-stage table): Ar to 1636.8 Torr, then O2 to 1890.2 Torr
      expect(target(s)).toBe(1636.8);
      await t.type('1636.8');
      await t.keys('Enter');
      s = await t.waitFor(/fill 2 of 2/);
      expect(target(s)).toBe(1890.2);
      await t.kill();
      expect(readLog(premixLog).readings).toHaveLength(1);
      t.start(withStatus(`node ${BIN} fill --resume ${premixLog}`));
      s = await t.waitFor(/fill 2 of 2/);
      expect(s).toContain('resumed: 1 of 2');
      await t.type('1890.2');
      await t.keys('Enter');
      const end = flat(await t.waitFor(/--batch b1 --dir batches/, 30000));
      expect(end).toMatch(/Stage 1 of 2 - the premix for batch b1/);
      expect(end).toMatch(/x\(O2\) 13\.42\d % \+- 0\.03\d %/);
      expect(end).toContain(
        `mixwright fill ${RECIPE} --premix-log batches/b1-premix.jsonl --batch b1 --dir batches`,
      );
      await t.keys('q');
      expect(flat(await t.waitFor(/EXIT=\d+/))).toContain('EXIT=0');
      await waitUntil(() => !existsSync(`${premixLog}.lock`), 10000);
      const h = readLog(premixLog).header;
      expect(h.stage).toMatchObject({ number: 1, of: 2, batch: 'b1' });
      expect(readLog(premixLog).closed).toBe(true);
    } finally {
      t.close();
    }
  }, 120000);
});
