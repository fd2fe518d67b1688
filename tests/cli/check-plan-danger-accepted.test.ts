// A danger of the plan's own review, accepted on the guided fill's danger screen (plain acknowledge
// lines of the plan's codes, written before the first fill), is as much an accepted hazard as one
// accepted at the mid-fill review: `check` marks the verdict ACCEPTED HAZARD, lists it in
// `accepted_hazards` and exits 6 (README "Exit codes"), and the label shows it. The log is the plan
// of recipes/ng-blend-air.yaml (its detonable-state danger) read exactly at its targets; no computed
// number is checked here, only what check and label say of the record.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { checkFile } from '../../src/io/check.js';
import { verdictWord } from '../../src/report/check-report.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planFill } from '../../src/core/index.js';
import { runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

/** the log a guided fill writes when TT accepts the plan's dangers (as fill-state.ts words them) */
function ngLog(accept: boolean): string {
  const req = buildPlanRequest(readRecipe('recipes/ng-blend-air.yaml'));
  const plan = planFill(req.input);
  const f = join(mkdtempSync(join(tmpdir(), 'mw-plan-danger-')), 'ng1.jsonl');
  return logAtTargets(
    f,
    plan,
    req,
    'ng1',
    accept ? { by: 'TT', note: 'the plan danger as shown' } : undefined,
  );
}

describe("a plan's danger accepted at the start of the fill", () => {
  let accepted = '';
  beforeAll(() => {
    accepted = ngLog(true);
  });

  it('the plan carries the detonable-state danger at fill 3 that the fill asks to accept', async () => {
    const j = JSON.parse((await runCli(['plan', 'recipes/ng-blend-air.yaml', '--json'])).stdout);
    expect(
      j.findings
        .filter((f: { severity: string }) => f.severity === 'danger')
        .map((f: { code: string }) => f.code),
    ).toEqual(['detonable-state']);
  });

  it('check: the verdict is marked ACCEPTED HAZARD with who and when, the JSON lists it, exit 6', async () => {
    const text = await runCli(['check', accepted]);
    expect(text.code).toBe(6);
    const verdict = text.stdout.split('\n').find((l) => l.startsWith('Verdict'))!;
    expect(verdict).toContain('ACCEPTED HAZARD (plan danger: detonable-state (fill 3))');
    expect(text.stdout).toContain(
      "ACCEPTED HAZARD: the plan's safety review found detonable-state (fill 3) (a danger), and TT accepted it " +
        'at 2026-12-02T09:05:00Z',
    );
    const json = await runCli(['check', accepted, '--json']);
    expect(json.code).toBe(6);
    const j = JSON.parse(json.stdout);
    expect(j.accepted_hazards).toEqual([
      {
        found_by: 'plan',
        before_step: null,
        by: 'TT',
        time: '2026-12-02T09:05:00Z',
        hazards: [{ code: 'detonable-state', step: 3, severity: 'danger' }],
      },
    ]);
    expect(j.verdict_caveats.join('\n')).toContain('ACCEPTED HAZARD');
  });

  it("the fill's end screen words the verdict with the mark (verdictWord)", async () => {
    const r = await checkFile(accepted, { trials: 0, seed: 1 });
    // never the bare word PASS where check exits 6
    expect(verdictWord(r)).toBe(
      'NOT A PASS (the composition is within tolerance) - ACCEPTED HAZARD (see below)',
    );
  });

  it('label: the label box carries the accepted hazard and the exit is 6', async () => {
    const r = await runCli(['label', accepted, '--trials', '100000']);
    expect(r.code).toBe(6);
    const box = r.stdout.slice(0, r.stdout.indexOf('BATCH CERTIFICATE'));
    expect(box).toContain("! ACCEPTED HAZARD: the plan's safety review found detonable-state (fill 3)");
  });

  it('the same log without the acceptance has no accepted hazard: its plan danger is NOT ACKNOWLEDGED, no pass either (exit 6)', async () => {
    // was a warning beside a pass; a danger nobody accepted must not read weaker than an accepted one
    const r = await runCli(['check', ngLog(false), '--json']);
    expect(r.code).toBe(6);
    const j = JSON.parse(r.stdout);
    expect(j.accepted_hazards).toEqual([]);
    expect(j.plan_dangers_not_acknowledged).toEqual([{ code: 'detonable-state', step: 3 }]);
    expect(j.verdict_caveats.join('\n')).toContain('this log records no acknowledgement of it');
  });

  it('CSV readings checked against a recipe whose plan carries a danger: no acknowledgement recorded, so not a pass (exit 6)', async () => {
    const args = ['--trials', '100000', '--json'];
    const ng = JSON.parse(
      (await runCli(['check', 'readings/ng-blend-air.csv', '--recipe', 'recipes/ng-blend-air.yaml', ...args]))
        .stdout,
    );
    expect(ng.verdict).toBe('plan-danger-not-acknowledged');
    expect(ng.verdict_caveats.join('\n')).toContain(
      "the plan's safety review of recipe recipes/ng-blend-air.yaml found detonable-state (fill 3)",
    );
    const ch4 = JSON.parse(
      (
        await runCli([
          'check',
          'readings/ch4-phi1-ar98.csv',
          '--recipe',
          'recipes/ch4-o2-ar-phi1.yaml',
          ...args,
        ])
      ).stdout,
    );
    expect(ch4.verdict_caveats.join('\n')).not.toContain('PLAN DANGER NOT ACKNOWLEDGED');
  });
});
