/** `mixwright label`: the as-filled tank label and batch certificate, from a batch log. */
import { Option, type Command } from 'commander';
import { ProblemError } from '../../core/index.js';
import { readLog } from '../../io/batch-log.js';
import { checkLog } from '../../io/check.js';
import { buildCertificateModel } from '../../report/label-certificate.js';
import { certificateToHtml, certificateToMarkdown, certificateToText } from '../../report/label-render.js';
import { VERSION } from '../../version.js';
import { EXIT, ExitSignal, type Cli } from '../context.js';
import { numberOption, parseTrials } from '../numbers.js';
import { emitDocument, isDirectory } from '../output.js';

interface LabelOptions {
  format: string;
  output?: string;
  force?: boolean;
  paper: 'a4' | 'letter';
  trials?: string;
  seed: string;
}

async function label(cli: Cli, target: string, o: LabelOptions): Promise<void> {
  if (isDirectory(target) || !/\.jsonl$/i.test(target))
    throw new ProblemError({ code: 'label-needs-log' }, { file: target });
  const trials = parseTrials(o.trials, 200000, 'plain');
  const log = readLog(target);
  // the same computation as `check` of this log, so the label and `check --json` agree
  const report = await checkLog(log, { trials, seed: numberOption(o.seed, '--seed') });
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
