/**
 * One candidate of the sequence search, evaluated: its charges (a split charge's stop reading
 * from the share of its source's amount it delivers), its steps (the step stage itself), the
 * safety review of every state and fill path it passes (cached by tank contents: candidates
 * that share a prefix share its reviews), and, for a candidate worth it, the predicted U of
 * the design fractions and phi (predict.ts, the GUM budget `check` uses).
 */
import type { GasSource } from '../supply.js';
import type { Fractions } from '../composition.js';
import { bMix, cMix, pressureFromDensity } from '../mixture-eos.js';
import type { Finding, FindingCode } from '../findings.js';
import { ORDER_RELEVANT } from '../order.js';
import { ProblemError } from '../problems.js';
import { flammabilityNumbers, reviewFill, reviewState, type FillEvent, type TankState } from '../safety.js';
import { assessFlammability } from '../flammability.js';
import { speciesRole } from '../composition.js';
import { reviewFillPath } from '../fill-path.js';
import { predictPlan, type PlanPrediction } from '../predict.js';
import type { PlanBasis } from './validate.js';
import { eosComposition, type PlanAmounts } from './amounts.js';
import type { Charge, PlanSequence } from './sequence.js';
import { planSteps, type PlanSteps } from './steps.js';
import { hazardRank } from '../supply-check.js';
import { planResult } from './result.js';
import { withGauges } from './search-gauges.js';
import type { Plan } from './types.js';

/** the lab's thermometer, as the prediction needs it */
export interface SearchThermometer {
  readonly uK: number;
  readonly resolutionK: number;
  readonly settlingK: number;
}

/** one charge of a candidate: a split charge (not its source's last) delivers `share` of the source's amount */
export interface CandidateCharge {
  readonly source: GasSource;
  readonly share?: number;
}

/** how big the search was: what `npm run bench` reports */
export interface SearchStats {
  /** charge structures (orders, with or without split charges) enumerated */
  structures: number;
  /** candidates (a structure with its stop readings) whose states and fill paths were reviewed */
  reviewed: number;
  /** candidates whose uncertainty was predicted (gauge alternatives included) */
  predicted: number;
  /** distinct fill reviews made (the rest came from the cache) */
  fillReviews: number;
}

/** what every evaluation of one search shares */
export interface SearchContext {
  readonly basis: PlanBasis;
  readonly amounts: PlanAmounts;
  readonly thermometer: SearchThermometer;
  readonly cache: Map<string, Finding[]>;
  readonly stats: SearchStats;
}

/** the sequence hazards of a candidate, counted as the advice counts them */
export interface HazardCount {
  readonly danger: number;
  readonly warning: number;
  readonly note: number;
  readonly hazards: readonly Finding[];
  /** false when the review stopped at the first hazard (the counts are then lower bounds) */
  readonly complete: boolean;
}

export interface Evaluated {
  readonly candidate: readonly CandidateCharge[];
  readonly charges: readonly Charge[];
  readonly steps: PlanSteps;
  readonly safety: HazardCount;
  /** gauge id of each reading (undefined: the step stage's choice) */
  readonly gauges: readonly (string | undefined)[];
  readonly prediction?: PlanPrediction;
  /** the largest predicted relative U (k = 2) of the design fractions and phi */
  readonly worst?: { readonly name: string; readonly relative: number };
}

/**
 * The finding codes a sequence can change (the advice's, order.ts, and the fill paths), and
 * those of the steps that make a sequence unusable (no gauge, supply pressure).
 */
const SEQUENCE_CODES: ReadonlySet<FindingCode> = new Set<FindingCode>([
  ...ORDER_RELEVANT,
  'flammable-fill-path',
  'flammable-at-inlet',
  'near-flammable-fill-path',
  'closed-vessel-fill-path',
  'no-gauge-covers',
  'supply-pressure-low',
  'tank-over-rating',
  'premix-runs-low',
  'premix-cools-low',
]);

/** is this finding one the search counts against a sequence */
export function countsAgainstSequence(f: Finding): boolean {
  return SEQUENCE_CODES.has(f.code);
}

/** the charges of a candidate, a split charge's stop reading from the real-gas state it ends at */
export function chargesOf(ctx: SearchContext, candidate: readonly CandidateCharge[]): Charge[] {
  const { basis, amounts } = ctx;
  const { model, volumeM3: V, temperatureK: T, initial } = basis;
  const amountOf = new Map(basis.input.sources.map((s, i) => [s, amounts.allocation.amountsMol[i]]));
  const delivered = new Map<GasSource, number>();
  const parts: { source: GasSource | Fractions; mol: number }[] = initial
    ? [{ source: initial.composition, mol: initial.amountMol }]
    : [];
  let cum = initial?.amountMol ?? 0;
  return candidate.map(({ source, share }) => {
    const total = amountOf.get(source) ?? 0;
    const before = delivered.get(source) ?? 0;
    const mol = share === undefined ? total - before : share * total;
    delivered.set(source, before + mol);
    parts.push({ source, mol });
    cum += mol;
    if (share === undefined) return { source };
    const y = eosComposition(parts);
    return { source, stopPa: pressureFromDensity(cum / V, T, bMix(model, y), cMix(model, y)) };
  });
}

const key = (s: TankState | undefined) =>
  s === undefined
    ? '-'
    : `${s.pressurePa.toPrecision(10)}:` +
      Object.entries(s.composition)
        .filter(([, v]) => v > 0)
        .sort(([a], [b]) => (a < b ? -1 : 1))
        .map(([k, v]) => `${k}=${v.toPrecision(10)}`)
        .join(',');

/**
 * hazards found by a quick review whose severity was not judged: a detonable fill path is counted as
 * a danger without its reflected pressure against the limit (enough to reject a candidate); a review
 * holding them is not complete
 */
const provisional = new WeakSet<readonly Finding[]>();

/**
 * The hazards of one fill and of the state it ends at, cached by the tank contents before and
 * after. `quick`: a flammable intermediate state is reported as flammable-state alone (its
 * detonation and closed-vessel review, and the fill's path, are left for a full review), and a
 * detonable stretch of the fill's path is not judged against the working limit (provisional):
 * enough to reject the candidate.
 */
function fillHazards(ctx: SearchContext, f: FillEvent, quick: boolean): Finding[] {
  const safety = ctx.basis.safety;
  const k = `${key(f.before)}>${f.sourceId}>${key(f.after)}`;
  let found = ctx.cache.get(k) ?? (quick ? ctx.cache.get(`quick ${k}`) : undefined);
  if (found) return found;
  if (quick && !f.after.final) {
    const a = assessFlammability(f.after.composition, safety.temperatureK, f.after.pressurePa);
    if (a.verdict === 'flammable') {
      const nums = flammabilityNumbers(a, f.after.pressurePa);
      found = [{ severity: 'warning', code: 'flammable-state', step: f.step, ...nums }];
      ctx.cache.set(`quick ${k}`, found);
      return found;
    }
  }
  ctx.stats.fillReviews++;
  found = [];
  // the finished batch is the same for every sequence; in-tank condensation of a state depends
  // only on the vapour's own amount (as in the advice)
  if (!f.after.final)
    found.push(
      ...reviewState(f.after, safety, 'severity').findings.filter(
        (x) => countsAgainstSequence(x) && x.code !== 'condensation',
      ),
    );
  found.push(...reviewFill(f, safety).filter(countsAgainstSequence));
  const path = reviewFillPath(f, safety, false, !quick);
  found.push(...path);
  if (quick && path.some((x) => x.code === 'flammable-fill-path' && x.detonable)) {
    provisional.add(found);
    ctx.cache.set(`quick ${k}`, found);
    return found;
  }
  ctx.cache.set(k, found);
  return found;
}

/** the states and fills of planned steps, as the review stage builds them */
function eventsOf(basis: PlanBasis, planned: PlanSteps): FillEvent[] {
  const { initial } = basis;
  let before: TankState | undefined = initial
    ? { step: 0, composition: initial.composition, pressurePa: initial.pressurePa, final: false }
    : undefined;
  const steps = planned.steps;
  return steps.map((s) => {
    const after: TankState = {
      step: s.index,
      composition: s.compositionAfter,
      pressurePa: s.targetPa,
      final: s.index === steps.length,
    };
    const f: FillEvent = {
      step: s.index,
      sourceId: s.source.id,
      sourceComposition: s.source.composition,
      before,
      after,
    };
    before = after;
    return f;
  });
}

/**
 * The sequence hazards of planned steps: every state and fill path, and the steps' own. With
 * `firstOnly` the review stops at the first fill with a hazard of any severity (enough to reject
 * a candidate when the advised order is clean); with `stopAt` it stops at the first fill after which a
 * hazard so far satisfies it (a review that only asks whether a hazard occurs); `complete` says
 * whether every fill was reviewed.
 */
export function screen(
  ctx: SearchContext,
  planned: PlanSteps,
  firstOnly = false,
  stopAt?: (h: Finding) => boolean,
): HazardCount {
  const hazards: Finding[] = planned.findings.filter(countsAgainstSequence);
  let complete = true;
  for (const f of eventsOf(ctx.basis, planned)) {
    if ((firstOnly && hazards.length) || (stopAt && hazards.some(stopAt))) {
      complete = false;
      break;
    }
    const found = fillHazards(ctx, f, firstOnly);
    if (provisional.has(found)) complete = false;
    hazards.push(...found.map((h) => ({ ...h, step: h.step === undefined ? undefined : f.step })));
  }
  const count = (sev: string) => hazards.filter((h) => h.severity === sev).length;
  return { danger: count('danger'), warning: count('warning'), note: count('note'), hazards, complete };
}

/**
 * a is not less safe than b: by hazardRank (supply-check.ts), the states' and fills' dangers,
 * warnings and notes first (a near-flammable state is a note: inside the NFPA 69 operating margins,
 * which the search does not trade for precision), then the supply's; a state or fill hazard that b
 * does not have is never bought with fewer supply findings
 */
export function notLessSafe(a: HazardCount, b: HazardCount): boolean {
  const [ra, rb] = [hazardRank(a.hazards), hazardRank(b.hazards)];
  const i = ra.findIndex((x, k) => x !== rb[k]);
  return i < 0 || ra[i] < rb[i];
}

/** the sequence stage's hand-off for a candidate (the reason is the search's, set by the caller) */
export function sequenceOfCharges(charges: readonly Charge[], reason = ''): PlanSequence {
  return { charges, reason, recommended: true, findings: [] };
}

/** a Plan of the candidate's steps, enough for the prediction (no review findings) */
function bareplan(ctx: SearchContext, charges: readonly Charge[], planned: PlanSteps): Plan {
  const review = { findings: [], orderReason: '' };
  return planResult(ctx.basis, ctx.amounts, sequenceOfCharges(charges), planned, review);
}

/** the largest relative U (k = 2) of the design fractions and phi */
export function worstOf(p: PlanPrediction): { name: string; relative: number } | undefined {
  let worst: { name: string; relative: number } | undefined;
  for (const r of p.rows) {
    if (r.kind === 'dilution' || !(r.design > 0)) continue;
    const relative = r.expandedU / r.design;
    if (!worst || relative > worst.relative) worst = { name: r.name, relative };
  }
  return worst;
}

/** the steps of a candidate with its gauges; undefined when the step stage refuses the charges */
export function buildSteps(
  ctx: SearchContext,
  charges: readonly Charge[],
  gauges: readonly (string | undefined)[] = [],
): PlanSteps | undefined {
  try {
    const planned = planSteps(ctx.basis, ctx.amounts, sequenceOfCharges(charges));
    return gauges.length ? withGauges(ctx.basis, planned, gauges) : planned;
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
}

/** the candidate's steps and safety review (no prediction yet); `firstOnly` as for screen */
export function review(
  ctx: SearchContext,
  candidate: readonly CandidateCharge[],
  firstOnly = false,
): Evaluated | undefined {
  const charges = chargesOf(ctx, candidate);
  const steps = buildSteps(ctx, charges);
  if (!steps) return undefined;
  ctx.stats.reviewed++;
  const safety = screen(ctx, steps, firstOnly);
  return { candidate, charges, steps, safety, gauges: steps.steps.map((s) => s.gauge?.id) };
}

/**
 * The candidate's review, unless its lower bound (temperatureBound) already reaches `toBeat`:
 * then 'hopeless', with no review made. Undefined when the step stage refuses its charges.
 */
export function reviewIfPromising(
  ctx: SearchContext,
  candidate: readonly CandidateCharge[],
  firstOnly: boolean,
  toBeat: number,
): Evaluated | 'hopeless' | undefined {
  if (temperatureBound(ctx, candidate) >= toBeat) return 'hopeless';
  return review(ctx, candidate, firstOnly);
}

/** the candidate with every fill reviewed (after a review that stopped at the first hazard) */
export function reviewedFully(
  ctx: SearchContext,
  ev: Evaluated,
  stopAt?: (h: Finding) => boolean,
): Evaluated {
  return ev.safety.complete ? ev : { ...ev, safety: screen(ctx, ev.steps, false, stopAt) };
}

/** the candidate with its prediction (unchanged when the prediction cannot be made) */
export function predicted(ctx: SearchContext, ev: Evaluated): Evaluated {
  if (ev.prediction) return ev;
  ctx.stats.predicted++;
  try {
    const p = predictPlan({
      plan: bareplan(ctx, ev.charges, ev.steps),
      gauges: ctx.basis.input.gauges,
      reading: ctx.basis.input.reading,
      thermometer: ctx.thermometer,
    });
    const worst = p && worstOf(p);
    return worst ? { ...ev, prediction: p, worst } : ev;
  } catch (e) {
    if (e instanceof ProblemError) return ev;
    throw e;
  }
}

/** the candidate with other gauges for its readings (each covering its reading: gaugeAlternatives), predicted */
export function regauged(
  ctx: SearchContext,
  ev: Evaluated,
  gauges: readonly (string | undefined)[],
): Evaluated {
  const steps = withGauges(ctx.basis, ev.steps, gauges);
  const next: Evaluated = { ...ev, steps, gauges, prediction: undefined, worst: undefined };
  return predicted(ctx, next);
}

/**
 * A lower bound of a candidate's worst relative U (k = 2), from the per-reading temperature terms
 * alone (thermometer resolution d and settling half-width s, independent from reading to reading,
 * rectangular: u_T^2 = d^2/12 + s^2/3, as predict.ts counts them; GUM 5.1.2, uncorrelated inputs
 * add in quadrature, so leaving the other inputs out can only lower u). A fuel or oxidizer filled
 * in one charge k is the difference of the amounts read before and after it, n_s = n_k - n_k-1,
 * and a reading's amount moves by -n dT/T (n = P V / (Z R T) at the reading P), so
 *   u(x_s)/x_s >= (u_T/T) sqrt(n_k^2 + n_k-1^2) / n_s          (k not the last charge),
 *   u(x_s)/x_s >= (u_T/T) sqrt(2) n_k-1 / n_s                  (k the last: n_k is the total);
 * times 0.95 for the temperature dependence of Z and the impurities. From the amounts alone: no
 * steps are planned for it.
 */
export function temperatureBound(ctx: SearchContext, candidate: readonly CandidateCharge[]): number {
  let bound = 0;
  for (const b of temperatureBounds(ctx, candidate).values()) bound = Math.max(bound, b);
  return bound;
}

/** temperatureBound of each design gas it bounds (filled in one charge, not inert), by its main species */
export function temperatureBounds(
  ctx: SearchContext,
  candidate: readonly CandidateCharge[],
): Map<string, number> {
  const { thermometer: th, basis, amounts } = ctx;
  const uT = Math.sqrt(th.resolutionK ** 2 / 12 + th.settlingK ** 2 / 3) / basis.temperatureK;
  const amountOf = new Map(basis.input.sources.map((s, i) => [s, amounts.allocation.amountsMol[i]]));
  const once = (s: GasSource) => candidate.filter((c) => c.source === s).length === 1;
  let cum = basis.initial?.amountMol ?? 0;
  const bounds = new Map<string, number>();
  candidate.forEach(({ source, share }, k) => {
    const before = cum;
    cum +=
      share === undefined
        ? (amountOf.get(source) ?? 0) * (once(source) ? 1 : 1 - sharesOf(candidate, source))
        : share * (amountOf.get(source) ?? 0);
    const sp = source.mainSpecies;
    const d = cum - before;
    if (!once(source) || !(basis.input.design.composition[sp] > 0) || speciesRole(sp) === 'inert' || !(d > 0))
      return;
    const spread = k === candidate.length - 1 ? Math.SQRT2 * before : Math.hypot(cum, before);
    bounds.set(sp, Math.max(bounds.get(sp) ?? 0, (0.95 * 2 * uT * spread) / d));
  });
  return bounds;
}

/**
 * The candidate's prediction cannot meet the tolerance: a design fraction's lower bound of its
 * relative U (temperatureBounds) is already past what its row allows (predict.ts: U <= max(relative
 * tolerance x design, absolute tolerance)), so that row, and the candidate, is not within.
 */
export function cannotBeWithin(ctx: SearchContext, candidate: readonly CandidateCharge[]): boolean {
  const { design, tolerance } = ctx.basis.input;
  for (const [sp, bound] of temperatureBounds(ctx, candidate)) {
    const d = design.composition[sp];
    if (bound * d > Math.max(tolerance.relative * d, tolerance.absolute)) return true;
  }
  return false;
}

/** the shares of a source's split charges, summed */
function sharesOf(candidate: readonly CandidateCharge[], source: GasSource): number {
  return candidate.reduce((a, c) => a + (c.source === source ? (c.share ?? 0) : 0), 0);
}
