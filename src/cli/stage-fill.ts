/**
 * The guided fill of a two-stage preparation. Stage 1 (`fill RECIPE --premix-tank ID`, or a
 * recipe with `premix.tank`): the premix, in the premix tank, into `<batch>-premix.jsonl`, with
 * the same screens, log, undo and resume as any fill; its end screen gives the premix's
 * re-checked composition, its mixing time and the stage-2 command. Every refusal is a
 * `stage-fill` problem (core/stage-words.ts).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { createLog, readLog, type LogHeader } from '../io/batch-log.js';
import {
  createBatchStageLog,
  premixLogBytes,
  premixLogOf,
  premixLogPath,
  refuseExistingStageLog,
  refuseLowPremix,
  shellLine,
  stage1Header,
} from '../io/stage-log.js';
import { fromTui, type Cli } from './context.js';
import { fillEnded } from './fill-ended.js';
import { attributeOf, DESIGN_OPTIONS, optionName, type DesignValues } from './design-options.js';
import type { Planned } from './plan-from.js';
import { loadTui } from './load-tui.js';

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
    if (v === undefined || d.recipe === 'premix.tank' || d.recipe === 'premix.log') continue;
    words.push(optionName(d), v);
  }
  words.push('--premix-log', premixLog, '--batch', batchId, '--dir', dir);
  return shellLine(words);
}

/** the guided fill of a new stage log, its end ending the command */
async function guide(cli: Cli, file: string, operator: string | undefined): Promise<void> {
  const tui = await loadTui();
  fillEnded(
    cli,
    await fromTui(() => tui.runFill({ header: readLog(file).header, logFile: file, operator })),
    file,
  );
}

/** stage 1: the premix of a two-stage plan, guided into `<dir>/<batch>-premix.jsonl` */
export async function fillPremixStage(
  cli: Cli,
  recipeFile: string | undefined,
  o: DesignValues & { dir: string },
  planned: Planned,
  batchId: string,
  operator?: string,
): Promise<void> {
  refuseLowPremix(planned.plan);
  const file = premixLogPath(o.dir, batchId);
  refuseExistingStageLog(file, 1);
  // the batch's own log (stage 2) must be free too: stage 2 writes it beside the premix log
  refuseExistingStageLog(join(o.dir, `${batchId}.jsonl`), 2);
  mkdirSync(o.dir, { recursive: true });
  const next = stage2Command(recipeFile, o, file, batchId, o.dir);
  createLog(file, stage1Header(planned.plan, planned.req, batchId, new Date().toISOString(), next));
  await guide(cli, file, operator);
}

/**
 * stage 2: the batch planned from a finished premix log (`--premix-log` or the recipe's
 * `premix.log`, by the premix-log planner as `plan` does), guided into `<batch>.jsonl` beside the
 * premix log (or in --dir when given); the batch id defaults to the one the premix was made for
 */
export async function fillBatchStage(
  cli: Cli,
  o: DesignValues & { batch?: string },
  planned: Planned,
  operator?: string,
): Promise<void> {
  const file = createBatchStageLog(planned.plan, planned.req, o);
  await guide(cli, file, operator);
}

/** a stage-2 log resumed: its premix log must still be the one it was started from */
export function checkStageOnResume(logFile: string, header: LogHeader): void {
  const st = header.stage;
  const premixLog = st && premixLogOf(logFile, st);
  if (!st || st.number !== 2 || !premixLog || !st.premix_log) return;
  premixLogBytes(premixLog, { sha256: st.premix_log.sha256 });
}
