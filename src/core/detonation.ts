/**
 * Detonation: whether a tank state can detonate (published detonation limits where they
 * exist, the conservative inert rule elsewhere), and the Chapman-Jouguet state on the
 * equilibrium Hugoniot with the reflected pressure.
 */
import type { Fractions } from './composition.js';
import { diagramPoint } from './flammability.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { equilibriumWorkspace } from './equilibrium.js';
import { rootNear } from './root-increasing.js';
import { fail } from './problems.js';
import { DETONATION_LIMITS, type DetonationLimits } from './data/detonation-data.js';
import {
  DETONABLE_INERT_BELOW,
  DETONABLE_OXYGEN_SHARE_FROM,
  PURE_OXYGEN_SHARE_FROM,
  REFLECTED_OVER_CJ,
  UNDILUTED_INERT_BELOW,
} from './thresholds.js';

/** O2 share of air on the N2-equivalent diagram */
const AIR_O2 = 0.21;

export interface ChapmanJouguet {
  readonly pressurePa: number;
  readonly temperatureK: number;
  /** detonation velocity, m/s */
  readonly velocityMPerS: number;
  /** rho_CJ / rho_1 */
  readonly densityRatio: number;
  /** about 2.5 x P_CJ: a detonation reflected at a closed end (common practice) */
  readonly reflectedPa: number;
}

const cjCache = new Map<string, ChapmanJouguet>();

/**
 * how closely the CJ state is located: the density ratio (Brent's minimisation) and each
 * Hugoniot temperature (K). 'quick' is for a severity that is clearly on one side of a limit
 * (explosion-review.ts): its reflected pressure is within 1e-3 relative of the full one on the
 * reference states (tests/core/detonation-quick.test.ts).
 */
const CJ_PRECISION = {
  full: { ratio: 1e-5, temperatureK: 1e-5 },
  quick: { ratio: 1e-2, temperatureK: 0.05 },
} as const;
export type CjPrecision = keyof typeof CJ_PRECISION;

/** Brent's minimisation (golden section with parabolic steps) of a unimodal f on [a, b], to tolerance tol in x */
function minimise(f: (x: number) => number, a: number, b: number, tol: number): number {
  const g = 0.3819660112501051;
  let x = a + g * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let it = 0; it < 100; it++) {
    const m = (a + b) / 2;
    const tol1 = tol / 3 + 1e-10 * Math.abs(x);
    if (Math.abs(x - m) <= 2 * tol1 - (b - a) / 2) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (a - x) && p < q * (b - x)) {
        e = d;
        d = p / q;
        const u = x + d;
        if (u - a < 2 * tol1 || b - u < 2 * tol1) d = x < m ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = (x < m ? b : a) - x;
      d = g * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      [v, fv, w, fw, x, fx] = [w, fw, x, fx, u, fu];
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        [v, fv, w, fw] = [w, fw, u, fu];
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return x;
}

/**
 * Chapman-Jouguet detonation state by the minimum-velocity condition on the equilibrium
 * Hugoniot (Fickett & Davis, Detonation, 1979, ch. 2): for a density ratio r = rho2/rho1
 * the equilibrium state (T2, v2 = v1/r) satisfies h2 - h1 = (P2 - P1)(v1 + v2)/2, the
 * wave speed is w1^2 = (P2 - P1)/(rho1^2 (v1 - v2)), and the CJ state is the r that
 * minimises w1 (the Rayleigh line tangent to the Hugoniot, where the products move at
 * the equilibrium sound speed). Brent's minimisation in r over 1.1-3.2 (`precision`: how
 * closely, CJ_PRECISION).
 * y: initial mole fractions; temperatureK, pressurePa: initial state. Ideal gas.
 * Example: chapmanJouguet({ H2: 0.42 / 1.42, O2: 0.21 / 1.42, N2: 0.79 / 1.42 }, 298.15, 1e5)
 *   -> { pressurePa: 15.58 bar, temperatureK: 2944 K, velocityMPerS: 1969 m/s } (stoichiometric H2-air from
 *   1 bar; Cantera 3.2.0 on the same data, tests/fixtures/reference/equilibrium-cantera.json).
 * Refuses (ProblemError) species without equilibrium data and states without a Hugoniot
 * in range (too little fuel to burn).
 */
export function chapmanJouguet(
  y: Fractions,
  temperatureK: number,
  pressurePa: number,
  precision: CjPrecision = 'full',
): ChapmanJouguet {
  const tol = CJ_PRECISION[precision];
  const key = `${precision}|${temperatureK.toPrecision(12)}|${pressurePa.toPrecision(12)}|${Object.entries(y)
    .filter(([, v]) => v > 0)
    .sort(([a], [b]) => (a < b ? -1 : 1))
    .map(([k, v]) => `${k}:${v.toPrecision(12)}`)
    .join(',')}`;
  const hit = cjCache.get(key);
  if (hit) return hit;
  const ws = equilibriumWorkspace(y, temperatureK, pressurePa);
  const { h0, v0, massKg } = ws;
  let tGuess = 2500;
  let firstStep = 100;
  // the last two Hugoniot points, for a linear guess of the next one's temperature
  let last: { r: number; t: number } | undefined;
  let before: { r: number; t: number } | undefined;
  const done = new Map<number, { w2: number; t: number; p2: number }>();
  const hugoniot = (r: number) => {
    const known = done.get(r);
    if (known) return known;
    const v2 = v0 / r;
    // the pressure at the last temperature tried: the root is often that point
    let seen = { t: NaN, p: NaN };
    const f = (t: number) => {
      const s = ws.at(t, v2);
      seen = { t, p: s.pressurePa };
      return s.enthalpyJ - h0 - 0.5 * (s.pressurePa - pressurePa) * (v0 + v2);
    };
    let t: number | undefined;
    if (last && before && last.r !== before.r) {
      // the Hugoniot temperature is smooth in r: from the line through the last two points
      const guess = last.t + ((last.t - before.t) / (last.r - before.r)) * (r - last.r);
      t = rootNear(f, temperatureK, 6000, guess, tol.temperatureK, 1);
    } else t = rootNear(f, temperatureK, 6000, tGuess, tol.temperatureK, firstStep);
    if (t === undefined)
      return fail({
        code: 'equilibrium-not-converged',
        what: `detonation Hugoniot at density ratio ${r.toFixed(3)} (too little fuel, or beyond 6000 K)`,
      });
    // the next density ratio is close: its Hugoniot temperature is within a few tens of kelvin
    firstStep = Math.max(1, Math.min(100, Math.abs(t - tGuess) * 1.5));
    tGuess = t;
    before = last;
    last = { r, t };
    const p2 = t === seen.t ? seen.p : ws.at(t, v2).pressurePa;
    const out = { w2: ((p2 - pressurePa) * v0 * v0) / (massKg * (v0 - v2)), t, p2 };
    done.set(r, out);
    return out;
  };
  const r = minimise((x) => hugoniot(x).w2, 1.1, 3.2, tol.ratio);
  const h = hugoniot(r);
  const out = {
    pressurePa: h.p2,
    temperatureK: h.t,
    velocityMPerS: Math.sqrt(h.w2),
    densityRatio: r,
    reflectedPa: REFLECTED_OVER_CJ * h.p2,
  };
  if (cjCache.size > 500) cjCache.clear();
  cjCache.set(key, out);
  return out;
}

export interface Detonability {
  readonly detonable: boolean;
  /** published detonation limits, or the conservative inert rule where none are published */
  readonly basis: 'published-limits' | 'inert-rule';
  /** fuel and oxidizer with less than 10 % N2-equivalent inert */
  readonly undiluted: boolean;
  /** N2-equivalent inert share of the state (ISO 10156 coefficients) */
  readonly inertFraction: number;
  /** equivalence ratio on the N2-equivalent diagram */
  readonly phi: number;
  /** O2 share of the oxidizer + inert, 0.21 for air, 1 for pure O2 */
  readonly oxygenShare: number;
  /** the limits applied, as equivalence ratios, with the records they came from */
  readonly limits?: {
    readonly phiLow: number;
    readonly phiHigh: number;
    readonly records: readonly DetonationLimits[];
  };
}

function phiOf(rec: DetonationLimits, x: number): number {
  const z = oxygenDemand(getSpecies(rec.fuel).elements);
  const o2 = rec.oxidizer === 'air' ? AIR_O2 * (1 - x) : 1 - x;
  return (z * x) / o2;
}

/**
 * Can this state detonate? The one entry point for every state and every point along a
 * fill path; call it for states the flammability review finds flammable.
 * Published limits (data/detonation-data.ts) are used for a single fuel (99 % of the
 * fuel or more) that has them: each limit is turned into an equivalence ratio, the
 * air and O2 ratios are interpolated linearly in the O2 share of the oxidizer+inert
 * s = O2/(O2 + N2-equivalent inert) between s = 0.21 and 1, and below air's share the
 * air limits are kept (dilution only narrows detonation limits: conservative). A fuel
 * with limits in O2 only is judged by them; inside them, an oxidizer of O2 with at most a
 * trace of inert (O2 share PURE_OXYGEN_SHARE_FROM or more: ppm of cylinder N2) is detonable
 * by those limits, and O2 diluted further by the inert rule.
 * Elsewhere the conservative rule: detonable when the N2-equivalent inert share is below
 * 50 %, or the oxidizer is about as rich in O2 as air or richer (O2 share 0.20 or more;
 * both thresholds in thresholds.ts; stoichiometric alkane-air mixtures detonate in large
 * geometries, common practice). Limits are those near 1 atm; they widen at higher pressure
 * and in larger vessels.
 * Example: detonability({ H2: 0.42 / 1.42, O2: 0.21 / 1.42, N2: 0.79 / 1.42 }).detonable -> true
 *   (stoichiometric H2-air, 29.6 % H2, inside the published limits 18.3-59 %, Lewis & von Elbe 1987, from memory).
 * Example: detonability({ H2: 0.7, O2: 0.063, N2: 0.237 }).detonable -> false (70 % H2 in air, above 59 %).
 */
export function detonability(y: Fractions): Detonability {
  const { point, fuelBlend } = diagramPoint(y);
  let z = 0;
  for (const [k, w] of Object.entries(fuelBlend)) z += w * oxygenDemand(getSpecies(k).elements);
  const phi = point.oxygen > 0 ? (z * point.fuel) / point.oxygen : Infinity;
  const oxygenShare = point.oxygen + point.inert > 0 ? point.oxygen / (point.oxygen + point.inert) : 0;
  const undiluted = point.inert < UNDILUTED_INERT_BELOW;
  const base = { inertFraction: point.inert, phi, oxygenShare, undiluted };
  const byRule = point.inert < DETONABLE_INERT_BELOW || oxygenShare >= DETONABLE_OXYGEN_SHARE_FROM;
  const rule = (): Detonability => ({
    ...base,
    detonable: point.fuel > 0 && point.oxygen > 0 && byRule,
    basis: 'inert-rule',
  });
  const main = Object.entries(fuelBlend).find(([, w]) => w >= 0.99)?.[0];
  if (!main) return rule();
  const inAir = DETONATION_LIMITS.find((r) => r.fuel === main && r.oxidizer === 'air');
  const inO2 = DETONATION_LIMITS.find((r) => r.fuel === main && r.oxidizer === 'O2');
  if (!inO2 && !inAir) return rule();
  let phiLow: number;
  let phiHigh: number;
  let records: DetonationLimits[];
  if (inAir && inO2) {
    const w = Math.min(1, Math.max(0, (oxygenShare - AIR_O2) / (1 - AIR_O2)));
    phiLow = (1 - w) * phiOf(inAir, inAir.low.value) + w * phiOf(inO2, inO2.low.value);
    phiHigh = (1 - w) * phiOf(inAir, inAir.high.value) + w * phiOf(inO2, inO2.high.value);
    records = [inAir, inO2];
  } else {
    const r = (inO2 ?? inAir)!;
    phiLow = phiOf(r, r.low.value);
    phiHigh = phiOf(r, r.high.value);
    records = [r];
  }
  const inside = phi >= phiLow && phi <= phiHigh;
  const limits = { phiLow, phiHigh, records };
  if (!inside) return { ...base, detonable: false, basis: 'published-limits', limits };
  // limits in O2 only: they hold for O2 with a trace of inert at most; for O2 diluted further the
  // conservative rule decides inside them, and says so
  const byLimits = Boolean(inAir) || oxygenShare >= PURE_OXYGEN_SHARE_FROM;
  if (!byLimits && !byRule) return { ...base, detonable: false, basis: 'inert-rule', limits };
  return {
    ...base,
    detonable: point.fuel > 0 && point.oxygen > 0,
    basis: byLimits ? 'published-limits' : 'inert-rule',
    limits,
  };
}
