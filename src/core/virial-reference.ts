/**
 * Reference pure-fluid virial coefficients B(T) and C(T), tabulated from the
 * reference equations of state (data/virial-reference.json, generated with
 * CoolProp 8.0.0 by scripts/reference/gen_virial.py) and interpolated by a
 * four-point Lagrange polynomial in 1/T.
 */
import table from './data/virial-reference.json' with { type: 'json' };

interface TableEntry {
  readonly fluid: string;
  readonly B: readonly number[]; // cm3/mol
  readonly C: readonly number[]; // cm6/mol2
}

const temperatures: readonly number[] = table.temperatures_K;
const entries = table.species as Record<string, TableEntry>;

export const VIRIAL_TABLE_RANGE_K = { min: temperatures[0], max: temperatures[temperatures.length - 1] } as const;
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
 * outside the table (230-480 K). Example: Ar at 298.15 K -> -15.55e-6 m3/mol.
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
