/**
 * Fill-order advice: evaluate the candidate orders of a design's fills and
 * recommend one that keeps every intermediate tank state and the path of every
 * fill (in the tank and at its inlet) out of the flammable region, and free of
 * compression heating and line hazards (line condensation included), where one
 * exists; among equally safe orders, the smallest partial pressure first. Orders
 * are ranked by their count of dangers, then warnings, then notes. The review of
 * one fill depends only on which sources are already in the tank, so it is cached
 * by that set: n sources need n 2^(n-1) fill reviews, not n! n.
 */
import type { Fractions } from './composition.js';
import type { GasSource } from './supply.js';
import { reviewFill, reviewState, type FillEvent, type SafetyContext, type TankState } from './safety.js';
import type { Finding, FindingCode } from './findings.js';
import { reviewFillPath } from './fill-path.js';
import { NO_SAFE_ORDER_OPENING, ORDER_REVIEW_CLAIM } from './order-words.js';

export interface OrderScore {
  readonly danger: number;
  readonly warning: number;
  readonly note: number;
  /**
   * of these, line condensation findings (counted in danger/warning too: a vapour filled
   * early keeps its line below saturation)
   */
  readonly condensation: number;
  /** pairs out of smallest-first order */
  readonly inversions: number;
  /** what the order makes, for the reason text */
  readonly hazards: readonly Finding[];
}

export interface OrderAdvice {
  readonly sources: GasSource[];
  readonly reason: string;
  readonly score: OrderScore;
  /** true when no order keeps every intermediate state non-flammable and hazard-free */
  readonly noSafeOrder: boolean;
}

/** the finding codes an order can change (typed: a misspelt code does not compile) */
export const ORDER_RELEVANT: ReadonlySet<FindingCode> = new Set<FindingCode>([
  'flammable-state',
  'near-flammable',
  'detonable-state',
  'closed-vessel-pressure',
  'compression-heating',
  'oxygen-compression',
  'condensation',
  'acetylene-pressure',
  'no-with-o2',
  'n2o-decomposition',
]);

/** one charge as the scoring sees it: a source and the mol it delivers (a source may come more than once) */
export interface ScoredCharge {
  readonly source: GasSource;
  readonly mol: number;
}

/** states and fills of one order, with pressures from the amounts (ideal gas: enough for ranking) */
export function sequenceOf(
  order: readonly GasSource[],
  amounts: ReadonlyMap<GasSource, number>,
  finalPa: number,
  initial?: { composition: Fractions; amountMol: number },
) {
  return chargeSequenceOf(
    order.map((source) => ({ source, mol: amounts.get(source) ?? 0 })),
    finalPa,
    initial,
  );
}

/**
 * states and fills of a sequence of charges (a source may be charged more than once), with
 * pressures from the amounts: P after a charge = final pressure x cumulative mol / total mol
 */
export function chargeSequenceOf(
  charges: readonly ScoredCharge[],
  finalPa: number,
  initial?: { composition: Fractions; amountMol: number },
) {
  const total = charges.reduce((a, c) => a + c.mol, 0) + (initial?.amountMol ?? 0);
  const cum: Record<string, number> = {};
  let n = 0;
  if (initial) {
    for (const [k, v] of Object.entries(initial.composition)) cum[k] = v * initial.amountMol;
    n = initial.amountMol;
  }
  const states: TankState[] = [];
  const fills: FillEvent[] = [];
  let before: TankState | undefined = initial
    ? { step: 0, composition: { ...initial.composition }, pressurePa: (finalPa * n) / total, final: false }
    : undefined;
  if (before) states.push(before);
  charges.forEach(({ source: s, mol: a }, i) => {
    for (const [k, v] of Object.entries(s.composition)) cum[k] = (cum[k] ?? 0) + v * a;
    cum[s.mainSpecies] = (cum[s.mainSpecies] ?? 0) + s.unidentified * a;
    n += a;
    const y: Record<string, number> = {};
    const sum = Object.values(cum).reduce((p, q) => p + q, 0);
    for (const [k, v] of Object.entries(cum)) y[k] = v / sum;
    const after: TankState = {
      step: i + 1,
      composition: y,
      pressurePa: (finalPa * n) / total,
      final: i === charges.length - 1,
    };
    states.push(after);
    fills.push({ step: i + 1, sourceId: s.id, sourceComposition: s.composition, before, after });
    before = after;
  });
  return { states, fills };
}

/**
 * The hazards an order can change of one fill: the state after it (unless final; in-tank
 * condensation of an intermediate state left out: once the vapour is in, its partial pressure
 * is the same in every order), the fill itself (its line, compression heating), and its path
 * in the tank and at the inlet.
 */
export function fillHazards(f: FillEvent, ctx: SafetyContext): Finding[] {
  const found: Finding[] = [];
  if (!f.after.final)
    found.push(
      ...reviewState(f.after, ctx, 'severity').findings.filter(
        (x) => ORDER_RELEVANT.has(x.code) && x.code !== 'condensation',
      ),
    );
  found.push(...reviewFill(f, ctx).filter((x) => ORDER_RELEVANT.has(x.code)));
  found.push(...reviewFillPath(f, ctx, false));
  return found;
}

/** findings of one fill and of the state after it, cached by which sources are in the tank: orders share them */
type ReviewCache = Map<string, Finding[]>;

/** what scoring one order needs */
export interface ScoreRequest {
  readonly order: readonly GasSource[];
  /** mol each source delivers */
  readonly amounts: ReadonlyMap<GasSource, number>;
  /** the sources smallest amount first: the tie-break counts pairs out of this order */
  readonly ascending: readonly GasSource[];
  /** final tank pressure, Pa (states are placed at ideal-gas pressures on it) */
  readonly finalPa: number;
  readonly ctx: SafetyContext;
  /** gas already in the tank, with its amount on the same scale */
  readonly initial?: { composition: Fractions; amountMol: number };
  /** reviews shared between the orders of one search (a fresh cache when absent) */
  readonly cache?: ReviewCache;
}

/** the hazards of one order, counted by severity, with its inversions for the tie-break */
export function scoreOrder(req: ScoreRequest): OrderScore {
  const { order, amounts, ascending, finalPa, ctx, initial } = req;
  const cache: ReviewCache = req.cache ?? new Map();
  const { fills } = sequenceOf(order, amounts, finalPa, initial);
  const index = new Map(ascending.map((s, i) => [s, i]));
  const hazards: Finding[] = [];
  fills.forEach((f, i) => {
    const key = `${order
      .slice(0, i)
      .map((s) => index.get(s))
      .sort((a, b) => a! - b!)
      .join(',')}>${index.get(order[i])}`;
    let found = cache.get(key);
    if (!found) {
      found = fillHazards(f, ctx);
      cache.set(key, found);
    }
    hazards.push(...found.map((h) => ({ ...h, step: h.step === undefined ? undefined : i + 1 })));
  });
  let inversions = 0;
  for (let i = 0; i < order.length; i++)
    for (let j = i + 1; j < order.length; j++) if (index.get(order[i])! > index.get(order[j])!) inversions++;
  return counted(hazards, inversions);
}

function counted(hazards: Finding[], inversions: number): OrderScore {
  const count = (sev: string) => hazards.filter((h) => h.severity === sev).length;
  return {
    danger: count('danger'),
    warning: count('warning'),
    note: count('note'),
    condensation: hazards.filter((h) => h.code === 'condensation').length,
    inversions,
    hazards,
  };
}

function better(a: OrderScore, b: OrderScore): boolean {
  if (a.danger !== b.danger) return a.danger < b.danger;
  if (a.warning !== b.warning) return a.warning < b.warning;
  if (a.note !== b.note) return a.note < b.note;
  return a.inversions < b.inversions;
}

const MAX_EXHAUSTIVE = 6;

type Common = Omit<ScoreRequest, 'order'> & { readonly cache: ReviewCache };

/** the score's ranking key: dangers, warnings, notes, inversions (compared in that order) */
function keyOf(danger: number, warning: number, note: number, inversions: number): number[] {
  return [danger, warning, note, inversions];
}

/** a < b in the ranking (the first differing entry decides) */
function lessThan(a: readonly number[], b: readonly number[]): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] < b[i];
  return false;
}

/**
 * The best order of every permutation of the sources (smallest-first order first), by
 * depth-first search with a bound: the hazards of a fill are counted whatever follows it and
 * the pairs a prefix puts out of smallest-first order stay out of order, so a prefix whose
 * counts already rank no better than the best order found cannot lead to a better one and is
 * not followed. The orders are visited in the order the full enumeration visits them and an
 * order replaces the best only when strictly better, so the result is the full enumeration's;
 * each fill is reviewed as the enumeration first met it (its prefix smallest-first), from the
 * shared cache.
 */
function bestOrder(
  ascending: GasSource[],
  common: Common,
  ascendingScore: OrderScore,
): { best: GasSource[]; bestScore: OrderScore } {
  const { cache } = common;
  const n = ascending.length;
  let best: GasSource[] = ascending;
  let bestScore = ascendingScore;
  let bestKey = keyOf(bestScore.danger, bestScore.warning, bestScore.note, bestScore.inversions);
  const used = new Array<boolean>(n).fill(false);
  const prefix: number[] = [];
  const hazards: Finding[] = [];
  let inv = 0;
  const counts = { danger: 0, warning: 0, note: 0 };
  // the fill at position |prefix| as the full enumeration first reviews it: the prefix's set
  // smallest-first, then this source, then the rest smallest-first
  const reviewed = (j: number): Finding[] => {
    const set = [...prefix].sort((a, b) => a - b);
    const key = `${set.join(',')}>${j}`;
    let found = cache.get(key);
    if (!found) {
      const rest = ascending.map((_, i) => i).filter((i) => i !== j && !set.includes(i));
      const order = [...set, j, ...rest].map((i) => ascending[i]);
      const { fills } = sequenceOf(order, common.amounts, common.finalPa, common.initial);
      found = fillHazards(fills[set.length], common.ctx);
      cache.set(key, found);
    }
    const i = prefix.length;
    return found.map((h) => ({ ...h, step: h.step === undefined ? undefined : i + 1 }));
  };
  const visit = (): void => {
    if (prefix.length === n) {
      const order = prefix.map((i) => ascending[i]);
      const sc = counted([...hazards], inv);
      if (better(sc, bestScore)) {
        best = order;
        bestScore = sc;
        bestKey = keyOf(sc.danger, sc.warning, sc.note, sc.inversions);
      }
      return;
    }
    for (let j = 0; j < n; j++) {
      if (used[j]) continue;
      // pairs this source makes out of order with the sources still to come (a smaller one after it)
      let addInv = 0;
      for (let r = 0; r < j; r++) if (!used[r]) addInv++;
      const found = reviewed(j);
      const add = { danger: 0, warning: 0, note: 0 };
      for (const h of found) if (h.severity in add) add[h.severity as keyof typeof add]++;
      const bound = keyOf(
        counts.danger + add.danger,
        counts.warning + add.warning,
        counts.note + add.note,
        inv + addInv,
      );
      if (!lessThan(bound, bestKey)) continue;
      used[j] = true;
      prefix.push(j);
      hazards.push(...found);
      inv += addInv;
      counts.danger += add.danger;
      counts.warning += add.warning;
      counts.note += add.note;
      visit();
      counts.danger -= add.danger;
      counts.warning -= add.warning;
      counts.note -= add.note;
      inv -= addInv;
      hazards.length -= found.length;
      prefix.pop();
      used[j] = false;
    }
  };
  visit();
  return { best, bestScore };
}

export { ORDER_REVIEW_CLAIM } from './order-words.js';

/**
 * the opening of the sequence search's comparison of its choice with the advised order (its own
 * review: intermediate states and fill paths, no tank rating, no finished mixture); the plan's
 * review (plan/review.ts) adds what the full review of the planned fill finds
 */
export const COMPARED_CLAIM = "not less safe than the advised order by the search's review";

/**
 * @param sources the fills, in any order; `amountsMol` the mol each delivers (same order)
 * @param initial gas already in the tank, with its amount on the same scale
 */
export function adviseOrder(
  sources: readonly GasSource[],
  amountsMol: readonly number[],
  finalPa: number,
  ctx: SafetyContext,
  initial?: { composition: Fractions; amountMol: number },
): OrderAdvice {
  const amounts = new Map(sources.map((s, i) => [s, amountsMol[i]]));
  const ascending = [...sources].sort((a, b) => amounts.get(a)! - amounts.get(b)!);
  const cache: ReviewCache = new Map();
  const common = { amounts, ascending, finalPa, ctx, initial, cache };
  const ascendingScore = scoreOrder({ order: ascending, ...common });
  const { best, bestScore } =
    sources.length <= MAX_EXHAUSTIVE
      ? bestOrder(ascending, common, ascendingScore)
      : { best: ascending, bestScore: ascendingScore };
  const clean = bestScore.danger === 0 && bestScore.warning === 0 && bestScore.note === 0;
  const names = (o: readonly GasSource[]) => o.map((s) => s.id);
  let reason: string;
  if (clean && best === ascending) {
    reason =
      'smallest partial pressure first, largest last (best relative resolution ' +
      `for the small fills); ${ORDER_REVIEW_CLAIM}`;
  } else if (clean) {
    const first = ascendingScore.hazards[0];
    reason =
      `not the smallest-first order (${names(ascending).join(', ')}), which would give ` +
      (first ? `${first.code} after fill ${first.step}` : 'a hazardous state') +
      `; ${ORDER_REVIEW_CLAIM}`;
  } else {
    const codes = [...new Set(bestScore.hazards.map((h) => h.code))].join(', ');
    reason =
      `${NO_SAFE_ORDER_OPENING} (intermediate states, fill paths, ` +
      `fill lines); this one has the fewest and least severe (${bestScore.danger} ` +
      `danger, ${bestScore.warning} warning, ${bestScore.note} note: ${codes})`;
  }
  return { sources: best, reason, score: bestScore, noSafeOrder: !clean };
}

/** the score of a given order (its own smallest-first ranking for the tie-break) */
export function scoreGivenOrder(
  order: readonly GasSource[],
  amountsMol: readonly number[],
  finalPa: number,
  ctx: SafetyContext,
  initial?: { composition: Fractions; amountMol: number },
): OrderScore {
  const amounts = new Map(order.map((s, i) => [s, amountsMol[i]]));
  const ascending = [...order].sort((a, b) => amounts.get(a)! - amounts.get(b)!);
  return scoreOrder({ order, amounts, ascending, finalPa, ctx, initial });
}

/**
 * The score of a given sequence of charges, a source possibly charged more than once (a split
 * charge): every charge's state and path reviewed as it is, at ideal-gas pressures on the final
 * pressure; the tie-break counts pairs of charges out of smallest-first order.
 */
export function scoreGivenCharges(
  charges: readonly ScoredCharge[],
  finalPa: number,
  ctx: SafetyContext,
  initial?: { composition: Fractions; amountMol: number },
): OrderScore {
  const { fills } = chargeSequenceOf(charges, finalPa, initial);
  const hazards = fills.flatMap((f) => fillHazards(f, ctx));
  let inversions = 0;
  for (let i = 0; i < charges.length; i++)
    for (let j = i + 1; j < charges.length; j++) if (charges[i].mol > charges[j].mol) inversions++;
  return counted(hazards, inversions);
}

export function isSaferThan(a: OrderScore, b: OrderScore): boolean {
  return a.danger < b.danger || (a.danger === b.danger && a.warning < b.warning);
}
