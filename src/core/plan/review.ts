/**
 * Stage 5 of the fill plan: the review of the whole planned fill. The tank rating, the
 * gauges to isolate, the safety review of every state the fill passes through and of
 * the path of every charge (at the real-gas pressures of the steps), the sources
 * (assumed purities, impurities, a composition off the design), and the model itself
 * (virial correlations, combining-rule cross coefficients, the error an ideal-gas plan
 * would make). Findings only: the review never changes the steps.
 */
import { R } from '../constants.js';
import type { VirialModel } from '../mixture-eos.js';
import {
  bMix,
  cMix,
  densityFromPressure,
  pressureFromDensity,
  virialModel,
  virialU,
} from '../mixture-eos.js';
import type { Finding, FindingCode } from '../findings.js';
import { COMPARED_CLAIM, ORDER_RELEVANT, ORDER_REVIEW_CLAIM } from '../order.js';
import { reviewSequence } from '../sequence-review.js';
import { inAirFinding } from '../tank-gas.js';
import { cleanClaim, orderReviewClaim, shortOfMixtureClaim } from '../order-words.js';
import { inverseSetup, invertReadings } from '../recheck.js';
import { ProblemError } from '../problems.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import type { PlanSequence } from './sequence.js';
import type { PlanSteps } from './steps.js';
import { allowedDeviation, type PlanStep } from './types.js';

/** what the review stage hands on */
export interface PlanReview {
  /** the review's own findings, in the order they are shown after those of the earlier stages */
  readonly findings: readonly Finding[];
  /** the sequence's reason, corrected where the full review contradicts it */
  readonly orderReason: string;
  /**
   * the sequence's findings, a safer-order's claim qualified by the limits used only where the review
   * estimated one of them, as the order reason's (qualifiedClaims); reviewPlan always gives them (a bare
   * review without findings, search-eval.ts, leaves them out: the sequence's own are taken)
   */
  readonly sequenceFindings?: readonly Finding[];
}

/** below this mole fraction an impurity or an unidentified remainder is not reported */
export const TRACE_FRACTION = 1e-7;

/** a note is due when the combining-rule cross coefficients could move a target by more than this (relative) */
export const CROSS_NOTE_RELATIVE = 1e-4;

export function reviewPlan(
  basis: PlanBasis,
  amounts: PlanAmounts,
  sequence: PlanSequence,
  planned: PlanSteps,
  reviews?: SafetyReviews,
): PlanReview {
  const { steps } = planned;
  const findings: Finding[] = [...ratingFindings(basis, steps)];
  for (const s of steps)
    for (const g of s.isolateBefore)
      findings.push({ severity: 'note', code: 'isolate-gauge', step: s.index, gauge: g.id, topPa: g.topPa });
  const safety = safetyFindings(basis, steps, true, reviews);
  findings.push(...safety);
  // the finished gas released into air (tank-gas.ts): once per plan, never in the sequence search
  const last = steps[steps.length - 1];
  const inAir = last ? inAirFinding(last.compositionAfter, basis.temperatureK) : undefined;
  // a gas that burns by itself has its own flammable-mixture finding (at its pressure, which may widen its limits)
  if (inAir && !safety.some((f) => f.code === 'flammable-mixture')) findings.push(inAir);
  findings.push(...sourceFindings(basis, amounts, sequence));
  findings.push(...modelFindings(basis, steps));
  const all = [...sequence.findings, ...planned.findings, ...findings];
  return {
    findings,
    orderReason: correctedReason(sequence.reason, all, steps),
    sequenceFindings: qualifiedClaims(sequence.findings, all),
  };
}

/**
 * every fill whose band's top passes the tank's working limit (not only the last: a split
 * diluent's charges, or a final pressure far over the limit, put earlier fills over it too)
 */
function ratingFindings(basis: PlanBasis, steps: readonly PlanStep[]): Finding[] {
  const { tank } = basis.input;
  const limitPa = basis.workingLimitPa;
  if (tank.ratedPressurePa === undefined || limitPa === undefined) return [];
  const over: Finding[] = steps
    .filter((s) => s.targetPa + s.bandPa > limitPa)
    .map((s) => ({
      severity: 'danger',
      code: 'tank-over-rating',
      step: s.index,
      pressurePa: s.targetPa + s.bandPa,
      limitPa,
      ratedPa: tank.ratedPressurePa!,
      tank: tank.id,
    }));
  // once a band's top passes the limit at the fill temperature that is said; warming it is said too where
  // it passes the rating
  const warm = warmFinding(basis, steps[steps.length - 1], limitPa);
  return warm && (!over.length || warm.severity === 'danger') ? [...over, warm] : over;
}

/** standard ambient temperature, K (IUPAC SATP: common practice for "room temperature") */
export const STANDARD_AMBIENT_K = 298.15;

/**
 * The filled tank as it warms: a tank filled colder than the warmest temperature it reaches (the lab
 * profile's `warmest`, else standard ambient) holds the same gas at a higher pressure there (constant
 * density: P = rho R T Z(rho, T), the virial series at each temperature). A warning when the last band's
 * top, warmed, passes the working limit; a danger when it passes the rating. None when the fill is at or
 * above that temperature.
 */
function warmFinding(basis: PlanBasis, last: PlanStep | undefined, limitPa: number): Finding | undefined {
  const { tank } = basis.input;
  const T = basis.temperatureK;
  const given = basis.input.safety?.warmestK;
  const Tw = Math.max(given ?? STANDARD_AMBIENT_K, T);
  if (!last || !(Tw > T) || tank.ratedPressurePa === undefined) return undefined;
  const y = last.compositionAfter;
  const warmModel = virialModel(basis.species, Tw);
  const warmAt = (pa: number) => {
    const rho = densityFromPressure(pa, T, bMix(basis.model, y), cMix(basis.model, y));
    return pressureFromDensity(rho, Tw, bMix(warmModel, y), cMix(warmModel, y));
  };
  const topPa = last.targetPa + last.bandPa;
  const warmPa = warmAt(topPa);
  if (!(warmPa > limitPa)) return undefined;
  // the band top whose warm pressure is the limit: one Newton step from the proportional guess, with the
  // proportional law's slope (the virial terms move the answer by parts in 1e4, the step leaves ~1e-8)
  const guess = (topPa * limitPa) / warmPa;
  const maxFillPa = guess - ((warmAt(guess) - limitPa) * guess) / warmAt(guess);
  return {
    severity: warmPa > tank.ratedPressurePa ? 'danger' : 'warning',
    code: 'tank-warms-past-limit',
    step: last.index,
    pressurePa: topPa,
    fillK: T,
    warmK: Tw,
    warmPa,
    assumed: given === undefined,
    maxFillPa,
    // the final pressure whose band's top is there: the band scales with the reading (to first order)
    maxFinalPa: maxFillPa * (last.targetPa / topPa),
    limitPa,
    ratedPa: tank.ratedPressurePa,
    tank: tank.id,
  };
}

/** safety reviews kept by everything they review (safetyFindings' states, fills, context and depth) */
export type SafetyReviews = Map<string, readonly Finding[]>;

/**
 * the safety review of every state the fill passes through (after every charge, split charges
 * included), and of each charge's path in the tank and at its inlet (core/sequence-review.ts, the
 * code the guided fill reviews its re-targeted remainder with); `locate` false bisects the path
 * boundaries 4 times instead of 9 (the split-point search needs the severities only). With `reviews`
 * a review of the same states and fills in the same context is taken from there (the review is a
 * function of what it is given: the same findings).
 */
export function safetyFindings(
  basis: PlanBasis,
  steps: readonly PlanStep[],
  locate = true,
  reviews?: SafetyReviews,
): Finding[] {
  const { initial } = basis;
  const start = initial
    ? { step: 0, composition: initial.composition, pressurePa: initial.pressurePa }
    : undefined;
  const fills = steps.map((s) => ({
    step: s.index,
    sourceId: s.source.id,
    sourceComposition: s.source.composition,
    compositionAfter: s.compositionAfter,
    pressurePa: s.targetPa,
  }));
  if (!reviews) return reviewSequence(start, fills, basis.safety, locate);
  const key = JSON.stringify([start, fills, basis.safety, locate]);
  let found = reviews.get(key);
  if (!found) {
    found = reviewSequence(start, fills, basis.safety, locate);
    reviews.set(key, found);
  }
  return [...found];
}

/** codes judged at a fill (its path in the tank, its line, the gas it compresses) */
const FILL_CODES: ReadonlySet<FindingCode> = new Set<FindingCode>([
  'flammable-fill-path',
  'flammable-at-inlet',
  'near-flammable-fill-path',
  'closed-vessel-fill-path',
  'compression-heating',
  'oxygen-compression',
]);

/** codes judged on a tank state: at the last fill, the finished mixture's own */
const STATE_CODES: ReadonlySet<FindingCode> = new Set<FindingCode>([
  ...[...ORDER_RELEVANT].filter((c) => !FILL_CODES.has(c)),
  'flammable-mixture',
  'tank-over-rating',
  'tank-warms-past-limit',
  // not weighed by the order advice or the search (filling a premix's O2 alone is the ordinary way to read
  // it), but an intermediate state above 23.5 % O2 is not called free of the hazards checked
  'oxygen-enriched',
]);

/** "flammable-state (fill 3), tank-over-rating (fills 2, 3)" */
function listed(fs: readonly Finding[]): string {
  const steps = new Map<string, number[]>();
  for (const f of fs) steps.set(f.code, [...(steps.get(f.code) ?? []), f.step ?? 0]);
  return [...steps]
    .map(([code, at]) => {
      const n = [...new Set(at)].filter((x) => x > 0);
      return n.length ? `${code} (fill${n.length > 1 ? 's' : ''} ${n.join(', ')})` : code;
    })
    .join(', ');
}

/**
 * whether a flammability limit the review judged by was estimated, not measured: the safety review
 * (safety.ts) emits a flammability-data-estimated note for each such limit of a fuel in the tank
 */
export function limitsEstimated(findings: readonly Finding[]): boolean {
  return findings.some((f) => f.code === 'flammability-data-estimated');
}

/**
 * What is true of the planned fill's states and fill paths, from its own final findings (the
 * sequence's, the steps' and the review's): the clean claim only when no intermediate state and no
 * fill has a hazard checked; the finished mixture's own hazards (a state finding at the last fill)
 * are said apart, and so are the plan's other dangers (a supply, a gauge). "Non-flammable" is
 * qualified by the limits used only where the review estimated one of them (limitsEstimated).
 */
export function safetyClause(findings: readonly Finding[], lastStep: number): string {
  const estimated = limitsEstimated(findings);
  const atFill = (f: Finding) => FILL_CODES.has(f.code) || ('inLine' in f && f.inLine === true);
  const onState = (f: Finding) => STATE_CODES.has(f.code) && !atFill(f);
  const fills = findings.filter(atFill);
  const states = findings.filter((f) => onState(f) && f.step !== undefined && f.step < lastStep);
  const mixture = findings.filter((f) => onState(f) && (f.step === undefined || f.step >= lastStep));
  const other = findings.filter((f) => f.severity === 'danger' && !atFill(f) && !onState(f));
  let clause: string;
  if (states.length || fills.length)
    clause =
      `the full review of the planned fill finds ${listed([...states, ...fills])} on its ` +
      `intermediate states and fill paths` +
      (mixture.length ? `, and ${listed(mixture)} on the finished mixture` : '') +
      ' (see the findings)';
  else if (mixture.length)
    clause = `${shortOfMixtureClaim(estimated)}, which itself has ${listed(mixture)} (see the findings)`;
  else clause = cleanClaim(estimated);
  if (other.length)
    clause +=
      `; besides the tank states and fills, the plan has ${other.length} more ` +
      `danger${other.length > 1 ? 's' : ''}: ${listed(other)}`;
  return clause;
}

/**
 * The sequence's reason claims ORDER_REVIEW_CLAIM from the advice's or the search's review (at ideal-gas
 * or searched pressures, short of the finished mixture); the claim is replaced by what the plan's own
 * final findings say (safetyClause). A search's comparison with the advised order (COMPARED_CLAIM,
 * counts of its own review, which leaves out the tank's rating and the finished mixture) is
 * followed by what the full review finds, so that the line never reads 0 dangers beside a
 * tank-over-rating in the findings.
 */
export function correctedReason(
  reason: string,
  findings: readonly Finding[],
  steps: readonly PlanStep[],
): string {
  if (!steps.length) return reason;
  const clause = safetyClause(findings, steps[steps.length - 1].index);
  if (reason.includes(ORDER_REVIEW_CLAIM)) return reason.replace(ORDER_REVIEW_CLAIM, clause);
  if (reason.includes(COMPARED_CLAIM) && clause !== cleanClaim(limitsEstimated(findings)))
    return `${reason}; ${clause}`;
  return reason;
}

/**
 * A safer-order finding's reason carries the advice's claim (ORDER_REVIEW_CLAIM), qualified by the
 * limits used because the advice runs before any review knows whether a limit was estimated; here,
 * with the plan's final findings known, it is qualified only where one was (limitsEstimated), the
 * rule of the order reason (safetyClause). The advised order holds the same gases, so the same limits.
 */
export function qualifiedClaims(findings: readonly Finding[], all: readonly Finding[]): Finding[] {
  const claim = orderReviewClaim(limitsEstimated(all));
  return findings.map((f) =>
    f.code === 'safer-order' && f.reason.includes(ORDER_REVIEW_CLAIM)
      ? { ...f, reason: f.reason.replace(ORDER_REVIEW_CLAIM, claim) }
      : f,
  );
}

/** assumed purities, unidentified remainders, impurities, and fractions the sources cannot meet */
function sourceFindings(basis: PlanBasis, amounts: PlanAmounts, sequence: PlanSequence): Finding[] {
  const { design, tolerance: tol } = basis.input;
  const alloc = amounts.allocation;
  const out: Finding[] = [];
  // once per source, however many charges it is filled in
  for (const s of new Map(sequence.charges.map((c) => [c.source.id, c.source])).values())
    if (s.purityAssumed)
      out.push({ severity: 'note', code: 'purity-assumed', source: s.id, species: s.mainSpecies });
  if (alloc.unidentified > TRACE_FRACTION)
    out.push({ severity: 'note', code: 'unidentified-impurity', fraction: alloc.unidentified });
  for (const [sp, x] of Object.entries(alloc.composition)) {
    const xd = design.composition[sp] ?? 0;
    if (xd === 0 && x > TRACE_FRACTION)
      out.push({ severity: 'note', code: 'impurity-present', species: sp, fraction: x });
    else if (xd > 0 && Math.abs(x - xd) > allowedDeviation(tol, xd))
      out.push({ severity: 'warning', code: 'supply-mismatch', species: sp, design: xd, actual: x });
  }
  return out;
}

/** virial coefficients from a correlation, the combining-rule estimate, and the ideal-gas error */
function modelFindings(basis: PlanBasis, steps: readonly PlanStep[]): Finding[] {
  const out: Finding[] = [];
  for (const e of basis.model.entries) {
    if (e.i === e.j && e.method !== 'reference')
      out.push({
        severity: 'note',
        code: 'virial-correlation',
        species: e.i,
        method:
          e.method === 'tsonopoulos-quantum'
            ? 'Tsonopoulos (effective quantum-gas constants)'
            : 'Tsonopoulos',
      });
  }
  const crossShift = crossVirialShift(basis.model, steps, basis.temperatureK);
  // a warning when it reaches a third of the band (the rule of gauge-coarser-than-band), else a note
  if (crossShift && crossShift.relative > CROSS_NOTE_RELATIVE) {
    out.push({
      severity: crossShift.shiftPa * 3 >= crossShift.bandPa ? 'warning' : 'note',
      code: 'cross-virial-estimate',
      ...crossShift,
    });
  }
  const ideal = idealGasError(basis, steps);
  if (ideal) out.push(ideal);
  return out;
}

/** the fallback: the reading an ideal-gas plan is furthest off, when that is beyond its band */
function readingOffsetFinding(design: Readonly<Record<string, number>>, steps: readonly PlanStep[]) {
  const at = steps.reduce((a, s) =>
    Math.abs(s.targetPa - s.idealTargetPa) / s.bandPa > Math.abs(a.targetPa - a.idealTargetPa) / a.bandPa
      ? s
      : a,
  );
  const worstPa = Math.abs(at.targetPa - at.idealTargetPa);
  if (!(worstPa > at.bandPa)) return undefined;
  // the fill's main gas, off by the reading's share of its increment (the later readings make up the rest)
  const species = at.source.mainSpecies;
  const xd = design[species] ?? 0;
  if (!(xd > 0)) return undefined;
  const f: Finding = {
    severity: 'warning',
    code: 'ideal-gas-error',
    species,
    design: xd,
    idealFraction: xd * (1 + (at.idealTargetPa - at.targetPa) / at.incrementPa),
    tolerance: xd * (at.bandPa / at.incrementPa),
    worstPa,
  };
  return f;
}

/**
 * What an ideal-gas plan would fill: each gas read to its ideal-gas cumulative target (partial
 * pressures x_i P, scaled to end at the final pressure), in the real gas. A reading off the real
 * target is not itself the error (every later reading makes up the cumulative offset); what each
 * fill adds is. So the readings at the ideal targets and at the real ones go through the same inverse
 * model (recheck.ts), and the finding is due when a design fraction filled by the ideal-gas plan is
 * off the real plan's by more than its tolerance. Worked case (our audit): 3 % Ar in CO2 at 1500 Torr,
 * Ar first: Ar read at 45.000 instead of 45.435 Torr (Z of the batch 0.9904) gives x(Ar) 0.96 % low
 * against a 0.5 % tolerance; CO2 first, the Ar fraction is 0.29 % low (within it).
 */
function idealGasError(basis: PlanBasis, steps: readonly PlanStep[]): Finding | undefined {
  const { design, tolerance } = basis.input;
  const T = basis.temperatureK;
  const init = basis.initial
    ? { composition: { ...basis.initial.composition }, pressurePa: basis.initial.pressurePa, temperatureK: T }
    : undefined;
  const filled = (pick: (s: PlanStep) => number): Record<string, number> => {
    const setup = inverseSetup(
      steps.map((s) => ({ source: s.source, pressurePa: pick(s), temperatureK: T })),
      init,
    );
    const r = invertReadings(setup, undefined, steps.map(pick));
    const x: Record<string, number> = {};
    setup.species.forEach((k, i) => (x[k] = r.x[i] * (1 - r.unidentified)));
    return x;
  };
  let real: Record<string, number>;
  let ideal: Record<string, number>;
  try {
    real = filled((s) => s.targetPa);
    ideal = filled((s) => s.idealTargetPa);
  } catch (e) {
    // readings the inverse cannot solve (an ideal target not above the one before it, a fill of
    // almost nothing): judged by the readings, the ideal-gas plan's largest offset against its band
    if (!(e instanceof ProblemError)) throw e;
    return readingOffsetFinding(design.composition, steps);
  }
  let worst: Finding | undefined;
  let worstRatio = 1;
  for (const [k, xd] of Object.entries(design.composition)) {
    if (!(xd > 0)) continue;
    const off = (ideal[k] ?? 0) - (real[k] ?? 0);
    const allowed = allowedDeviation(tolerance, xd);
    if (Math.abs(off) / allowed > worstRatio) {
      worstRatio = Math.abs(off) / allowed;
      const at = steps.reduce((a, s) =>
        Math.abs(s.targetPa - s.idealTargetPa) > Math.abs(a.targetPa - a.idealTargetPa) ? s : a,
      );
      worst = {
        severity: 'warning',
        code: 'ideal-gas-error',
        species: k,
        design: xd,
        idealFraction: (ideal[k] ?? 0) - (real[k] ?? 0) + xd,
        tolerance: allowed,
        worstPa: Math.abs(at.targetPa - at.idealTargetPa),
      };
    }
  }
  return worst;
}

interface CrossShift {
  readonly step: number;
  readonly pairs: string[];
  readonly relative: number;
  readonly shiftPa: number;
  readonly bandPa: number;
}

/**
 * How far the combining-rule cross coefficients could move the targets: rho dB at the step
 * where it is largest, dB = sqrt(sum (2 y_i y_j u_ij)^2) over the pairs of species at 1e-4 or more.
 */
export function crossVirialShift(
  model: VirialModel,
  steps: readonly PlanStep[],
  temperatureK: number,
): CrossShift | undefined {
  let best: CrossShift | undefined;
  for (const s of steps) {
    const y = s.compositionAfter;
    const rho = s.targetPa / (s.compressibilityAfter * R * temperatureK);
    let v = 0;
    const pairs: string[] = [];
    for (const e of model.entries) {
      if (e.i === e.j || e.method !== 'combining-rule') continue;
      const yi = y[e.i] ?? 0;
      const yj = y[e.j] ?? 0;
      if (yi < 1e-4 || yj < 1e-4) continue;
      v += (2 * yi * yj * virialU(e)) ** 2;
      pairs.push(`${e.i}-${e.j}`);
    }
    const relative = rho * Math.sqrt(v);
    if (pairs.length && (!best || relative > best.relative))
      best = { step: s.index, pairs, relative, shiftPa: relative * s.targetPa, bandPa: s.bandPa };
  }
  return best;
}
