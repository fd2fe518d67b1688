/**
 * The logs of a two-stage preparation: stage 1 (the premix, `<batch>-premix.jsonl`) and stage 2
 * (the batch, `<batch>.jsonl`, beside the premix log). A stage log is an ordinary batch log whose
 * header carries `stage` (batch-log.ts): stage 1 names the command that fills the batch from it,
 * stage 2 names its premix log and the sha256 of that log's bytes when the batch was started.
 *
 * The gate of stage 2 (`premixLogGate`) refuses a premix log that cannot stand behind a batch: not
 * closed, a danger in its record (a reading past a limit, a line changed after it was written),
 * a re-check that does not show its composition within tolerance, or bytes that differ from those
 * the batch was started from. Each refusal is a `stage-fill` problem, worded in core/stage-words.ts.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import {
  describeFinding,
  fail,
  planFill,
  premixDeliveryCheck,
  ProblemError,
  TORR_PA,
  type Finding,
  type Plan,
  type PredictedPlan,
  type StageFillCause,
  type TankSpec,
} from '../core/index.js';
import { readLog, type LogHeader, type ParsedLog } from './batch-log.js';
import { checkLog, headerFromPlan, type CheckReport } from './check.js';
import type { PlanRequest } from './load.js';
import { planWithPrediction } from './plan-predict.js';
import { premixSourceFromLog } from './premix-check.js';

export type StageOfLog = NonNullable<LogHeader['stage']>;

/** the stage-1 log of a batch: `<dir>/<batch>-premix.jsonl` */
export function premixLogPath(dir: string, batchId: string): string {
  return join(dir, `${batchId}-premix.jsonl`);
}

/** the stage-2 log of a batch: `<batch>.jsonl` in the premix log's folder */
export function batchLogBeside(premixLog: string, batchId: string): string {
  return join(dirname(premixLog), `${batchId}.jsonl`);
}

/** sha256 of a file's bytes; null when it cannot be read */
export function fileSha256(file: string): string | null {
  try {
    return createHash('sha256').update(readFileSync(file)).digest('hex');
  } catch {
    return null;
  }
}

/** refuse to start a stage whose log exists (a log is never overwritten; it may be resumed) */
export function refuseExistingStageLog(file: string, stage: 1 | 2): void {
  if (existsSync(file)) fail({ code: 'stage-fill', cause: { kind: 'log-exists', stage, file } }, { file });
}

/** a shell command line from its words: a word is quoted when it holds anything but safe characters */
export function shellLine(words: readonly string[]): string {
  return words
    .map((w) => (/^[A-Za-z0-9._/:@%+,=-]+$/.test(w) ? w : `'${w.replace(/'/g, `'\\''`)}'`))
    .join(' ');
}

/** the premix tank of a two-stage plan would run below what the batch must reach: refused before any gas flows */
export function refuseLowPremix(plan: Plan): void {
  const two = plan.twoStage;
  if (!two) return;
  const d = two.delivery;
  if (d.endPa < d.requiredPa)
    fail({
      code: 'stage-fill',
      cause: {
        kind: 'premix-low',
        tank: two.premix.tank.id,
        startPa: d.startPa,
        endPa: d.endPa,
        targetPa: d.targetPa,
        requiredPa: d.requiredPa,
        from: 'plan',
      },
    });
}

const torr = (pa: number) => `${(pa / TORR_PA).toPrecision(6)} Torr`;

/** a batch finding carried into the stage-1 header: no step of stage 1, the stage named in its words */
function batchFindingForStage1(f: Finding): NonNullable<LogHeader['findings']>[number] {
  return {
    severity: f.severity,
    code: f.code,
    step: null,
    message: `stage 2 (the batch${f.step ? `, fill ${f.step}` : ''}): ${describeFinding(f, torr)}`,
  };
}

/**
 * The header of stage 1: the premix plan's own header (its steps, gauges, findings), the batch's
 * dangers added without a step (acknowledged before the premix is made, since the premix is
 * made for that batch), and `stage` with the command that fills the batch from it.
 */
export function stage1Header(
  plan: Plan,
  req: PlanRequest,
  batchId: string,
  created: string,
  nextCommand: string,
): LogHeader {
  const two = plan.twoStage;
  if (!two) throw new Error('stage1Header needs a two-stage plan');
  const h = headerFromPlan(two.premix, req, `${batchId}-premix`, created);
  const info = req.lab.tanks.find((t) => t.id === two.premix.tank.id);
  const batchDangers = plan.findings.filter((f) => f.severity === 'danger').map(batchFindingForStage1);
  return {
    ...h,
    findings: [...(h.findings ?? []), ...batchDangers],
    stage: {
      number: 1,
      of: 2,
      batch: batchId,
      next_command: nextCommand,
      ...(info?.heightM ? { premix_tank: { height_m: info.heightM, stirred: Boolean(info.stirred) } } : {}),
    },
  };
}

/** the stage-2 header: the batch plan's, linked to its premix log (path relative to the batch log) */
export function stage2Header(
  plan: Plan,
  req: PlanRequest,
  batchId: string,
  created: string,
  premix: { file: string; id: string; sha256: string },
  batchLog: string,
): LogHeader {
  const h = headerFromPlan(plan, req, batchId, created);
  const file = relative(dirname(resolve(batchLog)), resolve(premix.file)) || basename(premix.file);
  return { ...h, stage: { number: 2, of: 2, batch: batchId, premix_log: { ...premix, file } } };
}

/** the premix log a stage-2 log names, as a path from the working folder */
export function premixLogOf(batchLog: string, stage: StageOfLog): string | undefined {
  return stage.premix_log && resolve(dirname(batchLog), stage.premix_log.file);
}

export interface PremixGate {
  readonly log: ParsedLog;
  readonly report: CheckReport;
  readonly sha256: string;
}

const refuse = (cause: StageFillCause, file: string): never => fail({ code: 'stage-fill', cause }, { file });

/**
 * The premix log a batch may be filled from: closed, no danger in its record, its re-check (GUM,
 * `check`'s model) a pass, and - when the batch was started from it before - the same bytes.
 */
export async function premixLogGate(
  file: string,
  expect?: { sha256?: string; batch?: string },
): Promise<PremixGate> {
  const sha256 = fileSha256(file);
  if (expect?.sha256 && sha256 !== expect.sha256)
    refuse({ kind: 'premix-changed', file, expected: expect.sha256, found: sha256 }, file);
  let log: ParsedLog;
  try {
    log = readLog(file);
  } catch (e) {
    if (e instanceof ProblemError) throw e.at({ file });
    throw e;
  }
  const stage = log.header.stage;
  if (expect?.batch && stage?.number === 1 && stage.batch !== expect.batch)
    refuse({ kind: 'premix-other-batch', file, batch: stage.batch, asked: expect.batch }, file);
  if (!log.closed)
    refuse({ kind: 'premix-open', file, logged: log.readings.length, steps: log.header.steps.length }, file);
  const report = await checkLog(log, { trials: 0, seed: 1 });
  const dangers = report.findings.filter((f) => f.severity === 'danger');
  if (dangers.length) refuse({ kind: 'premix-danger', file, findings: dangers.map((f) => f.message) }, file);
  const v = report.verdict.verdict;
  if (v !== 'pass') {
    const pct = (x: number) => `${(x * 100).toPrecision(3)} %`;
    const worst = report.verdict.deviations
      .filter((d) => !d.provenWithin)
      .map(
        (d) =>
          `x(${d.species}) ${pct(d.actual)}, ${pct(d.deviation / d.design)} off the design ` +
          `+- U ${pct(d.expandedU / d.design)}, tolerance ${pct(d.tolerance / d.design)}`,
      )
      .join('; ');
    refuse({ kind: 'premix-unproven', file, verdict: v, worst }, file);
  }
  return { log, report, sha256: sha256 ?? '' };
}

/** the premix tank of a premix log: the lab profile's tank of that id, else the tank its header records */
export function premixTankOf(log: ParsedLog, tanks: readonly TankSpec[]): TankSpec {
  const h = log.header.tank;
  return (
    tanks.find((t) => t.id === h.id) ?? {
      id: h.id,
      label: h.id,
      volumeM3: h.volume_m3,
      ratedPressurePa: h.rated_pressure_Pa ?? undefined,
      workingFraction:
        h.rated_pressure_Pa && h.working_limit_Pa ? h.working_limit_Pa / h.rated_pressure_Pa : undefined,
    }
  );
}

/**
 * Stage 2 planned from the premix log (the batch's cylinders but those of the premix's own
 * non-diluent gases, and the premix as a source with the log's re-checked composition and
 * budget; core plan/premix-source.ts), predicted with `check`'s model, and the premix tank's
 * delivery checked from its last logged reading. A stage-2 plan for this fill only, until the
 * premix-log planner of `plan --premix-log` takes its place.
 */
export function planBatchFromPremixLog(req: PlanRequest, gate: PremixGate): PredictedPlan {
  const source = premixSourceFromLog(gate.log.file);
  const dil = new Set(Object.keys(req.input.design.groups.diluent));
  const carried = Object.keys(source.composition).filter((k) => source.composition[k] >= 1e-3 && !dil.has(k));
  const others = req.input.sources.filter((s) => !carried.includes(s.mainSpecies));
  const plan = planWithPrediction(
    planFill({ ...req.input, sources: [...others, source], order: 'recommend', charges: undefined }),
    req,
  );
  const last = gate.log.readings[gate.log.readings.length - 1];
  const tank = premixTankOf(gate.log, req.lab.tanks);
  const { check, findings } = premixDeliveryCheck(plan, source, tank, last.pressure_Pa);
  if (check.endPa < check.requiredPa)
    refuse(
      {
        kind: 'premix-low',
        tank: tank.id,
        startPa: check.startPa,
        endPa: check.endPa,
        targetPa: check.targetPa,
        requiredPa: check.requiredPa,
        from: 'log',
      },
      gate.log.file,
    );
  return { ...plan, findings: [...plan.findings, ...findings] };
}
