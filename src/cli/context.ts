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
