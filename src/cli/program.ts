/**
 * The command line, built by a factory so tests run it in-process:
 *   const { program, run } = createProgram({ stdout, stderr }); await run(argv)
 * Each command lives in its own module under commands/; this file assembles them and
 * turns what ends a run (a refusal, an exit code, a system error) into the exit code.
 */
import { parserErrorText } from './parser-errors.js';
import { Command, CommanderError } from 'commander';
import { ProblemError, type Problem, type Where } from '../core/index.js';
import { checkRefusedJson, commandRefusedJson } from '../report/check-report.js';
import { VERSION } from '../version.js';
import { registerCheck } from './commands/check.js';
import { registerFill } from './commands/fill.js';
import { registerLabel } from './commands/label.js';
import { registerPlan } from './commands/plan.js';
import { registerReady } from './commands/ready.js';
import { registerSheet } from './commands/sheet.js';
import { registerDemoLab, registerSchema, registerSpecies } from './commands/species.js';
import { registerWizard } from './commands/wizard.js';
import { cliOf, EXIT, ExitSignal, refusalText, type Cli, type Streams } from './context.js';
import { refuseRepeatedOptions } from './repeated.js';

export { EXIT, type Streams } from './context.js';

function systemReason(code: string): string {
  switch (code) {
    case 'ENOSPC':
      return 'the disk is full; free some space, or write elsewhere';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied; choose another place, or ask for access';
    case 'EISDIR':
      return 'a folder is in the way';
    case 'EROFS':
      return 'the file system is read-only';
    case 'EDQUOT':
      return 'the disk quota is used up';
    case 'ENOENT':
      return 'a folder on the path does not exist';
    default:
      return 'an input/output error';
  }
}

/** what ended a run, as an exit code, with its message on stderr */
function exitCodeOf(cli: Cli, e: unknown): number {
  if (e instanceof ExitSignal) return e.code;
  if (e instanceof CommanderError) {
    if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.exitCode === 0)
      return EXIT.ok;
    return EXIT.input;
  }
  if (e instanceof ProblemError) {
    cli.err(refusalText(e.problem, e.where));
    return EXIT.input;
  }
  const sys = e as NodeJS.ErrnoException;
  if (typeof sys.code === 'string' && /^E[A-Z]+$/.test(sys.code) && typeof sys.syscall === 'string') {
    // a refusal by the system (full disk, permission, a folder in the way): the file and the cause, no stack
    cli.err(
      `mixwright: ${sys.path ?? ''}${sys.path ? ': ' : ''}the system refused to ` +
        `${sys.syscall} it: ${systemReason(sys.code)} (${sys.code})\n  (error code: write-failed)\n`,
    );
    return EXIT.input;
  }
  cli.err(
    `mixwright: internal error: ${(e as Error).message}\n  This is a fault in ` +
      `mixwright, not in your input; please report it with the command you ran.\n`,
  );
  return EXIT.internal;
}

/** the commands whose --json prints a refusal document on stdout when they refuse (exit 2) */
const JSON_REFUSAL: ReadonlySet<string> = new Set(['check', 'plan', 'ready']);

/** a refusal as a problem: the command's own, or the parser's (an unknown option, a missing value) */
function refusalOf(e: unknown): { problem: Problem; where: Where } | undefined {
  if (e instanceof ProblemError) return { problem: e.problem, where: e.where };
  if (e instanceof CommanderError && e.exitCode !== 0 && e.code !== 'commander.helpDisplayed')
    return { problem: { code: 'usage', text: e.message.replace(/^error: /, '') }, where: {} };
  return undefined;
}

/**
 * `check --json` (and `plan`, `ready`) refused, by the command or by the parser before it ran: the
 * refusal document, as a refusal of the command itself gives it (check-report.ts checkRefusedJson), so
 * a tool that reads stdout is never left with nothing; undefined when --json was not asked for
 */
function refusalDocument(program: Command, argv: readonly string[], e: unknown): object | undefined {
  const name = argv[0];
  const options = argv.includes('--') ? argv.slice(0, argv.indexOf('--')) : argv;
  if (name === undefined || !JSON_REFUSAL.has(name) || !options.includes('--json')) return undefined;
  const refused = refusalOf(e);
  if (!refused) return undefined;
  // the operand as the parser read it (the log or the recipe); none where it stopped before one
  const args = program.commands.find((c) => c.name() === name)?.args ?? [];
  const first = args.findIndex((a) => a.startsWith('-'));
  const file = (first < 0 ? args : args.slice(0, first))[0] ?? null;
  return name === 'check'
    ? checkRefusedJson(file, refused.problem, refused.where, VERSION)
    : commandRefusedJson(name, file, refused.problem, refused.where, VERSION);
}

export function createProgram(streams: Streams): {
  program: Command;
  run: (argv: readonly string[]) => Promise<number>;
} {
  const cli = cliOf(streams);
  const program = new Command();
  program
    .name('mixwright')
    .description(
      'Plan, guide and re-check the manometric preparation of reactant gas mixtures.\nRun ' +
        'with no command in a terminal to open the wizard.',
    )
    .version(VERSION, '-V, --version')
    // the parser's refusal of a choice in the house form (parser-errors.ts)
    .configureOutput({
      writeOut: cli.out,
      writeErr: cli.err,
      outputError: (s, write) => write(parserErrorText(s)),
    })
    .exitOverride()
    .showHelpAfterError('(run with --help for usage)');
  registerPlan(program, cli);
  registerSheet(program, cli);
  registerReady(program, cli);
  registerFill(program, cli);
  registerCheck(program, cli);
  registerLabel(program, cli);
  registerSpecies(program, cli);
  registerSchema(program, cli);
  registerDemoLab(program, cli);
  registerWizard(program, cli);
  const forgetOptions = refuseRepeatedOptions(program);

  const run = async (argv: readonly string[]): Promise<number> => {
    if (argv.length === 0 && !streams.isTTY) {
      cli.err(
        'mixwright: not a terminal, so the wizard cannot open.\nUse `mixwright plan`, ' +
          '`mixwright sheet` and `mixwright check`; `mixwright --help` lists the commands.\n',
      );
      return EXIT.input;
    }
    forgetOptions();
    try {
      await program.parseAsync(argv.length === 0 ? ['wizard'] : [...argv], { from: 'user' });
      return EXIT.ok;
    } catch (e) {
      const doc = refusalDocument(program, argv, e);
      if (doc) cli.out(JSON.stringify(doc, null, 2) + '\n');
      return exitCodeOf(cli, e);
    }
  };
  return { program, run };
}
