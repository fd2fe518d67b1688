/** `mixwright label`: the as-filled tank label and batch certificate, from a batch log. */
import { Option, type Command } from 'commander';
import { describeProblem, ProblemError, type PremixLogCause } from '../../core/index.js';
import { readLog, type ParsedLog } from '../../io/batch-log.js';
import { checkLog } from '../../io/check.js';
import type { CheckReport } from '../../report/check-types.js';
import { buildCertificateModel } from '../../report/label-certificate.js';
import { certificateToHtml, certificateToMarkdown, certificateToText } from '../../report/label-render.js';
import { VERSION } from '../../version.js';
import { EXIT, ExitSignal, type Cli } from '../context.js';
import { numberOption, parseTrials } from '../numbers.js';
import { checkExit } from './check.js';
import { emitDocument, isDirectory } from '../output.js';

interface LabelOptions {
  format: string;
  output?: string;
  force?: boolean;
  paper: 'a4' | 'letter';
  trials?: string;
  seed: string;
}

/** a refused premix log's cause in a few words, for the label itself (the certificate gives the whole refusal) */
function shortCause(kind: PremixLogCause['kind']): string {
  switch (kind) {
    case 'unreadable':
      return 'its log is missing or unreadable';
    case 'changed':
      return 'its log has changed since this batch recorded it';
    case 'record-altered':
      return 'its log was altered after it was written';
    case 'not-finished':
      return 'its log is not finished';
    case 'recheck-not-passed':
      return 'its re-check does not pass';
    case 'danger':
      return 'its log records a danger';
    default:
      return 'its log cannot be used';
  }
}

/**
 * The re-check behind the label: `check`'s, premix logs re-checked. A premix log that is missing,
 * changed since the batch recorded it, or not usable stops `check` (exit 2); the label is made all
 * the same, from the premix as the batch log recorded it, and says the premix was not re-checked.
 */
async function labelReport(log: ParsedLog, opts: { trials: number; seed: number }): Promise<CheckReport> {
  try {
    return await checkLog(log, opts);
  } catch (e) {
    if (!(e instanceof ProblemError) || e.problem.code !== 'premix-log-refused') throw e;
    const refused = e.problem;
    const report = await checkLog(log, opts, false);
    return {
      ...report,
      premixNotChecked: (log.header.premix_logs ?? []).map((p) => ({
        log: p.path,
        source: p.source,
        // a premix's source id is `premix-<tank>` (io/premix-check.ts premixIdOf)
        tank: p.source.replace(/^premix-/, ''),
        // the refusal names one premix log; any other is not re-checked either, as the re-check stopped
        short:
          refused.log === p.path
            ? shortCause(refused.cause.kind)
            : 'another premix log of this batch stopped the re-check',
        why:
          refused.log === p.path
            ? `${describeProblem(refused)}.`
            : 'not re-checked: the re-check stopped at another premix log of this batch.',
      })),
    };
  }
}

async function label(cli: Cli, target: string, o: LabelOptions): Promise<void> {
  if (isDirectory(target) || !/\.jsonl$/i.test(target))
    throw new ProblemError({ code: 'label-needs-log' }, { file: target });
  const trials = parseTrials(o.trials, 200000, 'plain');
  const log = readLog(target);
  // the same computation as `check` of this log, so the label and `check --json` agree
  const report = await labelReport(log, { trials, seed: numberOption(o.seed, '--seed') });
  const model = buildCertificateModel(report, log, {
    version: VERSION,
    paper: o.paper,
    generated: new Date().toISOString().slice(0, 16).replace('T', ' ') + ' UTC',
  });
  const render = () =>
    o.format === 'md'
      ? certificateToMarkdown(model)
      : o.format === 'html'
        ? certificateToHtml(model)
        : certificateToText(model);
  await emitDocument(
    cli,
    { format: o.format, output: o.output, force: Boolean(o.force), example: 'label.pdf' },
    render,
    () => certificateToHtml(model),
  );
  // as `check` of this log (exit 2): the premix it was made from could not be re-checked
  if (model.label.status === 'premix-not-checked') {
    cli.err(
      `mixwright: ${target}: a premix log it was made from is missing, changed or not usable; the ` +
        `label says so and does not show the premix as checked (restore the premix log and make the label again)\n`,
    );
    throw new ExitSignal(EXIT.input);
  }
  if (model.label.status === 'fail' || model.label.status === 'incomplete') {
    cli.err(
      `mixwright: ${target}: the re-check FAILED; the label says so and gives the ` +
        `as-filled composition, not the design\n`,
    );
    throw new ExitSignal(EXIT.outOfTolerance);
  }
  // as `check`: a reading past the tank's working limit or a gauge's range stands whatever the composition
  if (model.label.danger) {
    cli.err(`mixwright: ${target}: the log records a danger; the label says the tank is not fit to use\n`);
    throw new ExitSignal(EXIT.danger);
  }
  // as `check` (exits 6, 5 and 7): a plan danger nobody acknowledged or hazards accepted at the
  // manifold, a record changed after it was written, a verdict short of a pass (4 and 3 are thrown
  // above, so `check`'s own precedence leaves 6, 5, 7 or 0 here)
  const code = checkExit(report);
  if (code !== EXIT.ok) {
    cli.err(
      code === EXIT.recordAltered
        ? `mixwright: ${target}: the log was changed after it was written; the label says RECORD ` +
            'ALTERED and shows no pass\n'
        : code === EXIT.notShown
          ? `mixwright: ${target}: the re-check is not a pass (${
              report.verdict.verdict === 'pass-uncertain'
                ? 'NOT SHOWN WITHIN TOLERANCE: the uncertainty reaches past the tolerance'
                : 'NOT CLOSED: the fill never ended with a close entry'
            }); the label says so\n`
          : model.label.outcome === 'plan-danger-not-acknowledged'
            ? `mixwright: ${target}: the plan's danger findings are not acknowledged in the log; the label ` +
              'says PLAN DANGER NOT ACKNOWLEDGED and shows no pass\n'
            : model.label.outcome === 'recorded-fill-danger'
              ? `mixwright: ${target}: the fill as recorded went through a danger the log does not show ` +
                'accepted; the label says DANGER IN THE RECORDED FILL and shows no pass\n'
              : `mixwright: ${target}: the fill went on through hazards accepted at the manifold; ` +
                'the label lists them\n',
    );
    throw new ExitSignal(code);
  }
}

export function registerLabel(program: Command, cli: Cli): void {
  program
    .command('label')
    .description(
      'as-filled tank label and one-page batch certificate from a batch log (the ' +
        'composition and U of `check`, never the design)',
    )
    .argument('<log>', 'batch log (.jsonl)')
    .addOption(
      new Option('--format <format>', 'output format (txt: the label and the certificate as text)')
        .choices(['txt', 'md', 'html', 'pdf'])
        .default('txt'),
    )
    .option('-o, --output <file>', 'write to this file (required for pdf); stdout otherwise')
    .option('--force', 'overwrite an existing output file')
    .addOption(
      new Option('--paper <size>', 'page size for html and pdf').choices(['a4', 'letter']).default('a4'),
    )
    .option('--trials <n>', 'Monte Carlo trials, 100000 to 10000000 (default 200000, as check)')
    .option('--seed <n>', 'seed of the Monte Carlo generator', '1')
    .action((target: string, o: LabelOptions) => label(cli, target, o));
}
