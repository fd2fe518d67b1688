/**
 * The predicted uncertainty of a plan with the lab's instruments: the lab profile's
 * gauges, barometer and thermometer (and its settling value, else our default) handed to
 * the core's prediction. One call after planFill: `planWithPrediction(planFill(req.input), req)`.
 */
import {
  DEFAULT_TEMPERATURE_SETTLING_K,
  describeProblem,
  predictPlan,
  ProblemError,
  withBandEdges,
  withPrediction,
  type Plan,
  type PredictedPlan,
  type PredictionInput,
} from '../core/index.js';
import type { PlanRequest } from './load.js';

/** the thermometer a lab profile without one is taken to have (as check does) */
export const DEFAULT_THERMOMETER = { uncertaintyK: 0.5, resolutionK: 0 } as const;

/**
 * The gas-thermometer difference after settling that plan and check both use: the lab
 * profile's `thermometer.settling`, else our default (the same value in the prediction and
 * in the re-check, so a plan predicts what check will find).
 */
export function settlingOf(t: { readonly settlingK?: number } | undefined): number {
  return t?.settlingK ?? DEFAULT_TEMPERATURE_SETTLING_K;
}

/**
 * The thermometer the prediction (and the planner's sequence search, `PlanInput.thermometer`)
 * uses: the lab profile's, else DEFAULT_THERMOMETER, with its settling value or our default.
 */
export function predictionThermometer(
  t: { readonly uncertaintyK: number; readonly resolutionK: number; readonly settlingK?: number } | undefined,
): PredictionInput['thermometer'] {
  const used = t ?? DEFAULT_THERMOMETER;
  return { uK: used.uncertaintyK, resolutionK: used.resolutionK, settlingK: settlingOf(t) };
}

/** the prediction's input from a plan request: the lab's instruments, the default settling value where none is given */
export function predictionInput(plan: Plan, req: PlanRequest): PredictionInput {
  return {
    plan,
    gauges: req.input.gauges,
    reading: req.input.reading,
    thermometer: predictionThermometer(req.lab.thermometer),
  };
}

/**
 * The plan with its predicted uncertainty. A refusal inside the prediction (a state the
 * re-check's model cannot evaluate) does not stop the plan: the plan says why there is no prediction.
 */
export function planWithPrediction(plan: Plan, req: PlanRequest): PredictedPlan {
  try {
    // readings inside every band, taken together (a paper fill reads each later fill to its printed target)
    return withBandEdges(withPrediction(plan, predictPlan(predictionInput(plan, req))));
  } catch (e) {
    if (e instanceof ProblemError) return withPrediction(plan, undefined, describeProblem(e.problem));
    throw e;
  }
}
