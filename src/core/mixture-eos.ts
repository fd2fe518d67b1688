/**
 * The mixture equation of state: the density-form virial equation
 *   P = rho R T (1 + B_mix rho + C_mix rho^2),
 *   B_mix = sum_i sum_j y_i y_j B_ij,   C_mix = sum_i sum_j sum_k y_i y_j y_k C_ijk,
 * with B_ii from reference values where tabulated (always for He, H2, Ne), else
 * Tsonopoulos; B_ij (i != j) from the reference mixture model where the pair is tabulated
 * (fitted to mixture data and virial-consistent: data/cross-virial-reference.json), else
 * Tsonopoulos with the Prausnitz combining rules and the Chueh-Prausnitz size-difference
 * k_ij plus the fitted additions, or, for a pair the library fits but not as a virial
 * expansion, its composition average where that is the smaller uncertainty or refutes the
 * rule (crossEntry). C_iii from reference values (non-polar species), C_iij likewise from the pair
 * table, and every C_ijk not tabulated by the cube-root rule (C_iii C_jjj C_kkk)^(1/3).
 */
import { R } from './constants.js';
import { fail } from './problems.js';
import { getSpecies } from './lookup.js';
import type { SpeciesRecord } from './data/species.js';
import {
  averagedCrossB,
  referenceB,
  referenceC,
  referenceCrossB,
  referenceCrossC,
} from './virial-reference.js';
import {
  correlationConstants,
  crossRuleCalibrated,
  crossRuleKij,
  crossRuleLowTFactor,
  pairConstants,
  tsonopoulosB,
  type CorrelationConstants,
} from './virial.js';

export type VirialMethod =
  | 'reference' // tabulated reference-EOS value
  | 'tsonopoulos' // pure species, correlation
  | 'tsonopoulos-quantum' // pure quantum gas outside the reference table: effective constants
  | 'reference-mixture' // cross coefficient from a tabulated reference mixture model
  | 'reference-mixture-average' // composition average of a fitted but not virial-consistent reference mixture model
  | 'combining-rule'; // cross coefficient from the correlation

export interface VirialEntry {
  readonly i: string;
  readonly j: string;
  readonly valueM3PerMol: number;
  readonly method: VirialMethod;
  readonly source: string;
  /** the binary mixture model behind a 'reference-mixture' entry, as the library cites it */
  readonly model?: string;
  /** standard uncertainty of this entry where it is its own (a composition average: its spread), m3/mol */
  readonly uM3PerMol?: number;
}

/** a tabulated C_iij (species i twice, j once) and its departure from the cube-root rule */
export interface ThirdVirialPair {
  readonly i: number;
  readonly j: number;
  /** C_iij, m6/mol2 */
  readonly value: number;
  /** C_iij - (C_ii^2 C_jj)^(1/3), m6/mol2: what the table adds to the cube-root rule */
  readonly delta: number;
  readonly model: string;
}

export interface VirialModel {
  readonly temperatureK: number;
  readonly species: readonly string[];
  /** B[i][j], m3/mol, symmetric */
  readonly B: readonly (readonly number[])[];
  /** pure C_ii, m6/mol2; 0 where no reference value is used (polar species, untabulated species) */
  readonly C: readonly number[];
  /** tabulated cross C_iij of the non-polar pairs (both orientations), indices into species */
  readonly cPairs: readonly ThirdVirialPair[];
  readonly entries: readonly VirialEntry[];
}

/**
 * our estimates of the virial-coefficient standard uncertainty, from the comparisons recorded in
 * DEVELOPERS.md (m3/mol)
 */
export const VIRIAL_U = {
  reference: { absolute: 0.5e-6, relative: 0.01 },
  correlation: { absolute: 2e-6, relative: 0.05 },
  /**
   * cross B by the fitted rule (classical pairs): calibrated so that leaving each fitted pair out, at least 95 % of
   * them lie within 2u over 250-350 K (scripts/cross-rule-lib.ts); the relative part grows as crossRuleLowTFactor
   */
  cross: { absolute: 4e-6, relative: 0.05 },
  /**
   * cross B by the rule where it is not calibrated (pairs with He, H2, Ne or a hydrogen-bonding
   * species): our estimate
   */
  crossUncalibrated: { absolute: 4e-6, relative: 0.15 },
  /** cross B from a tabulated reference mixture model: at least half the largest spread the table admits (3 cm3/mol) */
  referenceCross: { absolute: 1.5e-6, relative: 0.03 },
} as const;

/**
 * When the fitted reference model of a pair refutes the calibrated cross-B rule (classical pairs; the rule is not
 * calibrated for quantum gases and hydrogen-bonding species): its implied B_12 spreads over composition
 * by at most this share of their average (so it defines B_12 to that extent, our choice), and the rule lies more
 * than 2 of its own u outside every value it implies. The composition average is used there, with its spread as u.
 */
export const CROSS_RULE_REFUTED = { maxRelativeSpread: 0.2 } as const;

/** standard uncertainty of one B entry, m3/mol: max(absolute, relative |B|) of its method's class */
export function virialU(e: VirialEntry): number {
  if (e.uM3PerMol !== undefined) return e.uM3PerMol;
  const rule =
    e.i === e.j
      ? e.method === 'reference'
        ? VIRIAL_U.reference
        : VIRIAL_U.correlation
      : e.method === 'reference-mixture'
        ? VIRIAL_U.referenceCross
        : VIRIAL_U.cross;
  return Math.max(rule.absolute, rule.relative * Math.abs(e.valueM3PerMol));
}

/**
 * The cross B_ij entry of one pair at T: the tabulated reference mixture model where it is a virial expansion;
 * else the calibrated rule, or the fitted model's composition average where its spread is the smaller
 * uncertainty (at least the tabulated pairs' floor) or where it refutes the rule (CROSS_RULE_REFUTED).
 */
function crossEntry(
  a: SpeciesRecord,
  b: SpeciesRecord,
  ca: CorrelationConstants,
  cb: CorrelationConstants,
  temperatureK: number,
): VirialEntry {
  const ref = referenceCrossB(a.key, b.key, temperatureK);
  if (ref)
    return {
      i: a.key,
      j: b.key,
      valueM3PerMol: ref.value,
      method: 'reference-mixture',
      source: 'coolprop-8-mixture',
      model: ref.model,
    };
  // Prausnitz rules with the Chueh-Prausnitz size-difference k_ij (0 for like sizes) and the fitted additions
  const v = tsonopoulosB(pairConstants(ca, cb, crossRuleKij(a, b, ca, cb)), temperatureK);
  const calibrated = crossRuleCalibrated(a, b);
  const cls = calibrated ? VIRIAL_U.cross : VIRIAL_U.crossUncalibrated;
  const lowT = calibrated ? crossRuleLowTFactor(Math.sqrt(ca.Tc * cb.Tc), temperatureK) : 1;
  const uRule = Math.max(cls.absolute, cls.relative * lowT * Math.abs(v));
  const avg = averagedCrossB(a.key, b.key, temperatureK);
  if (avg) {
    const avgU = Math.max(
      avg.u,
      VIRIAL_U.referenceCross.absolute,
      VIRIAL_U.referenceCross.relative * Math.abs(avg.value),
    );
    // the rule more than 2 of its own u outside every value a well-defined fitted model implies: N2-CO2, CO-CO2
    const refuted =
      calibrated &&
      avg.u <= CROSS_RULE_REFUTED.maxRelativeSpread * Math.abs(avg.value) &&
      (v < avg.min - 2 * uRule || v > avg.max + 2 * uRule);
    if (avgU < uRule || refuted)
      return {
        i: a.key,
        j: b.key,
        valueM3PerMol: avg.value,
        method: 'reference-mixture-average',
        source: 'coolprop-8-mixture',
        model: avg.model,
        uM3PerMol: avgU,
      };
  }
  return {
    i: a.key,
    j: b.key,
    valueM3PerMol: v,
    method: 'combining-rule',
    source: 'prausnitz-1999',
    uM3PerMol: uRule,
  };
}

/** Build the B matrix and pure C values of a set of species at one temperature. */
export function virialModel(speciesKeys: readonly string[], temperatureK: number): VirialModel {
  // a pure function of its arguments, asked again and again with the same ones (every prediction of a
  // search evaluates each reading's temperature and its two neighbours): kept, never changed by callers
  const key = `${speciesKeys.join(',')}|${temperatureK}`;
  const hit = modelCache.get(key);
  if (hit) return hit;
  const m = buildVirialModel(speciesKeys, temperatureK);
  if (modelCache.size >= MODEL_CACHE_SIZE) modelCache.clear();
  modelCache.set(key, m);
  return m;
}

const MODEL_CACHE_SIZE = 512;
const modelCache = new Map<string, VirialModel>();

function buildVirialModel(speciesKeys: readonly string[], temperatureK: number): VirialModel {
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
      const e = crossEntry(records[i], records[j], consts[i], consts[j], temperatureK);
      B[i][j] = B[j][i] = e.valueM3PerMol;
      entries.push(e);
    }
  }
  // C enters only for non-polar species: the polar ones (H2O, NH3, alcohols, DME) have zero-density C
  // of order -1e6 cm6/mol2, which the cube-root rule would spread over the whole mixture
  const C = records.map((r) => (r.polarClass === 'nonpolar' ? (referenceC(r.key, temperatureK) ?? 0) : 0));
  const cPairs: ThirdVirialPair[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      // a pair C only where both pure C are in use (non-polar, tabulated), so that the cube-root rest is consistent
      if (C[i] === 0 || C[j] === 0) continue;
      const ref = referenceCrossC(records[i].key, records[j].key, temperatureK);
      if (!ref) continue;
      const ci = Math.cbrt(C[i]);
      const cj = Math.cbrt(C[j]);
      cPairs.push({ i, j, value: ref.aab, delta: ref.aab - ci * ci * cj, model: ref.model });
      cPairs.push({ i: j, j: i, value: ref.abb, delta: ref.abb - cj * cj * ci, model: ref.model });
    }
  }
  return { temperatureK, species: records.map((r) => r.key), B, C, cPairs, entries };
}

function fractionsVector(model: VirialModel, y: Readonly<Record<string, number>>): number[] {
  for (const k of Object.keys(y)) {
    if (!model.species.includes(k) && y[k] !== 0) throw new Error(`species ${k} is not in the virial model`);
  }
  return model.species.map((k) => y[k] ?? 0);
}

/**
 * B_mix = sum_i sum_j y_i y_j B_ij over arrays (the form the re-check's Monte Carlo loop uses),
 * summed over the upper triangle of the symmetric S x S matrix B (row-major), m3/mol; y is used
 * as given (normalised by the caller). Terms of a species with y_i = 0 are skipped.
 * Example: bMixOf([0.5, 0.5], [-40e-6, -20e-6, -20e-6, 10e-6], 2) -> -17.5 cm3/mol (by hand:
 *   0.25 x (-40) + 2 x 0.25 x (-20) + 0.25 x 10 = -17.5 cm3/mol, the quadratic mixing rule of the virial B).
 */
export function bMixOf(y: ArrayLike<number>, B: ArrayLike<number>, S: number): number {
  let b = 0;
  for (let i = 0; i < S; i++) {
    const yi = y[i];
    if (yi === 0) continue;
    const row = i * S;
    let acc = 0.5 * B[row + i] * yi;
    for (let j = i + 1; j < S; j++) acc += B[row + j] * y[j];
    b += 2 * yi * acc;
  }
  return b;
}

/**
 * C_mix over arrays, the same rule as cMix: (sum_i y_i C_ii^(1/3))^3 plus the tabulated pairs'
 * departures 3 y_i^2 y_j dC_iij + 3 y_j^2 y_i dC_jji, m6/mol2. `cbrtC` holds C_ii^(1/3);
 * `cPairs` (S x S, row-major) holds 3 (C_iij - (C_ii^2 C_jj)^(1/3)) at [i][j] (i twice, j once),
 * else 0; y is used as given.
 */
export function cMixOf(
  y: ArrayLike<number>,
  cbrtC: ArrayLike<number>,
  cPairs: ArrayLike<number>,
  S: number,
): number {
  let c3 = 0;
  let dc = 0;
  for (let i = 0; i < S; i++) {
    const yi = y[i];
    if (yi === 0) continue;
    c3 += yi * cbrtC[i];
    let accC = 0;
    for (let j = i + 1; j < S; j++) {
      const yj = y[j];
      accC += yj * (yi * cPairs[i * S + j] + yj * cPairs[j * S + i]);
    }
    dc += yi * accC;
  }
  return c3 * c3 * c3 + dc;
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
 * C_mix = sum_ijk y_i y_j y_k C_ijk, m6/mol2, written as the cube-root rule plus the
 * tabulated pairs' departures from it:
 *   C_mix = (sum_i y_i C_ii^(1/3))^3 + 3 sum_(i != j) y_i^2 y_j (C_iij - (C_ii^2 C_jj)^(1/3)).
 * Untabulated C_iij and every C_ijk of three different species follow the cube-root rule
 * (an estimate of the Orentlicher-Prausnitz form). Its share of Z is below 2e-4 up to
 * about 10 bar for these gases.
 */
export function cMix(model: VirialModel, y: Readonly<Record<string, number>>): number {
  const v = fractionsVector(model, y);
  const s = v.reduce((a, b) => a + b, 0);
  let c = 0;
  for (let i = 0; i < v.length; i++) c += (v[i] / s) * Math.cbrt(model.C[i]);
  let extra = 0;
  for (const p of model.cPairs) extra += 3 * (v[p.i] / s) ** 2 * (v[p.j] / s) * p.delta;
  return c * c * c + extra;
}

/**
 * P = rho R T (1 + B rho + C rho^2).
 * @param rho molar density, mol/m3; B m3/mol; C m6/mol2; T K. @returns Pa
 * Example: pressureFromDensity(2.6918, 298.15, -42.91e-6, 0) -> 6672.1 Pa (pure CH4, B = -42.91 cm3/mol:
 *   50.045 Torr; the reference EOS of CH4, CoolProp 8.0.0, at the same density: 6672.12 Pa).
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
    kind: 'no-gas-solution',
    pressurePa,
    temperatureK,
    secondVirialM3PerMol: B,
  });
}

/** Z = P/(rho R T) at the given density. */
export function compressibility(rho: number, B: number, C: number): number {
  return 1 + B * rho + C * rho * rho;
}
