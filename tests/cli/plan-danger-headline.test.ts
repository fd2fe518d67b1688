import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, sheetFlowed } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const OVER = ['--pressure', '3000 Torr'];
/** the findings' DANGER lines of a plan text */
const dangerLines = (text: string) => text.split('\n').filter((l) => /^ {2}DANGER /.test(l));

describe('a plan with dangers is headlined by the danger, before the tolerance (README "Exit codes")', () => {
  it('plan text: line 2 counts and names the dangers with their fills; the tolerance headline follows; --json dangers', async () => {
    const r = await runCli(['plan', RECIPE, ...OVER]);
    expect(r.code).toBe(3);
    const lines = r.stdout.split('\n');
    expect(lines[0]).toMatch(/^Fill plan /);
    const found = dangerLines(r.stdout);
    expect(found.length).toBe(3);
    // every danger of the findings is named in the headline, with its fill
    for (const l of found) {
      const [, code, fill] = /DANGER {2}([a-z-]+) \(fill (\d+)\)/.exec(l)!;
      expect(lines[1]).toMatch(new RegExp(`${code} \\(fills? ([\\d, ]*\\b${fill}\\b)`));
    }
    expect(lines[1]).toBe(
      'DANGER findings stand (3): tank-over-rating (fills 2, 3), supply-pressure-low (fill 3). Do not fill ' +
        'as planned: see the findings (below); fill only once each is resolved or formally accepted.',
    );
    expect(lines[2]).toMatch(/^CANNOT MEET ITS TOLERANCE \(x\(O2\)\)/);
    const json = JSON.parse((await runCli(['plan', RECIPE, ...OVER, '--json'])).stdout);
    expect(json.dangers).toBe(3);
    expect(json.findings.filter((f: { severity: string }) => f.severity === 'danger').length).toBe(3);
  });

  it('a plan without a danger has no DANGER line and --json dangers 0', async () => {
    const r = await runCli(['plan', RECIPE]);
    expect(r.code).toBe(0);
    expect(r.stdout).not.toContain('DANGER');
    expect(r.stdout.split('\n')[1]).toMatch(/^CANNOT MEET ITS TOLERANCE/);
    const json = JSON.parse((await runCli(['plan', RECIPE, '--json'])).stdout);
    expect(json.dangers).toBe(0);
    // phi and the dilution are shown, not judged: no tolerance in the text ("-"), null in the JSON
    const rows: { name: string; kind: string; tolerance: number | null; within_tolerance: boolean | null }[] =
      json.predicted.rows;
    expect(r.stdout).toMatch(/^ {2}phi +[\d.]+ +[\d.]+ +[\d.]+ % +- {2}/m);
    for (const row of rows.filter((x) => x.kind !== 'fraction'))
      expect([row.name, row.tolerance, row.within_tolerance]).toEqual([row.name, null, null]);
    expect(rows.find((x) => x.name === 'O2')!.within_tolerance).toBe(false);
  });

  it('a given order under a danger is not neutral: the Order line counts its dangers and names the advised order', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-order-'));
    const file = join(dir, 'ordered.yaml');
    writeFileSync(file, `${readFileSync(RECIPE, 'utf8')}order: [CH4, O2, Ar]\n`);
    // 2900 Torr: over MT-1's working limit (2700 Torr), within its rating (3000.25 Torr) with the Ar's
    // band (+-15.0 Torr at 3000 Torr would pass the rating: refused, tests/core/tank-rating.test.ts)
    const r = await runCli(['plan', file, '--pressure', '2900 Torr']);
    expect(r.code).toBe(3);
    const n = dangerLines(r.stdout).length;
    expect(n).toBeGreaterThan(0);
    expect(r.stdout.split('\n')[1]).toMatch(new RegExp(`^DANGER findings stand \\(${n}\\): `));
    const order = r.stdout.split('\n').find((l) => l.startsWith('Order '))!;
    expect(order).toContain(
      `(as given; the plan in this given order has ${n} DANGER findings (see the findings)`,
    );
    // the review's safer order (its safer-order warning) is named on the line
    expect(r.stdout).toMatch(/warning safer-order: .*CH4 -> Ar -> O2 avoids them/);
    expect(order).toContain('the advised order: CH4 -> Ar -> O2 (safer-order)');
  });
});

// the safer-order warning once: it carried the advice's reason, written to explain the advised order against
// the smallest-first order, so a given order that is the smallest-first one (CH4, O2, Ar here) was told
// its own hazard twice, the second time by cylinder ids ("not the smallest-first order (cyl-CH4, cyl-O2,
// cyl-Ar), which would give flammable-state after fill 2"); the finding keeps only the advice's claim
describe('plan --order with an inline design: the safer-order warning says it once', () => {
  const INLINE = ['--fuel', 'CH4', '--oxidizer', 'O2', '--phi', '1', '--diluent', 'Ar', '--dilution', '0.85'];
  const TANK = ['--tank', 'MT-1', '--pressure', '1000 Torr', '--temperature', '22 degC'];
  it.each(['CH4,O2,Ar', 'O2,Ar,CH4'])('--order %s', async (given) => {
    const r = await runCli(['plan', ...INLINE, ...TANK, '--order', given]);
    expect(r.code, r.stderr).toBe(3);
    const safer = r.stdout.split('\n').filter((l) => /safer-order|smallest-first/.test(l));
    // the Order line names the advised order and points at the finding; the finding states it
    expect(safer).toHaveLength(2);
    expect(safer[0]).toMatch(/^Order {7}.*the advised order: CH4 -> Ar -> O2 \(safer-order\)\)$/);
    expect(safer[1]).toBe(
      '  warning safer-order: the order given makes flammable or hazardous intermediate states or fills; ' +
        'CH4 -> Ar -> O2 avoids them (by the order review, every intermediate tank state is ' +
        'non-flammable and free of the hazards checked, and so is every fill path ' +
        'short of the finished ' +
        "mixture; the finished mixture, the same in every order, is judged by the plan's own findings)",
    );
    // planned in the advised order the batch is flammable (flammable-mixture at fill 3, in this plan too:
    // the finished mixture does not depend on the order), so the last fill's path is not non-flammable:
    // the warning never claims every fill path is
    expect(r.stdout).toMatch(/warning flammable-mixture \(fill 3\)/);
    expect(safer[1]).not.toMatch(/every fill path is non-flammable/);
    // CH4's LFL, UFL and LOC are tabulated (no flammability-data-estimated note): the claim unqualified,
    // as the plain review's (tests/cli/order-claim-limits.test.ts)
    expect(r.stdout).not.toMatch(/flammability-data-estimated/);
    const advised = await runCli(['plan', ...INLINE, ...TANK, '--order', 'CH4,Ar,O2']);
    expect(advised.stdout).toMatch(/warning flammable-mixture \(fill 3\)/);
    const json = JSON.parse((await runCli(['plan', ...INLINE, ...TANK, '--order', given, '--json'])).stdout);
    expect(json.findings.filter((f: { code: string }) => f.code === 'safer-order')).toHaveLength(1);
  });
});

describe('the Order line of a sequence that keeps the advised order on other gauges', () => {
  it('does not compare the chosen order with itself by name (ng-blend-air: C2H6, CH4, N2+O2)', async () => {
    const r = await runCli(['plan', 'recipes/ng-blend-air.yaml']);
    const order = r.stdout.split('\n').find((l) => l.startsWith('Order '))!;
    expect(order).toContain('the advised order C2H6, CH4, N2+O2, read on other gauges,');
    expect(order).toMatch(
      /instead of [\d.]+ % \(x\(C2H6\)\) for the same order read on the gauges first chosen/,
    );
    expect(order).not.toContain('for the advised order C2H6, CH4, N2+O2');
    // the comparison it names is the sequence-chosen note's, which is printed
    expect(r.stdout).toMatch(/note {4}sequence-chosen \(fill 1\): /);
  });
});

describe('the fill sheet heads with the same lines, and its title is not the stale recipe title', () => {
  it('txt, md, html: the DANGER headline of the plan, then CANNOT MEET, above the design; a title from the plan', async () => {
    const plan = (await runCli(['plan', RECIPE, ...OVER])).stdout.split('\n');
    const txt = await runCli(['sheet', RECIPE, ...OVER, '--format', 'txt']);
    expect(txt.code).toBe(3);
    const t = txt.stdout;
    // the sheet wraps its prose at 80 columns: read it flowed
    const flowed = sheetFlowed(t);
    expect(flowed).toContain(`*** ${plan[1].replace(/\s+/g, ' ')} ***`);
    expect(t.indexOf('*** CANNOT MEET ITS TOLERANCE (x(O2))')).toBeGreaterThan(t.indexOf(plan[1]));
    expect(t.indexOf('*** CANNOT MEET ITS TOLERANCE')).toBeLessThan(t.indexOf('\nDESIGN'));
    // fill 2's band (+-0.0039 psi) holds one display value of the 0.01 psi step: no zero-width "low-high"
    // (its half-width in the table, the words under the row)
    expect(t).toMatch(
      /^ {2}2 .* {2}\+-0\.0039\n {5}\^ fill 2: band \+-0\.0039: finer than the display step /m,
    );
    expect(flowed).toContain(
      '^ fill 2: band +-0.0039: finer than the display step 0.01; only 42.54 reads inside it',
    );
    expect(t).not.toMatch(/(\d+\.\d+)-\1 /);
    // the recipe says 1500 Torr; planned here at 3000 Torr: the title says what is planned
    const title = flowed
      .split('\n')[0]
      .replace(/^=+ /, '')
      .replace(/ Batch .*$/, '');
    expect(title).toMatch(/^FILL SHEET CH4\/O2 phi 1 in 98 % Ar, 3000 Torr in MT-1 \(planned here with /);
    expect(title).toContain(
      '--pressure 3000 Torr; the recipe\'s title: "CH4/O2 phi 1 in 98 % Ar, 1500 Torr in MT-1")',
    );
    const md = (await runCli(['sheet', RECIPE, ...OVER, '--format', 'md'])).stdout;
    expect(md).toContain(`> **${plan[1]}**`);
    expect(md).toMatch(/> \*\*CANNOT MEET ITS TOLERANCE \(x\(O2\)\)/);
    expect(md.split('\n')[0]).toMatch(
      /^# Fill sheet — CH4\/O2 phi 1 in 98 % Ar, 3000 Torr in MT-1 \(planned/,
    );
    const html = (await runCli(['sheet', RECIPE, ...OVER, '--format', 'html'])).stdout;
    expect(html).toContain(`<div class="danger">${plan[1]}</div>`);
    expect(html).toMatch(/<div class="headline">CANNOT MEET ITS TOLERANCE/);
  });

  it("the recipe's own title where nothing overrides it; the label's verdict is check's printed one", async () => {
    for (const format of ['txt', 'md', 'html']) {
      const r = await runCli(['sheet', RECIPE, '--format', format]);
      expect(r.code).toBe(0);
      expect(r.stdout).toContain('CH4/O2 phi 1 in 98 % Ar, 1500 Torr in MT-1');
      expect(r.stdout).not.toContain('planned here with');
      expect(r.stdout).not.toContain('DANGER findings stand');
      expect(r.stdout).not.toContain('circle one');
      const words = format === 'txt' ? sheetFlowed(r.stdout) : r.stdout;
      expect(words).toMatch(/re-check verdict \(copy as printed by `mixwright check` of the log\): _+/);
    }
  });
});
