/**
 * The sequence search: when the fill order is left to the planner and the lab's thermometer
 * is known, the sequence of charges with the smallest predicted worst relative U (k = 2) of
 * the design mole fractions and phi (predict.ts: the GUM budget `check` uses, applied to
 * readings exactly at the targets), among the sequences that are not less safe than the
 * advice's order (order.ts): no danger or warning on any state or fill path where such a
 * sequence exists, as the review counts them (the review's own functions, cached by tank
 * contents), every reading covered by a connected gauge, every supply above its target.
 *
 * Candidates:
 *  - the orders of the sources (every permutation up to MAX_PERMUTED sources, else the
 *    advised order and that order with a diluent moved last), one charge each;
 *  - each with one diluent (a source whose main gas is inert) split into one or two extra
 *    charges placed earlier, stopped after a share of its amount: more diluent before is
 *    safer, and the smallest admissible share reads the fills after it at the lowest
 *    pressures, so one extra charge is placed by bisection in log(share) for the smallest
 *    admissible share (BISECTIONS steps between SHARE_MIN and SHARE_MAX); two extra charges
 *    on a small grid (SHARES_TWO);
 *  - for the best, the gauge of each reading among the heads that cover it (search-gauges.ts).
 * Pruning: a candidate whose lower bound of U (temperatureBound: the per-reading temperature
 * terms alone) cannot beat the best found is neither reviewed nor predicted; structures are
 * tried most promising first; a review stops at the first hazard when the advised order is
 * clean; reviews are cached by tank contents (as the advice caches them).
 * Only safe candidates are predicted. A candidate must beat the advised order by IMPROVEMENT
 * to replace it. Where no safe candidate meets the tolerance but one with only flammable
 * states or paths (warnings, no danger) does, it is offered as an option, never chosen.
 */
import type { GasSource } from '../supply.js';
import { speciesRole } from '../composition.js';
import type { Finding } from '../findings.js';
import { adviseOrder } from '../order.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import type { Charge, PlanSequence } from './sequence.js';
import { gaugeAlternatives, withGauges } from './search-gauges.js';
import type { PlanSteps } from './steps.js';
import {
  notLessSafe,
  predicted,
  reviewIfPromising,
  temperatureBound,
  cannotBeWithin,
  regauged,
  review,
  reviewedFully,
  type CandidateCharge,
  type Evaluated,
  type SearchContext,
  type SearchStats,
  type SearchThermometer,
} from './search-eval.js';
import { optionFinding, searchReason, wonFinding } from './search-result.js';

export type { SearchStats, SearchThermometer } from './search-eval.js';

/** every order of the sources is tried up to this many sources */
export const MAX_PERMUTED = 4;
/** the range of the share of a split source's amount its extra charge delivers */
export const SHARE_MAX = 0.64;
export const SHARE_MIN = 0.04;
/** bisections of the share (log scale): SHARE_MAX / SHARE_MIN = 16, so 4 end within a factor 16^(1/16) = 1.19 */
export const BISECTIONS = 4;
/** shares of each of two extra charges */
export const SHARES_TWO = [0.3, 0.1] as const;
/** a sequence other than the advised order must lower the worst relative U by more than this share */
export const IMPROVEMENT = 0.02;
/** shares tried below a split's first unsafe share when looking for a precise option (each 3/4 of the last) */
export const MAX_OPTION_STEPS = 4;

/** what the search hands on: the sequence stage's hand-off, the gauge of each reading, and its size */
export interface SearchedSequence extends PlanSequence {
  /** the gauge id of each charge's reading (undefined: the step stage's choice) */
  readonly gauges: readonly (string | undefined)[];
  readonly stats: SearchStats;
}

/** a sequence the search chose (with gauges), or one made by the plain advice */
export function isSearched(s: PlanSequence): s is SearchedSequence {
  return 'gauges' in s && 'stats' in s;
}

function permutations<T>(xs: readonly T[]): T[][] {
  if (xs.length <= 1) return [[...xs]];
  return xs.flatMap((x, i) => permutations([...xs.slice(0, i), ...xs.slice(i + 1)]).map((p) => [x, ...p]));
}

/** the sources that may be split: their main gas is inert (a diluent, or air's N2); the two largest */
function splittable(basis: PlanBasis, amountsMol: readonly number[]): GasSource[] {
  return basis.input.sources
    .map((s, i) => ({ s, n: amountsMol[i] }))
    .filter(({ s }) => speciesRole(s.mainSpecies) === 'inert')
    .sort((a, b) => b.n - a.n)
    .slice(0, 2)
    .map(({ s }) => s);
}

/** a split structure: an order, and the positions (indexes in it) before which extra charges of `source` go */
interface Structure {
  readonly order: readonly GasSource[];
  readonly source: GasSource;
  readonly positions: readonly number[];
}

function orders(basis: PlanBasis, advised: readonly GasSource[], split: readonly GasSource[]): GasSource[][] {
  if (basis.input.sources.length <= MAX_PERMUTED) return permutations(advised);
  return [[...advised], ...split.map((d) => [...advised.filter((s) => s !== d), d])];
}

function structures(all: readonly GasSource[][], split: readonly GasSource[], two: boolean): Structure[] {
  const out: Structure[] = [];
  for (const order of all)
    for (const source of split) {
      const j = order.indexOf(source);
      for (let i = 0; i < j; i++) out.push({ order, source, positions: [i] });
      if (!two) continue;
      for (let i = 0; i < j; i++)
        for (let k = i + 1; k < j; k++) out.push({ order, source, positions: [i, k] });
    }
  return out;
}

function candidateOf(st: Structure, shares: readonly number[]): CandidateCharge[] {
  const out: CandidateCharge[] = [];
  st.order.forEach((s, i) => {
    st.positions.forEach((p, k) => {
      if (p === i) out.push({ source: st.source, share: shares[k] });
    });
    out.push({ source: s });
  });
  return out;
}

/** no danger, warning or note of a state or path (the advice's "free of the hazards checked") */
const isClean = (ev: Evaluated) => ev.safety.danger + ev.safety.warning + ev.safety.note === 0;

const better = (a: Evaluated | undefined, b: Evaluated | undefined): boolean =>
  !!a?.worst && (!b?.worst || a.worst.relative < b.worst.relative);

/** what the search of one structure's shares found */
interface Swept {
  readonly st: Structure;
  /** the candidate with the smallest admissible share(s) found, predicted */
  readonly best?: Evaluated;
  /** the largest share found not admissible (one extra charge only) */
  readonly firstUnsafe?: number;
}

/** what one share of a structure gives */
type Trial =
  { kind: 'safe'; ev: Evaluated } | { kind: 'unsafe' } | { kind: 'hopeless' } | { kind: 'refused' };

interface SweepArgs {
  readonly ctx: SearchContext;
  readonly admissible: (ev: Evaluated) => boolean;
  readonly firstOnly: boolean;
  /** the smallest worst relative U found so far */
  readonly toBeat: () => number;
}

function trial(a: SweepArgs, st: Structure, shares: readonly number[]): Trial {
  const r = reviewIfPromising(a.ctx, candidateOf(st, shares), a.firstOnly, a.toBeat());
  if (r === undefined) return { kind: 'refused' };
  if (r === 'hopeless') return { kind: 'hopeless' };
  return a.admissible(r) ? { kind: 'safe', ev: r } : { kind: 'unsafe' };
}

/**
 * One extra charge: the smallest admissible share by bisection in log(share) between
 * SHARE_MIN and SHARE_MAX (more diluent before is safer: a structure unsafe at SHARE_MAX is
 * left; the smallest admissible share reads the fills after the extra charge at the lowest
 * pressures, the most precise of its structure). A share whose lower bound cannot beat the best
 * so far is not reviewed (larger shares cannot either). Two extra charges: a small grid.
 */
function sweep(a: SweepArgs, st: Structure): Swept {
  if (st.positions.length === 2) return sweepTwo(a, st);
  const top = trial(a, st, [SHARE_MAX]);
  if (top.kind === 'unsafe' || top.kind === 'refused') return { st, firstUnsafe: SHARE_MAX };
  let safe = top.kind === 'safe' ? top.ev : undefined;
  const bottom = trial(a, st, [SHARE_MIN]);
  if (bottom.kind === 'safe') return { st, best: predicted(a.ctx, bottom.ev) };
  if (bottom.kind === 'hopeless') return { st };
  let lo = SHARE_MIN;
  let hi = SHARE_MAX;
  for (let i = 0; i < BISECTIONS; i++) {
    const mid = Math.sqrt(lo * hi);
    const t = trial(a, st, [mid]);
    if (t.kind === 'safe') safe = t.ev;
    if (t.kind === 'unsafe' || t.kind === 'refused') lo = mid;
    else hi = mid;
  }
  return { st, best: safe && predicted(a.ctx, safe), firstUnsafe: lo };
}

function sweepTwo(a: SweepArgs, st: Structure): Swept {
  const grid = SHARES_TWO.flatMap((x) => SHARES_TWO.map((y) => [x, y])).sort(
    (p, q) => q[0] + q[1] - p[0] - p[1],
  );
  let safe: Evaluated | undefined;
  for (const shares of grid) {
    const t = trial(a, st, shares);
    if (t.kind === 'safe') safe = t.ev;
  }
  return { st, best: safe && predicted(a.ctx, safe) };
}

/**
 * the share of u^2 of the worst row that the gauges carry (span, zero, resolution, barometer):
 * what another head for a reading can change
 */
function gaugeShare(ev: Evaluated): number {
  const p = ev.prediction;
  const row = p?.rows.find((r) => r.name === ev.worst?.name);
  const cs = row?.stat.contributions;
  if (!p || !row || !cs || !(row.stat.u > 0)) return 0;
  let sum = 0;
  cs.forEach((c, i) => {
    const kind = p.result.components[i].about.kind;
    if (kind === 'span' || kind === 'zero' || kind === 'resolution' || kind === 'barometer') sum += c * c;
  });
  return sum / (row.stat.u * row.stat.u);
}

/** gauges are searched only when they carry at least this share of the worst row's u^2 */
export const GAUGE_SHARE_MIN = 0.2;

/** coordinate descent over the gauge of each reading (a second pass only after a change) */
function tuneGauges(ctx: SearchContext, ev: Evaluated): Evaluated {
  let best = ev;
  if (gaugeShare(ev) < GAUGE_SHARE_MIN) return best;
  const alternatives = gaugeAlternatives(ctx.basis, ev.steps.steps, true);
  for (let pass = 0; pass < 2; pass++) {
    let improved = false;
    alternatives.forEach((gs, k) => {
      for (const g of gs) {
        if (g.id === best.gauges[k]) continue;
        const ids = best.gauges.map((id, j) => (j === k ? g.id : id));
        const next = regauged(ctx, best, ids);
        if (next.worst && best.worst && next.worst.relative < best.worst.relative * (1 - 1e-3)) {
          best = next;
          improved = true;
        }
      }
    });
    if (!improved) break;
  }
  return best;
}

/** the advice's order: the search's baseline, and the sequence when the search cannot run */
function adviceOf(basis: PlanBasis, amounts: PlanAmounts) {
  const { input, finalPressurePa: Pf, safety, initial } = basis;
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  return adviseOrder(input.sources, amounts.allocation.amountsMol, Pf, safety, inTank);
}

/**
 * The sequence with the smallest predicted worst relative U among those not less safe than the
 * advised order; the advised order itself when nothing beats it by IMPROVEMENT or when its
 * uncertainty cannot be predicted.
 */
export function searchSequence(
  basis: PlanBasis,
  amounts: PlanAmounts,
  thermometer: SearchThermometer,
): SearchedSequence {
  const stats: SearchStats = { structures: 0, reviewed: 0, predicted: 0, fillReviews: 0 };
  const ctx: SearchContext = { basis, amounts, thermometer, cache: new Map(), stats };
  const advice = adviceOf(basis, amounts);
  const findings: Finding[] = [];
  if (advice.noSafeOrder)
    findings.push({ severity: 'warning', code: 'no-safe-order', reason: advice.reason });
  const out = (charges: readonly Charge[], gauges: readonly (string | undefined)[], reason: string) => ({
    charges,
    reason,
    recommended: true,
    findings,
    gauges,
    stats,
  });
  const base0 = review(
    ctx,
    advice.sources.map((source) => ({ source })),
  );
  const base = base0 && predicted(ctx, base0);
  if (!base?.worst)
    return out(
      advice.sources.map((source) => ({ source })),
      [],
      advice.reason,
    );
  const admissible = (ev: Evaluated) => notLessSafe(ev.safety, base.safety);
  // with a clean advised order, one hazard (a note included) rejects a candidate: its review may stop there
  const firstOnly = isClean(base);
  const found = explore(ctx, base, advice.sources, admissible, firstOnly);
  const ranked = [base, ...found.safe].sort((a, b) => a.worst!.relative - b.worst!.relative);
  let win = tuneGauges(ctx, ranked[0]);
  if (win.candidate !== base.candidate && win.worst!.relative >= base.worst.relative * (1 - IMPROVEMENT))
    win = base;
  if (win !== base) findings.push(wonFinding(win, base));
  const option = isWithin(win) ? undefined : preciseOption(ctx, found, admissible);
  if (option) findings.push(optionFinding(option, basis.input.tolerance.relative));
  const reason = searchReason({ win, base, advice, stats, clean: isClean(win) });
  return out(win.charges, win.gauges, reason);
}

interface Explored {
  /** admissible candidates, predicted */
  readonly safe: readonly Evaluated[];
  /** single-charge orders that are not admissible */
  readonly unsafeOrders: readonly Evaluated[];
  /** the sweeps of the split structures */
  readonly swept: readonly Swept[];
}

/**
 * two extra charges are tried for 4 sources (MAX_PERMUTED): with 3, a second extra charge of the
 * diluent has no second small fill to sit under; beyond 4 the structures are too many
 */
const twoExtra = (n: number) => n === MAX_PERMUTED;

/** the structures, most promising first: by the lower bound of their smallest share (hopeless ones late) */
function byPromise(ctx: SearchContext, sts: readonly Structure[]): Structure[] {
  const keyed = sts.map((st) => ({
    st,
    bound: temperatureBound(
      ctx,
      candidateOf(
        st,
        st.positions.map(() => SHARE_MIN),
      ),
    ),
  }));
  return keyed.sort((a, b) => a.bound - b.bound).map((k) => k.st);
}

/** every candidate but the advised order: single-charge orders, then split diluents */
function explore(
  ctx: SearchContext,
  base: Evaluated,
  advised: readonly GasSource[],
  admissible: (ev: Evaluated) => boolean,
  firstOnly: boolean,
): Explored {
  const { basis, amounts } = ctx;
  const split = splittable(basis, amounts.allocation.amountsMol);
  const all = orders(basis, advised, split);
  const safe: Evaluated[] = [];
  const unsafeOrders: Evaluated[] = [];
  const toBeat = () => Math.min(...[base, ...safe].map((e) => e.worst?.relative ?? Infinity));
  for (const order of all) {
    if (order.every((s, i) => s === advised[i])) continue;
    ctx.stats.structures++;
    const ev = reviewIfPromising(
      ctx,
      order.map((source) => ({ source })),
      firstOnly,
      toBeat(),
    );
    if (!ev || ev === 'hopeless') continue;
    if (admissible(ev)) safe.push(predicted(ctx, ev));
    else unsafeOrders.push(ev);
  }
  const swept: Swept[] = [];
  const args: SweepArgs = { ctx, admissible, firstOnly, toBeat };
  for (const st of byPromise(ctx, structures(all, split, twoExtra(basis.input.sources.length)))) {
    ctx.stats.structures++;
    const sw = sweep(args, st);
    swept.push(sw);
    if (sw.best) safe.push(sw.best);
  }
  return { safe: safe.filter((e) => e.worst), unsafeOrders, swept };
}

/** every design fraction and phi predicted within the tolerance */
function isWithin(ev: Evaluated): boolean {
  return !!ev.prediction && ev.prediction.rows.every((r) => r.kind === 'dilution' || r.within);
}

/**
 * Its hazards are near-flammable or flammable states or fill paths only (no danger, no other
 * warning), every fill reviewed: such a sequence may be offered as an option, never chosen.
 */
function optionable(ev: Evaluated): boolean {
  return ev.safety.complete && ev.safety.danger === 0 && !ev.safety.hazards.some(rulesOutOption);
}

/** a hazard no option may have: any danger, any warning but a flammable or near-flammable state or path */
function rulesOutOption(h: Finding): boolean {
  if (h.severity === 'danger') return true;
  return !(
    h.severity === 'note' ||
    h.code === 'near-flammable' ||
    h.code === 'near-flammable-fill-path' ||
    h.code === 'flammable-state' ||
    h.code === 'flammable-fill-path' ||
    h.code === 'flammable-at-inlet'
  );
}

/**
 * A candidate that meets the tolerance but is less safe than the advised order: only
 * near-flammable or flammable states or paths qualify (optionable), so a detonable or otherwise
 * dangerous sequence is never offered. Tried: the single-charge orders, then below the first
 * unsafe share of the two most precise one-extra splits, each share 3/4 of the last (the
 * largest such share that meets the tolerance: the least hazardous), ending at a danger.
 */
function preciseOption(
  ctx: SearchContext,
  found: Explored,
  admissible: (ev: Evaluated) => boolean,
): Evaluated | undefined {
  let best: Evaluated | undefined;
  // a candidate whose lower bound of U cannot meet the tolerance, or cannot beat the best option
  // found, is neither reviewed in full nor predicted (it could not be chosen)
  const hopeless = (c: readonly CandidateCharge[]) =>
    cannotBeWithin(ctx, c) || (!!best?.worst && temperatureBound(ctx, c) >= best.worst.relative);
  for (const e of found.unsafeOrders) {
    if (hopeless(e.candidate)) continue;
    // the review stops at the first hazard that rules the order out (hazards are only ever added)
    const full = reviewedFully(ctx, e, rulesOutOption);
    if (!optionable(full)) continue;
    const p = predicted(ctx, full);
    if (isWithin(p) && better(p, best)) best = p;
  }
  // the swept structures are in order of promise (byPromise)
  const splits = found.swept.filter((sw) => sw.firstUnsafe !== undefined).slice(0, 2);
  for (const sw of splits) {
    let share = sw.firstUnsafe!;
    for (let i = 0; i < MAX_OPTION_STEPS; i++, share *= 0.75) {
      const ev = review(ctx, candidateOf(sw.st, [share]));
      if (!ev || admissible(ev)) continue;
      if (!optionable(ev)) break;
      // not predicted when it cannot meet the tolerance: the next, smaller share is tried as it would be
      if (cannotBeWithin(ctx, ev.candidate)) continue;
      const p = predicted(ctx, ev);
      if (isWithin(p)) {
        if (better(p, best)) best = p;
        break;
      }
    }
  }
  return best;
}

/** the steps with the gauges a searched sequence chose (unchanged for any other sequence) */
export function searchedGauges(basis: PlanBasis, planned: PlanSteps, sequence: PlanSequence): PlanSteps {
  return isSearched(sequence) && sequence.gauges.length
    ? withGauges(basis, planned, sequence.gauges)
    : planned;
}
