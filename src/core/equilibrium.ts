/**
 * Ideal-gas chemical equilibrium by Gibbs (Helmholtz) energy minimisation, in the
 * element-potential form (W.C. Reynolds, "The element potential method for chemical
 * equilibrium analysis: implementation in the interactive program STANJAN", Stanford
 * ME 270 HO 7, 1986; S. Gordon & B.J. McBride, NASA RP-1311, 1994, ch. 2).
 *
 * At fixed T and V every gas species j follows from the element potentials lambda_i:
 *   n_j = exp(sum_i a_ij lambda_i - c_j),   c_j = g°_j/(RT) + ln(R T / (V P°)),  P° = 1 bar,
 * and the lambda_i maximise the concave dual D(lambda) = sum_i lambda_i b_i - sum_j n_j,
 * whose gradient is the element balance b_i - sum_j a_ij n_j: Newton on D with a line
 * search converges from any start. Graphite C(gr) is a condensed phase: present only
 * when the carbon potential would exceed g°_gr/(RT), and then lambda_C = g°_gr/(RT) and
 * n_gr = b_C - sum_j a_Cj n_j.
 * TV is the core; UV (closed vessel: iterate T on U), TP (iterate V on P) and HP
 * (iterate T on H at TP) are built on it. Species: every C/H/O/N/noble-gas species of
 * data/nasa7-thermo.json and data/nasa7-products.json (NASA TM-4513). Amounts are per
 * mole of initial mixture; ideal gas throughout (the virial correction is below 1 % at
 * combustion temperatures and tank pressures).
 */
import baseData from './data/nasa7-thermo.json' with { type: 'json' };
import productData from './data/nasa7-products.json' with { type: 'json' };
import { R } from './constants.js';
import { getSpecies } from './lookup.js';
import { fail } from './problems.js';
import { molarMassKgPerMol } from './formula.js';
import { closedVesselCombustion, completeCombustion, flameTemperatureK } from './combustion.js';
import type { Fractions } from './composition.js';

const P_REF = 1e5;
/** elements with a complete product set in the data */
const ELEMENTS = ['C', 'H', 'O', 'N', 'Ar', 'He', 'Ne', 'Kr', 'Xe'] as const;
const T_MAX_K = 6000;

interface Fit {
  readonly key: string;
  readonly atoms: Readonly<Record<string, number>>;
  readonly tMid: number;
  readonly low: readonly number[];
  readonly high: readonly number[];
}

interface RawFit {
  readonly composition: Record<string, number>;
  readonly temperatureRanges: readonly number[];
  readonly coefficients: readonly (readonly number[])[];
  readonly phase?: string;
}

function toFit(key: string, r: RawFit): Fit {
  const two = r.coefficients.length > 1;
  return {
    key,
    atoms: r.composition,
    tMid: two ? r.temperatureRanges[1] : Infinity,
    low: r.coefficients[0],
    high: r.coefficients[two ? 1 : 0],
  };
}

const allowed = new Set<string>(ELEMENTS);
const GAS_FITS: Fit[] = [];
let GRAPHITE: Fit | undefined;
for (const [k, r] of [
  ...Object.entries(baseData.species as Record<string, RawFit>),
  ...Object.entries(productData.species as Record<string, RawFit>),
]) {
  if (r.phase === 'solid') {
    if (k === 'C(gr)') GRAPHITE = toFit(k, r);
    continue;
  }
  if (Object.keys(r.composition).every((e) => allowed.has(e))) GAS_FITS.push(toFit(k, r));
}

/** h/(RT), s/R and cp/R of one fit (the polynomial is extrapolated outside its range; see the module note) */
function hsc(f: Fit, t: number, out: { h: number; s: number; cp: number }) {
  const a = t <= f.tMid ? f.low : f.high;
  out.cp = a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4])));
  out.h = a[0] + t * (a[1] / 2 + t * (a[2] / 3 + t * (a[3] / 4 + (t * a[4]) / 5))) + a[5] / t;
  out.s = a[0] * Math.log(t) + t * (a[1] + t * (a[2] / 2 + t * (a[3] / 3 + (t * a[4]) / 4))) + a[6];
}

/** the species and element matrix for one set of elements, built once */
interface System {
  readonly elements: readonly string[];
  readonly species: readonly Fit[];
  /** a[j * m + i] */
  readonly a: Float64Array;
  readonly carbon: number;
  readonly graphite: boolean;
}

const systems = new Map<string, System>();
function systemFor(elements: readonly string[]): System {
  const key = elements.join(',');
  const hit = systems.get(key);
  if (hit) return hit;
  const set = new Set(elements);
  const species = GAS_FITS.filter((f) => Object.keys(f.atoms).every((e) => set.has(e)));
  const m = elements.length;
  const a = new Float64Array(species.length * m);
  species.forEach((f, j) => elements.forEach((e, i) => (a[j * m + i] = f.atoms[e] ?? 0)));
  const sys = {
    elements,
    species,
    a,
    carbon: elements.indexOf('C'),
    graphite: set.has('C') && GRAPHITE !== undefined,
  };
  systems.set(key, sys);
  return sys;
}

/** species of y that the equilibrium cannot treat (no NASA data, or elements outside C/H/O/N/noble gases) */
export function equilibriumGaps(y: Fractions): string[] {
  const out: string[] = [];
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    const el = getSpecies(k).elements;
    const fit = GAS_FITS.some((f) => f.key === k);
    if (!fit || Object.keys(el).some((e) => !allowed.has(e))) out.push(k);
  }
  return out;
}

function elementTotals(y: Fractions): { elements: string[]; b: number[]; sum: number } {
  const gaps = equilibriumGaps(y);
  if (gaps.length) fail({ code: 'no-equilibrium-data', species: gaps });
  let sum = 0;
  for (const v of Object.values(y)) if (v > 0) sum += v;
  const tot = new Map<string, number>();
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    for (const [e, c] of Object.entries(getSpecies(k).elements))
      tot.set(e, (tot.get(e) ?? 0) + (c * v) / sum);
  }
  const elements = ELEMENTS.filter((e) => (tot.get(e) ?? 0) > 0);
  return { elements: [...elements], b: elements.map((e) => tot.get(e)!), sum };
}

/** an equilibrium state, per mole of initial mixture */
export interface EquilibriumState {
  readonly temperatureK: number;
  readonly pressurePa: number;
  /** volume per mole of initial mixture, m3/mol */
  readonly volumeM3: number;
  /** gas mole fractions (species above 1e-12) */
  readonly gas: Readonly<Record<string, number>>;
  /** gas moles per mole of initial mixture */
  readonly gasMol: number;
  /** graphite moles per mole of initial mixture (0 when it is not stable) */
  readonly graphiteMol: number;
  /** internal energy and enthalpy per mole of initial mixture, J */
  readonly internalEnergyJ: number;
  readonly enthalpyJ: number;
}

/** working state of one solve: element potentials are kept between calls (warm start) */
class Solver {
  readonly sys: System;
  readonly b: Float64Array;
  readonly lambda: Float64Array;
  readonly n: Float64Array;
  readonly g: Float64Array;
  readonly hRT: Float64Array;
  nGr = 0;
  gGr = 0;
  hGrRT = 0;
  started = false;
  private readonly tmp = { h: 0, s: 0, cp: 0 };
  // newton workspace, allocated once per solver
  private readonly H: Float64Array;
  private readonly grad: Float64Array;
  private readonly step: Float64Array;
  private readonly old: Float64Array;
  private readonly free: boolean[];
  private readonly work: SpdWork;
  private tCached = NaN;

  private readonly products: ReadonlyMap<string, number>;

  constructor(sys: System, b: readonly number[], products: ReadonlyMap<string, number>) {
    this.sys = sys;
    this.products = products;
    this.b = Float64Array.from(b);
    const m = sys.elements.length;
    const ns = sys.species.length;
    this.lambda = new Float64Array(m);
    this.n = new Float64Array(ns);
    this.g = new Float64Array(ns);
    this.hRT = new Float64Array(ns);
    this.H = new Float64Array(m * m);
    this.grad = new Float64Array(m);
    this.step = new Float64Array(m);
    this.old = new Float64Array(m);
    this.free = new Array<boolean>(m).fill(true);
    this.work = {
      L: new Float64Array(m * m),
      idx: new Int32Array(m),
      sc: new Float64Array(m),
      y: new Float64Array(m),
    };
  }

  private thermo(t: number) {
    if (t === this.tCached) return;
    this.tCached = t;
    this.sys.species.forEach((f, j) => {
      hsc(f, t, this.tmp);
      this.g[j] = this.tmp.h - this.tmp.s;
      this.hRT[j] = this.tmp.h;
    });
    if (this.sys.graphite) {
      hsc(GRAPHITE!, t, this.tmp);
      this.gGr = this.tmp.h - this.tmp.s;
      this.hGrRT = this.tmp.h;
    }
  }

  /**
   * a first guess of the element potentials: least squares a_j . lambda = g_j + shift + ln n_j
   * through the complete-combustion products (CO2, H2O, N2, O2, inerts, unburnt fuel),
   * held weakly to each element's most stable single-element carrier
   */
  private guess(shift: number) {
    const { sys } = this;
    const m = sys.elements.length;
    const A = new Float64Array(m * m);
    const rhs = new Float64Array(m);
    const row = (j: number, lnN: number, w: number) => {
      const t = this.g[j] + shift + lnN;
      for (let p = 0; p < m; p++) {
        const ap = sys.a[j * m + p];
        if (ap === 0) continue;
        rhs[p] += w * ap * t;
        for (let q = 0; q < m; q++) A[p * m + q] += w * ap * sys.a[j * m + q];
      }
    };
    sys.species.forEach((f, j) => {
      const n = this.products.get(f.key);
      if (n !== undefined && n > 1e-12) row(j, Math.log(n), 1);
    });
    for (let i = 0; i < m; i++) {
      let best = -1;
      let bestG = Infinity;
      sys.species.forEach((f, j) => {
        const atoms = sys.a[j * m + i];
        if (atoms === 0 || Object.keys(f.atoms).length !== 1) return;
        if (this.g[j] / atoms < bestG) {
          bestG = this.g[j] / atoms;
          best = j;
        }
      });
      if (best >= 0) row(best, Math.log(Math.max(this.b[i] / sys.a[best * m + i], 1e-30)), 1e-3);
    }
    this.free.fill(true);
    if (!solveSpd(A, rhs, this.lambda, m, this.free, this.work)) this.lambda.fill(0);
    if (sys.graphite) this.lambda[sys.carbon] = Math.min(this.lambda[sys.carbon], this.gGr);
  }

  /** amounts for the current lambda; returns sum n_j */
  private amounts(shift: number): number {
    const { sys, n, g, lambda } = this;
    const m = sys.elements.length;
    let s = 0;
    for (let j = 0; j < n.length; j++) {
      let e = -g[j] - shift;
      for (let i = 0; i < m; i++) e += sys.a[j * m + i] * lambda[i];
      n[j] = e > 700 ? Math.exp(700) : Math.exp(e);
      s += n[j];
    }
    return s;
  }

  /** dual objective D = lambda.b - sum n (with lambda_C fixed when graphite is present, b_C lambda_C is a constant) */
  private dual(shift: number): number {
    let d = -this.amounts(shift);
    for (let i = 0; i < this.b.length; i++) d += this.lambda[i] * this.b[i];
    return d;
  }

  /**
   * Equilibrium at temperature t and volume v (m3 per mole of initial mixture).
   * Returns false when Newton did not converge (never seen; the caller then refuses).
   */
  solveTV(t: number, v: number): boolean {
    this.thermo(t);
    const shift = Math.log((R * t) / (v * P_REF));
    if (!this.started) {
      this.guess(shift);
      this.started = true;
    }
    const { sys } = this;
    let fixC = sys.graphite && this.lambda[sys.carbon] >= this.gGr;
    if (fixC) this.lambda[sys.carbon] = this.gGr;
    for (let pass = 0; pass < 3; pass++) {
      if (!this.newton(shift, fixC)) return false;
      if (!sys.graphite) break;
      const c = sys.carbon;
      if (!fixC && this.lambda[c] > this.gGr) {
        fixC = true;
        this.lambda[c] = this.gGr;
        continue;
      }
      if (fixC) {
        let carried = 0;
        const m = sys.elements.length;
        for (let j = 0; j < this.n.length; j++) carried += sys.a[j * m + c] * this.n[j];
        this.nGr = this.b[c] - carried;
        if (this.nGr < 0) {
          // graphite not stable after all: free the carbon potential
          fixC = false;
          this.nGr = 0;
          continue;
        }
      } else this.nGr = 0;
      break;
    }
    if (!fixC) this.nGr = 0;
    return true;
  }

  private newton(shift: number, fixC: boolean): boolean {
    const { sys, b, lambda, n, H, grad, step, old, free } = this;
    const m = sys.elements.length;
    for (let i = 0; i < m; i++) free[i] = !(fixC && i === sys.carbon);
    let d = this.dual(shift);
    for (let it = 0; it < 200; it++) {
      H.fill(0);
      grad.set(b);
      for (let j = 0; j < n.length; j++) {
        const nj = n[j];
        if (nj === 0) continue;
        for (let i = 0; i < m; i++) {
          const aij = sys.a[j * m + i];
          if (aij === 0) continue;
          grad[i] -= aij * nj;
          for (let k = 0; k <= i; k++) H[i * m + k] += aij * sys.a[j * m + k] * nj;
        }
      }
      let converged = true;
      for (let i = 0; i < m; i++) if (free[i] && Math.abs(grad[i]) > 1e-11 * b[i] + 1e-15) converged = false;
      if (converged) return true;
      if (!solveSpd(H, grad, step, m, free, this.work)) return false;
      // limit the step so exp() stays finite; the line search does the rest (D is concave)
      let big = 0;
      for (let i = 0; i < m; i++) big = Math.max(big, Math.abs(step[i]));
      let alpha = big > 40 ? 40 / big : 1;
      old.set(lambda);
      let accepted = false;
      for (let ls = 0; ls < 60; ls++) {
        for (let i = 0; i < m; i++) lambda[i] = old[i] + alpha * step[i];
        const dn = this.dual(shift);
        if (dn >= d - 1e-14 * Math.abs(d)) {
          d = dn;
          accepted = true;
          break;
        }
        alpha /= 2;
      }
      if (!accepted) {
        lambda.set(old);
        this.dual(shift);
        // no ascent possible: at the optimum to machine precision
        return true;
      }
    }
    return false;
  }

  /** gas moles, internal energy and enthalpy (J) per mole of initial mixture at t, after solveTV */
  totals(t: number): { nGas: number; u: number; h: number } {
    let nGas = 0;
    let h = 0;
    for (let j = 0; j < this.n.length; j++) {
      nGas += this.n[j];
      h += this.n[j] * this.hRT[j];
    }
    h += this.nGr * this.hGrRT;
    return { nGas, h: h * R * t, u: (h - nGas) * R * t };
  }

  state(t: number, v: number): EquilibriumState {
    const { nGas, u, h } = this.totals(t);
    const gas: Record<string, number> = {};
    this.sys.species.forEach((f, j) => {
      const x = this.n[j] / nGas;
      if (x > 1e-12) gas[f.key] = x;
    });
    return {
      temperatureK: t,
      pressurePa: (nGas * R * t) / v,
      volumeM3: v,
      gas,
      gasMol: nGas,
      graphiteMol: this.nGr,
      internalEnergyJ: u,
      enthalpyJ: h,
    };
  }
}

interface SpdWork {
  readonly L: Float64Array;
  readonly idx: Int32Array;
  readonly sc: Float64Array;
  readonly y: Float64Array;
}

/** Cholesky solve of the free block of a symmetric positive (semi)definite H (lower triangle filled), Jacobi-scaled */
function solveSpd(
  H: Float64Array,
  rhs: Float64Array,
  x: Float64Array,
  m: number,
  free: readonly boolean[],
  w: SpdWork,
): boolean {
  const { L, idx, sc, y } = w;
  let k = 0;
  for (let i = 0; i < m; i++) if (free[i]) idx[k++] = i;
  for (let p = 0; p < k; p++) {
    const hii = H[idx[p] * m + idx[p]];
    sc[p] = hii > 0 ? 1 / Math.sqrt(hii) : 1;
  }
  for (let p = 0; p < k; p++)
    for (let q = 0; q <= p; q++) L[p * k + q] = H[idx[p] * m + idx[q]] * sc[p] * sc[q];
  for (let p = 0; p < k; p++) L[p * k + p] += 1e-13;
  for (let p = 0; p < k; p++) {
    for (let q = 0; q <= p; q++) {
      let s = L[p * k + q];
      for (let r = 0; r < q; r++) s -= L[p * k + r] * L[q * k + r];
      if (p === q) {
        if (!(s > 0)) return false;
        L[p * k + p] = Math.sqrt(s);
      } else L[p * k + q] = s / L[q * k + q];
    }
  }
  for (let p = 0; p < k; p++) y[p] = rhs[idx[p]] * sc[p];
  for (let p = 0; p < k; p++) {
    for (let r = 0; r < p; r++) y[p] -= L[p * k + r] * y[r];
    y[p] /= L[p * k + p];
  }
  for (let p = k - 1; p >= 0; p--) {
    for (let r = p + 1; r < k; r++) y[p] -= L[r * k + p] * y[r];
    y[p] /= L[p * k + p];
  }
  x.fill(0);
  for (let p = 0; p < k; p++) x[idx[p]] = y[p] * sc[p];
  return true;
}

/**
 * root of an increasing f on [lo, hi], starting at `guess` (so the first equilibrium is
 * solved near the answer and the rest warm-start): secant steps until the root is
 * bracketed, then Illinois regula falsi. undefined when f has no sign change on [lo, hi].
 */
function rootIncreasing(
  f: (x: number) => number,
  lo: number,
  hi: number,
  guess: number,
  tol: number,
  firstStep = 100,
): number | undefined {
  let x0 = Math.min(hi, Math.max(lo, guess));
  let f0 = f(x0);
  if (f0 === 0) return x0;
  let step = f0 > 0 ? -firstStep : firstStep;
  let a = NaN;
  let fa = NaN;
  let b = NaN;
  let fb = NaN;
  for (let it = 0; it < 60; it++) {
    const x1 = Math.min(hi, Math.max(lo, x0 + step));
    const f1 = f(x1);
    if (f1 === 0) return x1;
    if (f1 > 0 !== f0 > 0) {
      [a, fa, b, fb] = x1 < x0 ? [x1, f1, x0, f0] : [x0, f0, x1, f1];
      break;
    }
    if (x1 === lo || x1 === hi) return undefined;
    // secant estimate of the distance left, at least doubling the step
    const secant = (f1 * (x1 - x0)) / (f0 - f1);
    const next = Number.isFinite(secant)
      ? Math.sign(step) * Math.max(Math.abs(secant) * 1.2, 2 * Math.abs(step))
      : 2 * step;
    x0 = x1;
    f0 = f1;
    step = next;
  }
  if (Number.isNaN(a)) return undefined;
  let side = 0;
  for (let it = 0; it < 200; it++) {
    let c = b - (fb * (b - a)) / (fb - fa);
    if (!(c > a && c < b)) c = (a + b) / 2;
    const fc = f(c);
    if (fc === 0) return c;
    if (fc < 0) {
      a = c;
      fa = fc;
      if (side === -1) fb /= 2;
      side = -1;
    } else {
      b = c;
      fb = fc;
      if (side === 1) fa /= 2;
      side = 1;
    }
    if (b - a < tol) return (a * fb - b * fa) / (fb - fa);
  }
  return (a + b) / 2;
}

function initialState(y: Fractions, temperatureK: number, pressurePa: number) {
  const { elements, b, sum } = elementTotals(y);
  const sys = systemFor(elements);
  const tmp = { h: 0, s: 0, cp: 0 };
  let hRT = 0;
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    hsc(
      GAS_FITS.find((f) => f.key === k)!,
      temperatureK,
      tmp,
    );
    hRT += (v / sum) * tmp.h;
  }
  const h0 = hRT * R * temperatureK;
  const v0 = (R * temperatureK) / pressurePa;
  const products = new Map(Object.entries(completeCombustion(y).products).map(([k, v]) => [k, v / sum]));
  return { sys, b, h0, u0: h0 - R * temperatureK, v0, products };
}

/** start temperature: the complete-combustion value, pulled down where dissociation matters */
function completeGuessK(y: Fractions, temperatureK: number, kind: 'UV' | 'HP'): number {
  const t =
    kind === 'UV' ? closedVesselCombustion(y, temperatureK).temperatureK : flameTemperatureK(y, temperatureK);
  // above about 2200 K dissociation takes a growing share of the heat (fitted loosely on stoichiometric fuel/air and fuel/O2)
  return t > 2200 ? 2200 + (kind === 'UV' ? 0.5 : 0.3) * (t - 2200) : t;
}

function notConverged(what: string): never {
  return fail({ code: 'equilibrium-not-converged', what });
}

function checkInputs(y: Fractions, temperatureK: number, pressurePa: number) {
  if (!(temperatureK >= 150 && temperatureK <= 1000))
    fail({
      code: 'out-of-range',
      what: 'initial temperature for the equilibrium (K)',
      value: temperatureK,
      allowed: '150-1000 K',
    });
  if (!(pressurePa > 0 && pressurePa <= 1e8))
    fail({
      code: 'out-of-range',
      what: 'initial pressure for the equilibrium (Pa)',
      value: pressurePa,
      allowed: '0-1e8 Pa',
    });
  if (!Object.values(y).some((v) => v > 0)) fail({ code: 'fractions-sum', sum: 0 });
}

const cache = new Map<string, EquilibriumState>();
function memo(
  kind: string,
  y: Fractions,
  a: number,
  b: number,
  run: () => EquilibriumState,
): EquilibriumState {
  const key = `${kind}|${a.toPrecision(12)}|${b.toPrecision(12)}|${Object.entries(y)
    .filter(([, v]) => v > 0)
    .sort(([p], [q]) => (p < q ? -1 : 1))
    .map(([k, v]) => `${k}:${v.toPrecision(12)}`)
    .join(',')}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const s = run();
  if (cache.size > 2000) cache.clear();
  cache.set(key, s);
  return s;
}

/**
 * Constant-volume adiabatic equilibrium (UV): the end state of a closed vessel whose
 * contents burn completely to equilibrium without heat loss, U(T_e, V, n_e) = U(T0, V, n0).
 * y: mole fractions of the initial gas; temperatureK, pressurePa: initial state.
 * Valid for 150-1000 K and up to 1e8 Pa initially, end states up to 6000 K; ideal gas.
 * Example: equilibriumUV({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15, 101325)
 *   -> { pressurePa: 8.799 atm, temperatureK: 2586.3 K } (stoichiometric CH4-air from 1 atm; Cantera 3.2.0
 *   on the same data, tests/fixtures/reference/equilibrium-cantera.json).
 * Refuses (ProblemError) species without data or with elements other than C, H, O, N
 * and the noble gases.
 */
export function equilibriumUV(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  checkInputs(y, temperatureK, pressurePa);
  return memo('UV', y, temperatureK, pressurePa, () => {
    const { sys, b, u0, v0, products } = initialState(y, temperatureK, pressurePa);
    const s = new Solver(sys, b, products);
    const f = (t: number) => {
      if (!s.solveTV(t, v0)) notConverged(`closed-vessel equilibrium at ${t.toFixed(0)} K`);
      return s.totals(t).u - u0;
    };
    const lo = Math.max(120, temperatureK - 50);
    const t = rootIncreasing(f, lo, T_MAX_K, completeGuessK(y, temperatureK, 'UV'), 1e-5);
    if (t === undefined) notConverged('closed-vessel equilibrium: end temperature outside 120-6000 K');
    f(t);
    return s.state(t, v0);
  });
}

/** equilibrium at fixed T and P: secant iteration on ln V until the gas fills V at P */
function solveTP(s: Solver, t: number, pressurePa: number, vGuess: number): number {
  // err(ln V) = ln(n R T / (V P)); its slope d ln n/d ln V - 1 lies in (-1, 0]
  const err = (lnV: number) => {
    if (!s.solveTV(t, Math.exp(lnV))) notConverged(`equilibrium at ${t.toFixed(0)} K`);
    return Math.log((s.totals(t).nGas * R * t) / (Math.exp(lnV) * pressurePa));
  };
  let x0 = Math.log(vGuess);
  let e0 = err(x0);
  if (Math.abs(e0) < 1e-10) return Math.exp(x0);
  let x1 = x0 + e0;
  let e1 = err(x1);
  for (let it = 0; it < 100 && Math.abs(e1) >= 1e-10; it++) {
    const slope = (e1 - e0) / (x1 - x0);
    const next = Number.isFinite(slope) && slope < -0.05 ? x1 - e1 / slope : x1 + e1;
    [x0, e0] = [x1, e1];
    x1 = next;
    e1 = err(x1);
  }
  return Math.exp(x1);
}

/**
 * Equilibrium at fixed temperature and pressure (TP), per mole of initial mixture.
 * Example: equilibriumTP({ H2: 2 / 3, O2: 1 / 3 }, 3000, 1e5).gas
 *   -> { H2O: 0.645, H2: 0.134, OH: 0.092, H: 0.058, O2: 0.046 } (stoichiometric H2-O2 at 3000 K, 1 bar;
 *   Cantera 3.2.0 equilibrate('TP') on the same data, run with scripts/reference/gen_equilibrium.py's
 *   species: H2O 0.64485, H2 0.13428, OH 0.09229, H 0.05786, O2 0.04632).
 */
export function equilibriumTP(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  if (!(temperatureK >= 150 && temperatureK <= T_MAX_K))
    fail({
      code: 'out-of-range',
      what: 'equilibrium temperature (K)',
      value: temperatureK,
      allowed: `150-${T_MAX_K} K`,
    });
  checkInputs(y, 300, pressurePa);
  return memo('TP', y, temperatureK, pressurePa, () => {
    const { sys, b, products } = initialState(y, 298.15, pressurePa);
    const s = new Solver(sys, b, products);
    const v = solveTP(s, temperatureK, pressurePa, (R * temperatureK) / pressurePa);
    return s.state(temperatureK, v);
  });
}

/**
 * Adiabatic flame temperature at constant pressure with equilibrium products (HP):
 * H(T_ad, P, n_e) = H(T0, P, n0).
 * Example: equilibriumHP({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15, 101325)
 *   .temperatureK -> 2225.0 K (stoichiometric CH4-air at 1 atm; Cantera 3.2.0 on the same data,
 *   tests/fixtures/reference/equilibrium-cantera.json).
 */
export function equilibriumHP(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  checkInputs(y, temperatureK, pressurePa);
  return memo('HP', y, temperatureK, pressurePa, () => {
    const { sys, b, h0, products } = initialState(y, temperatureK, pressurePa);
    const s = new Solver(sys, b, products);
    let v = (R * temperatureK) / pressurePa;
    let tLast = temperatureK;
    const f = (t: number) => {
      v = solveTP(s, t, pressurePa, (v * t) / tLast);
      tLast = t;
      return s.totals(t).h - h0;
    };
    const t = rootIncreasing(
      f,
      Math.max(120, temperatureK - 50),
      T_MAX_K,
      completeGuessK(y, temperatureK, 'HP'),
      1e-4,
    );
    if (t === undefined) notConverged('flame equilibrium: temperature outside 120-6000 K');
    f(t);
    return s.state(t, v);
  });
}

/** a solver positioned on one initial state, for the detonation module (fixed-volume equilibria) */
export function equilibriumWorkspace(y: Fractions, temperatureK: number, pressurePa: number) {
  checkInputs(y, temperatureK, pressurePa);
  const init = initialState(y, temperatureK, pressurePa);
  const s = new Solver(init.sys, init.b, init.products);
  let mass = 0;
  let sum = 0;
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    mass += v * molarMassKgPerMol(getSpecies(k).elements);
    sum += v;
  }
  return {
    /** enthalpy and volume of the initial state per mole, J and m3; mass per mole, kg */
    h0: init.h0,
    v0: init.v0,
    massKg: mass / sum,
    /** equilibrium at (t, v): pressure and enthalpy per mole of initial mixture */
    at(t: number, v: number): { pressurePa: number; enthalpyJ: number } {
      if (!s.solveTV(t, v)) notConverged(`equilibrium at ${t.toFixed(0)} K`);
      const { nGas, h } = s.totals(t);
      return { pressurePa: (nGas * R * t) / v, enthalpyJ: h };
    },
    state: (t: number, v: number) => s.state(t, v),
  };
}

export const EQUILIBRIUM_SPECIES_COUNT = GAS_FITS.length + (GRAPHITE ? 1 : 0);
export { rootIncreasing as rootOfIncreasing };
