import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { checkFile } from '../../src/io/check.js';

// A real terminal: tmux runs the wizard, a design is typed, the guided fill starts, readings
// are typed, the process is killed with SIGKILL mid-fill, the fill is resumed and finished,
// and the log is re-checked. ink draws only the last frame under CI=true, so CI is unset.
const hasTmux = spawnSync('sh', ['-c', 'command -v tmux'], { encoding: 'utf8' }).status === 0;
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');

describe.runIf(hasTmux || required)('wizard and guided fill in a real terminal (tmux)', () => {
  it('design, fill, SIGKILL, resume, finish; the log re-checks to the composition of the readings typed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-e2e-'));
    const sock = `mw-e2e-${process.pid}`;
    const tm = (...a: string[]) => execFileSync('tmux', ['-L', sock, ...a], { encoding: 'utf8' });
    const screen = () => tm('capture-pane', '-p', '-t', 's');
    const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
    const waitFor = async (re: RegExp, ms = 15000) => {
      const t0 = Date.now();
      while (Date.now() - t0 < ms) {
        const s = screen();
        if (re.test(s)) return s;
        await sleep(100);
      }
      throw new Error(`timed out waiting for ${re}; screen:\n${screen()}`);
    };
    const key = async (...keys: string[]) => {
      for (const k of keys) {
        tm('send-keys', '-t', 's', k);
        await sleep(120);
      }
    };
    const typeText = async (t: string) => {
      tm('send-keys', '-t', 's', '-l', t);
      await sleep(200);
    };
    const start = (cmd: string) => {
      tm('new-session', '-d', '-s', 's', '-x', '80', '-y', '24', '-c', dir, `env -u CI -u CONTINUOUS_INTEGRATION ${cmd}`);
      tm('set-option', '-t', 's', 'remain-on-exit', 'on');
    };
    const typed: number[] = [];
    const readTarget = (s: string) => Number(/STOP AT ([\d.]+) Torr/.exec(s)![1]);
    try {
      start(`node ${BIN}`);
      await waitFor(/preview/);
      // fuel -> oxidizer -> phi -> diluent -> dilution: set 0.98
      await key('Down', 'Down', 'Down', 'Down');
      for (let i = 0; i < 4; i++) await key('BSpace');
      await typeText('0.98');
      await waitFor(/dilution\s+0\.98/);
      await waitFor(/1 CH4\s+head-1kT 10\.\d+ Torr/);
      // to the actions: tank, pressure, temperature, then save, sheet, fill
      await key('Down', 'Down', 'Down', 'Down', 'Down', 'Down', 'Enter');
      let s = await waitFor(/fill 1 of 3/);
      for (const k of [1, 2]) {
        const t = readTarget(s);
        typed.push(t);
        await typeText(String(t));
        await key('Enter');
        s = await waitFor(new RegExp(`fill ${k + 1} of 3`));
      }
      // kill the process mid-fill (the pane's process is node: env execs it)
      const pid = Number(tm('display-message', '-p', '-t', 's', '#{pane_pid}').trim());
      process.kill(pid, 'SIGKILL');
      await sleep(300);
      tm('kill-session', '-t', 's');
      const logs = readdirSync(join(dir, 'batches'));
      expect(logs).toHaveLength(1);
      const log = join(dir, 'batches', logs[0]);
      expect(readFileSync(log, 'utf8').trim().split('\n').filter((l) => l.includes('"reading"'))).toHaveLength(2);
      start(`node ${BIN} fill --resume ${log}`);
      s = await waitFor(/fill 3 of 3/);
      expect(s).toContain('resumed: 2 of 3');
      const t3 = readTarget(s);
      typed.push(t3);
      await typeText(String(t3));
      await key('Enter');
      await waitFor(/all 3 fills logged/);
      await key('q');
      await sleep(300);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      const TORR = 101325 / 760;
      rep.readings.forEach((r, i) => expect(Math.abs(r.pressurePa / TORR - typed[i])).toBeLessThan(1e-9));
      expect(rep.verdict.verdict).not.toBe('fail');
      expect(Math.abs(rep.result.composition.CH4.value / (0.02 / 3) - 1)).toBeLessThan(0.005);
    } finally {
      spawnSync('tmux', ['-L', sock, 'kill-server']);
    }
  }, 60000);
});
