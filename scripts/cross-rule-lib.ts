// Calibration of the cross-B combining rule on the pairs the reference library fits to mixture data
// (src/core/data/cross-virial-reference.json: the virial-consistent pairs, and the composition-averaged
// ones whose spread is small). Fits the rule's extra k_ij (one for all classical pairs, one added for
// pairs with CO2) and the rule's relative standard uncertainty, both validated by leaving each pair out.
// Used by scripts/accuracy.ts (prints it) and tests/core/virial-rule.test.ts (asserts the coverage).
import table from '../src/core/data/cross-virial-reference.json' with { type: 'json' };
import { getSpecies } from '../src/core/index.js';
import {
  correlationConstants,
  crossRuleLowTFactor,
  pairConstants,
  sizeDifferenceKij,
  tsonopoulosB,
} from '../src/core/virial.js';

interface Entry {
  a: string;
  b: string;
  B: number[];
  B_u?: number[];
}
export interface CalPair {
  key: string;
  a: string;
  b: string;
  co2: boolean;
  points: {
    T: number;
    ref: number;
    uRef: number;
    kSize: number;
    ca: ReturnType<typeof correlationConstants>;
    cb: ReturnType<typeof correlationConstants>;
  }[];
}

/** temperatures of the calibration, K: the record's range */
export const CAL_T = table.temperatures_K.filter((t) => t >= 250 && t <= 350);
/** a composition-averaged pair enters the calibration only when its spread is below max(3 cm3/mol, 5 %) */
const AVG_ADMIT = { absolute: 3, relative: 0.05 };

export function calibrationPairs(): CalPair[] {
  const all = [
    ...Object.entries(table.pairs as Record<string, Entry>),
    ...Object.entries(table.averaged as Record<string, Entry>),
  ];
  const out: CalPair[] = [];
  for (const [key, e] of all) {
    const A = getSpecies(e.a);
    const B = getSpecies(e.b);
    // the rule is calibrated for classical gases; quantum gases and hydrogen-bonding species are outside it
    if (
      A.quantum ||
      B.quantum ||
      ['alkanol', 'methanol', 'water'].includes(A.polarClass) ||
      ['alkanol', 'methanol', 'water'].includes(B.polarClass)
    )
      continue;
    const points: CalPair['points'] = [];
    let admit = true;
    for (const T of CAL_T) {
      const t = table.temperatures_K.indexOf(T);
      const uRef = e.B_u ? e.B_u[t] : 0;
      if (uRef > Math.max(AVG_ADMIT.absolute, AVG_ADMIT.relative * Math.abs(e.B[t]))) admit = false;
      const ca = correlationConstants(A, T);
      const cb = correlationConstants(B, T);
      points.push({ T, ref: e.B[t], uRef, kSize: sizeDifferenceKij(ca, cb), ca, cb });
    }
    if (admit) out.push({ key, a: e.a, b: e.b, co2: e.a === 'CO2' || e.b === 'CO2', points });
  }
  return out;
}

function ruleB(p: CalPair['points'][number], k: number): number {
  return tsonopoulosB(pairConstants(p.ca, p.cb, p.kSize + k), p.T) * 1e6;
}

/** least-squares extra k_ij (relative deviations) over a set of pairs, by golden-section search in [-0.1, 0.3] */
function fitK(pairs: readonly CalPair[], base = 0): number {
  if (!pairs.length) return 0;
  const cost = (k: number) =>
    pairs.reduce(
      (s, q) => s + q.points.reduce((t, p) => t + ((ruleB(p, base + k) - p.ref) / p.ref) ** 2, 0),
      0,
    );
  let lo = -0.1;
  let hi = 0.3;
  const g = (Math.sqrt(5) - 1) / 2;
  for (let i = 0; i < 60; i++) {
    const m1 = hi - g * (hi - lo);
    const m2 = lo + g * (hi - lo);
    if (cost(m1) < cost(m2)) hi = m2;
    else lo = m1;
  }
  return (lo + hi) / 2;
}

export interface RuleFit {
  general: number;
  co2: number;
}
export function fitRule(pairs: readonly CalPair[]): RuleFit {
  const general = fitK(pairs.filter((p) => !p.co2));
  return {
    general,
    co2: fitK(
      pairs.filter((p) => p.co2),
      general,
    ),
  };
}

/**
 * the worst ratio over temperature of |rule - reference| to sqrt(u_rule^2 + u_ref^2),
 * with u_rule = max(abs, rel |B|)
 */
function zOf(q: CalPair, fit: RuleFit, rel: number, absCm3: number): number {
  let z = 0;
  for (const p of q.points) {
    const v = ruleB(p, fit.general + (q.co2 ? fit.co2 : 0));
    const u = Math.hypot(
      Math.max(absCm3, rel * crossRuleLowTFactor(Math.sqrt(p.ca.Tc * p.cb.Tc), p.T) * Math.abs(v)),
      p.uRef,
    );
    z = Math.max(z, Math.abs(v - p.ref) / u);
  }
  return z;
}

/**
 * in-sample share of the pairs the calibrated u must put within 2u: set above 95 % so that
 * leave-one-out reaches 95 %
 */
export const CAL_QUANTILE = 0.975;
/** the least relative u (with the given absolute floor) that puts at least CAL_QUANTILE of the pairs within 2u */
function calibrateRel(pairs: readonly CalPair[], fit: RuleFit, absCm3: number): number {
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 50; i++) {
    const mid = (lo + hi) / 2;
    const covered = pairs.filter((q) => zOf(q, fit, mid, absCm3) <= 2).length;
    if (covered >= CAL_QUANTILE * pairs.length) hi = mid;
    else lo = mid;
  }
  return hi;
}

export interface Calibration {
  fit: RuleFit;
  relative: number;
  pairs: number;
  /** leave-one-out: each pair judged by the fit and u calibrated on the others */
  looCovered: number;
  looMissed: string[];
  /** per pair: worst |dev|/u over 250-350 K, leave-one-out */
  looZ: Record<string, number>;
}

export function calibrate(absCm3: number): Calibration {
  const pairs = calibrationPairs();
  const fit = fitRule(pairs);
  const relative = calibrateRel(pairs, fit, absCm3);
  const looZ: Record<string, number> = {};
  const looMissed: string[] = [];
  for (const q of pairs) {
    const others = pairs.filter((p) => p !== q);
    const f = fitRule(others);
    const r = calibrateRel(others, f, absCm3);
    looZ[q.key] = zOf(q, f, r, absCm3);
    if (looZ[q.key] > 2) looMissed.push(q.key);
  }
  return {
    fit,
    relative,
    pairs: pairs.length,
    looCovered: (pairs.length - looMissed.length) / pairs.length,
    looMissed,
    looZ,
  };
}
