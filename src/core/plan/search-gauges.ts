/**
 * The gauge of each reading, as the sequence search chooses it. The step stage gives each
 * reading the connected gauge with the smallest standard uncertainty of that one reading
 * (`chooseGauge`); the predicted budget correlates a gauge's span and zero between its
 * readings, so another head that also covers the reading can give a smaller U of the
 * composition (two readings on one head: its span error largely cancels in their difference).
 *
 * Isolation: a head is closed off before the tank passes the top of its range and is not
 * re-opened, so the heads a reading may use are those still connected at it (the step
 * stage's own rule: a head whose top is below a step's target plus band is closed off before
 * that step) whose range covers the reading and the top of its band.
 */
import { canRead, gaugeReadingPa, gaugeTopAbsolutePa, readingUncertaintyPa, type Gauge } from '../gauges.js';
import type { PlanBasis } from './validate.js';
import type { PlanSteps } from './steps.js';
import type { GaugeAssignment, PlanStep } from './types.js';

/**
 * A head whose own reading uncertainty is more than this many times the best covering head's is
 * not tried: the span it could share with the neighbouring readings cannot make up for it.
 */
export const ALTERNATIVE_U_FACTOR = 5;

/**
 * The gauges each step's reading may use (same rule of isolation as the step stage), by step;
 * with `pruned`, only those within ALTERNATIVE_U_FACTOR of the best reading uncertainty.
 */
export function gaugeAlternatives(basis: PlanBasis, steps: readonly PlanStep[], pruned = false): Gauge[][] {
  const { gauges, reading } = basis.input;
  const connected = new Set(gauges.map((g) => g.id));
  return steps.map((s) => {
    const upper = s.targetPa + s.bandPa;
    for (const g of gauges) if (gaugeTopAbsolutePa(g, reading) < upper) connected.delete(g.id);
    const covering = gauges.filter(
      (g) => connected.has(g.id) && canRead(g, s.targetPa, reading) && canRead(g, upper, reading),
    );
    if (!pruned || !covering.length) return covering;
    const u = covering.map((g) => readingUncertaintyPa(g, s.targetPa, reading));
    const best = Math.min(...u);
    return covering.filter((_, i) => u[i] <= ALTERNATIVE_U_FACTOR * best);
  });
}

function assignmentOf(basis: PlanBasis, g: Gauge, absolutePa: number): GaugeAssignment {
  const ctx = basis.input.reading;
  return {
    id: g.id,
    label: g.label,
    unit: g.unit,
    reference: g.reference,
    readingPa: gaugeReadingPa(g, absolutePa, ctx),
    uncertaintyPa: readingUncertaintyPa(g, absolutePa, ctx),
    resolutionPa: g.resolutionPa,
  };
}

/**
 * The steps with the gauge of each reading set to `ids` (undefined: keep the step stage's
 * choice). Each id must name a gauge that covers its reading (see gaugeAlternatives); the step
 * stage's findings (a reading no gauge covers, a supply below its target) do not depend on
 * which covering gauge reads it.
 */
export function withGauges(
  basis: PlanBasis,
  planned: PlanSteps,
  ids: readonly (string | undefined)[],
): PlanSteps {
  let changed = false;
  const steps = planned.steps.map((s, k) => {
    const id = ids[k];
    if (id === undefined || id === s.gauge?.id) return s;
    const g = basis.input.gauges.find((x) => x.id === id);
    if (!g) return s;
    changed = true;
    return { ...s, gauge: assignmentOf(basis, g, s.targetPa) };
  });
  return changed ? { ...planned, steps } : planned;
}
