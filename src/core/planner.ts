/**
 * The fill plan: cumulative target readings after each charge from the density-form
 * virial equation of the cumulative composition, beside the ideal-gas plan, with a
 * gauge and a tolerance band for each reading.
 *
 * `planFill` runs the stages of src/core/plan/ in turn, each a pure function with a
 * small typed hand-off:
 *   validate (PlanBasis) -> amounts (PlanAmounts) -> sequence (PlanSequence: the charges; a
 *   stop the planner chose rounded up to its gauge's display resolution, round-stops.ts)
 *   -> steps (PlanSteps: targets, bands, gauges) -> review (PlanReview: findings) -> result (Plan).
 * This module keeps the planner's public names in one place for index.ts and the core.
 */
import { refuseBandsAboveRating, validatePlanInput } from './plan/validate.js';
import { planAmounts } from './plan/amounts.js';
import { planSequence } from './plan/sequence.js';
import { roundChosenStops } from './plan/round-stops.js';
import { planSteps } from './plan/steps.js';
import { reviewPlan, type SafetyReviews } from './plan/review.js';
import { planResult } from './plan/result.js';
import { searchedGauges } from './plan/search.js';
import type { Plan, PlanInput } from './plan/types.js';
import type { PlanBasis } from './plan/validate.js';
import type { PlanAmounts } from './plan/amounts.js';
import type { PlanSequence } from './plan/sequence.js';
import type { GasSource } from './supply.js';

export type {
  ChargeRequest,
  GaugeAssignment,
  InitialGas,
  Plan,
  PlanInput,
  PlanStep,
  TankSpec,
  Tolerance,
} from './plan/types.js';
export { MODEL_T_RANGE_K } from './plan/validate.js';
export { MAX_NON_IDEALITY } from './plan/amounts.js';
export { fillLabel } from './supply.js';

export function planFill(input: PlanInput, shared?: SharedStages): Plan {
  const basis = validatePlanInput(input);
  const { amounts, sequence: planned } = gaugeFreeStages(basis, shared);
  // a stop the planner chose is read on a gauge: on its display grid (plan/round-stops.ts)
  const sequence = roundChosenStops(basis, amounts, planned);
  // the gauges the sequence search chose for the readings (none without a search)
  const steps = searchedGauges(basis, planSteps(basis, amounts, sequence), sequence);
  // no reading inside a band may be above the tank's rating (validate.ts aboveRating)
  refuseBandsAboveRating(basis, steps.steps);
  const review = reviewPlan(basis, amounts, sequence, steps, shared?.reviews);
  return planResult(basis, amounts, sequence, steps, review);
}

/**
 * The stages a plan's gauges do not enter: the amounts and the fill order (neither reads a gauge,
 * but for the sequence search and the split points of given charges: never shared). Plans of one
 * input that differ only in their gauges (a premix's head choices, two-stage.ts) share them: kept
 * by the input without its gauges, and used only for the very same source objects (later stages
 * look sources up). They share the safety review of their states and fill paths too, kept by
 * everything it reviews (safetyFindings: equal states and fills, equal findings).
 */
export interface SharedStages {
  readonly stages: Map<
    string,
    { readonly sources: readonly GasSource[]; readonly amounts: PlanAmounts; readonly sequence: PlanSequence }
  >;
  readonly reviews: SafetyReviews;
}

/** an empty SharedStages, for the plans of one input that differ only in their gauges */
export function sharedStages(): SharedStages {
  return { stages: new Map(), reviews: new Map() };
}

function gaugeFreeStages(
  basis: PlanBasis,
  shared: SharedStages | undefined,
): { amounts: PlanAmounts; sequence: PlanSequence } {
  const { input } = basis;
  // the sequence search and the split points of given charges both weigh the gauges: never shared
  const searched = input.order === 'recommend' && input.thermometer !== undefined;
  const gaugesUsed = searched || input.charges !== undefined;
  const key =
    shared && !gaugesUsed ? JSON.stringify({ ...input, gauges: undefined, manifoldGauges: undefined }) : '';
  const hit = key ? shared?.stages.get(key) : undefined;
  if (
    hit &&
    hit.sources.length === input.sources.length &&
    hit.sources.every((s, i) => s === input.sources[i])
  )
    return hit;
  const amounts = planAmounts(basis);
  const part = { sources: input.sources, amounts, sequence: planSequence(basis, amounts) };
  if (key) shared?.stages.set(key, part);
  return part;
}
