// `check --json` `verdict` is the re-check's overall outcome, the one the exit code gives (README "Exit
// codes" and "--json"): `pass` only for exit 0; the composition's own judgement is `composition_verdict`
// and every outcome that stands against a pass is listed in `outcomes`, in exit precedence. A tool that
// reads only `verdict` is never told "pass" where the text and the exit code say "not a pass". No
// computed number is checked here (the demo logs' numbers are check's own); only what is said of them.
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { labelBoxText, runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

const TRIALS = ['--trials', '100000'];
const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const dir = mkdtempSync(join(tmpdir(), 'mw-verdict-json-'));

/** the plan of recipes/ng-blend-air.yaml (a detonable-state danger at fill 3) read exactly at its targets */
function ngLog(name: string, accept: boolean): string {
  const req = buildPlanRequest(readRecipe('recipes/ng-blend-air.yaml'));
  const plan = planFill(req.input);
  const f = join(dir, name);
  return logAtTargets(f, plan, req, 'ng1', accept ? { by: 'TT' } : undefined);
}

async function json(args: string[]) {
  const r = await runCli(['check', ...args, '--json', ...TRIALS]);
  return { code: r.code, j: JSON.parse(r.stdout), stdout: r.stdout, stderr: r.stderr };
}

async function text(args: string[]) {
  const r = await runCli(['check', ...args, ...TRIALS]);
  return { ...r, verdict: r.stdout.split('\n').find((l) => l.startsWith('Verdict')) ?? '' };
}

describe('check --json: verdict, composition_verdict and outcomes agree with the exit code', () => {
  let unacked = '';
  let acked = '';
  let altered = '';
  let pastGauge = '';
  beforeAll(() => {
    unacked = ngLog('ng-unacked.jsonl', false);
    acked = ngLog('ng-acked.jsonl', true);
    altered = join(dir, 'premix-altered.jsonl');
    copyFileSync(PREMIX, altered);
    // the reading text changed after writing: off its hash chain (the numbers as they stand still pass)
    writeFileSync(
      altered,
      readFileSync(altered, 'utf8').replace('"reading":"1890.2 Torr"', '"reading":"1891.2 Torr"'),
    );
    pastGauge = join(dir, 'past-gauge.csv');
    writeFileSync(
      pastGauge,
      'species,pressure,temperature,gauge\nCH4,10.0126 Torr,25.0 degC,head-1kT\n' +
        'Ar,1480.02 Torr,25.0 degC,head-1kT\nO2,1500.0 Torr,25.0 degC,head-10kT\n',
    );
  });

  it('exit 0: a pass is "pass" in both keys and no outcome stands', async () => {
    const { code, j } = await json([PREMIX]);
    expect(code).toBe(0);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual(['pass', 'pass', []]);
  });

  it('exit 3: a reading past a gauge range is "danger" beside a composition inside tolerance', async () => {
    const { code, j } = await json([pastGauge, '--recipe', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(code).toBe(3);
    expect(j.verdict).toBe('danger');
    expect(j.danger).toBe(true);
    expect(j.composition_verdict).not.toBe('fail');
    expect(j.outcomes[0]).toBe('danger');
  });

  it('exit 4: out of tolerance is "fail" in both keys', async () => {
    const { code, j } = await json(['batches/demo-c2h4-phi05-ar-overshoot.jsonl']);
    expect(code).toBe(4);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual(['fail', 'fail', ['fail']]);
  });

  it('exit 5: an altered record whose numbers pass is "record-altered", never "pass"; the text says not a pass', async () => {
    const { code, j } = await json([altered]);
    expect(code).toBe(5);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual([
      'record-altered',
      'pass',
      ['record-altered'],
    ]);
    const t = await text([altered]);
    expect(t.code).toBe(5);
    expect(t.verdict).toMatch(/^Verdict {5}RECORD ALTERED AFTER WRITING \(line \d+\) - not a pass/);
  });

  it('exit 6: hazards accepted at the manifold are "accepted-hazard"; the text leads with NOT A PASS', async () => {
    const { code, j } = await json([acked]);
    expect(code).toBe(6);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual([
      'accepted-hazard',
      'pass',
      ['accepted-hazard'],
    ]);
    expect(j.plan_dangers_not_acknowledged).toEqual([]);
    const t = await text([acked]);
    expect(t.verdict).toMatch(
      /^Verdict {5}NOT A PASS - the composition alone is within tolerance .* - ACCEPTED HAZARD /,
    );
    expect(t.verdict).not.toMatch(/^Verdict {5}PASS/);
  });

  it('exit 7: not shown within tolerance is "not-shown-within-tolerance", the composition "pass-uncertain"', async () => {
    const { code, j } = await json(['batches/demo-ch4-phi1-ar98.jsonl']);
    expect(code).toBe(7);
    expect([j.verdict, j.composition_verdict]).toEqual(['not-shown-within-tolerance', 'pass-uncertain']);
  });

  it('exit 2: a refusal keeps verdict "refused", with no composition verdict', async () => {
    const { code, j } = await json([join(dir, 'no-such.jsonl')]);
    expect(code).toBe(2);
    expect([j.verdict, j.composition_verdict, j.composition]).toEqual(['refused', null, null]);
  });

  it('a folder: each row carries the overall verdict and the composition verdict, the exit the first of 4, 3, 6, 5, 7', async () => {
    const folder = join(dir, 'folder');
    mkdirSync(folder);
    copyFileSync(PREMIX, join(folder, 'a-pass.jsonl'));
    copyFileSync(altered, join(folder, 'b-altered.jsonl'));
    copyFileSync(unacked, join(folder, 'c-unacked.jsonl'));
    const r = await runCli(['check', folder, '--json']);
    expect(r.code).toBe(6);
    const rows = JSON.parse(r.stdout) as { file: string; verdict: string; composition_verdict: string }[];
    expect(rows.map((x) => [x.file.slice(folder.length + 1), x.verdict, x.composition_verdict])).toEqual([
      ['a-pass.jsonl', 'pass', 'pass'],
      ['b-altered.jsonl', 'record-altered', 'pass'],
      ['c-unacked.jsonl', 'plan-danger-not-acknowledged', 'pass'],
    ]);
    const summary = await runCli(['check', folder]);
    expect(summary.code).toBe(6);
    expect(summary.stdout).toMatch(
      /c-unacked\.jsonl .* NOT A PASS \(composition alone within tolerance, which does not make the tank usable\), PLAN DANGER NOT ACKNOWLEDGED \(detonable-state \(fill 3\)\)/,
    );
  });
});

describe("a plan's danger that the log records no acknowledgement of: never weaker than an accepted one", () => {
  let unacked = '';
  beforeAll(() => {
    unacked = ngLog('ng-unacked-2.jsonl', false);
  });

  it('check: PLAN DANGER NOT ACKNOWLEDGED leads the verdict, with its caveat; exit 6; JSON says so', async () => {
    const t = await text([unacked]);
    expect(t.code).toBe(6);
    expect(t.verdict).toMatch(/^Verdict {5}NOT A PASS - /);
    expect(t.verdict).toContain('PLAN DANGER NOT ACKNOWLEDGED (detonable-state (fill 3))');
    expect(t.stdout).toContain(
      "PLAN DANGER NOT ACKNOWLEDGED: the plan's safety review found detonable-state (fill 3) (a danger), and " +
        'this log records no acknowledgement of it',
    );
    const { code, j } = await json([unacked]);
    expect(code).toBe(6);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual([
      'plan-danger-not-acknowledged',
      'pass',
      ['plan-danger-not-acknowledged'],
    ]);
    expect(j.plan_dangers_not_acknowledged).toEqual([{ code: 'detonable-state', step: 3 }]);
    expect(j.accepted_hazards).toEqual([]);
    expect(j.verdict_caveats[0]).toMatch(/^PLAN DANGER NOT ACKNOWLEDGED: /);
  });

  it('label: the headline says it and no pass, the caveat in the box, the certificate leads with it; exit 6', async () => {
    const r = await runCli(['label', unacked, ...TRIALS]);
    expect(r.code).toBe(6);
    const box = labelBoxText(r.stdout);
    expect(box).toContain('*** PLAN DANGER NOT ACKNOWLEDGED - NOT A PASS ***');
    expect(box).toContain('composition only, within tolerance with U: it does not make the tank usable');
    expect(box).toContain("! PLAN DANGER NOT ACKNOWLEDGED: the plan's safety review found detonable-state");
    expect(box).not.toContain('PASS - as filled');
    expect(r.stdout).toMatch(/^VERDICT {2}NOT A PASS - PLAN DANGER NOT ACKNOWLEDGED/m);
    expect(r.stderr).toContain('PLAN DANGER NOT ACKNOWLEDGED');
  });

  it('CSV readings against a recipe whose plan has a danger: no acknowledgement is recorded, the same outcome (exit 6)', async () => {
    const args = ['readings/ng-blend-air.csv', '--recipe', 'recipes/ng-blend-air.yaml'];
    const { code, j } = await json(args);
    expect(code).toBe(6);
    expect(j.verdict).toBe('plan-danger-not-acknowledged');
    expect(j.plan_dangers_not_acknowledged).toEqual([{ code: 'detonable-state', step: 3 }]);
    expect(j.verdict_caveats[0]).toContain(
      "PLAN DANGER NOT ACKNOWLEDGED: the plan's safety review of recipe recipes/ng-blend-air.yaml found " +
        'detonable-state (fill 3) (a danger), and CSV readings record neither whether the fill went through it ' +
        'nor that anyone accepted it',
    );
    // a recipe whose plan has no danger: nothing of the kind
    const ch4 = await json(['readings/ch4-phi1-ar98.csv', '--recipe', 'recipes/ch4-o2-ar-phi1.yaml']);
    expect(ch4.j.plan_dangers_not_acknowledged).toEqual([]);
    expect(ch4.j.outcomes).not.toContain('plan-danger-not-acknowledged');
  });
});

describe('CSV readings without a recipe: no design, so no pass (exit 7)', () => {
  it('the text says what was computed and why no pass is claimed; JSON verdict "no-design"', async () => {
    const t = await text(['readings/ch4-phi1-ar98.csv']);
    expect(t.code).toBe(7);
    expect(t.verdict).toBe(
      'Verdict     NO DESIGN - not a pass: the composition above is computed from the readings, with its ' +
        'uncertainty, but there is no design and so no tolerance to compare it with: nothing is shown within ' +
        'tolerance. Give --recipe RECIPE (the design the tank was filled to) for a verdict - tank limits NOT ' +
        'checked',
    );
    const { code, j } = await json(['readings/ch4-phi1-ar98.csv']);
    expect(code).toBe(7);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual(['no-design', 'no-design', ['no-design']]);
    expect(j.design).toBeNull();
    expect(j.composition.CH4.value).toBeGreaterThan(0);
  });
});
