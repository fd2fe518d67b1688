/**
 * The element-potential solver of ideal-gas chemical equilibrium at fixed temperature and
 * volume (W.C. Reynolds, "The element potential method for chemical equilibrium
 * analysis: implementation in the interactive program STANJAN", Stanford ME 270 HO 7,
 * 1986; S. Gordon & B.J. McBride, NASA RP-1311, 1994, ch. 2).
 *
 * At fixed T and V every gas species j follows from the element potentials lambda_i:
 *   n_j = exp(sum_i a_ij lambda_i - c_j),   c_j = g°_j/(RT) + ln(R T / (V P°)),  P° = 1 bar,
 * and the lambda_i maximise the concave dual D(lambda) = sum_i lambda_i b_i - sum_j n_j,
 * whose gradient is the element balance b_i - sum_j a_ij n_j: Newton on D with a line
 * search converges from any start. Graphite C(gr) is a condensed phase: present only
 * when the carbon potential would exceed g°_gr/(RT), and then lambda_C = g°_gr/(RT) and
 * n_gr = b_C - sum_j a_Cj n_j. Amounts are per mole of initial mixture.
 */
import { R } from './constants.js';
import { GRAPHITE, hsc, P_REF, type System } from './equilibrium-species.js';

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
export class Solver {
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
