/** `mixwright fill`: the guided fill at the manifold (interactive; the screens load only here). */
import type { Command } from 'commander';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { ProblemError } from '../../core/index.js';
import { createLog, readLog } from '../../io/batch-log.js';
import { headerFromPlan } from '../../io/check.js';
import { fromTui, type Cli } from '../context.js';
import { fillEnded } from '../fill-ended.js';
import { addDesignOptions, type DesignValues } from '../design-options.js';
import { planFrom, stateGaugeConversions } from '../plan-from.js';
import { checkStageOnResume, fillBatchStage, fillPremixStage } from '../stage-fill.js';
import { loadTui } from '../load-tui.js';

type FillOptions = DesignValues & { resume?: string; batch?: string; dir: string; by?: string };

/** --by: the operator's initials for every reading of this session (else the fill asks first) */
function operatorOf(o: { by?: string }): string | undefined {
  if (o.by === undefined) return undefined;
  if (!/^[A-Za-z]{1,6}$/.test(o.by))
    throw new ProblemError({ code: 'bad-initials', text: o.by }, { field: '--by' });
  return o.by;
}

/** continue an interrupted fill from its log: the design is the log's own */
async function resume(
  cli: Cli,
  recipeFile: string | undefined,
  logFile: string,
  operator: string | undefined,
): Promise<void> {
  if (recipeFile) throw new ProblemError({ code: 'resume-with-recipe' }, { field: '--resume' });
  const tui = await loadTui();
  const log = readLog(logFile);
  if (log.closed)
    throw new ProblemError(
      {
        code: 'log-closed',
        made: log.readings.length,
        of: log.header.steps.length,
        ...(log.closeNote ? { note: log.closeNote } : {}),
      },
      { file: logFile },
    );
  for (const w of log.warnings) cli.err(`mixwright: ${logFile}: ${w}\n`);
  // stage 2 of a two-stage fill: its premix log must be the one the batch was started from
  checkStageOnResume(logFile, log.header);
  fillEnded(cli, await fromTui(() => tui.runFill({ header: log.header, logFile, log, operator })), logFile);
}

/** `dirGiven`: --dir typed (else stage 2 writes beside its premix log) */
async function fill(
  cli: Cli,
  recipeFile: string | undefined,
  o: FillOptions,
  dirGiven = false,
): Promise<void> {
  if (!cli.isTTY) throw new ProblemError({ code: 'needs-terminal', command: 'fill' }, { field: 'fill' });
  const operator = operatorOf(o);
  if (o.resume) return resume(cli, recipeFile, o.resume, operator);
  const tui = await loadTui();
  const planned = planFrom(recipeFile, o);
  const { plan, req } = planned;
  stateGaugeConversions(req, cli);
  const stamp = new Date().toISOString().replace(/[-:]/g, '').slice(0, 13);
  const id = o.batch ?? `${req.recipe.id}-${stamp}`;
  if (!/^[A-Za-z0-9._-]+$/.test(id))
    throw new ProblemError({ code: 'bad-batch-id', id }, { field: '--batch' });
  // two stages: this fill makes the premix (stage 1); the batch is filled from its log (cli/stage-fill.ts)
  if (plan.twoStage) return fillPremixStage(cli, recipeFile, o, planned, id, operator);
  // the batch from a finished premix log (stage 2; --premix-log or the recipe's premix.log)
  if (plan.premixLog)
    return fillBatchStage(cli, { ...o, dir: dirGiven ? o.dir : undefined }, planned, operator);
  mkdirSync(o.dir, { recursive: true });
  const file = join(o.dir, `${id}.jsonl`);
  createLog(file, headerFromPlan(plan, req, id, new Date().toISOString(), file));
  fillEnded(
    cli,
    await fromTui(() => tui.runFill({ header: readLog(file).header, logFile: file, operator })),
    file,
  );
}

export function registerFill(program: Command, cli: Cli): void {
  addDesignOptions(
    program
      .command('fill')
      .description(
        'guided fill at the manifold: one step at a time, each reading logged at ' +
          'once, the rest re-targeted (interactive)',
      ),
  )
    .option('--resume <log>', 'continue an interrupted fill from its batch log')
    .option('--batch <id>', 'batch id (default: recipe id and date and time)')
    .option('--dir <folder>', 'folder of the batch logs', 'batches')
    .option('--by <initials>', 'who fills: logged on every reading of this session (else it asks first)')
    .action((recipeFile: string | undefined, o: FillOptions, cmd: Command) =>
      fill(cli, recipeFile, o, cmd.getOptionValueSource('dir') === 'cli'),
    );
}
