/**
 * The inverse model: from logged cumulative readings to the composition the tank
 * holds. For each reading k (absolute pressure P_k at tank temperature T_k):
 *   solve rho_k from P_k = rho R T_k (1 + B_mix(y_k) rho + C_mix(y_k) rho^2),
 *   y_k = (n_(k-1) + (rho_k - rho_(k-1)) w_k) / rho_k   (fixed point),
 * amounts per unit volume n as differences, the source's composition w_k (purity and
 * impurities) added. The tank volume cancels. Pure arithmetic on arrays, so the Monte
 * Carlo loop can call it a million times.
 */
import { R } from './constants.js';
import type { Fractions } from './composition.js';
import type { GasSource } from './supply.js';
import { virialModel, type VirialModel } from './mixture-eos.js';
import { VIRIAL_TABLE_RANGE_K } from './virial-reference.js';
import { fail } from './problems.js';

export interface InverseSetup {
  readonly species: readonly string[];
  /** per reading: the source's EOS composition (unidentified counted as its main gas), length S */
  readonly wEos: readonly Float64Array[];
  /** per reading: the identified composition, length S, and the unidentified share */
  readonly wId: readonly Float64Array[];
  readonly unidentified: readonly number[];
  /** per reading: B matrix (S x S, row-major) and its temperature derivative, at the reading's T */
  readonly B: readonly Float64Array[];
  readonly dBdT: readonly Float64Array[];
  readonly C: readonly Float64Array[];
  /** cube roots of C, for the mixing rule */
  readonly cbrtC: readonly Float64Array[];
  /** per reading: 3 (C_iij - cube-root rule) of the tabulated pairs, S x S row-major (i twice, j once), else 0 */
  readonly cPairs: readonly Float64Array[];
  readonly temperaturesK: readonly number[];
  /** gas already in the tank: amounts per species per unit volume are solved from its reading */
  readonly initial?: {
    readonly y: Float64Array;
    readonly pressurePa: number;
    readonly temperatureK: number;
    readonly B: Float64Array;
    readonly cbrtC: Float64Array;
    readonly cPairs: Float64Array;
  };
  /** index of each reading's main identified species */
  readonly main: readonly number[];
  readonly model: VirialModel;
}

export interface ReadingInput {
  readonly source: GasSource;
  readonly pressurePa: number;
  readonly temperatureK: number;
}

/**
 * @param major per setup species: 1e-4 or more in some source. Third-virial pair terms of a trace
 * species (below 1e-4) change C_mix by at most 3e-4 dC, under 1e-7 in Z at 10 bar, and are left
 * out of the array model, which the Monte Carlo runs a million times.
 */
function matrixOf(
  m: VirialModel,
  idx: readonly number[],
  S: number,
  major: readonly boolean[],
): { B: Float64Array; C: Float64Array; cPairs: Float64Array } {
  const B = new Float64Array(S * S);
  const C = new Float64Array(S);
  for (let i = 0; i < S; i++) {
    C[i] = m.C[idx[i]];
    for (let j = 0; j < S; j++) B[i * S + j] = m.B[idx[i]][idx[j]];
  }
  const cPairs = new Float64Array(S * S);
  for (const p of m.cPairs) {
    const i = idx.indexOf(p.i);
    const j = idx.indexOf(p.j);
    if (major[i] && major[j]) cPairs[i * S + j] = 3 * p.delta;
  }
  return { B, C, cPairs };
}

export function inverseSetup(
  readings: readonly ReadingInput[],
  initial?: { composition: Fractions; pressurePa: number; temperatureK: number },
): InverseSetup {
  const set = new Set<string>();
  for (const r of readings) for (const k of Object.keys(r.source.composition)) set.add(k);
  for (const k of Object.keys(initial?.composition ?? {})) set.add(k);
  const species = [...set];
  const S = species.length;
  const major = species.map(
    (k) =>
      readings.some((r) => (r.source.composition[k] ?? 0) >= 1e-4) || (initial?.composition[k] ?? 0) >= 1e-4,
  );
  // the readings of a plan share one temperature: each temperature's matrices are made once (read only)
  const atT = new Map<number, { m: VirialModel; B: Float64Array; C: Float64Array; cPairs: Float64Array }>();
  const at = (T: number) => {
    let r = atT.get(T);
    if (!r) {
      const m = virialModel(species, T);
      const idx = species.map((k) => m.species.indexOf(k));
      r = { m, ...matrixOf(m, idx, S, major) };
      atT.set(T, r);
    }
    return r;
  };
  const wEos: Float64Array[] = [];
  const wId: Float64Array[] = [];
  const B: Float64Array[] = [];
  const dBdT: Float64Array[] = [];
  const C: Float64Array[] = [];
  const cPairs: Float64Array[] = [];
  let model: VirialModel | undefined;
  for (const r of readings) {
    const e = new Float64Array(S);
    const id = new Float64Array(S);
    for (const [k, v] of Object.entries(r.source.composition)) {
      id[species.indexOf(k)] = v;
      e[species.indexOf(k)] = v;
    }
    e[species.indexOf(r.source.mainSpecies)] += r.source.unidentified;
    wEos.push(e);
    wId.push(id);
    // dB/dT by a central difference that stays on one side of the reference tables' edges, so that
    // it never mixes a tabulated value with a correlation's
    const h = 0.5;
    const t = r.temperatureK;
    const { min, max } = VIRIAL_TABLE_RANGE_K;
    const side = (x: number) => (x < min ? -1 : x > max ? 1 : 0);
    const tUp = side(t + h) === side(t) ? t + h : side(t) === 0 ? max : t; // never across an edge
    const tDn = side(t - h) === side(t) ? t - h : side(t) === 0 ? min : t;
    const here = at(t);
    const up = at(tUp);
    const dn = at(tDn);
    model ??= here.m;
    B.push(here.B);
    C.push(here.C);
    cPairs.push(here.cPairs);
    const d = new Float64Array(S * S);
    for (let i = 0; i < S * S; i++) d[i] = (up.B[i] - dn.B[i]) / (tUp - tDn);
    dBdT.push(d);
  }
  let init: InverseSetup['initial'];
  if (initial) {
    const y = new Float64Array(S);
    for (const [k, v] of Object.entries(initial.composition)) y[species.indexOf(k)] = v;
    const here = at(initial.temperatureK);
    init = {
      y,
      pressurePa: initial.pressurePa,
      temperatureK: initial.temperatureK,
      B: here.B,
      cbrtC: here.C.map(Math.cbrt),
      cPairs: here.cPairs,
    };
  }
  return {
    species,
    wEos,
    wId,
    unidentified: readings.map((r) => r.source.unidentified),
    B,
    dBdT,
    C,
    cbrtC: C.map((c) => c.map(Math.cbrt)),
    cPairs,
    temperaturesK: readings.map((r) => r.temperatureK),
    initial: init,
    main: wId.map((w) => {
      let m = 0;
      for (let i = 1; i < S; i++) if (w[i] > w[m]) m = i;
      return m;
    }),
    model: model ?? virialModel(species, 298.15),
  };
}

/** perturbations the uncertainty evaluation applies; all zero for the nominal result */
export interface Perturbation {
  /** absolute pressure of each reading, Pa */
  readonly pressurePa: ArrayLike<number>;
  /** temperature of each reading, K */
  readonly temperatureK: ArrayLike<number>;
  /** change of every B_ij, m3/mol (S x S, row-major; keep it symmetric) */
  readonly bAbsolute?: ArrayLike<number>;
  /** change of each reading's main-gas share (purity), absolute */
  readonly purity?: ArrayLike<number>;
  /** change of each reading's source composition (K x S, row-major), mole fractions; sums to 0 per reading */
  readonly composition?: ArrayLike<number>;
}

export interface InverseResult {
  /** mole fractions of the identified species (normalised over them), same order as setup.species */
  readonly x: Float64Array;
  readonly unidentified: number;
  /** molar density after each reading, mol/m3 */
  readonly rho: Float64Array;
  /** amount of each species per unit volume after the last reading (EOS bookkeeping), mol/m3 */
  readonly amounts: Float64Array;
}

/** what solveRho needs: the reading, the gas before it, the source and the mixture's coefficients */
export interface RhoProblem {
  /** absolute pressure of the reading, Pa */
  readonly pressurePa: number;
  readonly temperatureK: number;
  /** amounts per unit volume before the fill, mol/m3 (length S) */
  readonly nPrev: Float64Array;
  /** molar density before the fill, mol/m3 */
  readonly rhoPrev: number;
  /** the source's EOS composition (length S) */
  readonly w: Float64Array;
  /** B matrix at the reading (S x S, row-major, perturbations applied), m3/mol */
  readonly B: Float64Array;
  /** cube roots of C_ii, and the pair departures of the mixing rule (mixture-eos cMixOf) */
  readonly cbrtC: Float64Array;
  readonly cPairs: Float64Array;
  /** scratch and result: the mixture's composition after the fill (length S) */
  readonly y: Float64Array;
  /** density to start from, mol/m3 (the nominal result in a Monte Carlo loop); else ideal gas */
  readonly start?: number;
}

/** iterations of Newton's method on the density, and its relative tolerance on rho */
const RHO_ITERATIONS = 30;
const RHO_TOLERANCE = 1e-13;

/**
 * The density after a fill: rho solves P = rho R T (1 + B_mix(y) rho + C_mix(y) rho^2) with
 * y = n / rho and n = n_prev + (rho - rho_prev) w, the amounts per volume. Written in n, the
 * virial terms are polynomials in rho: B_mix rho^2 = n^T B n is quadratic (mixture-eos bMixOf's
 * upper-triangle rule), C_mix rho^3 = (sum_i n_i C_ii^(1/3))^3 + sum_(i<j) n_i n_j (n_i dC_iij +
 * n_j dC_jji) is cubic (cMixOf's rule), so P(rho) / (R T) is a cubic whose coefficients are made
 * once; Newton's method on it (quadratic convergence) stops when a step is within 1e-13 of rho.
 * Raises `not-converged` after 30 steps (no gas root: P above the series' maximum).
 */
export function solveRho(q: RhoProblem): number {
  const S = q.w.length;
  const { y, w, nPrev, rhoPrev, B, cbrtC, cPairs } = q;
  const P = q.pressurePa;
  const rt = R * q.temperatureK;
  // n_i(rho) = a_i + rho w_i; k[m] is the coefficient of rho^m of P / (R T) - rho
  let k0 = 0;
  let k1 = 0;
  let k2 = 0;
  let k3 = 0;
  let alpha = 0;
  let beta = 0;
  for (let i = 0; i < S; i++) {
    const ai = nPrev[i] - rhoPrev * w[i];
    const wi = w[i];
    alpha += ai * cbrtC[i];
    beta += wi * cbrtC[i];
    const bii = B[i * S + i];
    k0 += bii * ai * ai;
    k1 += 2 * bii * ai * wi;
    k2 += bii * wi * wi;
    for (let j = i + 1; j < S; j++) {
      const aj = nPrev[j] - rhoPrev * w[j];
      const wj = w[j];
      const bij = 2 * B[i * S + j];
      k0 += bij * ai * aj;
      k1 += bij * (ai * wj + aj * wi);
      k2 += bij * wi * wj;
      // n_i^2 n_j dC_iij + n_i n_j^2 dC_jji (cPairs holds 3 dC at [i][j] and [j][i])
      const pij = cPairs[i * S + j];
      const pji = cPairs[j * S + i];
      if (pij !== 0) {
        k0 += pij * ai * ai * aj;
        k1 += pij * (ai * ai * wj + 2 * ai * wi * aj);
        k2 += pij * (2 * ai * wi * wj + wi * wi * aj);
        k3 += pij * wi * wi * wj;
      }
      if (pji !== 0) {
        k0 += pji * aj * aj * ai;
        k1 += pji * (aj * aj * wi + 2 * aj * wj * ai);
        k2 += pji * (2 * aj * wj * wi + wj * wj * ai);
        k3 += pji * wj * wj * wi;
      }
    }
  }
  let r = q.start !== undefined && q.start > rhoPrev ? q.start : P / rt;
  let change = Infinity;
  for (let it = 0; it < RHO_ITERATIONS; it++) {
    const c = alpha + beta * r;
    const f = rt * (r + k0 + r * (k1 + r * (k2 + r * k3)) + c * c * c) - P;
    const df = rt * (1 + k1 + r * (2 * k2 + 3 * r * k3) + 3 * beta * c * c);
    const step = f / df;
    r -= step;
    change = Math.abs(step) / Math.abs(r);
    if (change <= RHO_TOLERANCE) {
      const d = r - rhoPrev;
      for (let i = 0; i < S; i++) y[i] = (nPrev[i] + d * w[i]) / r;
      return r;
    }
  }
  return fail({
    code: 'not-converged',
    computation: 'density after a fill (re-check)',
    iterations: RHO_ITERATIONS,
    residual: change,
    tolerance: RHO_TOLERANCE,
  });
}

/** scratch arrays, so that a Monte Carlo loop allocates nothing per trial */
export interface Workspace {
  readonly n: Float64Array;
  readonly nId: Float64Array;
  readonly y: Float64Array;
  readonly w: Float64Array;
  readonly x: Float64Array;
  readonly rho: Float64Array;
  readonly zero: Float64Array;
  /** the B matrix of one reading with its temperature and virial perturbations applied */
  readonly Beff: Float64Array;
}

export function workspaceFor(setup: InverseSetup): Workspace {
  const S = setup.species.length;
  const K = setup.wEos.length;
  return {
    n: new Float64Array(S),
    nId: new Float64Array(S),
    y: new Float64Array(S),
    w: new Float64Array(S),
    x: new Float64Array(S),
    rho: new Float64Array(K),
    zero: new Float64Array(S),
    Beff: new Float64Array(S * S),
  };
}

/**
 * @param start densities to start the iteration from (the nominal result, in a Monte Carlo loop)
 */
export function invertReadings(
  setup: InverseSetup,
  p?: Perturbation,
  nominalP?: readonly number[],
  ws: Workspace = workspaceFor(setup),
  start?: Float64Array,
): InverseResult {
  const S = setup.species.length;
  const K = setup.wEos.length;
  const { n, nId, y, w, rho: rhoOut } = ws;
  n.fill(0);
  nId.fill(0);
  let rhoPrev = 0;
  let unid = 0;
  if (setup.initial) {
    const i0 = setup.initial;
    const r0 = solveRho({
      pressurePa: i0.pressurePa,
      temperatureK: i0.temperatureK,
      nPrev: ws.zero,
      rhoPrev: 0,
      w: i0.y,
      B: i0.B,
      cbrtC: i0.cbrtC,
      cPairs: i0.cPairs,
      y,
    });
    for (let i = 0; i < S; i++) {
      n[i] = r0 * i0.y[i];
      nId[i] = n[i];
    }
    rhoPrev = r0;
  }
  for (let k = 0; k < K; k++) {
    const P = p ? p.pressurePa[k] : nominalP![k];
    const T0 = setup.temperaturesK[k];
    const T = p ? p.temperatureK[k] : T0;
    const wk = setup.wEos[k];
    const dw = p?.composition;
    for (let i = 0; i < S; i++) w[i] = wk[i] + (dw ? dw[k * S + i] : 0);
    // a purity perturbation moves gas between the main species and the unidentified remainder;
    // the EOS composition already counts the remainder as main gas, so only the bookkeeping changes
    const dp = p?.purity?.[k] ?? 0;
    const Bk = setup.B[k];
    const dBk = setup.dBdT[k];
    const dT = T - T0;
    const bAbs = p?.bAbsolute;
    const Beff = ws.Beff;
    for (let i = 0; i < S * S; i++) Beff[i] = Bk[i] + dBk[i] * dT + (bAbs ? bAbs[i] : 0);
    const rho = solveRho({
      pressurePa: P,
      temperatureK: T,
      nPrev: n,
      rhoPrev,
      w,
      B: Beff,
      cbrtC: setup.cbrtC[k],
      cPairs: setup.cPairs[k],
      y,
      start: start?.[k],
    });
    const d = rho - rhoPrev;
    if (!(d > 0)) {
      return fail({ code: 'density-not-rising', reading: k + 1, pressurePa: P, inUncertainty: false });
    }
    const wid = setup.wId[k];
    const main = setup.main[k];
    for (let i = 0; i < S; i++) {
      n[i] += d * w[i];
      nId[i] += d * (wid[i] + (dw ? dw[k * S + i] : 0));
    }
    // the unidentified remainder, less what the purity perturbation moves into the main gas
    const u = Math.max(0, setup.unidentified[k] - dp);
    nId[main] += d * (setup.unidentified[k] - u);
    unid += d * u;
    rhoOut[k] = rho;
    rhoPrev = rho;
  }
  // normalised over the identified species, as the plan reports them; the unidentified share beside
  let identified = 0;
  for (let i = 0; i < S; i++) identified += nId[i];
  const x = ws.x;
  for (let i = 0; i < S; i++) x[i] = nId[i] / identified;
  return { x, unidentified: unid / (identified + unid), rho: rhoOut, amounts: n };
}
