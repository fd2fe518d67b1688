/**
 * The split point of a charge that is not its source's last and was given no stop reading:
 * where to stop it, so that the fills between it and its source's next charge are read as
 * low as is safe.
 *
 * Our choice of rule (no published source; it is what a careful lab member does by hand when
 * splitting a diluent charge to read a small oxidizer fill on a low-range head): the lowest
 * stop at which
 *  - every tank state and every fill path of the whole sequence (bulk path and inlet, at the
 *    real-gas readings) is as free of the hazards the plan's safety review checks (review.ts
 *    `safetyFindings`: flammable, near-flammable with the NFPA 69 margins, detonable,
 *    compression heating, line condensation, ...) as any stop of this charge can make it, and
 *  - every reading has a connected gauge that covers it, and no charge is above its source's
 *    supply pressure (steps.ts),
 * counted as dangers, then warnings, then notes. A lower stop reads the fills in between at
 * a lower tank pressure, so on a lower-range gauge or with a smaller share of the span error
 * and resolution; the safety review sets how low it may go. The search: the share of what is
 * left of the source's allocation that the charge delivers is tried on a grid (1/32, then
 * 1/8 to 7/8 in steps of 1/8; 1/32 is the lowest split we consider: a charge of less is not
 * worth a valve opening), and the step from the highest hazardous grid point below the
 * lowest acceptable one is bisected 11 times (to 1/16384 of the allocation). Hazards need not
 * fall monotonically as the stop rises, so the grid is searched first and the lowest
 * acceptable share kept. Charges are chosen in fill order; while one is searched, a later
 * charge without a stop is taken at half of what is left of its source.
 *
 * When the hazards set the stop (a lower stop is more hazardous), the stop is not that lowest
 * acceptable one but one tolerance band (steps.ts) above it: the guided fill and the sheet accept
 * any reading inside the band, so the band's lower edge, not its middle, must be at or above the
 * lowest acceptable stop. The hazards are checked again at the raised stop and at the top of its
 * band. round-stops.ts then rounds the stop up onto its gauge's grid and checks the band once more.
 *
 * A separate sequence search (minimising the predicted uncertainty) may call
 * `chooseSplitPoints` or replace it; `splitHazards` is the acceptance test it can reuse.
 */
import type { Finding, FindingCode } from '../findings.js';
import { ORDER_RELEVANT } from '../order.js';
import { ProblemError } from '../problems.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import { isLastCharge, stopsFromShares, type Charge } from './charges.js';
import { planSteps } from './steps.js';
import { safetyFindings } from './review.js';

/** the search's grid and refinement (module comment) */
export const SPLIT_SEARCH = {
  shares: [1 / 32, ...Array.from({ length: 7 }, (_, i) => (i + 1) / 8)],
  bisections: 11,
  /** share of a later charge without a stop while an earlier one is searched */
  laterShare: 1 / 2,
} as const;

/**
 * the findings a stop can change: those an order can change (order.ts), the paths, the oxygen
 * content, and the gauges and supply pressures of the readings; the rest (the tank's rating, the
 * oxygen-service note, the finished batch's own hazards) are the same at every stop
 */
const STOP_RELEVANT: ReadonlySet<FindingCode> = new Set<FindingCode>([
  ...ORDER_RELEVANT,
  'flammable-fill-path',
  'flammable-at-inlet',
  'near-flammable-fill-path',
  'closed-vessel-fill-path',
  'oxygen-enriched',
  'no-gauge-covers',
  'supply-pressure-low',
]);

/** the hazards of one candidate sequence a stop can change, counted by severity */
export interface SplitHazards {
  readonly danger: number;
  readonly warning: number;
  readonly note: number;
  readonly findings: readonly Finding[];
}

/** one chosen split point */
export interface SplitPoint {
  /** 1-based position of the charge in the fill order */
  readonly charge: number;
  readonly source: string;
  readonly stopPa: number;
  /**
   * share of what was left of the source's allocation that the charge delivers at the lowest
   * acceptable stop (before the raise by one band, lowestSafePa)
   */
  readonly share: number;
  /**
   * the highest stop found below the chosen one that is more hazardous (undefined: the lowest
   * share searched was chosen)
   */
  readonly hazardousBelowPa?: number;
  /**
   * the lowest stop found as free of hazards as any (the bracket's upper end) when the hazards
   * set the stop; the stop is then this plus its band, so that no reading inside the band is
   * below it (undefined: the lowest share searched was chosen)
   */
  readonly lowestSafePa?: number;
  /** the band half-width of the stop's reading (steps.ts) when lowestSafePa is given, Pa */
  readonly bandPa?: number;
  /**
   * true when no danger or warning that a stop can change remains at the chosen stop or at the top
   * of its band
   */
  readonly clean: boolean;
  /** at the chosen stop, or at the top of its band where that is worse */
  readonly hazards: SplitHazards;
}

export interface SplitPointChoice {
  /** the charges with every stop filled in */
  readonly charges: Charge[];
  readonly points: readonly SplitPoint[];
  /** one split-point-chosen note per chosen stop */
  readonly findings: readonly Finding[];
  /** for the order's reason; empty when nothing was chosen */
  readonly reason: string;
}

/**
 * The hazards of a sequence of charges (every stop given), by the plan's own steps and safety
 * review; undefined when the sequence cannot be planned (a stop the amounts refuse).
 */
export function splitHazards(
  basis: PlanBasis,
  amounts: PlanAmounts,
  charges: readonly Charge[],
): SplitHazards | undefined {
  let planned;
  try {
    planned = planSteps(basis, amounts, { charges, reason: '', recommended: false, findings: [] });
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
  const findings = [...planned.findings, ...safetyFindings(basis, planned.steps, false)].filter((f) =>
    STOP_RELEVANT.has(f.code),
  );
  const count = (s: string) => findings.filter((f) => f.severity === s).length;
  return { danger: count('danger'), warning: count('warning'), note: count('note'), findings };
}

/** a is no worse than b: dangers, then warnings, then notes */
function noWorse(a: SplitHazards | undefined, b: SplitHazards | undefined): boolean {
  if (!a) return false;
  if (!b) return true;
  if (a.danger !== b.danger) return a.danger < b.danger;
  if (a.warning !== b.warning) return a.warning < b.warning;
  return a.note <= b.note;
}

/** every non-last charge without a stop gets one by the rule of the module comment */
export function chooseSplitPoints(
  basis: PlanBasis,
  amounts: PlanAmounts,
  charges: readonly Charge[],
): SplitPointChoice {
  const current = [...charges];
  const points: SplitPoint[] = [];
  const { sources } = basis.input;
  const alloc = amounts.allocation.amountsMol;
  current.forEach((c, k) => {
    if (c.stopPa !== undefined || isLastCharge(current, k)) return;
    const evaluate = (share: number) => {
      const cs = stopsFromShares(basis, current, sources, alloc, (j) =>
        j === k ? share : SPLIT_SEARCH.laterShare,
      );
      return { share, charges: cs, hazards: splitHazards(basis, amounts, cs) };
    };
    const grid = SPLIT_SEARCH.shares.map(evaluate);
    let best = grid[0];
    for (const g of grid) if (!noWorse(best.hazards, g.hazards)) best = g;
    // no share plannable at all (never seen: every share is a valid stop): the highest, whose
    // refusal the amounts stage then states
    const first = Math.max(
      0,
      grid.findIndex((g) => noWorse(g.hazards, best.hazards)),
    );
    let hi = best.hazards ? grid[first] : grid[grid.length - 1];
    let lo = best.hazards && first > 0 ? grid[first - 1] : undefined;
    if (lo) {
      for (let i = 0; i < SPLIT_SEARCH.bisections; i++) {
        const mid = evaluate((lo.share + hi.share) / 2);
        if (noWorse(mid.hazards, best.hazards)) hi = mid;
        else lo = mid;
      }
    }
    const lowestPa = hi.charges[k].stopPa!;
    // a stop set by the hazards: one band above the lowest acceptable stop (module comment)
    const raised = lo && best.hazards ? raiseByBand(basis, amounts, current, k, lowestPa) : undefined;
    const stopPa = raised?.stopPa ?? lowestPa;
    current[k] = { source: c.source, stopPa };
    const hz = raised?.hazards ?? hi.hazards ?? { danger: 0, warning: 0, note: 0, findings: [] };
    points.push({
      charge: k + 1,
      source: c.source.id,
      stopPa,
      share: hi.share,
      hazardousBelowPa: lo?.charges[k].stopPa,
      lowestSafePa: raised ? lowestPa : undefined,
      bandPa: raised?.bandPa,
      clean: hz.danger === 0 && hz.warning === 0,
      hazards: hz,
    });
  });
  const findings: Finding[] = points.map((p) => ({
    severity: 'note',
    code: 'split-point-chosen',
    step: p.charge,
    source: p.source,
    stopPa: p.stopPa,
    hazardousBelowPa: p.hazardousBelowPa,
    lowestSafePa: p.lowestSafePa,
    bandPa: p.bandPa,
    floorPa: p.lowestSafePa,
    clean: p.clean,
  }));
  const reason = points.length
    ? `the stop of ${points.map((p) => `charge ${p.charge} (${p.source})`).join(', ')} chosen by the ` +
      `planner: ${points.some((p) => p.lowestSafePa !== undefined) ? 'one band above ' : ''}the lowest ` +
      `stop that keeps every state and fill path as free of the hazards checked as any stop can (see ` +
      `the split-point-chosen note)`
    : '';
  return { charges: current, points, findings, reason };
}

/** tries of the raise by one band (the band moves only a little with the stop: one or two do) */
const RAISE_TRIES = 4;
/** the raise is this share of the band more than the band, so that rounding never leaves it short */
const RAISE_MARGIN = 1e-9;

/**
 * The stop of charge k set one band above `lowestPa`, the lowest stop found as free of hazards as
 * any: a reading anywhere inside the stop's band (steps.ts; the guided fill accepts any) is then at
 * or above it. The band depends a little on the stop, so the stop is raised until its band's lower
 * edge is at or above `lowestPa`. The hazards are those at the stop, or at the top of its band
 * where they are worse (hazards need not fall as the stop rises).
 */
function raiseByBand(
  basis: PlanBasis,
  amounts: PlanAmounts,
  current: readonly Charge[],
  k: number,
  lowestPa: number,
): { stopPa: number; bandPa: number; hazards: SplitHazards | undefined } {
  const at = (stopPa: number) => {
    const given = current.map((c, j) => (j === k ? { source: c.source, stopPa } : c));
    return stopsFromShares(
      basis,
      given,
      basis.input.sources,
      amounts.allocation.amountsMol,
      () => SPLIT_SEARCH.laterShare,
    );
  };
  let bandPa = stopBandPa(basis, amounts, at(lowestPa), k);
  let stopPa = lowestPa + bandPa * (1 + RAISE_MARGIN);
  for (let i = 0; i < RAISE_TRIES; i++) {
    bandPa = stopBandPa(basis, amounts, at(stopPa), k);
    if (stopPa - bandPa >= lowestPa) break;
    stopPa = lowestPa + bandPa * (1 + RAISE_MARGIN);
  }
  const atStop = splitHazards(basis, amounts, at(stopPa));
  const atTop = splitHazards(basis, amounts, at(stopPa + bandPa));
  return { stopPa, bandPa, hazards: atTop && !noWorse(atTop, atStop) ? atTop : atStop };
}

/** the band half-width of charge k's reading with these charges (steps.ts), Pa; 0 when they cannot be planned */
function stopBandPa(basis: PlanBasis, amounts: PlanAmounts, charges: readonly Charge[], k: number): number {
  try {
    return planSteps(basis, amounts, { charges, reason: '', recommended: false, findings: [] }).steps[k]
      .bandPa;
  } catch (e) {
    if (e instanceof ProblemError) return 0;
    throw e;
  }
}
