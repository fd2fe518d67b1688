/** What every command module is given: the output streams, exit codes and the shared ways out. */
import { ProblemError } from '../core/index.js';

export interface Streams {
  readonly stdout: { write(s: string): unknown };
  readonly stderr: { write(s: string): unknown };
  /** whether stdin and stdout are a terminal (bare `mixwright` opens the wizard only then) */
  readonly isTTY?: boolean;
}

export const EXIT = {
  ok: 0,
  internal: 1,
  input: 2,
  danger: 3,
  outOfTolerance: 4,
  /** `check`: the verdict stands on a record changed after it was written (a line off its hash chain) */
  recordAltered: 5,
  interrupted: 130,
  /** `check`: the guided fill went on through hazards its review found and the plan did not have */
  acceptedHazard: 6,
  /**
   * `check` and `label`: not a pass, though not out of tolerance: the uncertainty reaches past the
   * tolerance (NOT SHOWN WITHIN TOLERANCE), or the fill was never closed (NOT CLOSED)
   */
  notShown: 7,
} as const;

/** thrown by a command to end with an exit code (its message is already printed) */
export class ExitSignal extends Error {
  constructor(readonly code: number) {
    super(`exit ${code}`);
  }
}

export interface Cli {
  readonly out: (s: string) => void;
  readonly err: (s: string) => void;
  readonly isTTY: boolean;
}

export function cliOf(streams: Streams): Cli {
  return {
    out: (s) => void streams.stdout.write(s),
    err: (s) => void streams.stderr.write(s),
    isTTY: Boolean(streams.isTTY),
  };
}

/**
 * the interactive screens are a separate bundle (dist/tui.mjs) with its own copy of the core, so a
 * refusal thrown there is not an instance of this bundle's ProblemError: carry it over by its shape
 */
export async function fromTui<T>(run: () => Promise<T>): Promise<T> {
  try {
    return await run();
  } catch (e) {
    if (
      !(e instanceof ProblemError) &&
      e instanceof Error &&
      e.name === 'ProblemError' &&
      'problem' in e &&
      'where' in e
    )
      throw new ProblemError((e as ProblemError).problem, (e as ProblemError).where);
    throw e;
  }
}

/** how a guided fill ended, as the screens report it */
export interface FillOutcome {
  interrupted: boolean;
  logged: number;
  steps: number;
  verdict?: string;
  danger?: boolean;
}

/** Ctrl-C in the guided fill: what the log holds and how to go on, then exit 130 */
export function fillEnded(cli: Cli, r: FillOutcome | undefined, logFile: string): void {
  if (!r) return;
  if (r.interrupted) {
    cli.err(
      `mixwright: fill stopped by Ctrl-C: ${r.logged} of ${r.steps} readings are ` +
        `logged in ${logFile}. Resume with: mixwright fill --resume ${logFile}\n`,
    );
    throw new ExitSignal(EXIT.interrupted);
  }
  // the outcome as \`check\` of the log reports it: out of tolerance (or ended incomplete) 4, a danger in the record 3
  if (r.verdict === 'fail') {
    cli.err(
      `mixwright: ${logFile}: the re-check of the batch is FAIL (out of tolerance, ` +
        `or stopped before the last fill); see \`mixwright check ${logFile}\`\n`,
    );
    throw new ExitSignal(EXIT.outOfTolerance);
  }
  if (r.danger) {
    cli.err(
      `mixwright: ${logFile}: a danger finding stands in the record (e.g. a reading ` +
        `past the working limit): do not use the tank as fit until it is inspected; ` +
        `see \`mixwright check ${logFile}\`\n`,
    );
    throw new ExitSignal(EXIT.danger);
  }
  // as `check` (exit 7): inside the tolerance on the readings, but not shown within it
  if (r.verdict === 'pass-uncertain') {
    cli.err(
      `mixwright: ${logFile}: the re-check is NOT SHOWN WITHIN TOLERANCE (the uncertainty reaches ` +
        `past the tolerance): not a pass; see \`mixwright check ${logFile}\`\n`,
    );
    throw new ExitSignal(EXIT.notShown);
  }
}
