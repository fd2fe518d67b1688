/**
 * Fuzz of hostile input and file faults (issue 15): special files, huge and denormal
 * numbers, YAML alias bombs, byte-order marks, suffixed gauge and degree units,
 * symbolic links, read-only and full output folders. The rules, for every run:
 * exit 0, 2, 3 or 4 only; no stack trace or internal error; no NaN or Infinity in any
 * output (beyond text the user typed, quoted back); a refusal names its code and ends
 * within 5 s; a refused write leaves its folder as it was, and "wrote" means the file
 * holds exactly what the same sheet prints to stdout.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { execFileSync } from 'node:child_process';
import {
  closeSync,
  ftruncateSync,
  mkdirSync,
  mkdtempSync,
  openSync,
  readdirSync,
  readFileSync,
  rmSync,
  symlinkSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { stringify } from 'yaml';
import { cliRuns, runCli, STACK_LINE } from '../helpers.js';
import { DEMO_LAB_YAML } from '../../src/io/demo-lab.js';

const RUNS = Number(process.env.FUZZ_RUNS ?? 40);
/** a property's time budget grows with its runs (the 5 s rule is per invocation, in judge) */
const BUDGET_MS = 30000 + RUNS * 300;
const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const CSV = readFileSync('readings/ch4-phi1-ar98.csv', 'utf8');
const dir = mkdtempSync(join(tmpdir(), 'mw-hostile-'));
let n = 0;
const file = (ext: string, text: string | Buffer) => {
  const f = join(dir, `h${n++}.${ext}`);
  writeFileSync(f, text);
  return f;
};
const broken: string[] = [];

type Result = { code: number; stdout: string; stderr: string; stderrShown: string; ms: number };

async function run(argv: string[]): Promise<Result> {
  const t0 = performance.now();
  const r = await runCli(argv);
  return { ...r, ms: performance.now() - t0 };
}

/** the rules every invocation keeps; quoted user text is left out of the NaN/Infinity check */
function judge(r: Result, allowed: number[], what: string): void {
  const unquoted = (s: string) => s.replace(/"[^"\n]*"/g, '""');
  const problems: string[] = [];
  if (!allowed.includes(r.code)) problems.push(`exit ${r.code} not in ${allowed.join('/')}`);
  if (STACK_LINE.test(r.stderrShown) || r.stderr.includes('internal error'))
    problems.push('stack trace or internal error');
  if (/\bNaN\b|\bInfinity\b/.test(r.stdout) || /\bNaN\b|\bInfinity\b/.test(unquoted(r.stderr)))
    problems.push('NaN or Infinity in the output');
  if (r.code === 2 && !/\(error code: [a-z-]+\)|error: /.test(r.stderr))
    problems.push('a refusal without its code');
  if (r.code === 2 && r.ms > 5000) problems.push(`a refusal after ${Math.round(r.ms)} ms`);
  if (problems.length) broken.push(`${what}: ${problems.join('; ')}\n  ${r.stderr.slice(0, 300)}`);
  expect(problems, `${what}\n${r.stderr}`).toEqual([]);
}

const warnings: string[] = [];
process.on('warning', (w) => warnings.push(`${w.name}: ${w.message}`));

// output folders on file systems that refuse: a read-only one and a full one (tmpfs of 8 kB), where mounting is allowed
const mounts: string[] = [];
let readOnly: string | undefined;
let full: string | undefined;
function tryMount(options: string): string | undefined {
  const m = mkdtempSync(join(tmpdir(), 'mw-mnt-'));
  try {
    execFileSync('mount', ['-t', 'tmpfs', '-o', options, 'tmpfs', m], { stdio: 'ignore' });
    mounts.push(m);
    return m;
  } catch {
    rmSync(m, { recursive: true, force: true });
    return undefined;
  }
}
beforeAll(() => {
  readOnly = tryMount('ro,size=16k');
  full = tryMount('size=8k');
});
afterAll(() => {
  for (const m of mounts) {
    try {
      execFileSync('umount', [m], { stdio: 'ignore' });
      rmSync(m, { recursive: true, force: true });
    } catch {
      // left for the system's tmp cleaning
    }
  }
  console.log(
    `fuzz hostile: ${cliRuns.count} invocations, ${broken.length} rules broken; read-only target ${readOnly ? 'mounted' : 'not mountable here'}, full target ${full ? 'mounted' : 'not mountable here'}`,
  );
  expect(warnings).toEqual([]);
});

/** special files, made once */
function specials(): Record<string, string> {
  const s = join(dir, 'special');
  mkdirSync(s, { recursive: true });
  const fifo = join(s, 'pipe.yaml');
  execFileSync('mkfifo', [fifo]);
  const big = join(s, 'big.csv');
  const fd = openSync(big, 'w');
  ftruncateSync(fd, 64 * 1024 * 1024); // sparse
  closeSync(fd);
  symlinkSync(fifo, join(s, 'to-pipe.yaml'));
  symlinkSync(join(s, 'loop-b.yaml'), join(s, 'loop-a.yaml'));
  symlinkSync(join(s, 'loop-a.yaml'), join(s, 'loop-b.yaml'));
  writeFileSync(join(s, 'nul.yaml'), Buffer.from('id: x\n\0\0\0'));
  mkdirSync(join(s, 'folder.yaml'), { recursive: true });
  return {
    fifo,
    zero: '/dev/zero',
    null: '/dev/null',
    random: '/dev/urandom',
    big,
    toPipe: join(s, 'to-pipe.yaml'),
    loop: join(s, 'loop-a.yaml'),
    nul: join(s, 'nul.yaml'),
    folder: join(s, 'folder.yaml'),
    missing: join(s, 'missing.yaml'),
  };
}

describe('fuzz: hostile files and numbers', () => {
  it(
    'special files in every place a file is read: refused (exit 2) within 5 s',
    async () => {
      const sp = specials();
      const slot = fc.constantFrom<(x: string) => string[]>(
        (x) => ['plan', x],
        (x) => ['sheet', x, '--format', 'md'],
        (x) => ['ready', x],
        (x) => ['plan', RECIPE, '--lab', x],
        (x) => [
          'plan',
          file(
            'yaml',
            stringify({
              id: 'sp',
              lab: x,
              tank: 'MT-1',
              pressure: '1000 Torr',
              temperature: '25 degC',
              mixture: { fractions: 'Ar' },
            }),
          ),
        ],
        (x) => ['check', x],
        (x) => ['check', 'readings/ch4-phi1-ar98.csv', '--recipe', x],
        (x) => ['check', 'readings/ch4-phi1-ar98.csv', '--lab', x],
      );
      await fc.assert(
        fc.asyncProperty(fc.constantFrom(...Object.keys(sp)), slot, async (kind, argv) => {
          const args = argv(sp[kind]);
          judge(await run(args), [2], `special file ${kind}: ${args.join(' ')}`);
        }),
        { numRuns: Math.ceil(RUNS / 4) },
      );
    },
    BUDGET_MS,
  );

  const extreme = fc.oneof(
    fc.constantFrom(
      1e300,
      1e-300,
      5e-324,
      Number.MAX_VALUE,
      Number.MIN_VALUE,
      1e30,
      1e-30,
      -0,
      -1e300,
      1e16,
      0.9999999999999999,
    ),
    fc.double({ noNaN: false }),
  );
  const extremeText = fc.oneof(
    fc.constantFrom(
      '1e999',
      '-1e999',
      '1e-324',
      '5e-324',
      '4.9e-324',
      '1e308',
      '1e-308',
      '9e15',
      '-0',
      '0e0',
      '00001',
      '1e+300',
    ),
    extreme.map(String),
  );
  const unit = fc.constantFrom(
    'Torr',
    'Pa',
    'bar',
    'psi',
    'L',
    'm^3',
    'K',
    'degC',
    'mTorr',
    'kPa',
    'psig',
    'barg',
    'psia',
    '°C',
    'C',
  );

  it(
    'huge, tiny and denormal numbers in recipes and options: no hang, no NaN, a range in the refusal',
    async () => {
      await fc.assert(
        fc.asyncProperty(
          fc.record({
            phi: extreme,
            dilution: extreme,
            tol: extreme,
            p: extremeText,
            u: unit,
            v: extremeText,
            t: extremeText,
            days: extremeText,
            exp: extremeText,
            basis: fc.constantFrom('dilution', 'diluent_ratio', 'fuel_fraction'),
          }),
          async (x) => {
            const recipe = {
              id: 'big',
              tank: 'MT-1',
              volume: `${x.v} L`,
              pressure: `${x.p} ${x.u}`,
              temperature: `${x.t} K`,
              mixture: { fuel: 'CH4', oxidizer: 'O2', diluent: 'Ar', phi: x.phi, [x.basis]: x.dilution },
              tolerance: { relative: x.tol },
            };
            const f = file('yaml', stringify(recipe));
            judge(await run(['plan', f]), [0, 2, 3], `recipe ${JSON.stringify(recipe)}`);
            judge(
              await run([
                'plan',
                RECIPE,
                '--phi',
                String(x.phi),
                '--pressure',
                `${x.p} ${x.u}`,
                '--experiments',
                x.exp,
              ]),
              [0, 2, 3],
              `plan --phi ${x.phi} --pressure ${x.p} ${x.u} --experiments ${x.exp}`,
            );
            judge(
              await run([
                'ready',
                RECIPE,
                '--days',
                x.days,
                '--height',
                `${x.v} m`,
                '--leak',
                `${x.p} Torr/min`,
              ]),
              [0, 2, 3],
              `ready --days ${x.days} --height ${x.v} m --leak ${x.p}`,
            );
            judge(
              await run(['species', 'CH4', '--temperature', `${x.t} ${x.u}`]),
              [0, 2],
              `species --temperature ${x.t} ${x.u}`,
            );
          },
        ),
        { numRuns: Math.ceil(RUNS / 2) },
      );
    },
    BUDGET_MS,
  );

  it(
    'extreme CSV readings with Monte Carlo trials: exit 0, 2 or 4, never an internal error',
    async () => {
      await fc.assert(
        fc.asyncProperty(
          fc.array(fc.tuple(fc.constantFrom('CH4', 'Ar', 'O2'), extremeText, unit), {
            minLength: 1,
            maxLength: 3,
          }),
          fc.constantFrom('100000', '1e999', '1e5', '-0'),
          async (rows, trials) => {
            const f = file(
              'csv',
              ['species,pressure,temperature', ...rows.map(([s, p, u]) => `${s},${p} ${u},25 degC`)].join(
                '\n',
              ),
            );
            judge(
              await run(['check', f, '--trials', trials]),
              // no --recipe: no design, so never a pass (NO DESIGN, exit 7; README "Exit codes")
              [2, 4, 7],
              `check ${rows.join(' | ')} --trials ${trials}`,
            );
          },
        ),
        { numRuns: Math.ceil(RUNS / 40) },
      );
    },
    BUDGET_MS,
  );

  it(
    'YAML alias bombs and unresolved aliases, in recipes and lab profiles: refused or inert, never expanded',
    async () => {
      const bomb = fc.record({
        depth: fc.integer({ min: 1, max: 7 }),
        width: fc.integer({ min: 1, max: 12 }),
        at: fc.constantFrom('notes', 'order', 'mixture', 'junk', 'tank'),
        unresolved: fc.boolean(),
      });
      await fc.assert(
        fc.asyncProperty(bomb, fc.boolean(), async (b, inLab) => {
          const lines = ['a0: &a0 [x, x, x, x, x, x, x, x, x, x]'];
          for (let i = 1; i <= b.depth; i++)
            lines.push(
              `a${i}: &a${i} [${Array(b.width)
                .fill(`*a${i - 1}`)
                .join(', ')}]`,
            );
          const ref = b.unresolved ? '*nowhere' : `*a${b.depth}`;
          const text = inLab
            ? `${lines.join('\n')}\n${DEMO_LAB_YAML.replace('notes:', `notes: ${ref}\nxnotes:`)}`
            : `${lines.join('\n')}\nid: bomb\ntank: MT-1\npressure: 1000 Torr\ntemperature: 25 degC\nmixture: { fractions: Ar }\n${b.at}: ${ref}\n`;
          const f = file('yaml', text.replace(/^mixture: \{ fractions: Ar \}\nmixture:/m, 'mixture:'));
          const r = await run(inLab ? ['plan', RECIPE, '--lab', f] : ['plan', f]);
          judge(
            r,
            [2],
            `alias depth ${b.depth} width ${b.width} at ${b.at}${inLab ? ' in the lab' : ''}${b.unresolved ? ' unresolved' : ''}`,
          );
        }),
        { numRuns: Math.ceil(RUNS / 4) },
      );
    },
    BUDGET_MS,
  );

  it(
    'a byte-order mark changes nothing: the same exit and output as without it',
    async () => {
      await fc.assert(
        fc.asyncProperty(fc.constantFrom('yaml', 'csv'), fc.nat(40), async (kind, cut) => {
          const base =
            kind === 'yaml'
              ? readFileSync(RECIPE, 'utf8')
              : CSV.split('\n')
                  .slice(0, 2 + (cut % 3))
                  .join('\n');
          const plain = file(kind, base);
          const bom = file(kind, `\ufeff${base}`);
          const args = (f: string) =>
            kind === 'yaml'
              ? ['plan', f, '--json']
              : ['check', f, '--recipe', RECIPE, '--json', '--trials', '100000'];
          const a = await run(args(plain));
          const b = await run(args(bom));
          judge(b, [0, 2, 3, 4, 7], `BOM ${kind}`); // 7: the demo readings are not shown within tolerance
          expect(b.code).toBe(a.code);
          expect(b.stdout.split(bom).join('F')).toBe(a.stdout.split(plain).join('F'));
        }),
        { numRuns: Math.ceil(RUNS / 40) },
      );
    },
    BUDGET_MS,
  );

  it(
    'suffixed gauge and degree units, with and without a barometer: converted or refused with what to give',
    async () => {
      const value = fc.oneof(
        fc.constantFrom('0', '15', '-14.7', '1.2', '100', '-20', '1e3'),
        fc.double({ min: -50, max: 500, noNaN: true }).map((v) => v.toPrecision(5)),
      );
      const pu = fc.constantFrom(
        'psig',
        'psi(g)',
        'barg',
        'bar(g)',
        'kPag',
        'kPa(g)',
        'mbarg',
        'psia',
        'psi(a)',
        'bara',
        'bar(a)',
        'kPa(a)',
        'Torr',
        'psi',
      );
      const tu = fc.constantFrom('°C', '℃', '°F', 'degC', 'degF', 'K', 'C', 'F', '°K', 'c');
      const noBaroLab = file(
        'yaml',
        DEMO_LAB_YAML.replace(/barometer:\n {2}pressure: 760 Torr\n {2}uncertainty: 0.4 Torr\n/, ''),
      );
      await fc.assert(
        fc.asyncProperty(
          value,
          pu,
          value,
          tu,
          fc.constantFrom(undefined, '750 Torr', '1013 hPa', '29.9 inHg', '5 psig', '2 bar'),
          fc.boolean(),
          async (p, u, t, v, baro, labless) => {
            const args = ['plan', RECIPE, '--pressure', `${p} ${u}`, '--temperature', `${t} ${v}`];
            if (baro) args.push('--barometer', baro);
            if (labless) args.push('--lab', noBaroLab);
            const r = await run([...args, '--json']);
            judge(r, [0, 2, 3], args.join(' '));
            if (r.code === 2 && /g\)?$/.test(u) && !baro && labless)
              expect(r.stderr).toMatch(/needs-barometer|not-positive|out-of-range|bad-quantity/);
            if (r.code !== 2 && (v === 'C' || v === 'F' || v === 'c'))
              throw new Error(`"${t} ${v}" was read as a temperature`);
            const rows = `species,pressure,temperature,gauge\nCH4,${p} ${u},${t} ${v},head-1kT\nAr,${Number(p) + 5} psi,25 degC,xdcr-100g\n`;
            const cargs = ['check', file('csv', rows), '--trials', '100000'];
            if (baro) cargs.push('--barometer', baro);
            // no --recipe: no design, so never a pass (NO DESIGN, exit 7; README "Exit codes"); a reading
            // past its gauge's full scale is a danger of the record, which precedes it (exit 3)
            const cr = await run(cargs);
            const pastScale = /above its full scale/.test(cr.stdout);
            judge(cr, pastScale ? [2, 3] : [2, 4, 7], cargs.join(' '));
            if (cr.code === 3) expect(cr.stdout).toMatch(/Verdict\s+NO DESIGN - not a pass/);
          },
        ),
        { numRuns: Math.ceil(RUNS / 16) },
      );
    },
    BUDGET_MS,
  );

  it(
    'output through symlinks, folders, read-only and full targets: "wrote" only for the whole file, else nothing changed',
    async () => {
      const target = fc.constantFrom(
        'plain',
        'exists',
        'dangling-link',
        'link-to-file',
        'link-to-folder',
        'folder',
        'missing-folder',
        'read-only',
        'full',
      );
      await fc.assert(
        fc.asyncProperty(
          target,
          fc.constantFrom('md', 'txt', 'html'),
          fc.boolean(),
          fc.boolean(),
          async (kind, format, force, byExtension) => {
            const d = mkdtempSync(join(tmpdir(), 'mw-hostile-out-'));
            let out = join(d, `s.${format}`);
            if (kind === 'exists') writeFileSync(out, 'old');
            if (kind === 'dangling-link') symlinkSync(join(d, 'nowhere.txt'), out);
            if (kind === 'link-to-file') {
              writeFileSync(join(d, 'real.txt'), 'old');
              symlinkSync(join(d, 'real.txt'), out);
            }
            if (kind === 'link-to-folder') {
              mkdirSync(join(d, 'sub'));
              symlinkSync(join(d, 'sub'), out);
            }
            if (kind === 'folder') mkdirSync(out);
            if (kind === 'missing-folder') out = join(d, 'no', `s.${format}`);
            if (kind === 'read-only') {
              if (!readOnly) return;
              out = join(readOnly, `s.${format}`);
            }
            if (kind === 'full') {
              if (!full) return;
              for (const f of readdirSync(full)) rmSync(join(full, f), { force: true, recursive: true });
              out = join(full, `s.${format}`);
            }
            const folder = kind === 'read-only' ? readOnly! : kind === 'full' ? full! : d;
            const before = readdirSync(folder).sort();
            const args = [
              'sheet',
              RECIPE,
              '--batch',
              'fz',
              '-o',
              out,
              ...(byExtension ? [] : ['--format', format]),
              ...(force ? ['--force'] : []),
            ];
            const r = await run(args);
            judge(r, [0, 2], `${kind} ${args.join(' ')}`);
            if (r.code === 0) {
              expect(r.stdout).toContain('wrote');
              const printed = await run(['sheet', RECIPE, '--batch', 'fz', '--format', format]);
              expect(readFileSync(out, 'utf8'), `${kind}: the file differs from the sheet`).toBe(
                printed.stdout,
              );
            } else {
              expect(r.stdout).not.toContain('wrote');
              expect(readdirSync(folder).sort(), `${kind}: the folder changed on a refusal`).toEqual(before);
            }
            if (kind === 'full')
              for (const f of readdirSync(full!)) rmSync(join(full!, f), { force: true, recursive: true });
          },
        ),
        { numRuns: Math.ceil(RUNS / 8) },
      );
    },
    BUDGET_MS,
  );
});
