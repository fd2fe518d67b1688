/**
 * Ideal-gas thermochemistry from NASA 7-coefficient polynomials
 * (McBride, Gordon & Reno, NASA TM-4513, 1993; data/nasa7-thermo.json):
 *   cp/R = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4
 *   h/(RT) = a1 + a2 T/2 + a3 T^2/3 + a4 T^3/4 + a5 T^4/5 + a6/T
 *   s/R = a1 ln T + a2 T + a3 T^2/2 + a4 T^3/3 + a5 T^4/4 + a7
 */
import data from './data/nasa7-thermo.json' with { type: 'json' };
import { R } from './constants.js';

interface Nasa7 {
  readonly nasaName: string;
  readonly temperatureRanges: readonly number[];
  readonly coefficients: readonly (readonly number[])[];
}

const fits = data.species as Record<string, Nasa7>;

export function hasThermo(key: string): boolean {
  return key in fits;
}

export function thermoRangeK(key: string): { min: number; max: number } | undefined {
  const f = fits[key];
  if (!f) return undefined;
  return { min: f.temperatureRanges[0], max: f.temperatureRanges[f.temperatureRanges.length - 1] };
}

function coefficientsAt(key: string, temperatureK: number): readonly number[] {
  return fitCoefficientsAt(key, fits[key], temperatureK);
}

/** the coefficients of `key`'s fit `f` (looked up by the caller) at T; refuses a missing fit or T outside it */
function fitCoefficientsAt(key: string, f: Nasa7 | undefined, temperatureK: number): readonly number[] {
  if (!f) throw new Error(`no NASA polynomial for ${key}`);
  const r = f.temperatureRanges;
  if (temperatureK < r[0] * 0.9 || temperatureK > r[r.length - 1]) {
    throw new Error(`${key}: ${temperatureK} K is outside the NASA fit range ${r[0]}-${r[r.length - 1]} K`);
  }
  if (r.length === 2 || temperatureK <= r[1]) return f.coefficients[0];
  return f.coefficients[1];
}

/**
 * Molar heat capacity at constant pressure, J/(mol K).
 * Example: cpMolar('N2', 298.15) -> 29.12 J/(mol K) (CoolProp 8.0.0, ideal-gas cp of N2: 29.125 J/(mol K)).
 */
export function cpMolar(key: string, temperatureK: number): number {
  const a = coefficientsAt(key, temperatureK);
  const t = temperatureK;
  return R * (a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4]))));
}

/**
 * Molar enthalpy including the enthalpy of formation at 298.15 K, J/mol.
 * Example: enthalpyMolar('CO2', 298.15) -> -393.5 kJ/mol (the enthalpy of formation of CO2, -393.51 kJ/mol,
 *   CODATA Key Values 1989).
 */
export function enthalpyMolar(key: string, temperatureK: number): number {
  return enthalpyOf(coefficientsAt(key, temperatureK), temperatureK);
}

/** h(T) from the fit's coefficients at T, J/mol */
function enthalpyOf(a: readonly number[], t: number): number {
  return R * t * (a[0] + t * (a[1] / 2 + t * (a[2] / 3 + t * (a[3] / 4 + (t * a[4]) / 5))) + a[5] / t);
}

/**
 * The enthalpy of amounts `n` (mol per species) as a function of T, J: sum of n_k h_k(T) in the
 * order of `n`'s keys, the fits looked up once (a flame temperature evaluates it some 30 times).
 * The same arithmetic as adding n_k * enthalpyMolar(k, T) in that order, so the same number to the
 * last bit, and the same refusal (a species without a fit, T outside one) at the same species.
 */
export function enthalpySum(n: Readonly<Record<string, number>>): (temperatureK: number) => number {
  const keys = Object.keys(n);
  const amounts = keys.map((k) => n[k]);
  const fitted = keys.map((k) => fits[k] as Nasa7 | undefined);
  return (t) => {
    let h = 0;
    for (let i = 0; i < keys.length; i++)
      h += amounts[i] * enthalpyOf(fitCoefficientsAt(keys[i], fitted[i], t), t);
    return h;
  };
}

/** Molar standard-state entropy at 1 bar, J/(mol K). */
export function entropyMolar(key: string, temperatureK: number): number {
  const a = coefficientsAt(key, temperatureK);
  const t = temperatureK;
  return R * (a[0] * Math.log(t) + t * (a[1] + t * (a[2] / 2 + t * (a[3] / 3 + (t * a[4]) / 4))) + a[6]);
}

/** Ideal-gas ratio of heat capacities of a mixture, gamma = cp/(cp - R). */
export function gammaMixture(y: Readonly<Record<string, number>>, temperatureK: number): number {
  let cp = 0;
  let s = 0;
  for (const [k, v] of Object.entries(y)) {
    cp += v * cpMolar(k, temperatureK);
    s += v;
  }
  cp /= s;
  return cp / (cp - R);
}
