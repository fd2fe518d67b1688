/** Entry points of the interactive commands; loaded only when one of them runs. */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { render } from 'ink';
import { stringify } from 'yaml';
import { FillApp } from './fill-app.js';
import { initialState, setupFromHeader } from './fill-state.js';
import { WizardApp } from './wizard-app.js';
import { DEFAULTS, wizardInit, type WizardState } from './wizard-state.js';
import { loadLab } from '../io/load.js';
import { buildFromValues, makeEvaluator, recipeFromValues } from './wizard-eval.js';
import { createLog, openLogForFill, readLog, type NewLogEvent, type LogHeader, type ParsedLog } from '../io/batch-log.js';
import { checkLog, headerFromPlan } from '../io/check.js';

/** the Monte Carlo trials of the end screen's re-check: those `mixwright check LOG` runs by default, so the two agree */
const CHECK_TRIALS = 200000;
import { writeFileAtomic } from '../io/atomic.js';
import { buildSheetModel } from '../report/sheet-model.js';
import { sheetToHtml } from '../report/sheet-render.js';
import { describeProblemAt, mixingEstimate, ProblemError } from '../core/index.js';

export interface FillOutcome {
  /** Ctrl-C stopped the fill */
  readonly interrupted: boolean;
  /** readings in force in the log when the fill ended (read back from the file) */
  readonly logged: number;
  readonly steps: number;
  readonly logFile: string;
}

export async function runFill(args: { header: LogHeader; logFile: string; log?: ParsedLog }): Promise<FillOutcome> {
  // the lock is held for the whole fill; a torn last line is moved aside before anything is appended
  const opened = openLogForFill(args.logFile);
  let interrupted = false;
  try {
    for (const m of opened.messages) process.stderr.write(`mixwright: ${args.logFile}: ${m}
`);
    const setup = setupFromHeader(opened.log.header);
    const now = new Date().toISOString();
    const initial = initialState(setup, args.log ? opened.log : undefined, now);
    const write = (e: NewLogEvent) => opened.handle.append(e);
    for (const e of initial.effects) write(e);
    const recheck = async () => {
      const log = readLog(args.logFile);
      return { report: await checkLog(log, { trials: CHECK_TRIALS, seed: 1 }), log };
    };
    const told = opened.messages.length ? { message: [...opened.messages, initial.message].filter(Boolean).join('; ') } : {};
    const app = render(<FillApp initial={{ ...initial, ...told, effects: [] }} write={write} logFile={args.logFile} recheck={recheck} onInterrupt={() => (interrupted = true)} />, { exitOnCtrlC: false });
    await app.waitUntilExit();
    app.unmount();
    return { interrupted, logged: opened.handle.current().readings.length, steps: setup.steps.length, logFile: args.logFile };
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
}

/** carry out a wizard action: a message to show, or the log of a guided fill to hand over to */
export function wizardAct(s: WizardState, action: string, ctx: WizardContext): string | { header: LogHeader; logFile: string } {
  try {
    const built = buildFromValues(s.values, ctx.labFile);
    if (action === 'save recipe') {
      const dir = ctx.recipesDir ?? 'recipes';
      mkdirSync(dir, { recursive: true });
      const file = join(dir, `${s.values.id}.yaml`);
      writeFileAtomic(file, `# written by the mixwright wizard\n${stringify(recipeFromValues(s.values))}`, false);
      return `saved ${file}`;
    }
    if (action === 'write fill sheet') {
      const file = join(ctx.sheetsDir ?? '.', `fill-${s.values.id}.html`);
      const h = built.req.tankInfo?.heightM;
      const mixing = h ? mixingEstimate(built.plan.composition, built.plan.temperatureK, built.plan.final.pressurePa, h, Boolean(built.req.tankInfo?.stirred)) : undefined;
      const model = buildSheetModel(built.plan, { recipe: built.recipe, labName: built.req.lab.name, orderRecommended: built.req.orderRecommended, unit: 'Torr', version: ctx.version, paper: 'a4', mixing });
      writeFileAtomic(file, sheetToHtml(model), false);
      return `wrote ${file} (open it in a browser to print)`;
    }
    const dir = ctx.batchesDir ?? 'batches';
    mkdirSync(dir, { recursive: true });
    const id = `${s.values.id}-${new Date().toISOString().replace(/[-:]/g, '').slice(0, 13)}`;
    const logFile = join(dir, `${id}.jsonl`);
    createLog(logFile, headerFromPlan(built.plan, built.req, id, new Date().toISOString()));
    return { header: readLog(logFile).header, logFile };
  } catch (e) {
    if (e instanceof ProblemError) return describeProblemAt(e.problem, e.where);
    throw e;
  }
}

/** the wizard; returns when the user quits, or runs the guided fill it hands over to */
export async function runWizard(args: WizardContext): Promise<FillOutcome | undefined> {
  const evaluate = makeEvaluator(args.labFile);
  let handOver: { header: LogHeader; logFile: string } | undefined;
  const act = (s: WizardState, action: string): string | { handOver: true } => {
    const r = wizardAct(s, action, args);
    if (typeof r === 'string') return r;
    handOver = r;
    return { handOver: true };
  };
  const lab = loadLab(args.labFile);
  const app = render(<WizardApp initial={wizardInit(evaluate, { ...DEFAULTS, tank: lab.tanks[0]?.id ?? '' })} evaluate={evaluate} act={act} />);
  await app.waitUntilExit();
  app.unmount();
  if (handOver) return runFill(handOver);
  return undefined;
}
