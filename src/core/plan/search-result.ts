/**
 * What the sequence search says about its choice: the order reason (numbers without units:
 * relative U) and the findings that carry the readings (in Pa, worded by describeFinding in
 * the table's units): why the chosen sequence won, and a more precise option that is not
 * recommended because of its hazard.
 */
import { COMPARED_CLAIM, ORDER_REVIEW_CLAIM, type OrderAdvice } from '../order.js';
import { hazardRank } from '../supply-check.js';
import type { Finding } from '../findings.js';
import { fillLabel } from '../supply.js';
import { speciesRole } from '../composition.js';
import type { Evaluated, SearchStats } from './search-eval.js';
import type { PlanStep } from './types.js';

/** a relative size in per cent, two significant digits ("2.9 %", "0.45 %") */
export function relPct(x: number): string {
  return `${Number((x * 100).toPrecision(2)).toString()} %`;
}

const labels = (ev: Evaluated) => ev.charges.map((c) => fillLabel(c.source));

/** x(species) for a species key, phi as it is */
const quantity = (name: string) => (name === 'phi' ? 'phi' : `x(${name})`);

/** the relative U of a named row */
function relOf(ev: Evaluated, name: string): number | undefined {
  const r = ev.prediction?.rows.find((x) => x.name === name);
  return r && r.design > 0 ? r.expandedU / r.design : undefined;
}

/**
 * The design fraction whose reading the chosen sequence improved: the baseline's worst, or for
 * phi the fuel or oxidizer fraction the baseline knows least well.
 */
function improvedSpecies(win: Evaluated, base: Evaluated): string | undefined {
  const worst = base.worst!.name;
  if (worst !== 'phi') return worst;
  let best: { name: string; gain: number } | undefined;
  for (const r of base.prediction!.rows) {
    if (r.kind !== 'fraction' || speciesRole(r.name) === 'inert') continue;
    const gain = r.expandedU / r.design - (relOf(win, r.name) ?? Infinity);
    if (!best || gain > best.gain) best = { name: r.name, gain };
  }
  return best?.name;
}

/**
 * The last charge that delivers a species, in a candidate's steps: a source whose main gas it
 * is, else the source that carries the largest share of it (a premix); none for phi or dilution.
 */
function stepOf(ev: Evaluated, species: string): PlanStep | undefined {
  const steps = [...ev.steps.steps].reverse();
  const main = steps.find((s) => s.source.mainSpecies === species);
  if (main) return main;
  let best: PlanStep | undefined;
  for (const s of steps)
    if ((s.source.composition[species] ?? 0) > (best?.source.composition[species] ?? 0)) best = s;
  return best;
}

/** why the chosen sequence won, with its readings and U beside the advised order's */
export function wonFinding(win: Evaluated, base: Evaluated): Finding {
  const species = improvedSpecies(win, base) ?? win.worst!.name;
  const at = stepOf(win, species);
  const was = stepOf(base, species);
  return {
    severity: 'note',
    code: 'sequence-chosen',
    step: at?.index,
    species,
    source: at ? fillLabel(at.source) : species,
    readingPa: at?.targetPa ?? 0,
    gauge: at?.gauge?.id ?? '-',
    relativeU: relOf(win, species) ?? win.worst!.relative,
    baselineReadingPa: was?.targetPa ?? 0,
    baselineGauge: was?.gauge?.id ?? '-',
    baselineRelativeU: relOf(base, species) ?? base.worst!.relative,
    baselineOrder: labels(base),
    worst: win.worst!.name,
    worstRelativeU: win.worst!.relative,
    baselineWorst: base.worst!.name,
    baselineWorstRelativeU: base.worst!.relative,
  };
}

/** a sequence that meets the tolerance only through a hazard: offered, not recommended */
export function optionFinding(ev: Evaluated, toleranceRelative: number): Finding {
  const hazards = ev.safety.hazards;
  return {
    severity: 'note',
    code: 'precise-sequence-hazard',
    charges: ev.charges.map((c) => ({ label: fillLabel(c.source), stopPa: c.stopPa })),
    worst: ev.worst!.name,
    worstRelativeU: ev.worst!.relative,
    toleranceRelative,
    hazards: hazards.map((h) => ({ code: h.code, step: h.step })),
  };
}

/**
 * what the search compared (hazardRank, supply-check.ts): the hazards of the intermediate tank
 * states and fill paths, then the supply's findings, the chosen sequence's beside the advised
 * order's. The tank's rating and the finished mixture are the same for every sequence and not
 * counted here: the plan's review adds what its full review finds (review.ts correctedReason).
 */
function comparedSafety(win: Evaluated, base: Evaluated): string {
  const [w, b] = [hazardRank(win.safety.hazards), hazardRank(base.safety.hazards)];
  return (
    `${COMPARED_CLAIM} (of the gas, not the tank's rating): hazards of the intermediate tank states and ` +
    `fill paths ` +
    `${w[0]} danger, ${w[1]} warning, ${w[2]} note (the advised order: ${b[0]}, ${b[1]}, ${b[2]}); ` +
    `supply findings ${w[3]} danger, ${w[4]} warning (the advised order: ${b[3]}, ${b[4]})`
  );
}

/** the plan's order reason for a searched sequence: relative U only (no pressures: those are in the findings) */
export function searchReason(a: {
  win: Evaluated;
  base: Evaluated;
  advice: OrderAdvice;
  stats: SearchStats;
  clean: boolean;
}): string {
  const { win, base, advice, stats } = a;
  const n = `${stats.reviewed} sequences reviewed (orders, split diluent charges, gauges)`;
  if (win === base)
    return `${advice.reason}; of the ${n}, no other that is as safe predicts a smaller U (k = 2)`;
  const safety = a.clean ? ORDER_REVIEW_CLAIM : comparedSafety(win, base);
  const sameOrder = win.candidate === base.candidate;
  const what = sameOrder
    ? `the advised order ${labels(base).join(', ')}, read on other gauges,`
    : 'this sequence';
  // the same order on its first gauges is not compared with itself by name
  const against = sameOrder
    ? 'the same order read on the gauges first chosen for it (sequence-chosen)'
    : `the advised order ${labels(base).join(', ')}`;
  return (
    `${what} has the smallest predicted U (k = 2) of the ${n}, worst ` +
    `${relPct(win.worst!.relative)} (${quantity(win.worst!.name)}) instead of ` +
    `${relPct(base.worst!.relative)} (${quantity(base.worst!.name)}) for ${against}; ${safety}`
  );
}
