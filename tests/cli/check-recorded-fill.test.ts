// `check` reviews the fill as recorded: the tank after each reading (the re-check's own inverse
// composition at the reading's pressure) and each fill's path, with the planner's own safety review
// (core/sequence-review.ts). The reference for every danger asserted here is the planner's review of
// the same order (`plan --order CH4,O2,Ar`, and planFill with those sources in that order), with the
// detonability rule it applies (detonation.ts: CH4 has detonation limits on file in O2 only, 8.3-55 %,
// Kuchta 1985, from memory; inside them O2 diluted past a trace is detonable with less than 50 %
// N2-equivalent inert, our conservative rule; undiluted CH4/O2 is detonable, common practice). The compositions are checked against Dalton's law (ideal partial
// pressures; at 30 Torr the virial correction is under 1e-4 in a mole fraction, from memory: |B| of
// CH4 and O2 below 50 cm3/mol at 295 K, so B P / R T < 1e-4).
import { mkdtempSync, writeFileSync, copyFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { checkFile } from '../../src/io/check.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planFill, pureCylinder, recordedStates, TORR_PA } from '../../src/core/index.js';
import { runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const ROWS =
  'species,pressure,temperature\nCH4,10.0126 Torr,22 degC\nO2,30.03 Torr,22 degC\nAr,1500.0 Torr,22 degC\n';

/** the recipe's plan filled CH4, then O2, then Ar (the order the planner reviews as detonable at fill 2) */
function planInOrder() {
  const req = buildPlanRequest(readRecipe(RECIPE));
  const by = (sp: string) => req.input.sources.find((s) => s.mainSpecies === sp)!;
  const input = { ...req.input, sources: [by('CH4'), by('O2'), by('Ar')], order: 'given' as const };
  delete (input as { charges?: unknown }).charges;
  return { req, plan: planFill(input) };
}

/** a log as the guided fill writes it of that plan, read at its targets; `accept`: the dangers acknowledged */
function orderLog(dir: string, accept: boolean): string {
  const { req, plan } = planInOrder();
  const f = join(dir, `order-${accept ? 'accepted' : 'bare'}.jsonl`);
  return logAtTargets(
    f,
    plan,
    req,
    'order1',
    accept ? { by: 'TT', note: 'the plan danger as shown' } : undefined,
  );
}

describe('the states of the fill as recorded', () => {
  it("after CH4 10.0126 Torr and O2 30.03 Torr the tank holds 1/3 CH4, 2/3 O2 (Dalton's law within 1e-4)", () => {
    const T = 295.15;
    const src = (sp: string) => pureCylinder({ id: `cyl-${sp}`, species: sp, purity: 1 });
    const states = recordedStates([
      { step: 1, source: src('CH4'), pressurePa: 10.0126 * TORR_PA, temperatureK: T },
      { step: 2, source: src('O2'), pressurePa: 30.03 * TORR_PA, temperatureK: T },
      { step: 3, source: src('Ar'), pressurePa: 1500 * TORR_PA, temperatureK: T },
    ]);
    expect(states.map((s) => s.step)).toEqual([1, 2, 3]);
    expect(states[0].composition.CH4).toBeCloseTo(1, 12);
    expect(Math.abs(states[1].composition.CH4 - 10.0126 / 30.03)).toBeLessThan(1e-4);
    expect(Math.abs(states[1].composition.O2 - (30.03 - 10.0126) / 30.03)).toBeLessThan(1e-4);
    expect(Math.abs(states[2].composition.Ar - (1500 - 30.03) / 1500)).toBeLessThan(1e-4);
    expect(states[1].pressurePa).toBe(30.03 * TORR_PA);
  });
});

describe('check of CSV readings filled CH4, O2, Ar against the recipe (planned CH4, Ar, O2, Ar)', () => {
  let csv = '';
  beforeAll(() => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-recorded-'));
    csv = join(dir, 'order.csv');
    writeFileSync(csv, ROWS);
  });

  it("the planner's own review of that order has the danger the re-check names (the reference)", async () => {
    const p = JSON.parse((await runCli(['plan', RECIPE, '--order', 'CH4,O2,Ar', '--json'])).stdout);
    const dangers = p.findings.filter((f: { severity: string }) => f.severity === 'danger');
    expect(dangers.map((f: { code: string; step: number }) => `${f.code}@${f.step}`)).toEqual([
      'detonable-state@2',
    ]);
    const j = JSON.parse((await runCli(['check', csv, '--recipe', RECIPE, '--json'])).stdout);
    expect(
      j.recorded_fill.findings
        .filter((f: { severity: string }) => f.severity === 'danger')
        .map((f: { code: string; step: number }) => `${f.code}@${f.step}`),
    ).toEqual(['detonable-state@2']);
  });

  it('text: not a pass, DANGER IN THE RECORDED FILL (fill 2: detonable-state), the orders named; exit 6', async () => {
    const r = await runCli(['check', csv, '--recipe', RECIPE, '--trials', '100000']);
    expect(r.code, r.stderr).toBe(6);
    expect(r.stdout).not.toMatch(/^Verdict {5}PASS/m);
    expect(r.stdout).toMatch(
      /^Verdict {5}NOT A PASS .*DANGER IN THE RECORDED FILL \(detonable-state \(fill 2\)\)/m,
    );
    expect(r.stdout).toContain(
      'note: the readings fill cyl-CH4, cyl-O2, cyl-Ar in that order; the plan fills cyl-CH4, cyl-Ar, cyl-O2, cyl-Ar',
    );
    expect(r.stdout).toMatch(
      /DANGER: detonable-state \(fill 2\): this state can detonate: undiluted fuel\/O2/,
    );
    // the warnings of the recorded fill are listed as its warnings
    expect(r.stdout).toMatch(
      / {2}warning: flammable-state \(fill 2\): the tank is flammable after this fill/,
    );
  });

  it('--json: verdict recorded-fill-danger, the outcomes and the danger listed', async () => {
    const r = await runCli(['check', csv, '--recipe', RECIPE, '--json']);
    expect(r.code).toBe(6);
    const j = JSON.parse(r.stdout);
    expect([j.verdict, j.composition_verdict, j.outcomes]).toEqual([
      'recorded-fill-danger',
      'pass',
      ['recorded-fill-danger'],
    ]);
    expect(j.recorded_fill_dangers_not_accepted).toEqual([{ code: 'detonable-state', step: 2 }]);
    // the danger key says a danger stands, though the finished tank itself has none
    expect(j.danger).toBe(true);
    expect(j.recorded_fill.order_differs).toBe('order');
    expect(j.recorded_fill.order).toEqual(['cyl-CH4', 'cyl-O2', 'cyl-Ar']);
  });

  it('a folder row says it, without the bare word pass; the folder exits 6', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-recorded-folder-'));
    mkdirSync(join(dir, 'f'));
    copyFileSync(csv, join(dir, 'f', 'order.csv'));
    const r = await runCli(['check', join(dir, 'f'), '--recipe', RECIPE]);
    expect(r.code, r.stderr).toBe(6);
    const row = r.stdout.split('\n').find((l) => l.startsWith(join(dir, 'f', 'order.csv')))!;
    expect(row).toContain('DANGER IN THE RECORDED FILL (detonable-state (fill 2))');
    expect(row.replace(/not a pass/gi, '')).not.toMatch(/\bpass(-uncertain)?\b/i);
  });

  it('the same readings in the planned order are no danger of the recorded fill and keep their verdict', async () => {
    const r = await runCli(['check', 'readings/ch4-phi1-ar98.csv', '--recipe', RECIPE, '--json']);
    const j = JSON.parse(r.stdout);
    expect(r.code).toBe(7);
    expect(j.outcomes).toEqual(['not-shown-within-tolerance']);
    expect(j.recorded_fill_dangers_not_accepted).toEqual([]);
    // one Ar charge where the plan has two: the same order of first fills, other charges
    expect(j.recorded_fill.order_differs).toBe('charges');
  });
});

describe('a batch log of that order', () => {
  let dir = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'mw-recorded-log-'));
  });

  it('without the acknowledgement: PLAN DANGER NOT ACKNOWLEDGED (the same danger is said once), exit 6', async () => {
    const f = orderLog(dir, false);
    const rep = await checkFile(f, { trials: 0, seed: 1 });
    // the plan's own danger, unacknowledged: listed with the recorded fill, said once as the plan's
    expect(rep.planDangersNotAcknowledged).toEqual([{ code: 'detonable-state', step: 2 }]);
    expect(rep.recordedFillDangers).toEqual([]);
    expect(rep.recordedFill?.findings.find((x) => x.severity === 'danger')).toMatchObject({
      code: 'detonable-state',
      step: 2,
      accepted: false,
    });
    const r = await runCli(['check', f, '--json']);
    expect(r.code).toBe(6);
    expect(JSON.parse(r.stdout).outcomes).toEqual(['plan-danger-not-acknowledged']);
  });

  it('a log whose header carries no plan danger, filled O2 before Ar: DANGER IN THE RECORDED FILL; label too', async () => {
    // the header of the CH4, O2, Ar plan with its findings left out (a log not written by the guided
    // fill, or a header edited): nothing in the header says danger, the readings do
    const { req, plan } = planInOrder();
    const f = join(dir, 'no-findings.jsonl');
    logAtTargets(f, plan, req, 'nofind', undefined, { header: (h) => ({ ...h, findings: [] }) });
    const r = await runCli(['check', f, '--json']);
    expect(r.code, r.stderr).toBe(6);
    const j = JSON.parse(r.stdout);
    expect(j.outcomes).toEqual(['recorded-fill-danger']);
    expect(j.recorded_fill_dangers_not_accepted).toEqual([{ code: 'detonable-state', step: 2 }]);
    const label = await runCli(['label', f]);
    expect(label.code).toBe(6);
    expect(label.stdout).toContain('*** DANGER IN THE RECORDED FILL - NOT A PASS ***');
    expect(label.stderr).toContain('DANGER IN THE RECORDED FILL');
  });

  it('acknowledged on the danger screen: the recorded danger is shown accepted; ACCEPTED HAZARD only', async () => {
    const f = orderLog(dir, true);
    const r = await runCli(['check', f, '--json']);
    expect(r.code).toBe(6);
    const j = JSON.parse(r.stdout);
    expect(j.outcomes).toEqual(['accepted-hazard']);
    expect(j.recorded_fill_dangers_not_accepted).toEqual([]);
    const det = j.recorded_fill.findings.find((x: { code: string }) => x.code === 'detonable-state');
    expect(det).toMatchObject({ severity: 'danger', step: 2, accepted: true });
    const text = await runCli(['check', f]);
    expect(text.stdout).toMatch(/DANGER \(accepted in the log\): detonable-state \(fill 2\)/);
  });
});

describe('the demo logs keep their verdicts (they followed their plans)', () => {
  it.each([
    ['batches/demo-c2h4-phi05-ar-overshoot.jsonl', 'fail'],
    ['batches/demo-ch4-phi1-ar98.jsonl', 'not-shown-within-tolerance'],
    ['batches/demo-ch4-phi1-from-premix.jsonl', 'pass'],
    ['batches/demo-premix-o2-ar-mt2.jsonl', 'pass'],
  ])('%s: %s, no danger in the recorded fill', async (file, verdict) => {
    const rep = await checkFile(file, { trials: 0, seed: 1 });
    expect(rep.recordedFillDangers).toEqual([]);
    const j = JSON.parse((await runCli(['check', file, '--json', '--trials', '100000'])).stdout);
    expect(j.verdict).toBe(verdict);
    expect(j.recorded_fill.order_differs).toBe(false);
  });
});
