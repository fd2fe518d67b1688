// plan with a premix in a second tank: --premix-tank, the recipe's premix block, and the proposal.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, TORR } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';

describe('mixwright plan --premix-tank', () => {
  it('--premix-tank naming the batch tank itself is pointed at the option, not at a recipe line', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-tank', 'MT-1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /^mixwright: --premix-tank: the premix must be made in another tank than the batch \(both are MT-1\)/,
    );
    // in a recipe, at its premix.tank line
    const dir = mkdtempSync(join(tmpdir(), 'mw-same-tank-'));
    const f = join(dir, 'same.yaml');
    writeFileSync(
      f,
      'id: same\ntank: MT-1\nmixture: {fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1, dilution: 0.98}\n' +
        'pressure: 1500 Torr\ntemperature: 25 degC\npremix:\n  tank: MT-1\n',
    );
    const y = await runCli(['plan', f]);
    expect(y.code).toBe(2);
    expect(y.stderr).toContain(`${f}:7:9 premix.tank: the premix must be made in another tank`);
  });

  it('prints both stages, stage 1 first, and the premix tank delivery; exit 0', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-tank', 'MT-2']);
    expect(r.code).toBe(0);
    const s1 = r.stdout.indexOf('=== Stage 1 of 2: premix in MT-2 ===');
    const s2 = r.stdout.indexOf('=== Stage 2 of 2: the batch in MT-1, from the premix ===');
    expect(s1).toBeGreaterThan(0);
    expect(s2).toBeGreaterThan(s1);
    expect(r.stdout).toContain('Premix      13.42 % O2 in Ar in MT-2, filled to 1890.2 Torr');
    // the sequence search splits the batch's Ar so that the premix is read on the 1000 Torr head
    expect(r.stdout).toMatch(/3\s+Ar\+O2\s+premix-MT-2\s+head-1kT\s+520\.28 Torr/);
    expect(r.stdout).toContain(
      'Premix tank  MT-2: 1890.2 Torr before the batch, 1840.9 Torr after delivering',
    );
    expect(r.stdout).toMatch(/x\(O2\)\s+0\.0133333\s+0\.000048\s+0\.36 %\s+\+-0\.5 %\s+within/);
  });

  it('--json: two_stage with stage 1 then the batch, each with steps, findings and predicted; the batch U includes the premix', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-tank', 'MT-2', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    const t = j.two_stage;
    expect(t.premix_tank).toBe('MT-2');
    expect(t.stages.map((s: { role: string }) => s.role)).toEqual(['premix', 'batch']);
    expect(t.stages[0].order.fills).toEqual(['Ar', 'O2']);
    expect(t.stages[1].order.fills).toEqual(['CH4', 'Ar', 'Ar+O2', 'Ar']);
    for (const s of t.stages) {
      expect(s.steps.length).toBeGreaterThan(0);
      expect(Array.isArray(s.findings)).toBe(true);
      expect(s.predicted.composition.O2.u).toBeGreaterThan(0);
    }
    // the top level stays the batch (the documented keys), the same as stage 2
    expect(j.steps).toEqual(t.stages[1].steps);
    expect(t.delivery.start_Pa / TORR).toBeCloseTo(1890.2, 1);
    expect(t.delivery.end_Pa).toBeGreaterThan(t.delivery.required_Pa);
    // the batch budget names the premix's inputs
    const names = Object.keys(j.predicted.budget ?? {}).join(' ') + JSON.stringify(j.predicted);
    expect(names).toContain('premix-MT-2: ');
  });

  it('a single-tank plan over tolerance proposes the premix: a note naming the option and the U', async () => {
    const r = await runCli(['plan', RECIPE, '--json']);
    const j = JSON.parse(r.stdout);
    expect(j.two_stage).toBeNull();
    const f = j.two_stage_proposal;
    expect(f.code).toBe('two-stage-proposed');
    // the plan's findings stay those the sheet prints; the text lists the proposal among them
    expect(j.findings.map((x: { code: string }) => x.code)).not.toContain('two-stage-proposed');
    expect((await runCli(['plan', RECIPE])).stdout).toContain(
      'note    two-stage-proposed: a premix of 13.4 % O2 in Ar',
    );
    expect(f.severity).toBe('note');
    expect(f.premix_tank).toBe('MT-2');
    expect(f.command).toBe(`mixwright plan ${RECIPE} --premix-tank MT-2`);
    expect(f.two_stage_u).toBeCloseTo(0.0036, 4);
    // the single tank's best safe sequence (split Ar) is still over the 0.5 % tolerance
    expect(f.single_u).toBeGreaterThan(0.005);
    expect(f.message).toContain('--premix-tank MT-2');
    // the demo's proposed premix (13.4 % O2, Ar -> O2) carries no warning, and the note says none
    expect(f.warnings).toEqual([]);
    expect(f.message).not.toMatch(/carries warning/);
  });

  it('a proposal from inline options names a runnable command: the options as given, --premix-tank added', async () => {
    const opts = ['--fuel', 'CH4', '--oxidizer', 'O2', '--phi', '1', '--diluent', 'Ar', '--dilution', '0.98'];
    const where = ['--tank', 'MT-1', '--pressure', '1500 Torr', '--temperature', '25 degC'];
    const j = JSON.parse((await runCli(['plan', ...opts, ...where, '--json'])).stdout);
    const f = j.two_stage_proposal;
    expect(f.command).toBe(
      `mixwright plan ${opts.join(' ')} --tank MT-1 --pressure '1500 Torr' --temperature '25 degC' --premix-tank MT-2`,
    );
    // and it plans the two stages
    const two = JSON.parse(
      (await runCli(['plan', ...opts, ...where, '--premix-tank', 'MT-2', '--json'])).stdout,
    );
    expect(two.two_stage).not.toBeNull();
  }, 120_000);

  it('a fill order given (--order, or order: in the recipe) never gets a proposal command that is refused', async () => {
    // a premix tank takes no fill order (stage-order, exit 2): the printed command must run as printed
    const words = (line: string) =>
      [...line.matchAll(/'((?:[^']|'\\'')*)'|(\S+)/g)].map((m) =>
        m[1] !== undefined ? m[1].replace(/'\\''/g, "'") : m[2],
      );
    const runs = async (command: string) => {
      const argv = words(command);
      expect(argv.slice(0, 2)).toEqual(['mixwright', 'plan']);
      const r = await runCli([...argv.slice(1), '--json']);
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).two_stage.premix_tank).toBe('MT-2');
    };
    // --order on the command line: left out of the command, and said so
    const inline = JSON.parse(
      (await runCli(['plan', RECIPE, '--order', 'CH4,Ar,O2', '--json'])).stdout,
    ).two_stage_proposal;
    expect(inline.command).toBe(`mixwright plan ${RECIPE} --premix-tank MT-2`);
    expect(inline.order_left_out).toBe('CH4,Ar,O2');
    expect(inline.message).toContain('(--order CH4,Ar,O2 left out: a premix tank takes no fill order');
    await runs(inline.command);
    // order: in the recipe file: the file would give it again, so no command, and why and what to do
    const dir = mkdtempSync(join(tmpdir(), 'mw-order-proposal-'));
    const body = readFileSync(RECIPE, 'utf8');
    const withOrder = join(dir, 'ordered.yaml');
    writeFileSync(withOrder, `${body}order: [CH4, Ar, O2]\n`);
    const r = await runCli(['plan', withOrder, '--json']);
    expect(r.code).toBe(0);
    const f = JSON.parse(r.stdout).two_stage_proposal;
    expect(f.command).toBeUndefined();
    expect(f.recipe_order).toEqual({ file: withOrder, order: 'CH4,Ar,O2' });
    expect(f.message).toContain(`no command is given, since ${withOrder} fixes the fill order`);
    expect(f.message).toContain(
      'take order: out of a copy of the recipe, then plan that copy with --premix-tank MT-2',
    );
    // the text says the same, and names no command that would be refused
    const text = (await runCli(['plan', withOrder])).stdout;
    expect(text).toContain('no command is given');
    expect(text).not.toContain(`mixwright plan ${withOrder} --premix-tank`);
    // what the message says to do runs: the copy without order:, with --premix-tank
    const copy = join(dir, 'copy.yaml');
    writeFileSync(copy, body);
    await runs(`mixwright plan ${copy} --premix-tank MT-2`);
    // and the command it would have printed is refused, which is why it prints none
    expect((await runCli(['plan', withOrder, '--premix-tank', 'MT-2'])).code).toBe(2);
  }, 180_000);

  it('a plan that cannot meet its tolerance says so under its first line, with the cause and the fix; exit 0 (README exit codes)', async () => {
    // the demo recipe in one tank: x(O2) predicted over its 0.5 % tolerance (README's table)
    const one = await runCli(['plan', RECIPE]);
    expect(one.code).toBe(0);
    const [first, head] = one.stdout.split('\n');
    expect(first).toMatch(/^Fill plan /);
    expect(head).toMatch(/^CANNOT MEET ITS TOLERANCE \(x\(O2\)\): even readings exactly at the targets/);
    expect(head).toContain('NOT SHOWN WITHIN TOLERANCE by `check` (not a pass)');
    expect(head).toMatch(/Worst: the predicted U \(k = 2\) of x\(O2\) is [\d.]+ % of its design value/);
    expect(head).toMatch(/The largest cause \(\d+ % of u\^2\) is .+; what would reduce it: /);
    // the two stages meet it: no such line anywhere
    const two = await runCli(['plan', RECIPE, '--premix-tank', 'MT-2']);
    expect(two.stdout).not.toContain('CANNOT MEET ITS TOLERANCE');
    // a two-stage plan that cannot meet a tighter tolerance says so under its own first line, and why
    const tight = await runCli(['plan', RECIPE, '--premix-tank', 'MT-2', '--tolerance', '0.001']);
    expect(tight.code).toBe(0);
    const lines = tight.stdout.split('\n');
    expect(lines[0]).toMatch(/^Two-stage preparation: /);
    expect(lines[1]).toMatch(/^CANNOT MEET ITS TOLERANCE \(/);
    expect(lines[1]).toMatch(
      /(None of the \d+ premix choices planned without a danger meets it|A premix choice that meets it was passed over)/,
    );
  }, 120_000);

  it('the choices are ranked on the unsearched batch: the quietest is searched too, and kept when it then meets the tolerance', async () => {
    // 200 ppm CH4, 2 % O2 in Ar, tolerance 0.25 %: ranked on its unsearched batch, a 6 % O2 premix filled
    // minor-first (warnings safer-order, oxygen-compression) meets the tolerance and a quiet 20 % O2 premix
    // does not; searched, the quiet one meets it too, so it is kept (no computed value: the rule's choice)
    const r = await runCli([
      'plan',
      ...['--fractions', 'CH4:0.0002,O2:0.02,Ar:0.9798', '--tank', 'MT-1', '--pressure', '1500 Torr'],
      ...['--temperature', '22 degC', '--premix-tank', 'MT-2', '--tolerance', '0.0025', '--json'],
    ]);
    expect(r.code).toBe(0);
    const t = JSON.parse(r.stdout).two_stage;
    expect(t.premix.composition.O2).toBeCloseTo(0.2, 3);
    // no hazard warning: band-edges-past-tolerance, added to each stage of the chosen plan after the search
    // (how closely a paper fill must read its bands, not a hazard of the choice), is left aside
    const warnings = t.stages.flatMap((s: { findings: { severity: string; code: string }[] }) =>
      s.findings.filter((f) => f.severity === 'warning').map((f) => f.code),
    );
    expect(warnings.filter((k: string) => k !== 'band-edges-past-tolerance')).toEqual([]);
    // the design fractions are judged against the tolerance (phi and the dilution are shown, not judged: null)
    const rows: { kind: string; within_tolerance: boolean | null }[] = t.stages[1].predicted.rows;
    expect(rows.filter((x) => x.kind === 'fraction').length).toBe(3);
    expect(rows.every((x) => x.within_tolerance === (x.kind === 'fraction' ? true : null))).toBe(true);
  }, 120_000);

  it('an unknown premix tank, or the batch tank itself, is refused with exit 2', async () => {
    const unknown = await runCli(['plan', RECIPE, '--premix-tank', 'MT-9']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toContain('MT-9');
    const same = await runCli(['plan', RECIPE, '--premix-tank', 'MT-1']);
    expect(same.code).toBe(2);
    expect(same.stderr).toContain('another tank than the batch');
  });

  it("the recipe's premix block fixes fraction, pressure and order (the more precise choice)", async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-premix-'));
    const file = join(dir, 'r.yaml');
    writeFileSync(
      file,
      [
        'id: two-stage-o2',
        'tank: MT-1',
        'mixture: { fuel: CH4, oxidizer: O2, diluent: Ar, phi: 1.0, dilution: 0.98 }',
        'pressure: 1500 Torr',
        'temperature: 25 degC',
        'premix: { tank: MT-2, gases: [O2], fraction: 0.04026845637583896, pressure: 2835 Torr, order: minor-first }',
      ].join('\n'),
    );
    const r = await runCli(['plan', file, '--json']);
    expect(r.code).toBe(0);
    const t = JSON.parse(r.stdout).two_stage;
    expect(t.premix.order).toBe('minor-first');
    expect(t.stages[0].order.fills).toEqual(['O2', 'Ar']);
    const o2 = t.stages[1].predicted.composition.O2;
    // predicted U (k = 2) of O2 0.235 % (tests/core/two-stage.test.ts), +-0.01 % abs
    expect(Math.abs((2 * o2.u) / o2.value - 0.00235)).toBeLessThan(1e-4);
    expect(t.stages[0].findings.map((f: { code: string }) => f.code)).toContain('oxygen-compression');
  });

  it('sheet: one sheet per stage, stage 1 first; HTML one document with a page break', async () => {
    const txt = await runCli(['sheet', RECIPE, '--premix-tank', 'MT-2', '--format', 'txt']);
    expect(txt.code).toBe(0);
    const a = txt.stdout.indexOf('FILL SHEET  Stage 1 of 2: premix in MT-2');
    const b = txt.stdout.indexOf('FILL SHEET  Stage 2 of 2:');
    expect(a).toBeGreaterThanOrEqual(0);
    expect(b).toBeGreaterThan(a);
    expect(txt.stdout.slice(b)).toContain('premix-MT-2');
    expect(txt.stdout.slice(b)).toMatch(/Premix tank\s+MT-2 at 1890\.2 Torr before; 1840\.9 Torr after/);
    // its targets come from stage 1's prediction: the sheet says so and how to re-print it from the log
    expect(txt.stdout.slice(b).replace(/\s+/g, ' ')).toContain(
      're-print this sheet with `sheet --premix-log`',
    );
    const html = await runCli(['sheet', RECIPE, '--premix-tank', 'MT-2', '--format', 'html']);
    expect(html.code).toBe(0);
    expect(html.stdout.match(/<html/g)?.length).toBe(1);
    expect(html.stdout.match(/<\/body>/g)?.length).toBe(1);
    expect(html.stdout).toContain('break-before: page');
    expect(html.stdout.indexOf('Stage 1 of 2')).toBeLessThan(html.stdout.indexOf('Stage 2 of 2'));
  });
});
