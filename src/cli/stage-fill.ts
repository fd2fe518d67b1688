/**
 * The guided fill of a two-stage preparation. Stage 1 (`fill RECIPE --premix-tank ID`, or a
 * recipe with `premix.tank`): the premix, in the premix tank, into `<batch>-premix.jsonl`, with
 * the same screens, log, undo and resume as any fill; its end screen gives the premix's
 * re-checked composition, its mixing time and the stage-2 command. Every refusal is a
 * `stage-fill` problem (core/stage-words.ts).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { fail, ProblemError } from '../core/index.js';
import { orderText } from '../io/two-stage-request.js';
import { createLog, readLog, type LogHeader } from '../io/batch-log.js';
import { buildPlanRequest, locateCoreProblem, readRecipe, type PlanRequest } from '../io/load.js';
import {
  batchLogBeside,
  planBatchFromPremixLog,
  premixLogGate,
  premixLogOf,
  premixLogPath,
  stage2Header,
  refuseExistingStageLog,
  refuseLowPremix,
  shellLine,
  stage1Header,
} from '../io/stage-log.js';
import { fillEnded, fromTui, type Cli } from './context.js';
import {
  attributeOf,
  DESIGN_OPTIONS,
  mergeOptions,
  optionName,
  type DesignValues,
} from './design-options.js';
import { parseBarometer } from './numbers.js';
import type { Planned } from './plan-from.js';

/**
 * The command that fills stage 2 from the premix log: the same recipe and design options (the
 * premix tank left out: the batch's premix is the log's), the premix log, batch id and folder.
 */
export function stage2Command(
  recipeFile: string | undefined,
  o: DesignValues,
  premixLog: string,
  batchId: string,
  dir: string,
): string {
  const words = ['mixwright', 'fill'];
  if (recipeFile) words.push(recipeFile);
  for (const d of DESIGN_OPTIONS) {
    const v = o[attributeOf(d)];
    if (v === undefined || d.recipe === 'premix.tank') continue;
    words.push(optionName(d), v);
  }
  words.push('--premix-log', premixLog, '--batch', batchId, '--dir', dir);
  return shellLine(words);
}

/** stage 1: the premix of a two-stage plan, guided into `<dir>/<batch>-premix.jsonl` */
export async function fillPremixStage(
  cli: Cli,
  recipeFile: string | undefined,
  o: DesignValues & { dir: string },
  planned: Planned,
  batchId: string,
): Promise<void> {
  refuseLowPremix(planned.plan);
  const file = premixLogPath(o.dir, batchId);
  refuseExistingStageLog(file, 1);
  // the batch's own log (stage 2) must be free too: stage 2 writes it beside the premix log
  refuseExistingStageLog(join(o.dir, `${batchId}.jsonl`), 2);
  mkdirSync(o.dir, { recursive: true });
  const next = stage2Command(recipeFile, o, file, batchId, o.dir);
  createLog(file, stage1Header(planned.plan, planned.req, batchId, new Date().toISOString(), next));
  const tui = await import('../tui/run.js');
  fillEnded(cli, await fromTui(() => tui.runFill({ header: readLog(file).header, logFile: file })), file);
}

/** the request of the recipe and options, refusals pointed at the recipe line or option (as planFrom) */
function requestFrom(recipeFile: string | undefined, o: DesignValues): PlanRequest {
  const barometricPa = o.barometer === undefined ? undefined : parseBarometer(o.barometer);
  const rs = mergeOptions(recipeFile ? readRecipe(recipeFile) : undefined, o);
  try {
    return buildPlanRequest(rs, o.lab, { barometricPa });
  } catch (e) {
    if (e instanceof ProblemError) throw locateCoreProblem(e, rs);
    throw e;
  }
}

/**
 * stage 2: the batch from a finished premix log (`--premix-log`), into `<batch>.jsonl` beside it;
 * the batch id defaults to the one the premix was made for
 */
export async function fillBatchStage(
  cli: Cli,
  recipeFile: string | undefined,
  o: DesignValues & { premixLog: string; batch?: string },
): Promise<void> {
  const gate = await premixLogGate(o.premixLog, { batch: o.batch });
  const req = requestFrom(recipeFile, o);
  if (req.recipe.order)
    fail(
      { code: 'stage-order', premixTank: gate.log.header.tank.id, order: orderText(req.recipe.order) },
      { field: o.order === undefined ? 'order' : '--order' },
    );
  const stamp = new Date().toISOString().replace(/[-:]/g, '').slice(0, 13);
  const batchId = o.batch ?? gate.log.header.stage?.batch ?? `${req.recipe.id}-${stamp}`;
  if (!/^[A-Za-z0-9._-]+$/.test(batchId)) fail({ code: 'bad-batch-id', id: batchId }, { field: '--batch' });
  const file = batchLogBeside(o.premixLog, batchId);
  refuseExistingStageLog(file, 2);
  const plan = planBatchFromPremixLog(req, gate);
  const premix = { file: o.premixLog, id: gate.log.header.id, sha256: gate.sha256 };
  createLog(file, stage2Header(plan, req, batchId, new Date().toISOString(), premix, file));
  const tui = await import('../tui/run.js');
  fillEnded(cli, await fromTui(() => tui.runFill({ header: readLog(file).header, logFile: file })), file);
}

/** a stage-2 log resumed: its premix log must still be the one it was started from */
export async function checkStageOnResume(logFile: string, header: LogHeader): Promise<void> {
  const st = header.stage;
  const premixLog = st && premixLogOf(logFile, st);
  if (!st || st.number !== 2 || !premixLog || !st.premix_log) return;
  await premixLogGate(premixLog, { sha256: st.premix_log.sha256 });
}
