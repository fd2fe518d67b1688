import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { checkFile } from '../../src/io/check.js';
import { hasTmux, sleep, tmuxSession } from './tmux.js';

async function waitUntil(ok: () => boolean, ms: number): Promise<void> {
  for (const end = Date.now() + ms; !ok(); await sleep(100))
    if (Date.now() > end) throw new Error('timed out waiting');
}

// A real terminal: tmux runs the wizard, a design is typed, the guided fill starts, readings
// are typed, the process is killed with SIGKILL mid-fill, the fill is resumed and finished,
// and the log is re-checked.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');

describe.runIf(hasTmux || required)('wizard and guided fill in a real terminal (tmux)', () => {
  it('design, fill, SIGKILL, resume, finish; the log re-checks to the composition of the readings typed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-e2e-'));
    const t = tmuxSession(`mw-e2e-${process.pid}`, dir);
    const typed: number[] = [];
    const readTarget = (s: string) => Number(/STOP AT ([\d.]+) Torr/.exec(s)![1]);
    try {
      t.start(`node ${BIN}`);
      await t.waitFor(/preview/);
      // fuel -> oxidizer -> phi -> diluent -> dilution: set 0.98
      await t.keys('Down', 'Down', 'Down', 'Down');
      for (let i = 0; i < 4; i++) await t.keys('BSpace');
      await t.type('0.98');
      await t.waitFor(/dilution\s+0\.98/);
      await t.waitFor(/1 CH4\s+head-1kT 10\.\d+ Torr/);
      // the preview is the plan the fill starts (the sequence search): its 4 fills, not the advised order's 3
      await t.waitFor(/4 Ar 2\/2\s+head-10kT 1500\.0 Torr/);
      // to the actions: tank, premix, pressure, temperature, then save, sheet, fill
      await t.keys('Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Enter');
      // who fills: asked once a session, then on every reading it logs
      await t.waitFor(/who fills/);
      await t.type('JD');
      await t.keys('Enter');
      // the wizard's fill plans with the sequence search: CH4, Ar (charge 1 of 2), O2, Ar (charge 2 of 2)
      let s = await t.waitFor(/fill 1 of 4/);
      for (const k of [1, 2]) {
        const target = readTarget(s);
        typed.push(target);
        await t.type(String(target));
        await t.keys('Enter');
        s = await t.waitFor(new RegExp(`fill ${k + 1} of 4`));
      }
      await t.kill();
      // the killed fill leaves its lock beside the log; the resume takes it over as stale
      const logs = readdirSync(join(dir, 'batches')).filter((f) => f.endsWith('.jsonl'));
      expect(logs).toHaveLength(1);
      expect(readdirSync(join(dir, 'batches'))).toContain(`${logs[0]}.lock`);
      const log = join(dir, 'batches', logs[0]);
      expect(
        readFileSync(log, 'utf8')
          .trim()
          .split('\n')
          .filter((l) => l.includes('"reading"')),
      ).toHaveLength(2);
      t.start(`node ${BIN} fill --resume ${log}`);
      // a resume is a new session: asked again (another member may go on with it)
      await t.waitFor(/who fills/);
      await t.type('KL');
      await t.keys('Enter');
      s = await t.waitFor(/fill 3 of 4/);
      expect(s).toContain('resumed: 2 of 4');
      const t3 = readTarget(s);
      typed.push(t3);
      await t.type(String(t3));
      await t.keys('Enter');
      s = await t.waitFor(/fill 4 of 4/);
      const t4 = readTarget(s);
      typed.push(t4);
      await t.type(String(t4));
      await t.keys('Enter');
      await t.waitFor(/all 4 fills logged/);
      await t.keys('q');
      await waitUntil(() => !existsSync(`${log}.lock`), 10000);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      const TORR = 101325 / 760;
      rep.readings.forEach((r, i) => expect(Math.abs(r.pressurePa / TORR - typed[i])).toBeLessThan(1e-9));
      // who read each: the first session's operator, then the resumed one's
      expect(
        readFileSync(log, 'utf8')
          .trim()
          .split('\n')
          .map((l) => JSON.parse(l) as { kind: string; by?: string })
          .filter((e) => e.kind === 'reading')
          .map((e) => e.by),
      ).toEqual(['JD', 'JD', 'KL', 'KL']);
      expect(rep.verdict.verdict).not.toBe('fail');
      expect(Math.abs(rep.result.composition.CH4.value / (0.02 / 3) - 1)).toBeLessThan(0.005);
    } finally {
      t.close();
    }
  }, 60000);
});
