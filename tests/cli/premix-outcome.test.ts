// A premix log is a source of stage 2 only when `check` of it is a pass: stage 2 (plan --premix-log,
// check of a batch log that names it) refuses it by check's own overall outcome (report/check-outcome.ts
// checkOutcomes, the function behind `check --json` verdict and its exit code), naming that outcome.
// The premix logs are the demo stage-1 log (scripts/make-demo-premix-logs.ts) written again with what
// a guided fill (or a hand-written log) adds: a hazard accepted at the manifold, a plan danger with or
// without its acknowledgement. No computed number is checked here: every outcome is check's own.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ProblemError, type Problem } from '../../src/core/index.js';
import { appendEvent, createLog, readLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { readPremixLog } from '../../src/io/premix-check.js';
import { overallVerdict } from '../../src/report/check-outcome.js';
import { runCli } from '../helpers.js';

const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';

type Line = Record<string, unknown>;
const linesOf = (file: string): Line[] =>
  readFileSync(file, 'utf8')
    .trimEnd()
    .split('\n')
    .map((l) => {
      const { chain: _, ...rest } = JSON.parse(l) as Line;
      void _;
      return rest;
    });

/**
 * the demo premix log written again (a new hash chain, as a writer makes it): `header` changes its
 * header, `before2` are events logged before fill 2 (as the guided fill logs a review's choice)
 */
function premixLog(
  dir: string,
  name: string,
  header: (h: LogHeader) => LogHeader = (h) => h,
  before2: NewLogEvent[] = [],
  close = true,
): string {
  const file = join(dir, name);
  const [h, ...events] = linesOf(PREMIX);
  createLog(file, header(h as unknown as LogHeader));
  for (const e of events) {
    if (e.kind === 'reading' && e.step === 2) for (const b of before2) appendEvent(file, b);
    if (e.kind === 'close' && !close) continue;
    appendEvent(file, e as unknown as NewLogEvent);
  }
  return file;
}

/** the demo stage-2 batch log naming `premix` (in its folder) by the hash of its last entry */
function batchLogNaming(dir: string, premix: string): string {
  const file = join(dir, 'batch.jsonl');
  const [h, ...events] = linesOf(BATCH);
  const header = h as unknown as LogHeader;
  const named = header.premix_logs!.map((p) => ({
    ...p,
    path: premix.slice(dir.length + 1),
    last_entry_sha256: readLog(premix).lastLink,
  }));
  createLog(file, { ...header, premix_logs: named });
  for (const e of events) appendEvent(file, e as unknown as NewLogEvent);
  return file;
}

/** a hazard of the review of the remaining fills, accepted by the operator before fill 2 */
const acceptedReview: NewLogEvent = {
  kind: 'acknowledge',
  code: 'remainder-review',
  step: 2,
  by: 'KL',
  time: '2026-11-29T14:30:00Z',
  review: {
    trigger: 'reading',
    outcome: 'accepted',
    hazards: [{ code: 'oxygen-compression', step: 2, severity: 'warning' }],
  },
};

/** the plan of the premix with a danger (as a plan of a faster O2 fill would review it) */
const withPlanDanger = (h: LogHeader): LogHeader => ({
  ...h,
  findings: [
    ...(h.findings ?? []),
    {
      severity: 'danger',
      code: 'oxygen-compression',
      step: 2,
      message: 'this fill compresses oxygen-rich gas ... (invented for the test)',
    },
  ],
});

/** the premix plan's danger accepted on the fill's danger screen before the first fill */
const planAck: NewLogEvent = {
  kind: 'acknowledge',
  code: 'oxygen-compression',
  step: 2,
  by: 'KL',
  time: '2026-11-29T14:10:00Z',
};

function refusalOf(f: () => unknown): Problem & { code: 'premix-log-refused' } {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError && e.problem.code === 'premix-log-refused') return e.problem;
    throw e;
  }
  throw new Error('not refused');
}

describe("a premix log is a stage-2 source only when check's overall outcome of it is a pass", () => {
  const dir = mkdtempSync(join(tmpdir(), 'mw-premix-outcome-'));
  const cases = {
    demo: premixLog(dir, 'demo.jsonl'),
    accepted: premixLog(dir, 'accepted.jsonl', undefined, [acceptedReview]),
    unacknowledged: premixLog(dir, 'unacknowledged.jsonl', withPlanDanger),
    acknowledged: premixLog(dir, 'acknowledged.jsonl', withPlanDanger, [planAck]),
    unclosed: premixLog(dir, 'unclosed.jsonl', undefined, [], false),
  };

  it('readPremixLog refuses exactly the logs whose `check` verdict is not pass, naming that outcome', async () => {
    const seen: Record<string, string> = {};
    for (const [name, file] of Object.entries(cases)) {
      const verdict = overallVerdict(await checkLog(readLog(file), { trials: 0, seed: 1 }));
      seen[name] = verdict;
      if (verdict === 'pass') {
        expect(readPremixLog(file, resolve(file), undefined).source.id).toBe('premix-MT-2');
        continue;
      }
      const c = refusalOf(() => readPremixLog(file, resolve(file), undefined)).cause;
      if (verdict === 'not-closed') expect(c).toMatchObject({ kind: 'not-finished', closed: false });
      else expect(c).toMatchObject({ kind: 'not-a-pass', outcome: verdict });
    }
    // check's own verdicts of these logs: an acknowledged plan danger is an accepted hazard, no pass (exit 6)
    expect(seen).toEqual({
      demo: 'pass',
      accepted: 'accepted-hazard',
      unacknowledged: 'plan-danger-not-acknowledged',
      acknowledged: 'accepted-hazard',
      unclosed: 'not-closed',
    });
  });

  it('plan --premix-log of a premix filled through an accepted hazard: exit 2, the outcome, why and what to do; JSON names it', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-log', cases.accepted]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(
      `premix log ${cases.accepted} is not a pass (ACCEPTED HAZARD: the fill that log records`,
    );
    expect(r.stderr).toContain('oxygen-compression (fill 2), accepted by KL at 2026-11-29T14:30:00Z');
    expect(r.stderr).toContain('`mixwright check` of that log gives no pass (exit 6)');
    expect(r.stderr).toContain('make a new premix');
    expect(r.stderr).toContain('(error code: premix-log-refused)');
    const j = JSON.parse((await runCli(['plan', RECIPE, '--premix-log', cases.accepted, '--json'])).stdout);
    expect(j.verdict).toBe('refused');
    expect(j.refused.premix_log.cause).toEqual({
      kind: 'not-a-pass',
      outcome: 'accepted-hazard',
      hazards: [{ code: 'oxygen-compression', step: 2 }],
      by: ['KL at 2026-11-29T14:30:00Z'],
    });
    // the same premix as filled, with nothing accepted, is a source (the demo's plan runs)
    expect((await runCli(['plan', RECIPE, '--premix-log', cases.demo])).code).toBe(0);
  }, 120_000);

  it('plan --premix-log of a premix whose plan danger nobody acknowledged: PLAN DANGER NOT ACKNOWLEDGED', async () => {
    const r = await runCli(['plan', RECIPE, '--premix-log', cases.unacknowledged]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(
      'is not a pass (PLAN DANGER NOT ACKNOWLEDGED: the safety review of the plan that log records found oxygen-compression ' +
        '(fill 2) (a danger) and the log records no acknowledgement of it)',
    );
  }, 60_000);

  it('check of a stage-2 batch log naming such a premix log: exit 2, the premix refused by its outcome', async () => {
    const okDir = mkdtempSync(join(tmpdir(), 'mw-stage2-ok-'));
    const ok = batchLogNaming(okDir, premixLog(okDir, 'premix.jsonl'));
    // the batch log written again names the demo premix as filled: check re-checks it (not refused)
    expect((await runCli(['check', ok, '--trials', '100000'])).code).not.toBe(2);
    const sub = mkdtempSync(join(tmpdir(), 'mw-stage2-'));
    const premix = premixLog(sub, 'premix.jsonl', undefined, [acceptedReview]);
    const batch = batchLogNaming(sub, premix);
    const r = await runCli(['check', batch, '--json', '--trials', '100000']);
    expect(r.code).toBe(2);
    const j = JSON.parse(r.stdout);
    expect(j.verdict).toBe('refused');
    expect(j.refused.premix_log.cause.outcome).toBe('accepted-hazard');
  }, 60_000);

  it('check of the stage-1 log itself says stage 2 will refuse it, with the outcome', async () => {
    const r = await runCli(['check', cases.accepted, '--trials', '100000']);
    expect(r.code).toBe(6);
    expect(r.stdout).toContain(
      'Stage 2 will refuse this premix log: its re-check is not a pass (accepted-hazard',
    );
    const demo = await runCli(['check', cases.demo, '--trials', '100000']);
    expect(demo.code).toBe(0);
    expect(demo.stdout).not.toContain('Stage 2 will refuse');
  }, 60_000);
});
