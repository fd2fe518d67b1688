/**
 * The species of the equilibrium and their thermochemistry: every C/H/O/N/noble-gas
 * species of data/nasa7-thermo.json and data/nasa7-products.json (NASA TM-4513), with
 * graphite C(gr) as the one condensed phase, and the element matrix of each element set.
 * The NASA 7-coefficient polynomials give (T in K)
 *   cp/R = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4
 *   h/(RT) = a1 + a2 T/2 + a3 T^2/3 + a4 T^3/4 + a5 T^4/5 + a6/T
 *   s/R = a1 ln T + a2 T + a3 T^2/2 + a4 T^3/3 + a5 T^4/4 + a7
 * and are extrapolated outside their fitted range (the solver works up to 6000 K).
 */
import baseData from './data/nasa7-thermo.json' with { type: 'json' };
import productData from './data/nasa7-products.json' with { type: 'json' };
import { getSpecies } from './lookup.js';
import { fail } from './problems.js';
import type { Fractions } from './composition.js';

/** standard-state pressure of the NASA fits, Pa */
export const P_REF = 1e5;
/** elements with a complete product set in the data */
export const ELEMENTS = ['C', 'H', 'O', 'N', 'Ar', 'He', 'Ne', 'Kr', 'Xe'] as const;
/** the highest end temperature the equilibrium searches, K */
export const T_MAX_K = 6000;

export interface Fit {
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

function loadFits(): { gas: Fit[]; graphite?: Fit } {
  const gas: Fit[] = [];
  let graphite: Fit | undefined;
  for (const [k, r] of [
    ...Object.entries(baseData.species as Record<string, RawFit>),
    ...Object.entries(productData.species as Record<string, RawFit>),
  ]) {
    if (r.phase === 'solid') {
      if (k === 'C(gr)') graphite = toFit(k, r);
      continue;
    }
    if (Object.keys(r.composition).every((e) => allowed.has(e))) gas.push(toFit(k, r));
  }
  return { gas, graphite };
}

const loaded = loadFits();
/** the gas species the equilibrium treats */
export const GAS_FITS: readonly Fit[] = loaded.gas;
/** graphite, the one condensed phase */
export const GRAPHITE: Fit | undefined = loaded.graphite;

/** h/(RT), s/R and cp/R of one fit (the polynomial is extrapolated outside its range; see the module note) */
export function hsc(f: Fit, t: number, out: { h: number; s: number; cp: number }) {
  const a = t <= f.tMid ? f.low : f.high;
  out.cp = a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4])));
  out.h = a[0] + t * (a[1] / 2 + t * (a[2] / 3 + t * (a[3] / 4 + (t * a[4]) / 5))) + a[5] / t;
  out.s = a[0] * Math.log(t) + t * (a[1] + t * (a[2] / 2 + t * (a[3] / 3 + (t * a[4]) / 4))) + a[6];
}

/** the species and element matrix for one set of elements, built once */
export interface System {
  readonly elements: readonly string[];
  readonly species: readonly Fit[];
  /** a[j * m + i] */
  readonly a: Float64Array;
  readonly carbon: number;
  readonly graphite: boolean;
}

const systems = new Map<string, System>();
export function systemFor(elements: readonly string[]): System {
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

export function elementTotals(y: Fractions): { elements: string[]; b: number[]; sum: number } {
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

export const EQUILIBRIUM_SPECIES_COUNT = GAS_FITS.length + (GRAPHITE ? 1 : 0);
