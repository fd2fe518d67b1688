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
  readonly temperaturesK: readonly number[];
  /** gas already in the tank: amounts per species per unit volume are solved from its reading */
  readonly initial?: { readonly y: Float64Array; readonly pressurePa: number; readonly temperatureK: number; readonly B: Float64Array; readonly C: Float64Array };
  readonly model: VirialModel;
}

export interface ReadingInput {
  readonly source: GasSource;
  readonly pressurePa: number;
  readonly temperatureK: number;
}

function matrixOf(m: VirialModel, idx: readonly number[], S: number): { B: Float64Array; C: Float64Array } {
  const B = new Float64Array(S * S);
  const C = new Float64Array(S);
  for (let i = 0; i < S; i++) {
    C[i] = m.C[idx[i]];
    for (let j = 0; j < S; j++) B[i * S + j] = m.B[idx[i]][idx[j]];
  }
  return { B, C };
}

export function inverseSetup(readings: readonly ReadingInput[], initial?: { composition: Fractions; pressurePa: number; temperatureK: number }): InverseSetup {
  const set = new Set<string>();
  for (const r of readings) for (const k of Object.keys(r.source.composition)) set.add(k);
  for (const k of Object.keys(initial?.composition ?? {})) set.add(k);
  const species = [...set];
  const S = species.length;
  const at = (T: number) => {
    const m = virialModel(species, T);
    const idx = species.map((k) => m.species.indexOf(k));
    return { m, ...matrixOf(m, idx, S) };
  };
  const wEos: Float64Array[] = [];
  const wId: Float64Array[] = [];
  const B: Float64Array[] = [];
  const dBdT: Float64Array[] = [];
  const C: Float64Array[] = [];
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
    const h = 0.5;
    const here = at(r.temperatureK);
    const up = at(r.temperatureK + h);
    const dn = at(r.temperatureK - h);
    model ??= here.m;
    B.push(here.B);
    C.push(here.C);
    const d = new Float64Array(S * S);
    for (let i = 0; i < S * S; i++) d[i] = (up.B[i] - dn.B[i]) / (2 * h);
    dBdT.push(d);
  }
  let init: InverseSetup['initial'];
  if (initial) {
    const y = new Float64Array(S);
    for (const [k, v] of Object.entries(initial.composition)) y[species.indexOf(k)] = v;
    const here = at(initial.temperatureK);
    init = { y, pressurePa: initial.pressurePa, temperatureK: initial.temperatureK, B: here.B, C: here.C };
  }
  return {
    species,
    wEos,
    wId,
    unidentified: readings.map((r) => r.source.unidentified),
    B,
    dBdT,
    C,
    temperaturesK: readings.map((r) => r.temperatureK),
    initial: init,
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

function solveRho(P: number, T: number, nPrev: Float64Array, rhoPrev: number, w: Float64Array, B: Float64Array, dB: Float64Array | undefined, dT: number, bAbs: ArrayLike<number> | undefined, C: Float64Array, S: number, y: Float64Array): number {
  const rt = R * T;
  let rho = P / rt;
  for (let it = 0; it < 30; it++) {
    const d = rho - rhoPrev;
    for (let i = 0; i < S; i++) y[i] = (nPrev[i] + d * w[i]) / rho;
    let b = 0;
    let c3 = 0;
    for (let i = 0; i < S; i++) {
      if (y[i] === 0) continue;
      c3 += y[i] * Math.cbrt(C[i]);
      for (let j = 0; j < S; j++) {
        let bij = B[i * S + j];
        if (dB) bij += dB[i * S + j] * dT;
        if (bAbs) bij += bAbs[i * S + j];
        b += y[i] * y[j] * bij;
      }
    }
    const c = c3 * c3 * c3;
    // Newton on P(rho) at the current composition
    let r = rho;
    for (let n = 0; n < 4; n++) {
      const f = r * rt * (1 + b * r + c * r * r) - P;
      const df = rt * (1 + 2 * b * r + 3 * c * r * r);
      r -= f / df;
    }
    if (Math.abs(r - rho) <= 1e-13 * rho) return r;
    rho = r;
  }
  return rho;
}

/**
 * Invert the readings. @returns the tank composition and the density after each reading.
 * Example: the plan of properties.md 1.2 (50.038 / 150.106 / 1000 Torr, 298.15 K) fed back
 * gives CH4 0.05, O2 0.10, Ar 0.85 (to 1e-9 with the plan's own model).
 */
export function invertReadings(setup: InverseSetup, p?: Perturbation, nominalP?: readonly number[]): InverseResult {
  const S = setup.species.length;
  const K = setup.wEos.length;
  const n = new Float64Array(S);
  const nId = new Float64Array(S);
  const y = new Float64Array(S);
  const rhoOut = new Float64Array(K);
  let rhoPrev = 0;
  let unid = 0;
  if (setup.initial) {
    const i0 = setup.initial;
    const r0 = solveRho(i0.pressurePa, i0.temperatureK, new Float64Array(S), 0, i0.y, i0.B, undefined, 0, undefined, i0.C, S, y);
    for (let i = 0; i < S; i++) {
      n[i] = r0 * i0.y[i];
      nId[i] = n[i];
    }
    rhoPrev = r0;
  }
  const w = new Float64Array(S);
  for (let k = 0; k < K; k++) {
    const P = p ? p.pressurePa[k] : nominalP![k];
    const T0 = setup.temperaturesK[k];
    const T = p ? p.temperatureK[k] : T0;
    const wk = setup.wEos[k];
    for (let i = 0; i < S; i++) w[i] = wk[i];
    // a purity perturbation moves gas between the main species and the unidentified remainder;
    // the EOS composition already counts the remainder as main gas, so only the bookkeeping changes
    const dp = p?.purity?.[k] ?? 0;
    const rho = solveRho(P, T, n, rhoPrev, w, setup.B[k], setup.dBdT[k], T - T0, p?.bAbsolute, setup.C[k], S, y);
    const d = rho - rhoPrev;
    if (!(d > 0)) {
      return fail({ code: 'schema', reason: `reading ${k + 1} (${P.toPrecision(6)} Pa) is not above the one before it; each fill must raise the tank pressure` });
    }
    const wid = setup.wId[k];
    let main = 0;
    for (let i = 1; i < S; i++) if (wid[i] > wid[main]) main = i;
    for (let i = 0; i < S; i++) {
      n[i] += d * w[i];
      nId[i] += d * wid[i];
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
  const x = new Float64Array(S);
  for (let i = 0; i < S; i++) x[i] = nId[i] / identified;
  return { x, unidentified: unid / (identified + unid), rho: rhoOut, amounts: n };
}
