/**
 * How a guided fill ends the command: Ctrl-C exits 130 with what the log holds and how to resume;
 * a fill whose log was closed exits as `check` of that log would (checkExit: 4, 3, 6, 5, 7 in that
 * precedence), from `check`'s own re-check of the log at the end screen.
 */
import { checkExit } from './commands/check.js';
import { EXIT, ExitSignal, type Cli } from './context.js';

/** how a guided fill ended, as the screens report it */
export interface FillOutcome {
  interrupted: boolean;
  /** after Ctrl-C: the tank left above its working limit (no choice made, or accepted), in words */
  left?: string;
  logged: number;
  steps: number;
  verdict?: string;
  danger?: boolean;
  /** what `check` found in the record beside the verdict: lines off the hash chain, accepted hazards */
  record?: { readonly alteredLines: readonly number[]; readonly acceptedHazards?: readonly unknown[] };
  /** danger findings of the plan that the log records no acknowledgement of */
  planDangersNotAcknowledged?: readonly unknown[];
  /** dangers of the review of the fill as recorded that the log does not show accepted */
  recordedFillDangers?: readonly unknown[];
  /** stage 2: the premix tank's checks (one confirmed mixed before its least mixing time is `early`) */
  premixChecks?: readonly { readonly kind: string; readonly early?: unknown }[];
  /** the tank at the end in a hazard or above its working limit: what it is now, one line each */
  tankNow?: string;
  /** a reading above the working limit logged, then corrected or withdrawn: the end screen's title words */
  withdrawn?: string;
}

/** what the exit code means, on stderr, for each code but 0 */
function why(code: number, logFile: string, r: FillOutcome): string {
  const see = `see \`mixwright check ${logFile}\``;
  switch (code) {
    case EXIT.outOfTolerance:
      return (
        `the re-check of the batch is FAIL (out of tolerance, or stopped before the last fill)` +
        (r.danger ? '; a danger finding stands in the record as well (see above and the re-check)' : '') +
        `; ${see}`
      );
    case EXIT.danger:
      return (
        `a danger finding stands in the record (e.g. a reading past the working limit): do not use the ` +
        `tank as fit until it is inspected; ${see}`
      );
    case EXIT.acceptedHazard:
      if (r.recordedFillDangers?.length && !r.planDangersNotAcknowledged?.length)
        return (
          `DANGER IN THE RECORDED FILL: the fill as logged went through a danger of the planner's review ` +
          `that the log does not show accepted: not a pass; have the fill reviewed before the tank is ` +
          `used; ${see}`
        );
      if (r.planDangersNotAcknowledged?.length && !r.record?.acceptedHazards?.length)
        return (
          `PLAN DANGER NOT ACKNOWLEDGED: the plan's danger findings have no acknowledgement in the log; ` +
          `not a pass: have the fill reviewed before the tank is used; ${see}`
        );
      return (
        `ACCEPTED HAZARD: the fill went on through hazards accepted at the manifold (the plan's dangers, ` +
        `or what its review of the remaining fills found): not a pass; have them reviewed before the tank ` +
        `is used; ${see}`
      );
    case EXIT.notShown:
      if (r.verdict === 'pass' && r.premixChecks?.some((c) => c.kind === 'mixed' && c.early))
        return (
          `PREMIX DRAWN EARLY: the batch drew from its premix before the least mixing time (confirmed as ` +
          `mixed early); the re-check assumes a uniform premix, which the record does not show: not a ` +
          `pass; ${see}`
        );
      return (
        `the re-check is NOT SHOWN WITHIN TOLERANCE (the uncertainty reaches past the tolerance): ` +
        `not a pass; ${see}`
      );
    default:
      return `RECORD ALTERED: a line of the log no longer matches its hash chain; ${see}`;
  }
}

/** the end of a guided fill: exit 130 after Ctrl-C, else the exit `check` gives its log */
export function fillEnded(cli: Cli, r: FillOutcome | undefined, logFile: string): void {
  if (!r) return;
  if (r.interrupted) {
    cli.err(
      `mixwright: fill stopped by Ctrl-C: ${r.logged} of ${r.steps} readings are ` +
        `logged in ${logFile}. Resume with: mixwright fill --resume ${logFile}\n`,
    );
    if (r.left) cli.err(`mixwright: ${logFile}: ${r.left}\n`);
    throw new ExitSignal(EXIT.interrupted);
  }
  // the tank as it stands, whatever the verdict: it is in the state the review found, not past it
  for (const line of r.tankNow?.split('\n') ?? []) if (line) cli.err(`mixwright: ${logFile}: ${line}\n`);
  // what the end screen's title named first, whatever the exit code: the tank may have been past its limit
  if (r.withdrawn) cli.err(`mixwright: ${logFile}: ${r.withdrawn}\n`);
  // no re-check (the batch left open): nothing to report beyond the screen
  if (r.verdict === undefined) return;
  const code = checkExit({
    verdict: { verdict: r.verdict },
    findings: r.danger ? [{ severity: 'danger' }] : [],
    record: r.record,
    planDangersNotAcknowledged: r.planDangersNotAcknowledged,
    recordedFillDangers: r.recordedFillDangers,
    premixChecks: r.premixChecks,
  });
  if (code === EXIT.ok) return;
  cli.err(`mixwright: ${logFile}: ${why(code, logFile, r)}\n`);
  throw new ExitSignal(code);
}
