/**
 * Reference pure-fluid virial coefficients B(T) and C(T), tabulated from the
 * reference equations of state (data/virial-reference.json, generated with
 * CoolProp 8.0.0 by scripts/reference/gen_virial.py) and interpolated by a
 * four-point Lagrange polynomial in 1/T; cross coefficients of the pairs whose reference
 * mixture model qualifies (see below) likewise.
 */
import table from './data/virial-reference.json' with { type: 'json' };
import crossTable from './data/cross-virial-reference.json' with { type: 'json' };

interface TableEntry {
  readonly fluid: string;
  readonly B: readonly number[]; // cm3/mol
  readonly C: readonly number[]; // cm6/mol2
}

const temperatures: readonly number[] = table.temperatures_K;
const entries = table.species as Record<string, TableEntry>;

export const VIRIAL_TABLE_RANGE_K = {
  min: temperatures[0],
  max: temperatures[temperatures.length - 1],
} as const;
export const VIRIAL_TABLE_LIBRARY: string = table.library;

function interpolate(values: readonly number[], temperatureK: number): number {
  const x = 1 / temperatureK;
  const n = temperatures.length;
  // pick 4 nodes around T
  let i = 0;
  while (i < n - 1 && temperatures[i + 1] < temperatureK) i++;
  const start = Math.min(Math.max(i - 1, 0), n - 4);
  let sum = 0;
  for (let j = start; j < start + 4; j++) {
    let w = 1;
    const xj = 1 / temperatures[j];
    for (let k = start; k < start + 4; k++) {
      if (k !== j) w *= (x - 1 / temperatures[k]) / (xj - 1 / temperatures[k]);
    }
    sum += w * values[j];
  }
  return sum;
}

export function hasReferenceB(key: string): boolean {
  return key in entries;
}

function inRange(temperatureK: number): boolean {
  return temperatureK >= VIRIAL_TABLE_RANGE_K.min && temperatureK <= VIRIAL_TABLE_RANGE_K.max;
}

/**
 * Reference B of a pure species.
 * @returns m3/mol, or undefined when the species is not tabulated or T lies
 * outside the table (230-480 K).
 * Example: referenceB('Ar', 298.15) -> -15.55 cm3/mol (the reference EOS of argon, CoolProp 8.0.0: -15.554 cm3/mol).
 */
export function referenceB(key: string, temperatureK: number): number | undefined {
  const e = entries[key];
  if (!e || !inRange(temperatureK)) return undefined;
  return interpolate(e.B, temperatureK) * 1e-6; // cm3/mol -> m3/mol
}

/** Reference C of a pure species, m6/mol2, or undefined when not tabulated at T. */
export function referenceC(key: string, temperatureK: number): number | undefined {
  const e = entries[key];
  if (!e || !inRange(temperatureK)) return undefined;
  return interpolate(e.C, temperatureK) * 1e-12; // cm6/mol2 -> m6/mol2
}

/*
 * Cross coefficients from the reference mixture models (data/cross-virial-reference.json,
 * generated with CoolProp 8.0.0 by scripts/reference/gen_cross_virial.py): only the pairs
 * whose binary model is fitted to mixture data and whose zero-density B_mix is quadratic
 * (and C_mix cubic) in composition, as a virial expansion must be. The other pairs keep
 * the combining rules.
 */

interface CrossEntry {
  readonly a: string;
  readonly b: string;
  readonly model: string;
  readonly B: readonly number[];
  readonly C_aab?: readonly number[];
  readonly C_abb?: readonly number[];
}

const crossEntries = crossTable.pairs as Record<string, CrossEntry>;
export const CROSS_TABLE_LIBRARY: string = crossTable.library;
if (crossTable.temperatures_K.some((t, i) => t !== temperatures[i]))
  throw new Error('cross-virial table and pure table use different temperature grids');

function crossEntry(a: string, b: string): { e: CrossEntry; swapped: boolean } | undefined {
  const direct = crossEntries[`${a}|${b}`];
  if (direct) return { e: direct, swapped: false };
  const rev = crossEntries[`${b}|${a}`];
  return rev ? { e: rev, swapped: true } : undefined;
}

export interface ReferenceCrossB {
  /** m3/mol */
  readonly value: number;
  /** the binary mixture model, as the library cites it */
  readonly model: string;
}

/** Reference cross B_ab, or undefined when the pair is not tabulated or T lies outside 230-480 K. */
export function referenceCrossB(a: string, b: string, temperatureK: number): ReferenceCrossB | undefined {
  const hit = crossEntry(a, b);
  if (!hit || !inRange(temperatureK)) return undefined;
  return { value: interpolate(hit.e.B, temperatureK) * 1e-6, model: hit.e.model };
}

/**
 * Reference cross third virial coefficients of a pair, oriented as asked:
 * aab = C_aab (a twice), abb = C_abb, m6/mol2; undefined when not tabulated.
 */
export function referenceCrossC(
  a: string,
  b: string,
  temperatureK: number,
): { aab: number; abb: number; model: string } | undefined {
  const hit = crossEntry(a, b) ?? averagedCEntry(a, b);
  if (!hit || !inRange(temperatureK) || !hit.e.C_aab || !hit.e.C_abb) return undefined;
  const first = interpolate(hit.e.C_aab, temperatureK) * 1e-12;
  const second = interpolate(hit.e.C_abb, temperatureK) * 1e-12;
  const model = hit.e.model;
  return hit.swapped ? { aab: second, abb: first, model } : { aab: first, abb: second, model };
}

/*
 * Pairs the library fits to mixture data but whose zero-density B_mix is not quadratic in
 * composition: the table gives, per temperature, the composition average of the implied B_ab (the
 * constant B_ab that fits the model's B_mix over composition best, least squares: weights (2x(1-x))^2 on
 * the implied values) and a standard uncertainty covering their spread, max(half the range, standard deviation).
 */
interface AveragedEntry {
  readonly a: string;
  readonly b: string;
  readonly model: string;
  readonly B: readonly number[];
  readonly B_u: readonly number[];
  /** the range of the implied B_ab over the compositions, per temperature */
  readonly B_min: readonly number[];
  readonly B_max: readonly number[];
}

const averagedEntries = crossTable.averaged as Record<
  string,
  AveragedEntry & { readonly C_aab?: readonly number[]; readonly C_abb?: readonly number[] }
>;

/** an averaged pair whose C_mix is nevertheless cubic in composition (the table's C acceptance) */
function averagedCEntry(a: string, b: string): { e: CrossEntry; swapped: boolean } | undefined {
  const direct = averagedEntries[`${a}|${b}`];
  if (direct?.C_aab) return { e: direct, swapped: false };
  const rev = averagedEntries[`${b}|${a}`];
  return rev?.C_aab ? { e: rev, swapped: true } : undefined;
}

export interface AveragedCrossB extends ReferenceCrossB {
  /** standard uncertainty covering the spread of the implied B_ab over composition, m3/mol */
  readonly u: number;
  /** the least and the largest implied B_ab over composition, m3/mol */
  readonly min: number;
  readonly max: number;
}

/**
 * Composition-averaged cross B_ab of a fitted pair whose implied B_ab varies with composition,
 * with its spread as standard uncertainty; undefined when the pair is not in that part of the
 * table or T lies outside 230-480 K (the virial model floors the relative uncertainty at 3 %).
 * Example: averagedCrossB('CO2', 'C2H6', 300) -> { value: -123.0 cm3/mol, u: 0.5 cm3/mol } (CO2-C2H6 at 300 K,
 *   the Kunz & Wagner 2012 mixture model through CoolProp 8.0.0, data/cross-virial-reference.json).
 */
export function averagedCrossB(a: string, b: string, temperatureK: number): AveragedCrossB | undefined {
  const e = averagedEntries[`${a}|${b}`] ?? averagedEntries[`${b}|${a}`];
  if (!e || !inRange(temperatureK)) return undefined;
  return {
    value: interpolate(e.B, temperatureK) * 1e-6,
    u: interpolate(e.B_u, temperatureK) * 1e-6,
    min: interpolate(e.B_min, temperatureK) * 1e-6,
    max: interpolate(e.B_max, temperatureK) * 1e-6,
    model: e.model,
  };
}

/** the species whose cross coefficients with `key` come from a tabulated reference mixture model, with the model */
export function referenceCrossPartners(key: string): { species: string; model: string; withC: boolean }[] {
  const out: { species: string; model: string; withC: boolean }[] = [];
  for (const e of Object.values(crossEntries)) {
    if (e.a === key) out.push({ species: e.b, model: e.model, withC: !!e.C_aab });
    else if (e.b === key) out.push({ species: e.a, model: e.model, withC: !!e.C_aab });
  }
  return out;
}
