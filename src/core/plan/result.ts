/**
 * Stage 6 of the fill plan: the Plan, assembled from the hand-offs of the stages
 * before it; findings in stage order (sequence, steps, review).
 */
import { R } from '../constants.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import type { PlanSequence } from './sequence.js';
import type { PlanSteps } from './steps.js';
import type { PlanReview } from './review.js';
import type { Plan } from './types.js';

export function planResult(
  basis: PlanBasis,
  amounts: PlanAmounts,
  sequence: PlanSequence,
  planned: PlanSteps,
  review: PlanReview,
): Plan {
  const { input, finalPressurePa: Pf, temperatureK: T, volumeM3: V } = basis;
  return {
    design: input.design,
    temperatureK: T,
    tank: input.tank,
    orderReason: review.orderReason,
    orderRecommended: sequence.recommended,
    composition: amounts.allocation.composition,
    unidentifiedFraction: amounts.allocation.unidentified,
    initial: basis.initial,
    final: {
      pressurePa: Pf,
      temperatureK: T,
      compressibility: amounts.compressibility,
      amountMol: amounts.totalMol,
      idealAmountMol: (Pf * V) / (R * T),
      densityMolPerM3: amounts.densityMolPerM3,
      bMixM3PerMol: amounts.bMixM3PerMol,
      cMixM6PerMol2: amounts.cMixM6PerMol2,
    },
    steps: planned.steps,
    virial: basis.model,
    findings: [...(review.sequenceFindings ?? sequence.findings), ...planned.findings, ...review.findings],
    tolerance: input.tolerance,
  };
}
