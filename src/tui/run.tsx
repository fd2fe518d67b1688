/** Entry points of the interactive commands; loaded only when one of them runs. */
import { existsSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { render } from 'ink';
import { stringify } from 'yaml';
import { FillApp, withdrawnOverLimit } from './fill-app.js';
import { initialState, setupFromHeader } from './fill-state.js';
import { WizardApp } from './wizard-app.js';
import { DEFAULTS, wizardInit, type ActionName, type ActOutcome, type WizardState } from './wizard-state.js';
import { loadLab } from '../io/load.js';
import { buildFromValues, makeEvaluator, recipeFromValues } from './wizard-eval.js';
import {
  createLog,
  openLogForFill,
  readLog,
  type NewLogEvent,
  type LogHeader,
  type ParsedLog,
} from '../io/batch-log.js';
import { checkLog, headerFromPlan, type CheckReport } from '../io/check.js';

/**
 * the Monte Carlo trials of the end screen's re-check: those `mixwright check LOG` runs by default,
 * so the two agree
 */
const CHECK_TRIALS = 200000;
import { writeFileAtomic } from '../io/atomic.js';
import { buildSheetModel } from '../report/sheet-model.js';
import { sheetToHtml } from '../report/sheet-render.js';
import { joinSheets, stageSheets } from '../report/two-stage-sheet.js';
import {
  createBatchStageLog,
  premixLogPath,
  refuseLowPremix,
  shellLine,
  stage1Header,
} from '../io/stage-log.js';
import { describeProblemAt, mixingEstimate, ProblemError } from '../core/index.js';

export interface FillOutcome {
  /** Ctrl-C stopped the fill */
  readonly interrupted: boolean;
  /** after Ctrl-C: the tank left above its working limit (no choice made, or accepted), in words */
  readonly left?: string;
  /** readings in force in the log when the fill ended (read back from the file) */
  readonly logged: number;
  readonly steps: number;
  readonly logFile: string;
  /** `check`'s verdict of the closed log (undefined when the fill stopped with the batch open) */
  readonly verdict?: 'pass' | 'pass-uncertain' | 'fail' | 'no-design';
  /** a danger finding stands in the record (e.g. an accepted reading past the working limit) */
  readonly danger: boolean;
  /** what `check` found in the record beside the verdict (the shell's exit follows check's: checkExit) */
  readonly record?: {
    readonly alteredLines: readonly number[];
    readonly acceptedHazards?: readonly unknown[];
  };
  /** danger findings of the plan that the log records no acknowledgement of (check: exit 6) */
  readonly planDangersNotAcknowledged?: readonly unknown[];
  /** dangers of the review of the fill as recorded that the log does not show accepted (check: exit 6) */
  readonly recordedFillDangers?: readonly unknown[];
  /** stage 2: the premix tank's checks; one confirmed mixed before its least mixing time is `early` (exit 7) */
  readonly premixChecks?: readonly { readonly kind: string; readonly early?: unknown }[];
  /** the batch closed or stopped below a band with a hazard in the tank: what it holds now, in words */
  readonly tankNow?: string;
  /**
   * check found a reading above the working limit logged, then corrected or withdrawn: the end screen's
   * title words (withdrawnOverLimit), which the shell line repeats
   */
  readonly withdrawn?: string;
}

/** what the shell needs of `check`'s re-check of the closed log to exit as `check` would */
export function outcomeOfReport(
  report: CheckReport | undefined,
): Pick<
  FillOutcome,
  | 'verdict'
  | 'danger'
  | 'record'
  | 'planDangersNotAcknowledged'
  | 'recordedFillDangers'
  | 'withdrawn'
  | 'premixChecks'
> {
  const withdrawn = withdrawnOverLimit(report);
  return {
    verdict: report?.verdict.verdict,
    danger: Boolean(report?.findings.some((f) => f.severity === 'danger')),
    ...(report?.record ? { record: report.record } : {}),
    ...(report?.planDangersNotAcknowledged?.length
      ? { planDangersNotAcknowledged: report.planDangersNotAcknowledged }
      : {}),
    ...(report?.recordedFillDangers?.length ? { recordedFillDangers: report.recordedFillDangers } : {}),
    ...(withdrawn ? { withdrawn } : {}),
    ...(report?.premixChecks?.length ? { premixChecks: report.premixChecks } : {}),
  };
}

export async function runFill(args: {
  header: LogHeader;
  logFile: string;
  log?: ParsedLog;
  /** --by: who fills (initials, on every reading of this session); else the fill asks first */
  operator?: string;
}): Promise<FillOutcome> {
  // the lock is held for the whole fill; a torn last line is moved aside before anything is appended
  const opened = openLogForFill(args.logFile);
  let interrupted = false;
  let left: string | undefined;
  try {
    for (const m of opened.messages)
      process.stderr.write(`mixwright: ${args.logFile}: ${m}
`);
    const setup = setupFromHeader(opened.log.header);
    const now = new Date().toISOString();
    const initial = initialState(setup, args.log ? opened.log : undefined, now, {
      operator: args.operator,
      askOperator: true,
    });
    const write = (e: NewLogEvent) => opened.handle.append(e);
    for (const e of initial.effects) write(e);
    const recheck = async () => {
      const log = readLog(args.logFile);
      return { report: await checkLog(log, { trials: CHECK_TRIALS, seed: 1 }), log };
    };
    const told = opened.messages.length
      ? { message: [...opened.messages, initial.message].filter(Boolean).join('; ') }
      : {};
    let report: CheckReport | undefined;
    let tankNow: string | undefined;
    const app = render(
      <FillApp
        initial={{ ...initial, ...told, effects: [] }}
        write={write}
        logFile={args.logFile}
        recheck={recheck}
        onInterrupt={(note) => {
          interrupted = true;
          left = note;
        }}
        onReport={(r) => (report = r)}
        onTankNow={(t) => (tankNow = t)}
      />,
      { exitOnCtrlC: false },
    );
    await app.waitUntilExit();
    app.unmount();
    // the exit code follows `check` of the log: quit before the end screen's re-check came, it is made here
    if (!interrupted && !report && opened.handle.current().closed) report = (await recheck()).report;
    return {
      interrupted,
      ...(interrupted && left ? { left } : {}),
      logged: opened.handle.current().readings.length,
      steps: setup.steps.length,
      logFile: args.logFile,
      ...outcomeOfReport(report),
      ...(tankNow ? { tankNow } : {}),
    };
  } finally {
    opened.handle.release();
  }
}

export interface WizardContext {
  readonly labFile?: string;
  readonly version: string;
  readonly recipesDir?: string;
  readonly batchesDir?: string;
  /** folder for the fill sheet (default: the working folder) */
  readonly sheetsDir?: string;
  /** files this wizard session wrote, and when: a question about replacing one says so */
  readonly written?: Map<string, Date>;
}

const clock = (d: Date) => d.toTimeString().slice(0, 8);

/**
 * Write a file the wizard makes. An existing file is never replaced silently: without replace
 * the answer is a question naming the file (written by this session, or not, and when last
 * changed); a file that already holds exactly this text is left alone and said so.
 */
function writeWizardFile(
  file: string,
  data: string,
  what: string,
  action: ActionName,
  replace: boolean,
  ctx: WizardContext,
): ActOutcome {
  const saved = action === 'save recipe';
  if (existsSync(file)) {
    let same = false;
    try {
      same = readFileSync(file, 'utf8') === data;
    } catch {
      // unreadable (a folder, no permission): the question or the write says more
    }
    if (same)
      return {
        kind: 'message',
        text: `${file} already holds this ${what}; nothing to write`,
        savedRecipe: saved,
      };
    if (!replace) {
      const when = ctx.written?.get(file);
      let whose = when ? `written by this wizard at ${clock(when)}` : 'not written in this session';
      if (!when) {
        try {
          whose += `, last changed ${statSync(file).mtime.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
        } catch {
          // no date to show
        }
      }
      return {
        kind: 'confirm',
        action,
        file,
        text:
          `${file} exists (${whose}). Replace it with the ${what} on screen? What it ` +
          `holds now is lost. y: replace   n: keep it`,
      };
    }
  }
  // replace only when the user said yes: a file that appeared since the check is refused, not replaced
  const existed = replace && existsSync(file);
  writeFileAtomic(file, data, replace);
  ctx.written?.set(file, new Date());
  return {
    kind: 'message',
    text: `${existed ? 'replaced' : 'saved'} ${file}${saved ? '' : ' (open it in a browser to print)'}`,
    savedRecipe: saved,
  };
}

/**
 * a batch log name not taken yet: <id>-<UTC minute>, then -2, -3 ... when two fills start within one
 * minute (neither the batch's log nor its premix log taken)
 */
function freeLogName(dir: string, id: string): { id: string; file: string } {
  const stamp = `${id}-${new Date().toISOString().replace(/[-:]/g, '').slice(0, 13)}`;
  for (let n = 1; ; n++) {
    const batchId = n === 1 ? stamp : `${stamp}-${n}`;
    const file = join(dir, `${batchId}.jsonl`);
    if (!existsSync(file) && !existsSync(premixLogPath(dir, batchId))) return { id: batchId, file };
  }
}

/**
 * Stage 1 from the wizard: the premix log, once the recipe on screen is saved (stage 2 is filled
 * from that recipe file and the premix log: the command the end screen gives names both).
 */
function wizardPremixFill(
  s: WizardState,
  built: ReturnType<typeof buildFromValues>,
  dir: string,
  ctx: WizardContext,
): ActOutcome | { header: LogHeader; logFile: string } {
  const recipeFile = join(ctx.recipesDir ?? 'recipes', `${s.values.id}.yaml`);
  const text = `# written by the mixwright wizard\n${stringify(recipeFromValues(s.values))}`;
  let saved = false;
  try {
    saved = readFileSync(recipeFile, 'utf8') === text;
  } catch {
    // not saved yet
  }
  if (!saved)
    return {
      kind: 'message',
      text:
        `guided fill not started: a two-stage fill needs the recipe saved first (${recipeFile}): ` +
        'stage 2 is filled from it and the premix log. Use [save recipe], then start the fill again',
    };
  refuseLowPremix(built.plan);
  mkdirSync(dir, { recursive: true });
  const { id } = freeLogName(dir, s.values.id);
  const logFile = premixLogPath(dir, id);
  const words = ['mixwright', 'fill', recipeFile, ...(ctx.labFile ? ['--lab', ctx.labFile] : [])];
  const next = shellLine([...words, '--premix-log', logFile, '--batch', id, '--dir', dir]);
  createLog(logFile, stage1Header(built.plan, built.req, id, new Date().toISOString(), next));
  return { header: readLog(logFile).header, logFile };
}

/** carry out a wizard action: what to show (a message or a question), or the log of a guided fill to hand over to */
export function wizardAct(
  s: WizardState,
  action: string,
  ctx: WizardContext,
  replace = false,
): ActOutcome | { header: LogHeader; logFile: string } {
  const what =
    action === 'save recipe' ? 'recipe' : action === 'write fill sheet' ? 'fill sheet' : 'guided fill';
  try {
    const built = buildFromValues(s.values, ctx.labFile);
    if (action === 'save recipe') {
      const dir = ctx.recipesDir ?? 'recipes';
      mkdirSync(dir, { recursive: true });
      const file = join(dir, `${s.values.id}.yaml`);
      return writeWizardFile(
        file,
        `# written by the mixwright wizard\n${stringify(recipeFromValues(s.values))}`,
        'recipe',
        action,
        replace,
        ctx,
      );
    }
    if (action === 'write fill sheet') {
      const file = join(ctx.sheetsDir ?? '.', `fill-${s.values.id}.html`);
      const h = built.req.tankInfo?.heightM;
      const mixing = h
        ? mixingEstimate(
            built.plan.composition,
            built.plan.temperatureK,
            built.plan.final.pressurePa,
            h,
            Boolean(built.req.tankInfo?.stirred),
          )
        : undefined;
      // a two-stage design writes both stages, stage 1 first (as `sheet --premix-tank`)
      const models = stageSheets(
        built.plan,
        {
          recipe: built.recipe,
          labName: built.req.lab.name,
          orderRecommended: built.req.orderRecommended,
          unit: 'Torr',
          version: ctx.version,
          paper: 'a4',
          mixing,
          lab: {
            gauges: built.req.input.gauges,
            reading: built.req.input.reading,
            tanks: built.req.lab.tanks,
          },
        },
        buildSheetModel,
      );
      const html = joinSheets(models.map(sheetToHtml), 'html');
      return writeWizardFile(file, html, 'fill sheet', action, replace, ctx);
    }
    const dir = ctx.batchesDir ?? 'batches';
    // two stages: the guided fill makes the premix (stage 1); its end screen gives the stage-2 command
    if (built.plan.twoStage) return wizardPremixFill(s, built, dir, ctx);
    // from a premix log: the batch is stage 2, its log beside the premix log
    if (built.plan.premixLog) {
      const logFile = createBatchStageLog(built.plan, built.req, {});
      return { header: readLog(logFile).header, logFile };
    }
    mkdirSync(dir, { recursive: true });
    const { id, file: logFile } = freeLogName(dir, s.values.id);
    createLog(logFile, headerFromPlan(built.plan, built.req, id, new Date().toISOString(), logFile));
    return { header: readLog(logFile).header, logFile };
  } catch (e) {
    const not = what === 'guided fill' ? 'guided fill not started' : `${what} not written`;
    if (e instanceof ProblemError)
      return { kind: 'message', text: `${not}: ${describeProblemAt(e.problem, e.where)}` };
    // a file-system error must not end the wizard: the design on screen would be lost with it
    return {
      kind: 'message',
      text:
        `${not}: ${(e as Error).message}. The design is still on screen; check the ` +
        `folder (it must exist and be writable, with free space) and try again`,
    };
  }
}

/** the wizard; returns when the user leaves, or runs the guided fill it hands over to */
export async function runWizard(args: WizardContext): Promise<FillOutcome | undefined> {
  const evaluate = makeEvaluator(args.labFile);
  const ctx: WizardContext = { ...args, written: args.written ?? new Map() };
  let handOver: { header: LogHeader; logFile: string } | undefined;
  const act = (s: WizardState, action: ActionName, replace: boolean): ActOutcome | { kind: 'handOver' } => {
    const r = wizardAct(s, action, ctx, replace);
    if ('kind' in r) return r;
    handOver = r;
    return { kind: 'handOver' };
  };
  const lab = loadLab(args.labFile);
  // Ctrl-C goes to the wizard (it asks first when the design has unsaved changes), not straight to exit
  const app = render(
    <WizardApp
      initial={wizardInit(evaluate, { ...DEFAULTS, tank: lab.tanks[0]?.id ?? '' })}
      evaluate={evaluate}
      act={act}
      lab={args.labFile ? `${args.labFile}, ${lab.name}` : undefined}
    />,
    { exitOnCtrlC: false },
  );
  await app.waitUntilExit();
  app.unmount();
  if (handOver) return runFill(handOver);
  return undefined;
}
