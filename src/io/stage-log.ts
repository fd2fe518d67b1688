/**
 * The logs of a two-stage preparation: stage 1 (the premix, `<batch>-premix.jsonl`) and stage 2
 * (the batch, `<batch>.jsonl`, beside the premix log). A stage log is an ordinary batch log whose
 * header carries `stage` (batch-log.ts): stage 1 names the command that fills the batch from it,
 * stage 2 names its premix log and the sha256 of that log's bytes when the batch was started.
 *
 * Stage 2 plans from the premix log through the premix-log planner (`plan --premix-log`: closed,
 * no danger in its record, a re-check that passes, enough gas; `premix-log-refused`); this module
 * adds what a two-stage fill needs beyond it (`premixLogBytes`): a stage-1 log made for this
 * batch, and on a resume the same bytes as when the batch was started from it. Each refusal is a
 * `stage-fill` problem, worded in core/stage-words.ts.
 */
import { nodeCrypto } from './builtins.js';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import {
  describeFinding,
  fail,
  TORR_PA,
  type Finding,
  type Plan,
  type StageFillCause,
} from '../core/index.js';
import { createLog, gaugeToLog, readLog, type LogHeader, type ParsedLog } from './batch-log.js';
import { premixMixingTime, premixTankCheck } from '../report/two-stage-sheet.js';
import { headerFromPlan } from './check.js';
import type { PlanRequest } from './load.js';

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
    return nodeCrypto().createHash('sha256').update(readFileSync(file)).digest('hex');
  } catch {
    return null;
  }
}

/** refuse to start a stage whose log exists (a log is never overwritten; it may be resumed) */
export function refuseExistingStageLog(file: string, stage: 1 | 2): void {
  if (!existsSync(file)) return;
  let log: ParsedLog | undefined;
  try {
    log = readLog(file);
  } catch {
    // not readable as a log: refused as existing all the same
  }
  // a finished fill cannot be resumed: say what comes next instead
  const closed = log?.closed === true;
  const next = closed ? log?.header.stage?.next_command : undefined;
  fail({ code: 'stage-fill', cause: { kind: 'log-exists', stage, file, closed, next } }, { file });
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
  /** the premix log's close time, if closed (the mixing time is counted from it) */
  premixClosed?: string,
): LogHeader {
  const h = headerFromPlan(plan, req, batchId, created, batchLog);
  const file = relative(dirname(resolve(batchLog)), resolve(premix.file)) || basename(premix.file);
  const check = premixCheckOf(plan, req, premixClosed);
  return {
    ...h,
    stage: {
      number: 2,
      of: 2,
      batch: batchId,
      premix_log: { ...premix, file },
      ...(check ? { premix_check: check } : {}),
    },
  };
}

/**
 * the premix tank's check before the batch's first fill from it, as the stage-2 sheet prints it (same
 * function, same lab profile): the guided fill asks for the reading and the mixing with initials
 */
function premixCheckOf(plan: Plan, req: PlanRequest, premixClosed?: string): StageOfLog['premix_check'] {
  const lab = { gauges: req.input.gauges, reading: req.input.reading, tanks: req.lab.tanks };
  const c = premixTankCheck(plan, lab, 'Torr');
  if (!c) return undefined;
  const mixing = premixMixingTime(plan, lab);
  return {
    tank: c.tankId,
    gauge: c.gauge ? gaugeToLog(c.gauge) : null,
    minimum: `${c.minimum} ${c.unit}`,
    minimum_Pa: c.minimumAbsPa,
    planned_Pa: c.plannedPa,
    required_Pa: c.delivery.requiredPa,
    target_Pa: c.delivery.targetPa,
    delivered_mol: c.delivery.deliveredMol,
    fills: [...c.fills],
    close_off: c.closeOff.map((g) => ({ gauge: g.id, top_Pa: g.topPa, reopen: g.reopen })),
    ...(mixing ? { mixing: { stirred: mixing.stirred, rest_s: mixing.restS } } : {}),
    ...(premixClosed ? { premix_log_closed: premixClosed } : {}),
    ...(plan.premixLog
      ? { premix_log_last_Pa: plan.premixLog.lastReadingPa, premix_log_draws: plan.premixLog.draws.length }
      : {}),
  };
}

/** the premix log a stage-2 log names, as a path from the working folder */
export function premixLogOf(batchLog: string, stage: StageOfLog): string | undefined {
  return stage.premix_log && resolve(dirname(batchLog), stage.premix_log.file);
}

const refuse = (cause: StageFillCause, file: string): never => fail({ code: 'stage-fill', cause }, { file });

/**
 * The premix log a batch is filled from, beyond what the premix-log planner checks (closed, no
 * danger, re-check a pass, enough gas after the other batches' draws: `premix-log-refused`): on a
 * resume, the same bytes as when the batch was started from it. Returns its sha256.
 */
export function premixLogBytes(file: string, expect: { sha256?: string }): string {
  const sha256 = fileSha256(file);
  if (expect.sha256 && sha256 !== expect.sha256)
    refuse({ kind: 'premix-changed', file, expected: expect.sha256, found: sha256 }, file);
  // another batch than the one the premix was made for may draw from it too: the planner has
  // subtracted the other batches' draws and refuses a premix tank with too little gas left
  return sha256 ?? '';
}

/**
 * Stage 2's log: for a batch planned from a premix log (`plan.premixLog`), `<batch>.jsonl` beside
 * the premix log (or in `dir`), the batch id the premix was made for unless `batch` is given,
 * linked to the premix log's bytes (any batch may draw from the premix: the planner subtracted the
 * draws of the batch logs beside it). Refuses a batch log that exists. Returns the log's path.
 */
export function createBatchStageLog(
  plan: Plan,
  req: PlanRequest,
  o: { readonly batch?: string; readonly dir?: string },
): string {
  const use = plan.premixLog;
  if (!use) throw new Error('createBatchStageLog needs a plan from a premix log');
  // the premix log as a path from here (absolute when it lies outside the working folder)
  const rel = relative(process.cwd(), use.path);
  const premixLog = rel && !rel.startsWith('..') ? rel : use.path;
  const premixParsed = readLog(use.path);
  const premixHeader = premixParsed.header;
  const sha256 = premixLogBytes(use.path, {});
  const stage = premixHeader.stage;
  const stamp = new Date().toISOString().replace(/[-:]/g, '').slice(0, 13);
  const batchId = o.batch ?? (stage?.number === 1 ? stage.batch : `${req.recipe.id}-${stamp}`);
  if (!/^[A-Za-z0-9._-]+$/.test(batchId)) fail({ code: 'bad-batch-id', id: batchId }, { field: '--batch' });
  // `dir`: --dir as typed (a default folder is not asked for: then beside the premix log)
  const file = o.dir ? join(o.dir, `${batchId}.jsonl`) : batchLogBeside(premixLog, batchId);
  refuseExistingStageLog(file, 2);
  mkdirSync(dirname(file), { recursive: true });
  // the bytes the batch rests on: a resume refuses a premix log that changed since
  const premix = { file: premixLog, id: premixHeader.id, sha256 };
  createLog(
    file,
    stage2Header(plan, req, batchId, new Date().toISOString(), premix, file, premixParsed.closeTime),
  );
  return file;
}
