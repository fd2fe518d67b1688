// A private tmux server for the real-terminal tests: start a command in an 80x24 pane with CI
// unset (ink draws only the last frame under CI=true), read the screen, type, wait, kill.
import { execFileSync, spawnSync } from 'node:child_process';

export const hasTmux = spawnSync('sh', ['-c', 'command -v tmux'], { encoding: 'utf8' }).status === 0;
export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export function tmuxSession(name: string, cwd: string) {
  const tm = (...a: string[]) => execFileSync('tmux', ['-L', name, ...a], { encoding: 'utf8' });
  const screen = () => tm('capture-pane', '-p', '-t', 's');
  return {
    tm,
    screen,
    start(cmd: string) {
      const args = ['new-session', '-d', '-s', 's', '-x', '80', '-y', '24', '-c', cwd];
      // after kill() closed the last session, the private server is still exiting: a new session on
      // the same socket can meet it ("server exited unexpectedly"); tried again once it has gone
      for (let attempt = 1; ; attempt++) {
        try {
          tm(...args, `env -u CI -u CONTINUOUS_INTEGRATION ${cmd}`);
          break;
        } catch (e) {
          if (attempt >= 5 || !/server exited unexpectedly/.test(String(e))) throw e;
          execFileSync('sleep', ['0.3']);
        }
      }
      tm('set-option', '-t', 's', 'remain-on-exit', 'on');
    },
    async waitFor(re: RegExp, ms = 15000): Promise<string> {
      const t0 = Date.now();
      while (Date.now() - t0 < ms) {
        const s = screen();
        if (re.test(s)) return s;
        await sleep(80);
      }
      throw new Error(`timed out waiting for ${re}; screen:\n${screen()}`);
    },
    async keys(...keys: string[]) {
      for (const k of keys) {
        tm('send-keys', '-t', 's', k);
        await sleep(120);
      }
    },
    async type(text: string) {
      tm('send-keys', '-t', 's', '-l', text);
      await sleep(200);
    },
    /** SIGKILL the program in the pane (env execs it, so the pane's pid is the program) and close the pane */
    async kill() {
      const pid = Number(tm('display-message', '-p', '-t', 's', '#{pane_pid}').trim());
      try {
        process.kill(pid, 'SIGKILL');
      } catch {
        // already gone
      }
      await sleep(150);
      tm('kill-session', '-t', 's');
    },
    close() {
      spawnSync('tmux', ['-L', name, 'kill-server']);
    },
  };
}
