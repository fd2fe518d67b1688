// The batch log at the manifold: the fill's lock, a torn tail moved aside, and writes that fail
// (an injected short write, ENOSPC and EIO, and a real 64 kB tmpfs where one can be mounted):
// nothing confirmed is lost, nothing is reported written that was not.
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  symlinkSync,
  unlinkSync,
  writeFileSync,
  appendFileSync,
} from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, openLogForFill, readLog, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkFile, headerFromPlan } from '../../src/io/check.js';
import { writeFileAtomic } from '../../src/io/atomic.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { describeProblem, planFill, ProblemError, type Plan } from '../../src/core/index.js';
import { runCli, TORR } from '../helpers.js';

/** the fault injected into node:fs writes: none, a disk that fills after `budget` bytes, or writes of at most 7 bytes a call */
const fault = vi.hoisted(() => ({
  mode: 'none' as 'none' | 'short' | 'enospc' | 'trickle',
  budget: 0,
  fsyncFailures: 0,
}));

vi.mock('node:fs', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:fs')>();
  const writeSync = ((fd: number, buf: unknown, off?: number, len?: number, pos?: number | null) => {
    if (fault.mode === 'none' || !(buf instanceof Uint8Array))
      return (real.writeSync as (...a: unknown[]) => number)(fd, buf, off, len, pos);
    const o = off ?? 0;
    const l = len ?? buf.length - o;
    if (fault.mode === 'trickle') return real.writeSync(fd, buf, o, Math.min(l, 7));
    const n = Math.min(l, fault.budget);
    if (n === 0) {
      if (fault.mode === 'enospc')
        throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
      return 0;
    }
    fault.budget -= n;
    return real.writeSync(fd, buf, o, n);
  }) as typeof real.writeSync;
  const fsyncSync = ((fd: number) => {
    if (fault.fsyncFailures > 0) {
      fault.fsyncFailures--;
      throw Object.assign(new Error('EIO: i/o error, fsync'), { code: 'EIO' });
    }
    return real.fsyncSync(fd);
  }) as typeof real.fsyncSync;
  return { ...real, default: { ...real, writeSync, fsyncSync }, writeSync, fsyncSync };
});

function withFault<T>(mode: typeof fault.mode, budget: number, f: () => T): T {
  fault.mode = mode;
  fault.budget = budget;
  try {
    return f();
  } finally {
    fault.mode = 'none';
  }
}

function problemOf(f: () => unknown): ProblemError {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return e;
    throw e;
  }
  throw new Error('expected a ProblemError');
}

const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
const plan: Plan = planFill({
  ...req.input,
  thermometer: undefined,
}); /* the demo log: the advised order CH4, Ar, O2, without the sequence search */
const TARGETS_TORR = [10.0128, 1480.025, 1500];

function reading(i: number, torr = TARGETS_TORR[i]): NewLogEvent {
  const s = plan.steps[i];
  return {
    kind: 'reading',
    step: s.index,
    source: s.source.id,
    gauge: s.gauge!.id,
    reading: `${torr} Torr`,
    pressure_Pa: torr * TORR,
    temperature: '25 degC',
    temperature_K: 298.15,
    time: `2026-12-02T10:0${i}:00Z`,
    by: 'QX',
  };
}

function newLog(dir: string, n: number, name = 'b.jsonl'): string {
  const file = join(dir, name);
  createLog(file, headerFromPlan(plan, req, 'fill-test', '2026-12-02T10:00:00Z'));
  for (let i = 0; i < n; i++) appendEvent(file, reading(i));
  return file;
}

const tmp = () => mkdtempSync(join(tmpdir(), 'mw-log-'));

describe('the lock of a guided fill', () => {
  it('a second fill on the same log is refused and told who holds it; after release the log opens again', () => {
    const file = newLog(tmp(), 1);
    const a = openLogForFill(file);
    expect(JSON.parse(readFileSync(`${file}.lock`, 'utf8'))).toMatchObject({
      pid: process.pid,
      host: hostname(),
    });
    const e = problemOf(() => openLogForFill(file));
    expect(e.problem.code).toBe('log-locked');
    a.handle.release();
    expect(existsSync(`${file}.lock`)).toBe(false);
    const b = openLogForFill(file);
    expect(b.log.readings).toHaveLength(1);
    b.handle.release();
  });

  it('a live fill in another process holds the log: refused, naming its process, host and start time', async () => {
    const file = newLog(tmp(), 1);
    const child = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 20000)'], { stdio: 'ignore' });
    try {
      writeFileSync(
        `${file}.lock`,
        JSON.stringify({ pid: child.pid, host: hostname(), started: '2026-12-02T09:59:00Z' }) + '\n',
      );
      const e = problemOf(() => openLogForFill(file));
      expect(e.problem.code).toBe('log-locked');
      const text = describeProblem(e.problem);
      expect(text).toContain(`process ${child.pid} on host ${hostname()}, started 2026-12-02T09:59:00Z`);
      expect(text).toContain(`${file}.lock`);
      expect(readFileSync(file, 'utf8').trim().split('\n')).toHaveLength(2);
    } finally {
      child.kill('SIGKILL');
    }
  });

  it('a stale lock (its process is gone, this host) is taken over with a message; a lock from another host or an unreadable one is not', () => {
    const file = newLog(tmp(), 1);
    const dead = spawnSync(process.execPath, ['-e', '']).pid!;
    writeFileSync(
      `${file}.lock`,
      JSON.stringify({ pid: dead, host: hostname(), started: '2026-12-02T08:00:00Z' }) + '\n',
    );
    const o = openLogForFill(file);
    expect(o.messages.join('\n')).toMatch(
      new RegExp(
        `took over a stale lock: the fill of process ${dead} on host .* started 2026-12-02T08:00:00Z is no longer running`,
      ),
    );
    expect(JSON.parse(readFileSync(`${file}.lock`, 'utf8')).pid).toBe(process.pid);
    o.handle.release();

    writeFileSync(
      `${file}.lock`,
      JSON.stringify({ pid: dead, host: 'bench-pc-7', started: '2026-12-02T08:00:00Z' }) + '\n',
    );
    expect(describeProblem(problemOf(() => openLogForFill(file)).problem)).toMatch(
      /process \d+ on host bench-pc-7.*another computer/,
    );
    writeFileSync(`${file}.lock`, '{"pid":');
    expect(describeProblem(problemOf(() => openLogForFill(file)).problem)).toMatch(
      /lock file that cannot be read/,
    );
    unlinkSync(`${file}.lock`);
  });

  it('a lock whose fill was killed but not yet reaped by its parent (a zombie, as a terminal leaves it for a moment) is stale', async () => {
    const file = newLog(tmp(), 1);
    // a parent that forks a child and never reaps it: the killed child stays a zombie
    const parent = spawn(
      'python3',
      [
        '-c',
        'import os,sys,time\npid=os.fork()\nif pid==0:\n    time.sleep(60)\n    os._exit(0)\nprint(pid,flush=True)\ntime.sleep(5)',
      ],
      { stdio: ['ignore', 'pipe', 'ignore'] },
    );
    const pid = await new Promise<number>((resolve) =>
      parent.stdout!.once('data', (d: Buffer) => resolve(Number(String(d).trim()))),
    );
    try {
      process.kill(pid, 'SIGKILL');
      let state = '';
      for (let i = 0; i < 100 && state !== 'Z'; i++) {
        await new Promise((r) => setTimeout(r, 10));
        const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
        state = stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
      }
      expect(state).toBe('Z');
      writeFileSync(
        `${file}.lock`,
        JSON.stringify({ pid, host: hostname(), started: '2026-12-02T08:00:00Z' }) + '\n',
      );
      const o = openLogForFill(file);
      expect(o.messages.join('\n')).toMatch(/took over a stale lock/);
      o.handle.release();
    } finally {
      parent.kill('SIGKILL');
    }
  });

  it('a lock from before a restart of this computer (another boot id) is stale even if its pid is in use now', (ctx) => {
    if (!existsSync('/proc/sys/kernel/random/boot_id')) ctx.skip();
    const file = newLog(tmp(), 1);
    writeFileSync(
      `${file}.lock`,
      JSON.stringify({
        pid: process.ppid,
        host: hostname(),
        started: '2026-12-01T08:00:00Z',
        boot: '00000000-0000-0000-0000-000000000000',
      }) + '\n',
    );
    const o = openLogForFill(file);
    expect(o.messages.join('\n')).toMatch(/restarted since/);
    o.handle.release();
  });
});

describe('a torn last line', () => {
  it('is moved to a side file before anything is appended; the fill appends cleanly and check stays readable and names the side file', async () => {
    const dir = tmp();
    const file = newLog(dir, 2);
    const fragment = '{"kind":"reading","step":3,"sour';
    appendFileSync(file, fragment);
    expect(problemOf(() => appendEvent(file, reading(2))).problem.code).toBe('log-torn-tail');
    const o = openLogForFill(file, { now: '2026-12-02T10:30:00Z' });
    const side = readdirSync(dir).filter((f) => f.includes('.torn-'));
    expect(side).toHaveLength(1);
    expect(readFileSync(join(dir, side[0]), 'utf8')).toBe(fragment);
    expect(o.messages.join('\n')).toContain(`moved to ${join(dir, side[0])}`);
    expect(o.messages.join('\n')).toMatch(/line 4, 32 bytes/);
    expect(readFileSync(file, 'utf8').endsWith('}\n')).toBe(true);
    expect(o.handle.append(reading(2))).toMatchObject({ line: 4 });
    o.handle.release();
    const log = readLog(file);
    expect(log.readings.map((r) => r.step)).toEqual([1, 2, 3]);
    expect(log.issues).toEqual([]);
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    expect(rep.findings.map((f) => f.code)).toEqual(['torn-side-file']);
    const cli = await runCli(['check', file, '--trials', '100000']);
    // readable; its fill never closed (no close line), so not a pass (README "Exit codes": NOT CLOSED, 7)
    expect(rep.record?.closed).toBe(false);
    expect(cli.code, cli.stderr).toBe(7);
    expect(cli.stdout).toContain(`moved it to ${join(dir, side[0])}`);
  });
});

describe('writes that fail (injected in node:fs)', () => {
  it('a short write while appending: write-failed naming the path and the cause, the partial line cut back off, every confirmed reading kept', () => {
    const file = newLog(tmp(), 0);
    const o = openLogForFill(file);
    o.handle.append(reading(0));
    o.handle.append(reading(1));
    const before = readFileSync(file);
    const e = problemOf(() => withFault('short', 40, () => o.handle.append(reading(2))));
    expect(e.problem.code).toBe('write-failed');
    expect(e.where.file).toBe(file);
    expect(describeProblem(e.problem)).toMatch(
      /only 40 of \d+ bytes reached the disk .*the event was NOT logged \(the log is as it was before\)/,
    );
    expect(readFileSync(file).equals(before)).toBe(true);
    // the disk has room again: the same reading goes in, and the chain holds
    o.handle.append(reading(2));
    o.handle.release();
    const log = readLog(file);
    expect(log.readings.map((r) => r.pressure_Pa)).toEqual(TARGETS_TORR.map((t) => t * TORR));
    expect(log.issues).toEqual([]);
  });

  it('ENOSPC after part of the line, and EIO from fsync: both refused the same way, the log as before', () => {
    const file = newLog(tmp(), 1);
    const o = openLogForFill(file);
    const before = readFileSync(file);
    const e1 = problemOf(() => withFault('enospc', 100, () => o.handle.append(reading(1))));
    expect(describeProblem(e1.problem)).toMatch(/^not written: the disk is full; .*\(ENOSPC\)/);
    expect(readFileSync(file).equals(before)).toBe(true);
    fault.fsyncFailures = 1;
    const e2 = problemOf(() => o.handle.append(reading(1)));
    expect(describeProblem(e2.problem)).toMatch(/input\/output error; .*\(EIO\); the event was NOT logged/);
    expect(readFileSync(file).equals(before)).toBe(true);
    o.handle.release();
    expect(readLog(file).readings).toHaveLength(1);
  });

  it('writeSync writing a few bytes a call is looped until the line is whole', () => {
    const file = newLog(tmp(), 0);
    const o = openLogForFill(file);
    withFault('trickle', 0, () => o.handle.append(reading(0)));
    o.handle.release();
    const log = readLog(file);
    expect(log.readings[0].reading).toBe('10.0128 Torr');
    expect(log.issues).toEqual([]);
  });

  it('sheet -o with a short write: exit 2 with the path and cause, no file and no temporary file left, never "wrote"', async () => {
    const dir = tmp();
    const out = join(dir, 'fill.html');
    fault.mode = 'short';
    fault.budget = 8192;
    const r = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'html', '-o', out]).finally(
      () => (fault.mode = 'none'),
    );
    expect(r.code).toBe(2);
    expect(r.stdout).not.toContain('wrote');
    expect(r.stderr).toMatch(new RegExp(`${out}: not written: only 8192 of \\d+ bytes reached the disk`));
    expect(r.stderr).toContain('(error code: write-failed)');
    expect(readdirSync(dir)).toEqual([]);
    fault.mode = 'enospc';
    fault.budget = 0;
    const r2 = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'html', '-o', out]).finally(
      () => (fault.mode = 'none'),
    );
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/not written: the disk is full \(ENOSPC\)/);
    expect(readdirSync(dir)).toEqual([]);
    const ok = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'html', '-o', out]);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toBe(`wrote ${out}\n`);
  });

  it('sheet -o onto a dangling symlink or a folder: refused with what it is, nothing written (a read-only folder cannot be tested here: the tests run as root)', async () => {
    const dir = tmp();
    const link = join(dir, 'x.md');
    symlinkSync(join(dir, 'missing.md'), link);
    const r = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'md', '-o', link]);
    expect(r.code).toBe(2);
    // the command refuses before any work (src/cli/program.ts); writeFileAtomic refuses the same on its own (next test)
    expect(r.stderr).toMatch(/a symbolic link of that name exists \(it may point nowhere\); add --force/);
    expect(existsSync(join(dir, 'missing.md'))).toBe(false);
    const forced = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--format',
      'md',
      '-o',
      link,
      '--force',
    ]);
    expect(forced.code).toBe(0);
    expect(statSync(link).isFile()).toBe(true);
    expect(existsSync(join(dir, 'missing.md'))).toBe(false);
    mkdirSync(join(dir, 'sub'));
    const f = await runCli([
      'sheet',
      'recipes/ch4-o2-ar-phi1.yaml',
      '--format',
      'md',
      '-o',
      join(dir, 'sub'),
      '--force',
    ]);
    expect(f.code).toBe(2);
    expect(f.stderr).toMatch(/the name is a folder/);
  });
});

describe('writeFileAtomic on its own', () => {
  it('keeps a dangling symlink without force (the link is not followed or replaced), replaces it with force', () => {
    const dir = tmp();
    const link = join(dir, 'y.md');
    symlinkSync(join(dir, 'nowhere.md'), link);
    let err: unknown;
    try {
      writeFileAtomic(link, 'x', false);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ProblemError);
    expect(describeProblem((err as ProblemError).problem)).toMatch(
      /symbolic link of that name exists \(it may point nowhere\)/,
    );
    expect(existsSync(join(dir, 'nowhere.md'))).toBe(false);
    writeFileAtomic(link, 'x', true);
    expect(readFileSync(link, 'utf8')).toBe('x');
    expect(existsSync(join(dir, 'nowhere.md'))).toBe(false);
  });
});

// a real full disk: a 64 kB tmpfs, where this machine lets the test mount one (root in a container); skipped otherwise
describe('a real full disk (64 kB tmpfs)', () => {
  const mnt = join(tmpdir(), `mw-tmpfs-${process.pid}`);
  let mounted = false;
  beforeAll(() => {
    mkdirSync(mnt, { recursive: true });
    try {
      execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=64k', 'tmpfs', mnt], { stdio: 'ignore' });
      mounted = true;
    } catch {
      mounted = false;
    }
  });
  afterAll(() => {
    if (mounted) execFileSync('umount', [mnt], { stdio: 'ignore' });
    rmSync(mnt, { recursive: true, force: true });
  });

  /** fill the disk with 4 kB files until it refuses, then free `keep` of them */
  function fillDisk(dir: string, keep: number): void {
    mkdirSync(dir, { recursive: true });
    const page = Buffer.alloc(4096, 0x2e);
    const made: string[] = [];
    for (let i = 0; i < 100; i++) {
      const f = join(dir, `fill-${i}`);
      try {
        writeFileSync(f, page);
        made.push(f);
      } catch {
        rmSync(f, { force: true });
        break;
      }
    }
    for (const f of made.slice(0, keep)) unlinkSync(f);
  }

  it('sheet --format html with 8 kB left: exit 2, no file, no temporary file, never "wrote"', async (ctx) => {
    if (!mounted) ctx.skip();
    const dir = join(mnt, 'sheet');
    fillDisk(join(mnt, 'filler-a'), 2);
    mkdirSync(dir);
    const out = join(dir, 'fill.html');
    const r = await runCli(['sheet', 'recipes/ch4-o2-ar-phi1.yaml', '--format', 'html', '-o', out]);
    expect(r.code).toBe(2);
    expect(r.stdout).not.toContain('wrote');
    expect(r.stderr).toMatch(/fill\.html: not written: (the disk is full \(ENOSPC\)|only \d+ of \d+ bytes)/);
    expect(readdirSync(dir)).toEqual([]);
    rmSync(join(mnt, 'filler-a'), { recursive: true });
    rmSync(dir, { recursive: true });
  });

  it('appending readings until the disk is full: the failing append says so, every confirmed reading is in the log, no partial line', (ctx) => {
    if (!mounted) ctx.skip();
    const dir = join(mnt, 'log');
    mkdirSync(dir);
    const file = newLog(dir, 0);
    const o = openLogForFill(file);
    fillDisk(join(mnt, 'filler-b'), 0);
    let confirmed = 0;
    let failure: ProblemError | undefined;
    // steps 1-3 then notes as acknowledgements, until the disk refuses
    for (let i = 0; i < 60 && !failure; i++) {
      try {
        o.handle.append(
          i < 3
            ? reading(i)
            : {
                kind: 'acknowledge',
                code: 'test-filler',
                step: null,
                by: 'QX',
                time: 't',
                note: 'x'.repeat(300),
              },
        );
        confirmed++;
      } catch (e) {
        if (!(e instanceof ProblemError)) throw e;
        failure = e;
      }
    }
    o.handle.release();
    expect(failure?.problem.code).toBe('write-failed');
    expect(describeProblem(failure!.problem)).toMatch(/disk is full|bytes reached the disk/);
    const text = readFileSync(file, 'utf8');
    expect(text.endsWith('\n')).toBe(true);
    const log = readLog(file);
    expect(log.lines).toBe(1 + confirmed);
    expect(log.issues).toEqual([]);
    expect(log.readings.length).toBe(Math.min(3, confirmed));
    rmSync(join(mnt, 'filler-b'), { recursive: true });
  });
});
