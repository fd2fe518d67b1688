/** What every command module is given: the output streams, exit codes and the shared ways out. */
import { describeProblemAt, ProblemError, type Problem, type Where } from '../core/index.js';
import { STDERR_STYLE, wrapWords } from '../report/wrap.js';

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

/** the width stderr's messages are wrapped at: a terminal's usual 80 columns */
export const STDERR_WIDTH = 80;

/**
 * A message for stderr wrapped at `width` columns: each line longer than that is broken at its last
 * space that fits, and goes on indented two spaces deeper than the line it continues (as the
 * "(error code: ...)" line under a refusal). A word longer than the width (a path) is never cut: it
 * stands whole on its own line. Lines that fit, line feeds and other spacing are left as they are.
 */
export function wrapForStderr(text: string, width = STDERR_WIDTH): string {
  return text
    .split('\n')
    .flatMap((line) => wrapWords(line, width, STDERR_STYLE))
    .join('\n');
}

/** a refusal as stderr gives it: what, where, why and what to do, then its code (wrapped by `err`) */
export function refusalText(problem: Problem, where: Where): string {
  return `mixwright: ${describeProblemAt(problem, where)}\n  (error code: ${problem.code})\n`;
}

export function cliOf(streams: Streams): Cli {
  return {
    out: (s) => void streams.stdout.write(s),
    // every message on stderr (refusals: what, where, why, what to do; notes; the parser's errors) fits
    // an 80-column terminal
    err: (s) => void streams.stderr.write(wrapForStderr(s)),
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
