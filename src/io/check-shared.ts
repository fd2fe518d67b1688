/**
 * What the re-check of a batch log and of CSV readings share: the options, the report type,
 * the caveats beside a verdict, the file a refusal from inside the evaluation belongs to, and
 * the charge number of each fill (a source filled in more than one charge).
 */
import { fail, ProblemError, type PlanStep, type ReadingPastRange } from '../core/index.js';
import type { LogFinding } from './log-audit.js';
import {
  dangerList,
  hazardList,
  type AcceptedHazard,
  type PlanDanger,
  type CheckReportOf,
  type RecordSeverity,
} from '../report/check-types.js';
import { OVER_RANGE_CODE, WENT_ON_BELOW_BAND, type LogAck } from './batch-log.js';
import { fromPa, type PressureUnit } from './quantity.js';

const shown = (pa: number, unit: PressureUnit) => `${Number(fromPa(pa, unit).toPrecision(6))} ${unit}`;
/** a reading against the tank's working limit, absolute, as the log audit words it */
const limitVs = (f: { pressurePa: number; limitPa: number; unit: PressureUnit }) =>
  `${shown(f.pressurePa, f.unit)} absolute vs the working limit ${shown(f.limitPa, f.unit)}`;

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

/**
 * acknowledgements that are not the acceptance of a plan's danger: the review of the re-targeted
 * remainder, the choice on a capped re-target and going on from a fill read below its band (their own
 * shapes), and a reading past the working limit or a gauge's range accepted at the manifold (a danger
 * of the record itself, exit 3)
 */
const NOT_PLAN_ACKS = new Set([
  'remainder-review',
  'limit-cap',
  'above-working-limit',
  'above-gauge-range',
  WENT_ON_BELOW_BAND,
  OVER_RANGE_CODE,
]);

/** an acknowledgement of one of the plan's danger findings, on the fill's danger screen */
export function isPlanAck(a: LogAck): boolean {
  return !a.review && !a.cap && !NOT_PLAN_ACKS.has(a.code);
}

/**
 * The hazards the fill went on through, in log order: the plan's danger findings accepted on the
 * fill's danger screen (acknowledgements of one sitting grouped: same initials and time), and the
 * hazards of the guided fill's reviews that the operator accepted. `planFindings`: the header's
 * findings, for the severity of an accepted plan finding (a danger where the header does not say).
 */
export function acceptedHazardsOf(
  acks: readonly LogAck[],
  planFindings: readonly { code: string; step: number | null; severity: string }[] = [],
): AcceptedHazard[] {
  const out: AcceptedHazard[] = [];
  const severityOf = (code: string, step: number | null): RecordSeverity => {
    const f = planFindings.find((x) => x.code === code && x.step === step);
    return f?.severity === 'warning' || f?.severity === 'note' ? f.severity : 'danger';
  };
  for (const a of acks) {
    if (isPlanAck(a)) {
      const hazard = { code: a.code, step: a.step, severity: severityOf(a.code, a.step) };
      const prev = out.at(-1);
      if (prev?.found === 'plan' && prev.by === a.by && prev.time === a.time)
        out[out.length - 1] = { ...prev, hazards: [...prev.hazards, hazard] };
      else out.push({ found: 'plan', step: null, by: a.by, time: a.time, hazards: [hazard] });
    } else if (a.review?.outcome === 'accepted' && a.review.hazards.length)
      out.push({ found: 'review', step: a.step, by: a.by, time: a.time, hazards: a.review.hazards });
  }
  return out;
}

/**
 * the plan's danger findings that no acknowledgement of the log names (by code, as the guided fill's
 * danger screen writes them), each code once with the first fill it concerns
 */
export function planDangersNotAcknowledged(
  planFindings: readonly { code: string; step: number | null; severity: string }[],
  acks: readonly LogAck[],
): PlanDanger[] {
  const acked = new Set(acks.filter(isPlanAck).map((a) => a.code));
  const out: PlanDanger[] = [];
  for (const f of planFindings)
    if (f.severity === 'danger' && !acked.has(f.code) && !out.some((d) => d.code === f.code))
      out.push({ code: f.code, step: f.step });
  return out;
}

/**
 * the caveat of a plan danger nobody is recorded as having acknowledged: a log (`recipe` undefined)
 * or CSV readings checked against `recipe`
 */
function planDangerCaveat(dangers: readonly PlanDanger[], recipe?: string): string {
  const one = dangers.length === 1;
  const found =
    `PLAN DANGER NOT ACKNOWLEDGED: the plan's safety review ${recipe ? `of recipe ${recipe} ` : ''}found ` +
    `${dangerList(dangers)} (${one ? 'a danger' : 'dangers'}), and `;
  const why = recipe
    ? `CSV readings record neither whether the fill went through ${one ? 'it' : 'them'} nor that anyone ` +
      `accepted ${one ? 'it' : 'them'}`
    : `this log records no acknowledgement of ${one ? 'it' : 'them'} (the guided fill asks for one on its ` +
      `danger screen before filling: this log was not written so, or the acknowledgement is missing)`;
  return (
    found +
    why +
    `: nobody is recorded as having accepted that the tank goes through states the plan reviewed as ` +
    `dangerous. This is not a pass: have the fill reviewed (the hazards, the readings, the tank and its ` +
    `fittings) under local practice before the batch is used` +
    (recipe ? `; see \`mixwright plan ${recipe}\`` : '')
  );
}

/** the caveat of a danger the review of the fill as recorded finds, and the record does not show accepted */
function recordedDangerCaveat(dangers: readonly PlanDanger[], rowsMissing: boolean): string {
  const one = dangers.length === 1;
  if (rowsMissing)
    return (
      `DANGER IN THE RECORDED FILL, as the rows stand: the safety review of the rows given (the planner's ` +
      `own review) finds ${dangerList(dangers)} (${one ? 'a danger' : 'dangers'}), and the record does not ` +
      `show ${one ? 'it' : 'them'} accepted; a planned fill has no row, so the tank's states are not known ` +
      `from these rows. Add the missing row and check again; until then this is not a pass: have the fill ` +
      `reviewed (the hazards, the readings, the tank and its fittings) under local practice before the ` +
      `batch is used`
    );
  return (
    `DANGER IN THE RECORDED FILL: the safety review of the fill as recorded (the tank after each reading, ` +
    `by this re-check's composition at the reading's pressure, and each fill's path between readings; the ` +
    `planner's own review) finds ${dangerList(dangers)} (${one ? 'a danger' : 'dangers'}), and the record ` +
    `does not show ${one ? 'it' : 'them'} accepted: the tank went through ${one ? 'a state' : 'states'} the ` +
    `planner reviews as dangerous, whatever the final composition (one found at the last fill is the ` +
    `finished batch: the tank holds it now). This is not a pass: have the fill ` +
    `reviewed (the hazards, the readings, the tank and its fittings) under local practice before the ` +
    `batch is used`
  );
}

/** the sentences beside a verdict: the composition may pass while the record says the tank is not fit to use */
export function verdictCaveats(
  findings: readonly LogFinding[],
  noun = 'logged reading',
  accepted: readonly AcceptedHazard[] = [],
  unacknowledged: { readonly dangers: readonly PlanDanger[]; readonly recipe?: string } = { dangers: [] },
  recordedDangers: readonly PlanDanger[] = [],
  /** a planned fill has no reading (a CSV row missing): the recorded states are the rows', not the tank's */
  rowsMissing = false,
): string[] {
  const out: string[] = [];
  if (unacknowledged.dangers.length)
    out.push(planDangerCaveat(unacknowledged.dangers, unacknowledged.recipe));
  if (recordedDangers.length) out.push(recordedDangerCaveat(recordedDangers, rowsMissing));
  for (const a of accepted)
    out.push(
      a.found === 'plan'
        ? `ACCEPTED HAZARD: the plan's safety review found ${hazardList(a)} ` +
            `(${a.hazards.length === 1 ? 'a danger' : 'dangers'}), and ${a.by} accepted ` +
            `${a.hazards.length === 1 ? 'it' : 'them'} at ${a.time} on the fill's danger screen and ` +
            `filled through: the tank went through (and, for a danger at the last fill, holds) states the ` +
            `plan reviewed as dangerous. Have the fill ` +
            `reviewed (the hazards, the readings, the tank and its fittings) under local practice before ` +
            `the batch is used`
        : `ACCEPTED HAZARD: before fill ${a.step ?? '?'} the review of the re-targeted fills found ` +
            `${hazardList(a)}, which the plan did not have, and ${a.by} went on through it at ${a.time}: ` +
            `the tank went through states the plan did not review as safe. Have the fill reviewed ` +
            `(the hazards, the readings, the tank and its fittings) under local practice before the batch is used`,
    );
  const notRead = findings.filter((f) => f.code === 'over-range-typed' && f.severity === 'danger');
  if (notRead.length)
    out.push(
      `DANGER: ${notRead.length === 1 ? 'a value was' : `${notRead.length} values were`} typed past a gauge's ` +
        `range and the tank was NOT read on a gauge that covers it (see the findings): it may hold more gas ` +
        `than the readings say. Do not label or use it as fit until it is read on a gauge that covers it ` +
        `and the fill reviewed under local practice`,
    );
  const dangers = findings.filter((f) => f.severity === 'danger' && f.code !== 'over-range-typed');
  if (dangers.length) {
    out.push(
      `DANGER: ${dangers.length === 1 ? `a ${noun}` : `${dangers.length} ${noun}s`} ` +
        `went past the tank's working limit or a gauge's range (see the findings). ` +
        `Whatever the composition, do not label or use this tank as fit until it ` +
        `and its gauges have been inspected under local practice`,
    );
  }
  // a reading past the working limit later corrected or withdrawn: its finding is a warning, but the
  // verdict (and the label, the fill's end screen) must not read as if it never was logged
  const withdrawnOver = findings.filter(
    (f): f is Extract<LogFinding, { code: 'above-working-limit' }> =>
      f.code === 'above-working-limit' && f.replaced && !f.ventedAgain,
  );
  if (withdrawnOver.length)
    out.push(
      `A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn (` +
        withdrawnOver
          .map((f) => `${f.line ? `line ${f.line}, ` : ''}fill ${f.step ?? '?'}: ${limitVs(f)}`)
          .join('; ') +
        `): if the tank really reached it, treat it as a danger: have the tank and its fittings inspected ` +
        `under local practice before the batch is used`,
    );
  const edited = findings.filter(
    (f) =>
      f.code === 'text-number-mismatch' ||
      f.code === 'format-set-back' ||
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

/**
 * the readings the composition is computed from (`lines`: the fill readings in force, and a top-up's
 * starting pressure) that went past their gauge's full scale: a danger of the record, and no support
 * for a composition (core withReadingsPastRange)
 */
export function readingsPastRange(
  findings: readonly LogFinding[],
  lines: ReadonlySet<number>,
): ReadingPastRange[] {
  return findings.flatMap((f) =>
    f.code === 'above-gauge-range' && f.severity === 'danger' && lines.has(f.line)
      ? [{ step: f.step, line: f.line, gauge: f.gauge }]
      : [],
  );
}
