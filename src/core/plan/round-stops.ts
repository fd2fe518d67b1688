/**
 * Stop readings the planner chose itself (a split charge given no stop, and every stop of a
 * searched sequence), put on the display grid of the gauge that reads them (reading-grid.ts):
 * rounded up to its resolution, so that a person can read the stop (461.0703 Torr on a 0.01 Torr
 * head is 461.08 Torr) and the targets, the band and the predicted uncertainty are those of the
 * stop that will be read, so that a fill exactly at the printed targets re-checks to the plan's
 * prediction. Up is the safe side: a chosen stop is the lowest one its rule accepts, and more
 * diluent before the oxidizer only moves the later states away from the flammable region. A stop
 * given after "@" is the user's and is kept as given. Called once, between the sequence stage and
 * the steps (planner.ts); the sequence's findings that carry the stop or a reading follow it. A stop
 * set one band above its lowest safe stop (split-point.ts) is checked again once rounded: if its
 * band (which moves a little with the stop) reaches below that stop, it goes up by one more step.
 */
import { roundUpToGrid, type ReadingGrid } from '../reading-grid.js';
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
  const grids = planned.steps.map((st) => {
    const g = st.gauge;
    if (!g) return undefined;
    return {
      resolutionPa: g.resolutionPa,
      offsetPa: g.reference === 'gauge' ? basis.input.reading.barometricPa : 0,
    };
  });
  let changed = false;
  let charges = sequence.charges.map((c, k) => {
    const grid = grids[k];
    if (!chosen[k] || !grid) return c;
    const stopPa = roundUpToGrid(c.stopPa!, grid);
    if (stopPa === c.stopPa) return c;
    changed = true;
    return { ...c, stopPa };
  });
  if (!changed && !floorsShort(sequence.findings, planned, charges).length) return sequence;
  let rounded: PlanSequence = { ...sequence, charges };
  let after = changed ? searchedGauges(basis, planSteps(basis, amounts, rounded), rounded) : planned;
  // a stop set one band above its lowest safe stop (split-point.ts) keeps its whole band above it
  for (let tries = 0; tries < FLOOR_TRIES; tries++) {
    const short = floorsShort(sequence.findings, after, charges);
    if (!short.length) break;
    charges = charges.map((c, k) =>
      short.includes(k) && grids[k] ? { ...c, stopPa: c.stopPa! + grids[k].resolutionPa } : c,
    );
    rounded = { ...sequence, charges };
    after = searchedGauges(basis, planSteps(basis, amounts, rounded), rounded);
  }
  return { ...rounded, findings: sequence.findings.map((f) => followed(f, after, charges, grids)) };
}

/** steps of one display resolution a rounded stop is raised at most to keep its band above its floor */
const FLOOR_TRIES = 3;

/** the charges (0-based) whose stop's band reaches below the lowest safe stop of its split-point note */
function floorsShort(
  findings: readonly Finding[],
  after: PlanSteps,
  charges: PlanSequence['charges'],
): number[] {
  const out: number[] = [];
  for (const f of findings) {
    if (f.code !== 'split-point-chosen' || f.step === undefined || f.lowestSafePa === undefined) continue;
    const k = f.step - 1;
    if (charges[k].stopPa! - after.steps[k].bandPa < f.lowestSafePa) out.push(k);
  }
  return out;
}

/** a finding of the sequence stage with the stop or reading it names moved to the rounded one */
function followed(
  f: Finding,
  after: PlanSteps,
  charges: PlanSequence['charges'],
  grids: readonly (ReadingGrid | undefined)[],
): Finding {
  if (f.code === 'split-point-chosen' && f.step !== undefined) {
    const k = f.step - 1;
    const grid = grids[k];
    return {
      ...f,
      stopPa: charges[k].stopPa ?? f.stopPa,
      bandPa: f.bandPa === undefined ? undefined : after.steps[k].bandPa,
      floorPa: f.lowestSafePa === undefined || !grid ? f.floorPa : roundUpToGrid(f.lowestSafePa, grid),
    };
  }
  if (f.code === 'sequence-chosen' && f.step !== undefined)
    return { ...f, readingPa: after.steps[f.step - 1]?.targetPa ?? f.readingPa };
  return f;
}
