// Where `check` says a re-check is no pass, nothing further down may read as one: every line of its
// text, of the folder summary row and of the label that speaks of a pass (or of a composition inside
// its tolerance) says that it is the composition alone and that this does not make the tank usable,
// or says "not a pass" itself. One case per outcome that stands against a pass (report/check-outcome.ts
// CheckOutcome), each made as a lab member would meet it. Wording only: no computed number is checked.
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { planFill, type Plan } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe, type PlanRequest } from '../../src/io/load.js';
import type { CheckOutcome } from '../../src/report/check-outcome.js';
import type { LogHeader } from '../../src/io/batch-log.js';
import { certificateFlowed, labelBoxText, runCli } from '../helpers.js';
import { logAtTargets } from '../log-at-targets.js';

const TRIALS = ['--trials', '100000'];
const dir = mkdtempSync(join(tmpdir(), 'mw-wording-'));
const folder = join(dir, 'folder');
mkdirSync(folder);

const planned = (recipe: string): { req: PlanRequest; plan: Plan } => {
  const req = buildPlanRequest(readRecipe(recipe));
  return { req, plan: planFill(req.input) };
};
/** a copy of a log with each of `edits` made to its text (after writing: off its hash chain) */
function edited(from: string, name: string, edit: (text: string) => string): string {
  const f = join(folder, name);
  copyFileSync(from, f);
  writeFileSync(f, edit(readFileSync(f, 'utf8')));
  return f;
}
const csv = (name: string, rows: string) => {
  const f = join(folder, name);
  writeFileSync(f, rows);
  return f;
};

/** each outcome, the check arguments that give it first */
const CASES: [CheckOutcome, () => string[]][] = [
  [
    'incomplete',
    () => {
      const { req, plan } = planned('recipes/ch4-o2-ar-phi1.yaml');
      const f = logAtTargets(join(dir, 'full.jsonl'), plan, req, 'inc', undefined);
      // the last reading and the close left out: the batch is not finished
      const lines = readFileSync(f, 'utf8').trimEnd().split('\n');
      writeFileSync(join(folder, 'incomplete.jsonl'), lines.slice(0, -2).join('\n') + '\n');
      return [join(folder, 'incomplete.jsonl')];
    },
  ],
  ['fail', () => ['batches/demo-c2h4-phi05-ar-overshoot.jsonl']],
  [
    'danger',
    () => {
      // ng-blend-air read at its targets (a composition within tolerance, its plan danger accepted), the
      // last reading past a working limit 0.1 % below it: a danger in the record beside a passing composition
      const { req, plan } = planned('recipes/ng-blend-air.yaml');
      const limitPa = 0.999 * plan.steps[plan.steps.length - 1].targetPa;
      const limit = (h: LogHeader): LogHeader => ({ ...h, tank: { ...h.tank, working_limit_Pa: limitPa } });
      return [
        logAtTargets(join(folder, 'past-limit.jsonl'), plan, req, 'lim', { by: 'TT' }, { header: limit }),
      ];
    },
  ],
  [
    'danger',
    () => [
      csv(
        'past-gauge.csv',
        'species,pressure,temperature,gauge\nCH4,10.0126 Torr,25.0 degC,head-1kT\n' +
          'Ar,1480.02 Torr,25.0 degC,head-1kT\nO2,1500.0 Torr,25.0 degC,head-10kT\n',
      ),
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
    ],
  ],
  [
    'plan-danger-not-acknowledged',
    () => {
      const { req, plan } = planned('recipes/ng-blend-air.yaml');
      return [logAtTargets(join(folder, 'ng-unacked.jsonl'), plan, req, 'ng1', undefined)];
    },
  ],
  [
    'recorded-fill-danger',
    () => [
      csv(
        'order.csv',
        'species,pressure,temperature\nCH4,10.0126 Torr,22 degC\nO2,30.03 Torr,22 degC\nAr,1500.0 Torr,22 degC\n',
      ),
      '--recipe',
      'recipes/ch4-o2-ar-phi1.yaml',
    ],
  ],
  [
    'accepted-hazard',
    () => {
      const { req, plan } = planned('recipes/ng-blend-air.yaml');
      return [logAtTargets(join(folder, 'ng-acked.jsonl'), plan, req, 'ng2', { by: 'TT' })];
    },
  ],
  [
    'record-altered',
    () => [
      edited('batches/demo-premix-o2-ar-mt2.jsonl', 'premix-altered.jsonl', (t) =>
        t.replace('"reading":"1890.2 Torr"', '"reading":"1891.2 Torr"'),
      ),
    ],
  ],
  ['not-shown-within-tolerance', () => ['batches/demo-ch4-phi1-ar98.jsonl']],
  ['no-design', () => ['readings/ch4-phi1-ar98.csv']],
  [
    'not-closed',
    () => [
      edited('batches/demo-premix-o2-ar-mt2.jsonl', 'premix-open.jsonl', (t) =>
        t
          .trimEnd()
          .split('\n')
          .filter((l) => !l.includes('"kind":"close"'))
          .join('\n')
          .concat('\n'),
      ),
    ],
  ],
];

/** phrases that say no pass (or name one as a condition): what is left of a clause without them is judged */
const NO_PASS = [
  /not a pass/gi,
  /\bno pass\b/gi,
  /\bnot passed\b/gi,
  /not (be )?shown within (its |their )?tolerance/gi,
  /not every design fraction is shown within its tolerance/gi,
  /nothing is shown within tolerance/gi,
  /a re-check that shows it within tolerance/gi,
  // stage 2's condition on a premix, named where a premix log is not a pass
  /takes only a premix whose re-check is a pass \(closed, within tolerance,/gi,
];
/** what reads as a pass: the word itself, "would pass", a composition within its tolerance or band */
const PASS_WORDING =
  /\bpass(ed)?\b|\bwithin (its |their )?tolerance\b|\binside the band\b|\bas filled within\b/i;
/** said as the composition alone, and that this does not make the tank usable */
const qualified = (c: string) =>
  /composition (alone|only)/i.test(c) && /does not make the tank usable|not fit to use/i.test(c);

/** the clauses (lines cut at ". ", "; " and " - ") that read as a pass and are not so qualified */
export function unqualifiedPass(text: string): string[] {
  return text
    .split('\n')
    .flatMap((l) => l.split(/\. |; | - /))
    .filter((c) => PASS_WORDING.test(NO_PASS.reduce((x, re) => x.replace(re, ''), c)) && !qualified(c));
}

describe('the test itself: it finds the wording it is for', () => {
  it('"they would pass" behind RECORD ALTERED, "PASS" beside a danger, a bare "within tolerance" row', () => {
    expect(
      unqualifiedPass(
        'RECORD ALTERED AFTER WRITING (line 3) - not a pass: the record was changed; on the numbers as they ' +
          'stand they would pass (every design fraction within its tolerance, uncertainty included)',
      ),
    ).toHaveLength(1);
    expect(
      unqualifiedPass('composition only: PASS - as filled, within tolerance (uncertainty included)'),
    ).toHaveLength(2);
    expect(
      unqualifiedPass('x.jsonl  b1  -  NOT A PASS (composition within tolerance), NOT CLOSED'),
    ).toHaveLength(1);
    expect(
      unqualifiedPass('NOT SHOWN WITHIN TOLERANCE - not a pass; nothing is shown within tolerance'),
    ).toEqual([]);
  });
});

const RUNS = CASES.map(([outcome, args]) => ({ outcome, args: args() }));

describe('no pass wording behind a non-pass outcome', () => {
  it.each(RUNS.map((r) => [r.outcome, r] as const))(
    '%s: check text, its JSON outcome, and the label',
    async (outcome, r) => {
      const j = JSON.parse((await runCli(['check', ...r.args, '--json', ...TRIALS])).stdout);
      expect(j.outcomes[0]).toBe(outcome);
      const text = (await runCli(['check', ...r.args, ...TRIALS])).stdout;
      expect(text).toMatch(/^Verdict {5}\S/m);
      expect(unqualifiedPass(text)).toEqual([]);
      if (r.args[0].endsWith('.jsonl')) {
        const label = await runCli(['label', r.args[0], ...TRIALS]);
        expect(label.stdout).toContain('BATCH CERTIFICATE');
        expect(unqualifiedPass(labelBoxText(label.stdout))).toEqual([]);
        expect(unqualifiedPass(certificateFlowed(label.stdout))).toEqual([]);
      }
    },
  );

  it('the folder re-check: every row of a non-pass log says no more than the composition alone', async () => {
    const r = await runCli(['check', folder, ...TRIALS]);
    const rows = r.stdout.split('\n').filter((l) => l.startsWith(folder));
    expect(rows).toHaveLength(RUNS.filter((x) => x.args[0].startsWith(folder)).length);
    expect(unqualifiedPass(rows.join('\n'))).toEqual([]);
  });
});
