import { describe, expect, it } from 'vitest';
import { isAscii } from 'node:buffer';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { hasTmux, tmuxSession } from '../e2e/tmux.js';

// The built command compiles its bundle with a code cache made at build time (scripts/cli-load.mjs).
// A cache holds compiled bytecode only: every output must be the same with it, without it, and with
// a cache that is stale or damaged (which the loader must ignore). Each case is a copy of dist/.
const dist = resolve('dist');
const copy = (): string => {
  const dir = mkdtempSync(join(tmpdir(), 'mw-cache-'));
  cpSync(dist, dir, { recursive: true });
  return dir;
};

/** whether the loader in `dir` takes the cache beside its bundle */
function cacheUsed(dir: string): boolean {
  const js = `import('${resolve('scripts/cli-load.mjs')}').then((m) => console.log(m.loadBundle(new URL('file://${dir}/')).cached))`;
  return execFileSync(process.execPath, ['-e', js], { encoding: 'utf8' }).trim() === 'true';
}

function run(dir: string, args: readonly string[]): { out: string; code: number } {
  try {
    return {
      out: execFileSync(process.execPath, [join(dir, 'mixwright.mjs'), ...args], { encoding: 'utf8' }),
      code: 0,
    };
  } catch (e) {
    const x = e as { stdout: string; status: number };
    return { out: x.stdout, code: x.status };
  }
}

// the demo recipes, and the benchmark's 5-source design planned by the sequence search
const FIVE = [
  '--fuel',
  'CH4:0.5,H2:0.5',
  '--oxidizer',
  'O2',
  '--phi',
  '0.5',
  '--diluent',
  'Ar:0.5,He:0.5',
].concat(['--dilution', '0.9', '--tank', 'MT-2', '--pressure', '1500 Torr', '--temperature', '22 degC']);
const CASES: (readonly string[])[] = [
  ['plan', 'recipes/ch4-o2-ar-phi1.yaml'],
  ['plan', 'recipes/ng-blend-air.yaml', '--json'],
  ['plan', ...FIVE],
  ['--help'],
];

// each case starts several node processes: a generous timeout for a loaded machine
describe('the code cache of the built command', { timeout: 240_000 }, () => {
  const none = copy();
  rmSync(join(none, 'cli.cjs.cache'));
  const reference = CASES.map((args) => run(none, args));

  it('the bundle is ASCII (the loader decodes it as latin1, the fast path; a non-ASCII character falls back to UTF-8)', () => {
    expect(isAscii(readFileSync(resolve('dist/cli.cjs')))).toBe(true);
  });

  it('is used as built, and every output equals the run without a cache', () => {
    expect(cacheUsed(dist)).toBe(true);
    expect(cacheUsed(none)).toBe(false);
    CASES.forEach((args, i) => expect(run(dist, args), args.join(' ')).toEqual(reference[i]));
    // the plans ran (exit 0 or 3, danger findings of the demo) and printed their tables
    expect(reference[0].out).toContain('Fill plan  ch4-phi1-ar98');
  });

  it('is ignored when the bundle changed after the build (stale), with the same outputs', () => {
    const dir = copy();
    writeFileSync(join(dir, 'cli.cjs'), `${readFileSync(join(dir, 'cli.cjs'), 'utf8')}\n// changed\n`);
    expect(cacheUsed(dir)).toBe(false);
    expect(run(dir, CASES[0])).toEqual(reference[0]);
  });

  it('is ignored when its bytes are damaged or cut short, with the same outputs', () => {
    const dir = copy();
    const file = join(dir, 'cli.cjs.cache');
    const bytes = readFileSync(file);
    bytes[bytes.length >> 1] ^= 0xff;
    writeFileSync(file, bytes);
    expect(cacheUsed(dir)).toBe(false);
    expect(run(dir, CASES[0])).toEqual(reference[0]);
    writeFileSync(file, bytes.subarray(0, 100));
    expect(cacheUsed(dir)).toBe(false);
    expect(run(dir, CASES[2])).toEqual(reference[2]);
  });

  // the lazy parts (the terminal screens, dist/tui.mjs) are imported through the loader's import
  // function: a compiled script has no module loader, and a bare import() in it failed with
  // "A dynamic import callback was not specified" (fill, fill --resume and the wizard)
  it.runIf(hasTmux)(
    'loads the terminal screens of fill, fill --resume and the wizard, with no warning',
    async () => {
      expect(cacheUsed(dist)).toBe(true);
      const dir = mkdtempSync(join(tmpdir(), 'mw-cache-tui-'));
      const t = tmuxSession(`mw-cache-tui-${process.pid}`, dir);
      const bin = join(dist, 'mixwright.mjs');
      const recipe = resolve('recipes/ch4-o2-ar-phi1.yaml');
      const start = async (args: string, screen: RegExp, n: number): Promise<string> => {
        t.start(`sh -c 'node ${bin} ${args} 2>err${n}.txt; echo EXIT=$?; sleep 60'`);
        const s = await t.waitFor(screen, 60_000);
        await t.keys('C-c');
        await t.waitFor(/EXIT=\d+/, 30_000);
        t.tm('kill-session', '-t', 's');
        return s + readFileSync(join(dir, `err${n}.txt`), 'utf8');
      };
      try {
        const seen = [
          await start(`fill ${recipe} --by JD --batch cc --dir batches`, /fill 1 of \d/, 1),
          // without --by the resume asks who fills first
          await start('fill --resume batches/cc.jsonl', /who fills/, 2),
          await start('', /preview/, 3),
        ];
        for (const s of seen) {
          expect(s).not.toMatch(/internal error|dynamic import|Warning/);
        }
      } finally {
        t.close();
      }
    },
  );
});
