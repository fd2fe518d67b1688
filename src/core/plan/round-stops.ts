/**
 * Stop readings the planner chose itself (a split charge given no stop, and every stop of a
 * searched sequence), put on the display grid of the gauge that reads them (reading-grid.ts):
 * rounded up to its resolution, so that a person can read the stop (461.0703 Torr on a 0.01 Torr
 * head is 461.08 Torr) and the targets, the band and the predicted uncertainty are those of the
 * stop that will be read, so that a fill exactly at the printed targets re-checks to the plan's
 * prediction. Up is the safe side: a chosen stop is the lowest one its rule accepts, and more
 * diluent before the oxidizer only moves the later states away from the flammable region. A stop
 * given after "@" is the user's and is kept as given. Called once, between the sequence stage and
 * the steps (planner.ts); the sequence's findings that carry the stop or a reading follow it.
 */
import { roundUpToGrid } from '../reading-grid.js';
import type { Finding } from '../findings.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import type { PlanSequence } from './sequence.js';
import { planSteps, type PlanSteps } from './steps.js';
import { searchedGauges } from './search.js';

/** the sequence with every chosen stop on its gauge's grid; the same object when nothing changes */
export function roundChosenStops(
  basis: PlanBasis,
  amounts: PlanAmounts,
  sequence: PlanSequence,
): PlanSequence {
  const given = basis.input.charges;
  const chosen = sequence.charges.map((c, k) => c.stopPa !== undefined && given?.[k]?.stopPa === undefined);
  if (!chosen.some(Boolean)) return sequence;
  const planned = searchedGauges(basis, planSteps(basis, amounts, sequence), sequence);
  let changed = false;
  const charges = sequence.charges.map((c, k) => {
    const g = planned.steps[k].gauge;
    if (!chosen[k] || !g) return c;
    const offsetPa = g.reference === 'gauge' ? basis.input.reading.barometricPa : 0;
    const stopPa = roundUpToGrid(c.stopPa!, { resolutionPa: g.resolutionPa, offsetPa });
    if (stopPa === c.stopPa) return c;
    changed = true;
    return { ...c, stopPa };
  });
  if (!changed) return sequence;
  const rounded: PlanSequence = { ...sequence, charges };
  const after = searchedGauges(basis, planSteps(basis, amounts, rounded), rounded);
  return { ...rounded, findings: sequence.findings.map((f) => followed(f, after, charges)) };
}

/** a finding of the sequence stage with the stop or reading it names moved to the rounded one */
function followed(f: Finding, after: PlanSteps, charges: PlanSequence['charges']): Finding {
  if (f.code === 'split-point-chosen' && f.step !== undefined)
    return { ...f, stopPa: charges[f.step - 1].stopPa ?? f.stopPa };
  if (f.code === 'sequence-chosen' && f.step !== undefined)
    return { ...f, readingPa: after.steps[f.step - 1]?.targetPa ?? f.readingPa };
  return f;
}
