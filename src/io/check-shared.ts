/**
 * What the re-check of a batch log and of CSV readings share: the options, the report type,
 * the caveats beside a verdict, the file a refusal from inside the evaluation belongs to, and
 * the charge number of each fill (a source filled in more than one charge).
 */
import { fail, ProblemError, type PlanStep } from '../core/index.js';
import type { LogFinding } from './log-audit.js';
import { hazardList, type AcceptedHazard, type CheckReportOf } from '../report/check-types.js';
import type { LogAck } from './batch-log.js';

export interface CheckOptions {
  readonly trials: number;
  readonly seed: number;
  readonly recipeFile?: string;
  readonly labFile?: string;
  /** --barometer: the barometric pressure at the fill, Pa, for CSV readings (gauge-referenced sensors, "psig") */
  readonly barometricPa?: number;
  /** --tank: the lab profile's tank the CSV readings were filled in (its working limit and rating) */
  readonly tankId?: string;
  /** --premix-log: the batch log of a premix tank the CSV readings drew from */
  readonly premixLog?: string;
}

/** the report of `check`; its record findings carry their sentence (the type lives beside the renderers) */
export type CheckReport = CheckReportOf<LogFinding & { readonly message: string }>;

/** the guided fill's reviews whose hazards the operator accepted (went on through), in log order */
export function acceptedHazardsOf(acks: readonly LogAck[]): AcceptedHazard[] {
  return acks.flatMap((a) =>
    a.review?.outcome === 'accepted' && a.review.hazards.length
      ? [{ step: a.step, by: a.by, time: a.time, hazards: a.review.hazards }]
      : [],
  );
}

/** the sentences beside a verdict: the composition may pass while the record says the tank is not fit to use */
export function verdictCaveats(
  findings: readonly LogFinding[],
  noun = 'logged reading',
  accepted: readonly AcceptedHazard[] = [],
): string[] {
  const out: string[] = [];
  for (const a of accepted)
    out.push(
      `ACCEPTED HAZARD: before fill ${a.step ?? '?'} the review of the re-targeted fills found ` +
        `${hazardList(a)}, which the plan did not have, and ${a.by} went on through it at ${a.time}: ` +
        `the tank went through states the plan did not review as safe. Have the fill reviewed ` +
        `(the hazards, the readings, the tank and its fittings) under local practice before the batch is used`,
    );
  const dangers = findings.filter((f) => f.severity === 'danger');
  if (dangers.length) {
    out.push(
      `DANGER: ${dangers.length === 1 ? `a ${noun}` : `${dangers.length} ${noun}s`} ` +
        `went past the tank's working limit or a gauge's range (see the findings). ` +
        `Whatever the composition, do not label or use this tank as fit until it ` +
        `and its gauges have been inspected under local practice`,
    );
  }
  const edited = findings.filter(
    (f) =>
      f.code === 'text-number-mismatch' ||
      (f.code === 'record' && (f.issue.code === 'line-edited' || f.issue.code === 'line-unhashed')),
  );
  const unread = findings.find((f) => f.code === 'vent-not-read');
  if (unread)
    out.push(
      `the tank was vented after fill ${unread.step ?? '?'} and its pressure after venting was NOT read: ` +
        `the composition is checked (venting keeps it), the final pressure and amount are not known`,
    );
  if (edited.length)
    out.push(
      `the record was changed after it was written (${edited.length} line${edited.length === 1 ? '' : 's'}, ` +
        `see the findings): the verdict rests on numbers that are not as first logged`,
    );
  return out;
}

/**
 * Run the uncertainty evaluation for a file: a refusal from inside it (a Monte Carlo
 * trial whose readings no longer increase) names the file and says what it means.
 */
export async function withinFile<T>(file: string, f: () => Promise<T>): Promise<T> {
  try {
    return await f();
  } catch (e) {
    if (e instanceof ProblemError && e.problem.code === 'density-not-rising')
      return fail({ ...e.problem, inUncertainty: true }, { file });
    if (e instanceof ProblemError) throw e.at({ file });
    throw e;
  }
}

/** a fill's charge of its source: its number among that source's charges, and how many there are */
export type ChargeNumber = PlanStep['charge'];
