/**
 * The mixture equation of state: the density-form virial equation
 *   P = rho R T (1 + B_mix rho + C_mix rho^2),
 *   B_mix = sum_i sum_j y_i y_j B_ij,   C_mix = (sum_i y_i C_ii^(1/3))^3,
 * with B_ii from reference values where tabulated (always for He, H2, Ne), else
 * Tsonopoulos; B_ij (i != j) from Tsonopoulos with the Prausnitz combining rules and the
 * Chueh-Prausnitz size-difference k_ij.
 */
import { R } from './constants.js';
import { fail } from './problems.js';
import { getSpecies } from './lookup.js';
import { referenceB, referenceC } from './virial-reference.js';
import { correlationConstants, pairConstants, sizeDifferenceKij, tsonopoulosB } from './virial.js';

export type VirialMethod =
  | 'reference' // tabulated reference-EOS value
  | 'tsonopoulos' // pure species, correlation
  | 'tsonopoulos-quantum' // pure quantum gas outside the reference table: effective constants
  | 'combining-rule'; // cross coefficient

export interface VirialEntry {
  readonly i: string;
  readonly j: string;
  readonly valueM3PerMol: number;
  readonly method: VirialMethod;
  readonly source: string;
}

export interface VirialModel {
  readonly temperatureK: number;
  readonly species: readonly string[];
  /** B[i][j], m3/mol, symmetric */
  readonly B: readonly (readonly number[])[];
  /** pure C_ii, m6/mol2; 0 where no reference value is used (polar species, untabulated species) */
  readonly C: readonly number[];
  readonly entries: readonly VirialEntry[];
}

/** Build the B matrix and pure C values of a set of species at one temperature. */
export function virialModel(speciesKeys: readonly string[], temperatureK: number): VirialModel {
  const records = speciesKeys.map((k) => getSpecies(k));
  const consts = records.map((r) => correlationConstants(r, temperatureK));
  const n = records.length;
  const B: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const entries: VirialEntry[] = [];
  for (let i = 0; i < n; i++) {
    const key = records[i].key;
    const ref = referenceB(key, temperatureK);
    let value: number;
    let method: VirialMethod;
    let source: string;
    if (ref !== undefined) {
      value = ref;
      method = 'reference';
      source = 'coolprop-8-virial';
    } else {
      value = tsonopoulosB(consts[i], temperatureK);
      method = records[i].quantum ? 'tsonopoulos-quantum' : 'tsonopoulos';
      source = records[i].quantum ? 'prausnitz-1999' : 'tsonopoulos-1974';
    }
    B[i][i] = value;
    entries.push({ i: key, j: key, valueM3PerMol: value, method, source });
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      // Prausnitz rules with the Chueh-Prausnitz size-difference k_ij (0 for like sizes)
      const v = tsonopoulosB(pairConstants(consts[i], consts[j], sizeDifferenceKij(consts[i], consts[j])), temperatureK);
      B[i][j] = v;
      B[j][i] = v;
      entries.push({ i: records[i].key, j: records[j].key, valueM3PerMol: v, method: 'combining-rule', source: 'prausnitz-1999' });
    }
  }
  // C enters only for non-polar species: the polar ones (H2O, NH3, alcohols, DME) have zero-density C
  // of order -1e6 cm6/mol2, which the cube-root rule would spread over the whole mixture
  const C = records.map((r) => (r.polarClass === 'nonpolar' ? (referenceC(r.key, temperatureK) ?? 0) : 0));
  return { temperatureK, species: records.map((r) => r.key), B, C, entries };
}

function fractionsVector(model: VirialModel, y: Readonly<Record<string, number>>): number[] {
  for (const k of Object.keys(y)) {
    if (!model.species.includes(k) && y[k] !== 0) throw new Error(`species ${k} is not in the virial model`);
  }
  return model.species.map((k) => y[k] ?? 0);
}

/** B_mix = sum_i sum_j y_i y_j B_ij, m3/mol; y need not be normalised (it is normalised here). */
export function bMix(model: VirialModel, y: Readonly<Record<string, number>>): number {
  const v = fractionsVector(model, y);
  const s = v.reduce((a, b) => a + b, 0);
  let b = 0;
  for (let i = 0; i < v.length; i++) for (let j = 0; j < v.length; j++) b += v[i] * v[j] * model.B[i][j];
  return b / (s * s);
}

/**
 * C_mix = (sum_i y_i C_ii^(1/3))^3, m6/mol2: a cube-root mixing rule (an estimate of
 * the Orentlicher-Prausnitz form C_ijk = (C_ij C_jk C_ik)^(1/3) with C_ij from the pure
 * values). Its share of Z is below 2e-4 up to about 10 bar for these gases.
 */
export function cMix(model: VirialModel, y: Readonly<Record<string, number>>): number {
  const v = fractionsVector(model, y);
  const s = v.reduce((a, b) => a + b, 0);
  let c = 0;
  for (let i = 0; i < v.length; i++) c += (v[i] / s) * Math.cbrt(model.C[i]);
  return c * c * c;
}

/**
 * P = rho R T (1 + B rho + C rho^2).
 * @param rho molar density, mol/m3; B m3/mol; C m6/mol2; T K. @returns Pa
 * Example: pure CH4, B = -42.91 cm3/mol, 298.15 K, rho = 2.6918 mol/m3 -> 6671.1 Pa (50.038 Torr).
 */
export function pressureFromDensity(rho: number, temperatureK: number, B: number, C: number): number {
  return rho * R * temperatureK * (1 + B * rho + C * rho * rho);
}

/**
 * Inverse of pressureFromDensity by Newton's method from the ideal-gas density.
 * Refuses (throws) when the virial series has no gas root near the ideal density,
 * which means the state is far outside the truncated series' validity.
 */
export function densityFromPressure(pressurePa: number, temperatureK: number, B: number, C: number): number {
  const rt = R * temperatureK;
  let rho = pressurePa / rt;
  for (let it = 0; it < 50; it++) {
    const f = rho * rt * (1 + B * rho + C * rho * rho) - pressurePa;
    const df = rt * (1 + 2 * B * rho + 3 * C * rho * rho);
    if (df <= 0) break;
    const step = f / df;
    rho -= step;
    if (Math.abs(step) <= 1e-14 * rho) return rho;
  }
  return fail({
    code: 'model-range',
    reason: `the virial equation has no gas-phase solution at ${pressurePa.toPrecision(6)} Pa and ${temperatureK.toFixed(2)} K (B = ${(B * 1e6).toPrecision(4)} cm3/mol); the state is outside the model's range - lower the pressure`,
  });
}

/** Z = P/(rho R T) at the given density. */
export function compressibility(rho: number, B: number, C: number): number {
  return 1 + B * rho + C * rho * rho;
}
