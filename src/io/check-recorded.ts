/**
 * The safety review of the fill as recorded, for `check` of a batch log and of CSV readings alike
 * (core/recorded-review.ts: the states after each reading by the re-check's inverse model, each
 * fill's path, by the planner's own review), and which of its dangers the record shows accepted.
 */
import {
  describeFinding,
  reviewRecordedFill,
  TORR_PA,
  type CheckedReading,
  type Finding,
  type Fractions,
  type SafetyContext,
} from '../core/index.js';
import { workingLimitOf, type LogAck, type ParsedLog } from './batch-log.js';
import { acceptedHazardsOf, isPlanAck, planDangersNotAcknowledged } from './check-shared.js';
import type { AcceptedHazard, PlanDanger, RecordedFill, RecordSeverity } from '../report/check-types.js';

/** the record shows this finding accepted: the guided fill's acknowledgement of its code (at its fill) */
function acceptedIn(f: Finding, acks: readonly LogAck[]): boolean {
  const step = f.step ?? null;
  const at = (s: number | null | undefined) => s === null || s === undefined || step === null || s === step;
  return acks.some(
    (a) =>
      (isPlanAck(a) && a.code === f.code && at(a.step)) ||
      (a.review?.outcome === 'accepted' && a.review.hazards.some((h) => h.code === f.code && at(h.step))),
  );
}

/**
 * The review of the fill as recorded. `acks`: the log's acknowledgements (none for CSV readings);
 * `plannedOrder`: the sources in the plan's order, to say when the record filled in another;
 * `planUnacked`: the plan's dangers the record shows nobody acknowledged (said as such, not again).
 */
export function recordedFillOf(
  readings: readonly CheckedReading[],
  initial: { composition: Fractions; pressurePa: number; temperatureK: number } | undefined,
  safety: Omit<SafetyContext, 'temperatureK'>,
  acks: readonly LogAck[],
  plannedOrder?: readonly string[],
  planUnacked: readonly PlanDanger[] = [],
): { recordedFill: RecordedFill; dangers: PlanDanger[] } {
  const review = reviewRecordedFill({ readings, initial, safety });
  // an unknown rating is said by check's own warning of the limits not checked (in check's words)
  const listed = review.findings.filter((f) => f.severity !== 'note' && f.code !== 'tank-rating-unknown');
  const findings = listed.map((f) => ({
    severity: f.severity as RecordSeverity,
    code: f.code,
    step: f.step ?? null,
    message: describeFinding(f, (pa) => `${(pa / TORR_PA).toPrecision(6)} Torr`),
    accepted: acceptedIn(f, acks),
  }));
  // a danger the plan had and nobody acknowledged is said once, as PLAN DANGER NOT ACKNOWLEDGED (by code,
  // as that is matched); the finding stays listed with the recorded fill's
  const dangers: PlanDanger[] = [];
  for (const f of findings)
    if (
      f.severity === 'danger' &&
      !f.accepted &&
      !planUnacked.some((d) => d.code === f.code) &&
      !dangers.some((d) => d.code === f.code && d.step === f.step)
    )
      dangers.push({ code: f.code, step: f.step });
  return {
    recordedFill: {
      temperatures: review.temperatures,
      order: readings.map((r) => r.source.id),
      ...(plannedOrder ? { plannedOrder: [...plannedOrder] } : {}),
      findings,
      notes: [
        ...new Set(
          review.findings
            .filter((f) => f.severity === 'note')
            .map((f) => `${f.code}${f.step ? ` (fill ${f.step})` : ''}`),
        ),
      ],
    },
    dangers,
  };
}

/**
 * What a batch log's record says beside its composition, for check's overall outcome
 * (report/check-outcome.ts `checkOutcomes`): the hazards the fill went on through (accepted), the plan's
 * dangers nobody acknowledged, and the review of the fill as recorded with its dangers not accepted.
 * `check` of a log and the re-check of a premix log as a source (premix-check.ts) both take it from here,
 * so stage 2 refuses a premix log by the outcome `check` gives it.
 */
export function logRecordOutcome(
  log: ParsedLog,
  model: {
    readonly readings: readonly CheckedReading[];
    readonly initial?: { composition: Fractions; pressurePa: number; temperatureK: number };
  },
): {
  accepted: AcceptedHazard[];
  unacknowledged: PlanDanger[];
  recorded: { recordedFill: RecordedFill; dangers: PlanDanger[] };
} {
  const h = log.header;
  const accepted = acceptedHazardsOf(log.acknowledgements, h.findings);
  const unacknowledged = planDangersNotAcknowledged(h.findings ?? [], log.acknowledgements);
  // the fill as recorded, by the planner's own safety review: a danger nobody accepted is no pass
  const recorded = recordedFillOf(
    model.readings,
    model.initial,
    {
      tankId: h.tank.id,
      workingLimitPa: workingLimitOf(h),
      coldestK: h.safety?.coldest_K,
      condensationFraction: h.safety?.condensation_fraction,
    },
    log.acknowledgements,
    h.steps.map((s) => s.source),
    unacknowledged,
  );
  return { accepted, unacknowledged, recorded };
}
