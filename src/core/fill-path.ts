/**
 * The path of a fill: the tank passes through every composition between the state
 * before a fill and the state after it, and at the inlet the incoming gas meets the
 * tank gas. Both are straight segments in mole-fraction space; this module finds
 * where they enter the flammable region, by the same method as for tank states
 * (`assessFlammability`), and words the result as findings.
 *
 * Bulk path. With n0 mol of y0 in the tank and gas of composition s admitted, after
 * admitting a mol the tank holds y(w) = (1 - w) y0 + w s with w = a / (n0 + a) the
 * admitted share. The end state is y1 = y(w1), so the path is the segment y0 -> y1,
 * y(u) = (1 - u) y0 + u y1 for u in [0, 1] (u = w / w1). At fixed volume and
 * temperature the pressure follows the amount (ideal gas; the real-gas correction
 * is below a percent for the states this tool plans):
 *   P(u) = P0 P1 / (P1 - u (P1 - P0)).
 * Inlet. While the tank holds y(u) the jet mixes it with s, which spans the segment
 * y(u) -> s; over the whole fill these make up the segment y0 -> s, of which the part
 * y1 -> s lies beyond the bulk path. It is judged at P1, the highest tank pressure of
 * the fill (the upper limit only widens with pressure).
 *
 * Search (every verdict from assessFlammability, the method used for states):
 *  - a segment whose oxidizer stays below 0.1 % O2-equivalent, or whose fuel stays below
 *    0.2 x the lowest LFL of its fuels, is judged at its ends only (see canBurn);
 *  - 9 evenly spaced points, both ends included;
 *  - thin crossings of the limit envelope: the distance of the path from the envelope
 *    polygon on the N2-equivalent diagram is cheap, so it is computed on a 33-point
 *    grid and each local minimum outside the envelope is refined by golden-section
 *    search; the closest point is then judged. A straight path meets a convex region
 *    in one stretch and its distance has one minimum, so a crossing however thin is
 *    found where the envelope is convex;
 *  - thin crossings by flame temperature: each local maximum among the samples of the
 *    flame temperature (as a share of the rise to the limit flame temperature) that
 *    reaches 30 % of the limit is refined the same way and judged (along a mixing line
 *    the flame temperature rises to one peak near stoichiometric and falls);
 *  - each boundary between ranks (not flammable / flammable / detonable) is bisected
 *    nine times, to 1/4096 of the segment, for the pressure range that is reported
 *    (four times in the order search, which needs only the ranks).
 */
import type { Fractions } from './composition.js';
import {
  assessFlammability,
  blendLimits,
  diagramSums,
  envelopePolygon,
  insidePolygon,
  flameShareOf,
  flameShareToLimit,
  uflRisesWithPressure,
  type FlammabilityAssessment,
} from './flammability.js';
import { getSpecies } from './lookup.js';
import { FUEL_SAFETY } from './data/safety-data.js';
import { oxygenDemand } from './formula.js';
import { TRACE_FUEL_OF_LFL, TRACE_OXYGEN } from './thresholds.js';
import { detonableByRule, flammabilityNumbers, type FillEvent, type SafetyContext } from './safety.js';
import type { Finding } from './findings.js';
import { closedVesselFinding, detonationFinding } from './explosion-review.js';
import { detonability } from './detonation.js';

/** hazard rank of one composition: 0 not flammable (or only near the limit), 1 flammable, 2 detonable */
export type PathRank = 0 | 1 | 2;

export interface PathPoint {
  /** position on the segment, 0 (start) to 1 (end) */
  readonly u: number;
  readonly pressurePa: number;
  readonly composition: Fractions;
  readonly assessment: FlammabilityAssessment;
  readonly rank: PathRank;
}

export interface SegmentReview {
  /** worst rank anywhere on the segment (ends included) */
  readonly rank: PathRank;
  /** the worst point: highest rank, then hottest flame */
  readonly worst: PathPoint;
  /** span of u over which the segment is flammable (undefined when nowhere) */
  readonly flammableU?: readonly [number, number];
  /** tank pressures at the ends of that span, Pa */
  readonly flammablePa?: readonly [number, number];
  /** the detonable points the review judged (rank 2), in order of u: samples, refinements and boundaries */
  readonly detonable: readonly PathPoint[];
  readonly ranks: { readonly start: PathRank; readonly end: PathRank };
  /**
   * where the segment is not flammable: its point closest to the limits among those inside the
   * flammability data's uncertainty margin (verdict 'within-margin'), if any was judged
   */
  readonly withinMargin?: PathPoint;
  /** the end states' verdicts are 'within-margin' (their own state findings say so) */
  readonly endsWithinMargin: boolean;
}

const SAMPLES = 8;
/** flame-temperature share above which a local maximum between samples is searched */
const FLAME_SHARE_SEARCH = 0.3;
const FINE = 32;
const BISECTIONS = 9;
/** bisections where only the ranks are wanted (the order search) */
const SEARCH_BISECTIONS = 4;
const GOLDEN = 14;

export function mix(a: Fractions, b: Fractions, u: number): Fractions {
  const y: Record<string, number> = {};
  for (const k in a) y[k] = (1 - u) * a[k];
  for (const k in b) y[k] = (y[k] ?? 0) + u * b[k];
  // the positive ones, in the same order (a new object: deleting keys would slow every later read)
  let all = true;
  for (const k in y) if (y[k] <= 0) all = false;
  if (all) return y;
  const out: Record<string, number> = {};
  for (const k in y) if (!(y[k] <= 0)) out[k] = y[k];
  return out;
}

function normalised(y: Fractions): Fractions {
  const s = Object.values(y).reduce((p, q) => p + q, 0);
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(y)) if (v > 0) out[k] = v / s;
  return out;
}

function amounts(y: Fractions): { fuel: number; oxygen: number; fuels: string[] } {
  let fuel = 0;
  let oxygen = 0;
  const fuels: string[] = [];
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    const d = oxygenDemand(getSpecies(k).elements);
    if (d > 0) {
      fuel += v;
      fuels.push(k);
    } else if (d < 0) oxygen -= d * v;
  }
  return { fuel, oxygen, fuels };
}

/*
 * Traces (thresholds.ts): below TRACE_OXYGEN O2-equivalent no fuel heats the gas by more
 * than about 30 K (about 570 kJ per mol O2 at most, over cp of 20.8 J/mol K). Below
 * TRACE_FUEL_OF_LFL of the lowest LFL no state is flammable or near the limit: the heat
 * released scales with fuel / LFL (Burgess-Wheeler: LFL x heat of combustion about
 * constant), so the rise is under 0.2 x 1.4 (monatomic bath) of the limit rise, and on
 * the N2-equivalent diagram the fuel share is at most 2x its mole fraction (K >= 0.5).
 */

/**
 * A segment can only be flammable where fuel and oxidizer both occur along it in more
 * than traces (cylinder impurities would otherwise send every fill through the search).
 * Mixing is linear, so the largest fractions along a segment are at its ends.
 */
function canBurn(a: Fractions, b: Fractions): boolean {
  const x = amounts(a);
  const y = amounts(b);
  if (Math.max(x.oxygen, y.oxygen) < TRACE_OXYGEN) return false;
  const fuels = new Set([...x.fuels, ...y.fuels]);
  if (fuels.size === 0) return false;
  let lfl = Infinity;
  for (const k of fuels) {
    const rec = FUEL_SAFETY.get(k);
    if (!rec) return true; // no limits on file: never screened out
    lfl = Math.min(lfl, ...rec.lflAir.map((v) => v.value));
  }
  return Math.max(x.fuel, y.fuel) >= TRACE_FUEL_OF_LFL * lfl;
}

function rankOf(a: FlammabilityAssessment, y: Fractions, pressurePa: number): PathRank {
  if (a.verdict !== 'flammable') return 0;
  return detonableByRule(a, y, pressurePa) ? 2 : 1;
}

function distanceToSegment(p: [number, number], a: [number, number], b: [number, number]): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 > 0 ? Math.min(1, Math.max(0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2)) : 0;
  return Math.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy);
}

/** distance of a diagram point from the envelope polygon, negative inside */
function gapTo(p: [number, number], poly: [number, number][]): number {
  let d = Infinity;
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++)
    d = Math.min(d, distanceToSegment(p, poly[j], poly[i]));
  return insidePolygon(p, poly) ? -d : d;
}

/**
 * How far each composition of the segment a -> b lies outside the limit envelope on the
 * N2-equivalent diagram (negative inside), as a function of u: a cheap guide to where a thin
 * crossing could hide. The verdict itself always comes from assessFlammability. The diagram's
 * amounts are linear in u (diagramSums), so they are taken from the ends, and a point costs no
 * mixing of the compositions.
 */
function gapAlong(
  a: Fractions,
  b: Fractions,
  temperatureK: number,
  pressureAt: (u: number) => number,
): (u: number) => number {
  const A = diagramSums(a);
  const B = diagramSums(b);
  const fuels = [...new Set([...Object.keys(A.fuelBlend), ...Object.keys(B.fuelBlend)])];
  const single: Fractions | undefined = fuels.length === 1 ? { [fuels[0]]: 1 } : undefined;
  // a single fuel's envelope depends on the pressure only above 1 atm (blendLimits: the UFL's
  // pressure correction), so below it, and at a pressure met before, the last polygon is reused
  let last: { key: number; poly: [number, number][] } | undefined;
  const singlePolygon = (p: number) => {
    const key = uflRisesWithPressure(p) ? p : -1;
    if (last?.key !== key) last = { key, poly: envelopePolygon(blendLimits(single!, temperatureK, p)) };
    return last.poly;
  };
  return (u) => {
    const f = (1 - u) * A.fuel + u * B.fuel;
    const o = (1 - u) * A.oxygen + u * B.oxygen;
    const s = f + o + (1 - u) * A.inert + u * B.inert;
    if (!(f / s > 0) || !(o / s > 0)) return 1;
    if (single) return gapTo([f / s, o / s], singlePolygon(pressureAt(u)));
    const y: Record<string, number> = {};
    for (const k of fuels) {
      const v = (1 - u) * (A.fuelBlend[k] ?? 0) + u * (B.fuelBlend[k] ?? 0);
      if (v > 0) y[k] = v / f;
    }
    return gapTo([f / s, o / s], envelopePolygon(blendLimits(y, temperatureK, pressureAt(u))));
  };
}

/** golden-section search for the minimum of f on [lo, hi] */
function goldenMin(f: (u: number) => number, lo: number, hi: number, iterations: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let a = lo;
  let b = hi;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(c);
  let fd = f(d);
  for (let i = 0; i < iterations; i++) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  return (a + b) / 2;
}

/**
 * Review the segment a -> b at pressure P(u). Returns the worst rank along it, the worst
 * point and the span of u where it is flammable.
 */
export function reviewSegment(
  a: Fractions,
  b: Fractions,
  pressureAt: (u: number) => number,
  temperatureK: number,
  locate = true,
): SegmentReview {
  const at = (u: number): PathPoint => {
    const y = mix(a, b, u);
    const p = pressureAt(u);
    const assessment = assessFlammability(y, temperatureK, p);
    return { u, pressurePa: p, composition: y, assessment, rank: rankOf(assessment, y, p) };
  };
  let pts: PathPoint[] = [];
  if (canBurn(a, b)) {
    for (let i = 0; i <= SAMPLES; i++) pts.push(at(i / SAMPLES));
    // thin crossings of the envelope: local minima of the (cheap) gap on a fine grid, refined
    const gap = gapAlong(a, b, temperatureK, pressureAt);
    const fine = Array.from({ length: FINE + 1 }, (_, i) => gap(i / FINE));
    for (let i = 0; i <= FINE; i++) {
      const left = i > 0 ? fine[i - 1] : Infinity;
      const right = i < FINE ? fine[i + 1] : Infinity;
      // inside points too: a crossing thinner than the samples' spacing may hold only a fine-grid
      // point (its gap negative), which no sample judges
      if (fine[i] <= left && fine[i] <= right)
        pts.push(at(goldenMin(gap, Math.max(0, (i - 1) / FINE), Math.min(1, (i + 1) / FINE), GOLDEN)));
    }
    // thin crossings by flame temperature: local maxima of the flame share near the limit, refined
    const coarse = pts.slice(0, SAMPLES + 1);
    for (let i = 0; i <= SAMPLES; i++) {
      const s = flameShareOf(coarse[i].assessment, temperatureK);
      const left = i > 0 ? flameShareOf(coarse[i - 1].assessment, temperatureK) : -Infinity;
      const right = i < SAMPLES ? flameShareOf(coarse[i + 1].assessment, temperatureK) : -Infinity;
      if (coarse[i].rank === 0 && s >= FLAME_SHARE_SEARCH && s >= left && s >= right) {
        pts.push(
          at(
            goldenMin(
              // the flame share alone (no rank): the refined point is then judged in full
              (u) => -flameShareToLimit(mix(a, b, u), temperatureK),
              Math.max(0, (i - 1) / SAMPLES),
              Math.min(1, (i + 1) / SAMPLES),
              GOLDEN / 2,
            ),
          ),
        );
      }
    }
    // locate each boundary between ranks by bisection; a midpoint of a third rank (flammable
    // between detonable and non-flammable) has a boundary on each side, and both are followed,
    // so the flammable stretch is not cut off at the detonable one
    pts.sort((p, q) => p.u - q.u);
    const extra: PathPoint[] = [];
    const bisect = (lo: PathPoint, hi: PathPoint, depth: number): void => {
      if (depth === 0 || lo.rank === hi.rank) return;
      const m = at((lo.u + hi.u) / 2);
      extra.push(m);
      if (m.rank !== lo.rank) bisect(lo, m, depth - 1);
      if (m.rank !== hi.rank) bisect(m, hi, depth - 1);
    };
    for (let i = 0; i + 1 < pts.length; i++)
      bisect(pts[i], pts[i + 1], locate ? BISECTIONS : SEARCH_BISECTIONS);
    pts = [...pts, ...extra];
  } else {
    pts.push(at(0), at(1));
  }
  let worst = pts[0];
  for (const p of pts) {
    if (
      p.rank > worst.rank ||
      (p.rank === worst.rank && (p.assessment.flameK ?? 0) > (worst.assessment.flameK ?? 0))
    )
      worst = p;
  }
  const burning = pts.filter((p) => p.rank > 0).map((p) => p.u);
  const closest = closestInMargin(pts, at, locate);
  const endOf = (u: number) => pts.find((p) => p.u === u)!.assessment.verdict === 'within-margin';
  const span = burning.length ? ([Math.min(...burning), Math.max(...burning)] as const) : undefined;
  return {
    rank: worst.rank,
    worst,
    flammableU: span,
    flammablePa: span ? [pressureAt(span[0]), pressureAt(span[1])] : undefined,
    detonable: pts.filter((p) => p.rank === 2).sort((p, q) => p.u - q.u),
    ranks: { start: pts.find((p) => p.u === 0)!.rank, end: pts.find((p) => p.u === 1)!.rank },
    withinMargin: closest,
    endsWithinMargin: endOf(0) || endOf(1),
  };
}

/**
 * how far a state inside the data's uncertainty margin is from flammable: the share by which the LFL
 * and the LOC would have to fall for the envelope to hold it, else (inside by flame temperature only)
 * the share its flame temperature rise is short of the limit's; 1 outside the margin
 */
function closeness(a: FlammabilityAssessment): number {
  if (a.verdict !== 'within-margin') return 1;
  const d = a.distance;
  return d?.limitsLowerBy ?? (d?.flameRiseShare !== undefined ? 1 - d.flameRiseShare : 1);
}

/**
 * the point of a segment closest to flammable among those judged inside the data's margin, refined by
 * golden-section search around it (`locate`: the report's numbers; the search needs only the severity)
 */
function closestInMargin(
  pts: readonly PathPoint[],
  at: (u: number) => PathPoint,
  locate: boolean,
): PathPoint | undefined {
  const margin = pts.filter((p) => p.assessment.verdict === 'within-margin');
  if (!margin.length) return undefined;
  const best = margin.reduce((a, b) => (closeness(b.assessment) < closeness(a.assessment) ? b : a));
  if (!locate) return best;
  const u = goldenMin(
    (x) => closeness(at(x).assessment),
    Math.max(0, best.u - 1 / FINE),
    Math.min(1, best.u + 1 / FINE),
    GOLDEN,
  );
  const refined = at(u);
  return refined.rank === 0 && closeness(refined.assessment) < closeness(best.assessment) ? refined : best;
}

/** P(u) along the bulk path of a fill from P0 to P1 (amount-weighted, ideal gas) */
export function bulkPressure(p0Pa: number, p1Pa: number): (u: number) => number {
  return (u) => (p0Pa * p1Pa) / (p1Pa - u * (p1Pa - p0Pa));
}

/** the bulk path of a fill: every cumulative composition from the state before it to the state after it */
export function reviewBulkPath(e: FillEvent, temperatureK: number, locate = true): SegmentReview | undefined {
  if (!e.before || e.before.pressurePa <= 0) return undefined;
  return reviewSegment(
    e.before.composition,
    e.after.composition,
    bulkPressure(e.before.pressurePa, e.after.pressurePa),
    temperatureK,
    locate,
  );
}

/** the inlet of a fill beyond the bulk path: tank gas at the end of the fill meeting the incoming gas, at P1 */
export function reviewInlet(e: FillEvent, temperatureK: number, locate = true): SegmentReview | undefined {
  if (!e.before || e.before.pressurePa <= 0) return undefined;
  const p1 = e.after.pressurePa;
  return reviewSegment(e.after.composition, normalised(e.sourceComposition), () => p1, temperatureK, locate);
}

/**
 * The detonation finding of a detonable stretch, by the rule for states (detonationFinding
 * in explosion-review.ts): undiluted fuel/O2 anywhere on it is a danger whatever the
 * rating; a diluted stretch is a danger when the reflected pressure (about 2.5 x P_CJ at
 * the path's pressure there) exceeds the working limit anywhere on it, else a warning.
 * Judged at every detonable point the review found (its ends, the samples inside it and
 * the worst point), and the highest reflected pressure is kept.
 */
export function detonableStretchFinding(
  points: readonly PathPoint[],
  temperatureK: number,
  workingLimitPa: number | undefined,
  step: number | undefined,
  detail: 'full' | 'severity' = 'full',
): Extract<Finding, { code: 'detonable-state' }> | undefined {
  const judge = (p: PathPoint) =>
    detonationFinding(
      { composition: p.composition, pressurePa: p.pressurePa },
      temperatureK,
      workingLimitPa,
      step,
      detail,
    ) as Extract<Finding, { code: 'detonable-state' }> | undefined;
  // undiluted anywhere: a danger whatever the numbers; the first such point carries them
  const undiluted = points.find((p) => detonability(p.composition).undiluted);
  if (undiluted) return judge(undiluted);
  let worst: Extract<Finding, { code: 'detonable-state' }> | undefined;
  const rank = (f: Extract<Finding, { code: 'detonable-state' }>) =>
    f.severity === 'danger' ? 2 : f.severity === 'warning' ? 1 : 0;
  // the severity alone: the highest pressures first, and the first danger settles it
  const order = detail === 'severity' ? [...points].sort((a, b) => b.pressurePa - a.pressurePa) : points;
  for (const p of order) {
    const f = judge(p);
    if (!f) continue;
    if (detail === 'severity' && f.severity === 'danger') return f;
    if (
      !worst ||
      rank(f) > rank(worst) ||
      (rank(f) === rank(worst) && (f.reflectedPa ?? -1) > (worst.reflectedPa ?? -1))
    )
      worst = f;
  }
  return worst;
}

/**
 * The closed-vessel pressure of a flammable stretch of the bulk path that reaches a higher tank
 * pressure than every flammable end state (a fill that starts in a flammable tank and carries it
 * higher before the tank leaves the flammable region; or a crossing, below): the rule for states (closedVesselFinding
 * in explosion-review.ts, danger above the working limit, else a note) applied at the stretch's
 * highest-pressure flammable point (the end of the span the segment review found) and at its worst
 * point (hottest flame) where that lies inside the path, the higher peak kept. A stretch between two
 * end states that are not flammable (the crossing flammable-fill-path reports) gets the same figure
 * where `crossings` (the full review of a fill, not an order search), marked `crossing`. It is reported when
 * it exceeds the peak of every flammable end state (judged by the same rule; their own findings give
 * theirs): a fill that makes the tank leaner or richer while it fills can ignite lower at the top
 * than at its start, and then the start state's finding already holds the worst figure. No
 * assessment is added (equilibria are cached).
 */
function closedVesselOfPath(
  e: FillEvent,
  bulk: SegmentReview,
  ctx: SafetyContext,
  crossings: boolean,
): Extract<Finding, { code: 'closed-vessel-fill-path' }> | undefined {
  if (!e.before || !bulk.flammableU || !bulk.flammablePa) return undefined;
  const [pa, pb] = bulk.flammablePa;
  const topPa = Math.max(pa, pb);
  const ends = [...(bulk.ranks.start > 0 ? [e.before] : []), ...(bulk.ranks.end > 0 ? [e.after] : [])];
  // a stretch between two states that are not flammable (the crossing flammable-fill-path reports) is
  // judged the same way, with no end state's peak to exceed, where `crossings` asks for it
  if (!ends.length && !crossings) return undefined;
  if (ends.length && !(topPa > Math.max(...ends.map((s) => s.pressurePa)))) return undefined;
  const judge = (s: { composition: Fractions; pressurePa: number }) => {
    const f = closedVesselFinding(s, ctx.temperatureK, ctx.workingLimitPa, e.step);
    return f.code === 'closed-vessel-pressure' ? f : undefined; // closedVesselFinding gives no other code
  };
  const topU = pb >= pa ? bulk.flammableU[1] : bulk.flammableU[0];
  const points = [{ composition: mix(e.before.composition, e.after.composition, topU), pressurePa: topPa }];
  const w = bulk.worst;
  if (w.rank > 0 && w.u > 0 && w.u < 1 && w.u !== topU) points.push(w);
  let cv: Extract<Finding, { code: 'closed-vessel-pressure' }> | undefined;
  for (const p of points) {
    const f = judge(p);
    if (f && (!cv || f.peakPa > cv.peakPa)) cv = f;
  }
  if (!cv) return undefined;
  const endsPeak = Math.max(-Infinity, ...ends.map((s) => judge(s)?.peakPa ?? -Infinity));
  if (!(cv.peakPa > endsPeak)) return undefined;
  return {
    ...cv,
    code: 'closed-vessel-fill-path',
    source: e.sourceId,
    ...(ends.length ? {} : { crossing: true }),
    flammableFromPa: Math.min(pa, pb),
    flammableToPa: topPa,
  };
}

/** the finding of a bulk path worse than both its end states, judged like such a state at its worst point */
function crossingFinding(
  e: FillEvent,
  bulk: SegmentReview,
  ctx: SafetyContext,
  locate: boolean,
  judge: boolean,
): Finding {
  const w = bulk.worst;
  // a detonable stretch is judged by the rule for detonable states; without a verdict from it, a danger
  const det =
    bulk.rank === 2 && judge
      ? detonableStretchFinding(
          bulk.detonable,
          ctx.temperatureK,
          ctx.workingLimitPa,
          e.step,
          locate ? 'full' : 'severity',
        )
      : undefined;
  return {
    severity: bulk.rank === 2 ? (det?.severity ?? 'danger') : 'warning',
    code: 'flammable-fill-path',
    step: e.step,
    source: e.sourceId,
    detonable: bulk.rank === 2,
    inertFraction: w.assessment.point.inert,
    fromPa: bulk.flammablePa![0],
    toPa: bulk.flammablePa![1],
    ...(bulk.detonable.length
      ? {
          detonableFromPa: bulk.detonable[0].pressurePa,
          detonableToPa: bulk.detonable[bulk.detonable.length - 1].pressurePa,
        }
      : {}),
    ...flammabilityNumbers(w.assessment, w.pressurePa),
    ...(det
      ? {
          detonationAtPa: det.pressurePa,
          basis: det.basis,
          undiluted: det.undiluted,
          phi: det.phi,
          phiLow: det.phiLow,
          phiHigh: det.phiHigh,
          limitSources: det.limitSources,
          cjPa: det.cjPa,
          cjK: det.cjK,
          cjVelocityMPerS: det.cjVelocityMPerS,
          reflectedPa: det.reflectedPa,
          limitPa: det.limitPa,
          cjMissing: det.cjMissing,
        }
      : {}),
  };
}

/**
 * Findings of a fill's path: a bulk path that is flammable (or detonable) where
 * neither end state is is judged like such a state, at its worst point; a flammable
 * stretch that reaches above every flammable end state gets its closed-vessel pressure at
 * its top (closedVesselOfPath); an inlet that is flammable where neither the bulk path nor
 * the end states are is a warning.
 * `locate` false bisects the boundaries 4 times instead of 9 and judges a detonable stretch
 * for its severity alone (the order search needs the severities, not the exact pressure range
 * or the CJ numbers). `judge` false leaves a detonable stretch unjudged: a danger without its
 * detonation numbers (a search that only asks whether a fill has a hazard).
 */
export function reviewFillPath(e: FillEvent, ctx: SafetyContext, locate = true, judge = true): Finding[] {
  const out: Finding[] = [];
  const bulk = reviewBulkPath(e, ctx.temperatureK, locate);
  if (!bulk) return out;
  const ends = Math.max(bulk.ranks.start, bulk.ranks.end);
  if (bulk.rank > ends) out.push(crossingFinding(e, bulk, ctx, locate, judge));
  // a crossing's closed-vessel figure in the full review only (`locate`): the order searches score a
  // crossing by flammable-fill-path, as before
  const cv = closedVesselOfPath(e, bulk, ctx, locate);
  if (cv) out.push(cv);
  if (bulk.rank > 0) return out;
  // inside the data's uncertainty margin on the way, where neither end state is (those say it themselves)
  const m = bulk.withinMargin;
  if (m && !bulk.endsWithinMargin)
    out.push({
      severity: 'warning',
      code: 'near-flammable-fill-path',
      step: e.step,
      source: e.sourceId,
      ...flammabilityNumbers(m.assessment, m.pressurePa),
    });
  const inlet = reviewInlet(e, ctx.temperatureK, locate);
  if (inlet && inlet.rank > 0) {
    const w = inlet.worst;
    out.push({
      severity: 'warning',
      code: 'flammable-at-inlet',
      step: e.step,
      source: e.sourceId,
      incomingShare: w.u,
      ...flammabilityNumbers(w.assessment, w.pressurePa),
    });
  }
  return out;
}
