/** `mixwright check`: re-check a batch, or a folder of batches, from what was logged. */
import type { Command } from 'commander';
import { describeProblemAt, ProblemError } from '../../core/index.js';
import { checkFile, type CheckReport } from '../../io/check.js';
import {
  checkToJson,
  checkToText,
  folderSummary,
  refusalJson,
  stageJson,
} from '../../report/check-report.js';
import {
  checkOutcomes,
  overallVerdict,
  type CheckOutcome,
  type OutcomeInput,
} from '../../report/check-outcome.js';
import { VERSION } from '../../version.js';
import { EXIT, ExitSignal, refusalText, type Cli } from '../context.js';
import { numberOption, parseBarometer, parseTrials } from '../numbers.js';
import { isDirectory, listLogs } from '../output.js';

interface CheckOptions {
  recipe?: string;
  lab?: string;
  json?: boolean;
  trials?: string;
  seed: string;
  barometer?: string;
  tank?: string;
  premixLog?: string;
}
type CheckOpts = Parameters<typeof checkFile>[1];
type Row =
  | { file: string; report: CheckReport }
  | { file: string; error: string; refused: ReturnType<typeof refusalJson> };

/**
 * CSV readings of a folder: --premix-log serves the files whose rows draw from that premix; a file none
 * of whose rows does is checked without it, and its report says so (one file alone is refused instead:
 * premix-log-refused, cause not-drawn)
 */
async function checkCsvOfFolder(f: string, opts: CheckOpts): Promise<CheckReport> {
  try {
    return await checkFile(f, opts);
  } catch (e) {
    if (
      !(e instanceof ProblemError) ||
      e.problem.code !== 'premix-log-refused' ||
      e.problem.cause.kind !== 'not-drawn'
    )
      throw e;
    const c = e.problem.cause;
    const report = await checkFile(f, { ...opts, premixLog: undefined });
    const note =
      `--premix-log ${e.problem.log} was not used for this file: none of its rows (${c.rows.join(', ')}) ` +
      `draws from that premix (${c.names.join(' or ')})`;
    return { ...report, warnings: [...report.warnings, note] };
  }
}

/** each file of the folder checked on its own: a refusal is a row of the summary, not the end */
async function checkEach(cli: Cli, files: readonly string[], opts: CheckOpts): Promise<Row[]> {
  const rows: Row[] = [];
  for (const f of files) {
    try {
      // --barometer and --tank are for CSV readings; a log in the folder keeps its own
      rows.push({
        file: f,
        report: /\.csv$/i.test(f)
          ? await checkCsvOfFolder(f, opts)
          : await checkFile(f, { ...opts, barometricPa: undefined, tankId: undefined, premixLog: undefined }),
      });
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
      const where = e.where.file ? e.where : { ...e.where, file: f };
      rows.push({
        file: f,
        error: describeProblemAt(e.problem, e.where),
        refused: refusalJson(e.problem, where),
      });
      cli.err(refusalText(e.problem, where));
    }
  }
  return rows;
}

async function checkFolder(cli: Cli, target: string, o: CheckOptions, opts: CheckOpts): Promise<void> {
  const files = listLogs(target);
  if (files.length === 0) throw new ProblemError({ code: 'no-logs-in-folder' }, { file: target });
  const rows = await checkEach(cli, files, opts);
  if (o.json) {
    const json = rows.map((r) =>
      'report' in r
        ? {
            file: r.file,
            // the overall verdict (as the exit code), and the composition's own judgement beside it
            verdict: overallVerdict(r.report),
            composition_verdict: r.report.verdict.verdict,
            stage: stageJson(r.report),
            check: checkToJson(r.report, VERSION),
          }
        : { file: r.file, verdict: 'refused', error: r.error, refused: r.refused },
    );
    cli.out(JSON.stringify(json, null, 2) + '\n');
  } else cli.out(folderSummary(rows));
  const failed = rows.filter((r) => 'error' in r).length;
  const codes = rows.flatMap((r) => ('report' in r ? [checkExit(r.report)] : []));
  const worst = EXIT_PRECEDENCE.find((c) => codes.includes(c));
  if (failed) {
    cli.err(`mixwright: ${failed} of ${rows.length} files in ${target} could not be checked (above)\n`);
    // a failed or dangerous batch among the others is not hidden by a file that could not be read
    throw new ExitSignal(worst === EXIT.outOfTolerance || worst === EXIT.danger ? worst : EXIT.input);
  }
  if (worst !== undefined) throw new ExitSignal(worst);
}

/** check's exit codes beside a verdict, the first of them that applies wins (README "Exit codes") */
const EXIT_PRECEDENCE = [
  EXIT.outOfTolerance,
  EXIT.danger,
  EXIT.acceptedHazard,
  EXIT.recordAltered,
  EXIT.notShown,
];

/** the exit code of each outcome that stands against a pass (README "Exit codes") */
const OUTCOME_EXIT: Record<CheckOutcome, number> = {
  incomplete: EXIT.outOfTolerance,
  fail: EXIT.outOfTolerance,
  danger: EXIT.danger,
  'plan-danger-not-acknowledged': EXIT.acceptedHazard,
  'recorded-fill-danger': EXIT.acceptedHazard,
  'accepted-hazard': EXIT.acceptedHazard,
  'record-altered': EXIT.recordAltered,
  'premix-drawn-early': EXIT.notShown,
  'not-shown-within-tolerance': EXIT.notShown,
  'no-design': EXIT.notShown,
  'not-closed': EXIT.notShown,
};

/**
 * The exit code of one re-check, from the first outcome that stands against a pass (checkOutcomes,
 * in the precedence 4, 3, 6, 5, 7): out of tolerance (or incomplete) 4; a reading past a tank's
 * working limit or a gauge's range, which stands beside any verdict, 3; a plan danger nobody
 * acknowledged, or a fill that went on through hazards (accepted at the manifold), 6; numbers that
 * are not as first logged 5; a verdict that is not a pass all the same (NOT SHOWN WITHIN TOLERANCE,
 * no design to compare with, a log never closed) 7; else 0. The JSON `verdict` is that same first
 * outcome, so a tool that reads only the exit code or only `verdict` never sees a pass where the
 * words say "this is not a pass".
 */
export function checkExit(report: OutcomeInput): number {
  const first = checkOutcomes(report)[0];
  return first === undefined ? EXIT.ok : OUTCOME_EXIT[first];
}

/**
 * `check`; with --json a refusal (exit 2) still prints a JSON document on stdout (cli/program.ts
 * `refusalDocument`: checkRefusedJson, a usage error too), its message on stderr as for any command
 */
async function check(cli: Cli, target: string, o: CheckOptions): Promise<void> {
  const folder = isDirectory(target);
  const opts: CheckOpts = {
    trials: parseTrials(o.trials, folder ? 0 : 200000, 'explain'),
    seed: numberOption(o.seed, '--seed'),
    recipeFile: o.recipe,
    labFile: o.lab,
    barometricPa: o.barometer === undefined ? undefined : parseBarometer(o.barometer),
    tankId: o.tank,
    premixLog: o.premixLog,
  };
  if (folder) return checkFolder(cli, target, o, opts);
  const report = await checkFile(target, opts);
  if (o.json) cli.out(JSON.stringify(checkToJson(report, VERSION), null, 2) + '\n');
  else cli.out(checkToText(report));
  const code = checkExit(report);
  if (code !== EXIT.ok) throw new ExitSignal(code);
}

export function registerCheck(program: Command, cli: Cli): void {
  program
    .command('check')
    .description(
      're-check a batch from its logged fills: composition, phi and dilution with ' +
        'a GUM and Monte Carlo uncertainty budget, against the design',
    )
    .argument(
      '<log>',
      'batch log (.jsonl), CSV readings (species,pressure,temperature; one row per charge), or a folder of them',
    )
    .option(
      '--recipe <file>',
      'the design the CSV readings were filled to (its lab profile, cylinders and tolerance)',
    )
    .option('--lab <file>', 'lab profile for CSV readings (gauges, barometer, thermometer)')
    .option('--json', 'print one JSON object')
    .option(
      '--trials <n>',
      'Monte Carlo trials, 100000 to 10000000 (default 200000 for one log; a folder ' +
        'is checked by GUM alone unless given)',
    )
    .option('--seed <n>', 'seed of the Monte Carlo generator', '1')
    .option(
      '--barometer <quantity>',
      'barometric pressure at the fill, for CSV readings of gauge-referenced sensors ' +
        'and gauge units such as "psig", e.g. "752.3 Torr" (default: the lab profile)',
    )
    .option(
      '--tank <id>',
      "the lab profile's tank CSV readings were filled in, to check them against its working " +
        "limit and rating (default: the recipe's tank; without either they are not checked)",
    )
    .option(
      '--premix-log <log>',
      'the batch log of the premix tank CSV readings drew from (a row names it by its source id, ' +
        'e.g. premix-MT-2, or by its gases as the plan labels the fill, e.g. Ar+O2): its re-checked ' +
        'composition and budget are used',
    )
    .action((target: string, o: CheckOptions) => check(cli, target, o));
}
