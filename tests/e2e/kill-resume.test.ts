import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parseLog } from '../../src/io/batch-log.js';
import { hasTmux, sleep, tmuxSession } from './tmux.js';

// No data lost: the guided fill is killed with SIGKILL after every reading, at a random moment
// after Enter, over several batches; every reading the screen confirmed is in the log, none
// twice, and --resume always continues at the right step.
//
// The time from Enter to the fsync'd line is not small: a resumed fill is a fresh process, and
// before the line is written it judges the composition (re-targeting, the GUM budget at the
// last fill) and reads the log; that is 0.1-0.3 s on an idle 2-core machine and more under
// load. So a kill at a random moment may land before the write in round after round (nothing
// logged, nothing shown as logged: correct, but no progress). A round after one that logged
// nothing therefore waits for the screen to confirm the reading and kills at a random moment
// after that: the reading must then be in the log. In every round the screen is read just
// before the kill: a reading it shows as logged must be in the log after the kill.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const BATCHES = Number(process.env.KILL_BATCHES ?? 3);

describe.runIf(hasTmux || required)('SIGKILL between readings, many times over', () => {
  it(`${BATCHES} batches, a kill after every reading: the log keeps every confirmed reading and resume continues`, async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-kill-'));
    const server = `mw-kill-${process.pid}`;
    const t = tmuxSession(server, dir);
    let checkedOnScreen = 0;
    try {
      for (let b = 0; b < BATCHES; b++) {
        const log = join(dir, 'batches', `k${b}.jsonl`);
        const typed = new Map<number, number>();
        let confirmed = 0;
        let stalled = false;
        t.start(
          `node ${BIN} fill ${resolve('recipes/ch4-o2-ar-phi1.yaml')} --by JD --order CH4,Ar,O2 --batch k${b} --dir batches`,
        );
        for (let round = 0; round < 12 && confirmed < 3; round++) {
          const s = await t.waitFor(/fill (\d) of 3/);
          const step = Number(/fill (\d) of 3/.exec(s)![1]);
          expect(step).toBe(confirmed + 1);
          const target = Number(/STOP AT ([\d.]+) Torr/.exec(s)![1]);
          typed.set(step, target);
          t.tm('send-keys', '-t', 's', '-l', String(target));
          await sleep(150);
          // Enter is sent without waiting for tmux (on a loaded machine send-keys alone can take
          // longer than the fill needs to log), so the random kill can land before, during or
          // after the write; the program is killed by its pid (env execs it: the pane's pid)
          const pid = Number(t.tm('display-message', '-p', '-t', 's', '#{pane_pid}').trim());
          const enter = spawn('tmux', ['-L', server, 'send-keys', '-t', 's', 'Enter'], { stdio: 'ignore' });
          const sent = new Promise((r) => enter.on('close', r));
          // what the screen says once the line is fsync'd (on the next fill's screen, or the end screen)
          const shownLogged = new RegExp(`fill ${step} logged`);
          if (stalled || (b === BATCHES - 1 && step === 3)) {
            // the last round logged nothing (and, so the check below surely runs, the last reading
            // of all): kill at a random moment after the screen confirms
            await sent;
            await t.waitFor(shownLogged);
          }
          await sleep(Math.floor(Math.random() * 300));
          try {
            process.kill(pid, 'SIGKILL');
          } catch {
            // already gone: what it left is checked below
          }
          await sent;
          await sleep(150);
          // the pane keeps what the dead program drew, all of it before the kill
          const before = t.screen();
          t.tm('kill-session', '-t', 's');
          const readings = parseLog(readFileSync(log, 'utf8'), log).readings;
          // confirmed on screen before the kill: in the log after it
          if (shownLogged.test(before)) {
            expect(readings.map((r) => r.step)).toContain(step);
            checkedOnScreen++;
          }
          // each reading at most once, in step order, with the value typed for its step
          expect(readings.map((r) => r.step)).toEqual(readings.map((_, i) => i + 1));
          for (const r of readings)
            expect(Math.abs(r.pressure_Pa / (101325 / 760) - typed.get(r.step)!)).toBeLessThan(1e-9);
          expect(readings.length).toBeGreaterThanOrEqual(confirmed);
          stalled = readings.length === confirmed;
          confirmed = readings.length;
          if (confirmed < 3) t.start(`node ${BIN} fill --by JD --resume ${log}`);
        }
        expect(confirmed).toBe(3);
        expect(existsSync(log)).toBe(true);
      }
      expect(checkedOnScreen).toBeGreaterThan(0);
    } finally {
      t.close();
    }
  }, 180000);
});
