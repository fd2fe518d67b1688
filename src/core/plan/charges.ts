/**
 * Charges: the openings of the sources' valves, in fill order. A source may be filled in
 * more than one charge (e.g. CH4, Ar up to a stop reading, O2, then Ar to the final
 * pressure). This module checks a requested list of charges against the plan's sources,
 * and turns a list of charges (each non-last one with its stop reading) into the mol each
 * charge delivers:
 *  - a charge with a stop reading P_stop delivers the a mol of its source that bring the
 *    tank (the gas already in it plus a of the source, real gas, at the tank temperature)
 *    to exactly P_stop:  P_stop = rho R T (1 + B_mix(y) rho + C_mix(y) rho^2),
 *    rho = (n + a) / V, y the composition of the n mol in the tank plus a of the source;
 *    P rises with a, and a is found by bisection on [0, what is left of the allocation];
 *  - a source's last charge delivers the rest of its allocation (amounts.ts).
 */
import { bMix, cMix, pressureFromDensity } from '../mixture-eos.js';
import type { Fractions } from '../composition.js';
import type { GasSource } from '../supply.js';
import { fail } from '../problems.js';
import type { PlanBasis } from './validate.js';
import { eosComposition } from './amounts.js';
import type { ChargeRequest } from './types.js';

/**
 * The charge of every fill, from the source ids in fill order: the k-th fill from a source is
 * its charge k, of as many as the list holds ("Ar, O2, Ar" -> Ar 1 of 2, O2 1 of 1, Ar 2 of 2).
 * One source id is one cylinder: the plan numbers its steps so, and a record that predates the
 * charge numbers is counted the same way.
 */
export function chargeNumbers(sourceIds: readonly string[]): { number: number; of: number }[] {
  const total = new Map<string, number>();
  for (const id of sourceIds) total.set(id, (total.get(id) ?? 0) + 1);
  const seen = new Map<string, number>();
  return sourceIds.map((id) => {
    const number = (seen.get(id) ?? 0) + 1;
    seen.set(id, number);
    return { number, of: total.get(id)! };
  });
}

export interface Charge {
  readonly source: GasSource;
  /** absolute tank pressure to stop this charge at, Pa; only on a charge that is not its source's last */
  readonly stopPa?: number;
}

/** where a problem with the charges points: the fill order */
const AT_ORDER = { field: 'order' } as const;

/** true when charge k is the last charge of its source */
export function isLastCharge(charges: readonly Charge[], k: number): boolean {
  const id = charges[k].source.id;
  return !charges.slice(k + 1).some((c) => c.source.id === id);
}

/**
 * The requested charges, checked against the plan's sources and mapped onto them (by id):
 * every source charged at least once and nothing else, no source in two charges in a row,
 * and a stop reading only on a charge that is not its source's last. Refuses each with a
 * `charges-invalid` problem at the field `order`.
 */
export function checkCharges(
  requests: readonly ChargeRequest[],
  sources: readonly GasSource[],
  order: 'given' | 'recommend',
): Charge[] {
  if (order !== 'given') fail({ code: 'charges-invalid', kind: 'not-given-order' }, AT_ORDER);
  const byId = new Map(sources.map((s) => [s.id, s]));
  const unknown = [...new Set(requests.map((r) => r.source.id).filter((id) => !byId.has(id)))];
  if (unknown.length)
    fail(
      { code: 'charges-invalid', kind: 'unknown-source', sources: unknown, choices: [...byId.keys()] },
      AT_ORDER,
    );
  const missing = sources.map((s) => s.id).filter((id) => !requests.some((r) => r.source.id === id));
  if (missing.length)
    fail({ code: 'charges-invalid', kind: 'source-not-charged', sources: missing }, AT_ORDER);
  const charges = requests.map((r): Charge => ({ source: byId.get(r.source.id)!, stopPa: r.stopPa }));
  charges.forEach((c, k) => {
    if (k > 0 && charges[k - 1].source.id === c.source.id)
      fail({ code: 'charges-invalid', kind: 'consecutive', source: c.source.id, charge: k + 1 }, AT_ORDER);
    if (c.stopPa !== undefined && isLastCharge(charges, k))
      fail(
        {
          code: 'charges-invalid',
          kind: 'stop-on-last',
          source: c.source.id,
          charge: k + 1,
          stopPa: c.stopPa,
        },
        AT_ORDER,
      );
  });
  return charges;
}

/** the gas in the tank: its parts (sources with mol, or the initial composition) */
interface TankGas {
  readonly parts: { source: GasSource | Fractions; mol: number }[];
  readonly mol: number;
}

/** the real-gas pressure of the tank gas with `addMol` of `source` added, Pa */
export function pressureWith(basis: PlanBasis, gas: TankGas, source: GasSource, addMol: number): number {
  const n = gas.mol + addMol;
  if (!(n > 0)) return 0;
  const y = eosComposition(addMol > 0 ? [...gas.parts, { source, mol: addMol }] : gas.parts);
  return pressureFromDensity(
    n / basis.volumeM3,
    basis.temperatureK,
    bMix(basis.model, y),
    cMix(basis.model, y),
  );
}

/** bisections of the stop amount: [0, allocation] to 2^-64 of it, below double precision */
const STOP_BISECTIONS = 64;
/** secant steps before the bisection, until a step is within STOP_NARROW of the amount */
const STOP_SECANTS = 30;
const STOP_NARROW = 1e-15;

/** the mol of `source` that bring the tank gas to `stopPa` (between 0 and `maxMol`, P rising with it) */
function molToStop(
  basis: PlanBasis,
  gas: TankGas,
  source: GasSource,
  stopPa: number,
  maxMol: number,
): number {
  let lo = 0;
  let hi = maxMol;
  // the bracket narrowed first around the secant method's root (P is smooth and nearly linear
  // in the amount): kept only when P(lo) < stopPa <= P(hi) holds at its ends, as the bisection
  // keeps it; the bisection then finishes it (or does all of it when the secant does not converge)
  const f = (mol: number) => pressureWith(basis, gas, source, mol) - stopPa;
  const fLo = f(lo);
  const fHi = f(hi);
  if (fLo < 0 && fHi >= 0) {
    let x0 = lo;
    let f0 = fLo;
    let x1 = hi - (fHi * (hi - lo)) / (fHi - fLo);
    let f1 = f(x1);
    for (let i = 0; i < STOP_SECANTS && f1 !== 0 && Math.abs(x1 - x0) > STOP_NARROW * Math.abs(x1); i++) {
      const x2 = x1 - (f1 * (x1 - x0)) / (f1 - f0);
      if (!Number.isFinite(x2)) break;
      [x0, f0, x1, f1] = [x1, f1, x2, f(x2)];
    }
    const d = 2 * Math.abs(x1 - x0) + STOP_NARROW * Math.abs(x1);
    const a = Math.max(lo, x1 - d);
    const b = Math.min(hi, x1 + d);
    if (a < b && f(a) < 0 && f(b) >= 0) [lo, hi] = [a, b];
  }
  for (let i = 0; i < STOP_BISECTIONS && hi > lo; i++) {
    const mid = (lo + hi) / 2;
    if (mid === lo || mid === hi) break;
    if (pressureWith(basis, gas, source, mid) < stopPa) lo = mid;
    else hi = mid;
  }
  const pLo = pressureWith(basis, gas, source, lo);
  const pHi = pressureWith(basis, gas, source, hi);
  return Math.abs(pLo - stopPa) <= Math.abs(pHi - stopPa) ? lo : hi;
}

/**
 * The mol each charge delivers (see the module comment). `amountsMol` is the allocation, in
 * the order of `sources`. Refuses, as `split-stop` problems at the field `order`: a stop at or
 * below the reading before it, a stop at or beyond the reading the source's last charge
 * reaches, and a stop that needs all of the source's allocation or more (with the largest
 * stop it allows). A non-last charge without a stop is refused too (the sequence stage
 * chooses every missing stop before this is called).
 */
export function chargeAmounts(
  basis: PlanBasis,
  charges: readonly Charge[],
  sources: readonly GasSource[],
  amountsMol: readonly number[],
): number[] {
  return walkCharges(basis, charges, sources, amountsMol).mols;
}

/**
 * The charges with a stop reading on every non-last charge that has none: the reading after
 * it delivers `share(k)` of what is left of its source's allocation (0 < share < 1). Used by
 * the split-point search (split-point.ts), which searches the share and reads off the stop.
 */
export function stopsFromShares(
  basis: PlanBasis,
  charges: readonly Charge[],
  sources: readonly GasSource[],
  amountsMol: readonly number[],
  share: (k: number) => number | undefined,
): Charge[] {
  const { stops } = walkCharges(basis, charges, sources, amountsMol, share);
  return charges.map((c, k) =>
    c.stopPa !== undefined || stops[k] === undefined ? c : { source: c.source, stopPa: stops[k] },
  );
}

/**
 * The readings around non-last charge k, with the charges before it as given: the reading
 * before it, and the reading with all that is left of its source's allocation (a stop must
 * lie between them).
 */
export function splitRange(
  basis: PlanBasis,
  charges: readonly Charge[],
  k: number,
  sources: readonly GasSource[],
  amountsMol: readonly number[],
): { previousPa: number; largestPa: number } {
  const w = walkCharges(basis, charges.slice(0, k), sources, amountsMol, undefined, charges);
  const rest = w.left.get(charges[k].source.id) ?? 0;
  return { previousPa: w.previousPa, largestPa: pressureWith(basis, w.gas, charges[k].source, rest) };
}

interface Walk {
  readonly mols: number[];
  readonly stops: (number | undefined)[];
  readonly gas: TankGas;
  readonly left: Map<string, number>;
  readonly previousPa: number;
}

/**
 * Charge by charge: the mol of each, the reading after each non-last charge, the tank gas
 * and what is left of each allocation. `all` is the whole list when `charges` is a head of it
 * (which charges are last is judged on the whole list).
 */
function walkCharges(
  basis: PlanBasis,
  charges: readonly Charge[],
  sources: readonly GasSource[],
  amountsMol: readonly number[],
  share?: (k: number) => number | undefined,
  all: readonly Charge[] = charges,
): Walk {
  const left = new Map(sources.map((s, i) => [s.id, amountsMol[i]]));
  const { initial } = basis;
  const gas: TankGas = initial
    ? { parts: [{ source: initial.composition, mol: initial.amountMol }], mol: initial.amountMol }
    : { parts: [], mol: 0 };
  let prevPa = initial?.pressurePa ?? 0;
  const stops: (number | undefined)[] = [];
  const mols = charges.map((c, k) => {
    const id = c.source.id;
    const rest = left.get(id) ?? 0;
    const f = c.stopPa === undefined ? share?.(k) : undefined;
    let mol: number;
    if (isLastCharge(all, k)) mol = rest;
    else if (f !== undefined) mol = f * rest;
    else mol = stopMol(basis, { charges: all, k, gas, left, previousPa: prevPa });
    left.set(id, rest - mol);
    gas.parts.push({ source: c.source, mol });
    (gas as { mol: number }).mol += mol;
    prevPa = pressureWith(basis, gas, c.source, 0);
    stops.push(isLastCharge(all, k) ? undefined : prevPa);
    return mol;
  });
  return { mols, stops, gas, left, previousPa: prevPa };
}

/** the mol a non-last charge with a stop reading delivers, or the refusal of its stop */
function stopMol(
  basis: PlanBasis,
  at: {
    charges: readonly Charge[];
    k: number;
    gas: TankGas;
    left: ReadonlyMap<string, number>;
    previousPa: number;
  },
): number {
  const { charges, k, gas, left, previousPa } = at;
  const c = charges[k];
  const where = { source: c.source.id, charge: k + 1 };
  if (c.stopPa === undefined) fail({ code: 'split-stop', kind: 'stop-missing', ...where }, AT_ORDER);
  const stopPa = c.stopPa;
  if (!(stopPa > previousPa))
    fail({ code: 'split-stop', kind: 'not-above-previous', ...where, stopPa, previousPa }, AT_ORDER);
  const lastPa = lastChargePressure(basis, charges, k, gas, left);
  // at the last charge's reading within rounding (1e-12) counts as at it
  if (stopPa >= lastPa * (1 - 1e-12))
    fail({ code: 'split-stop', kind: 'not-below-last', ...where, stopPa, lastPa }, AT_ORDER);
  const rest = left.get(c.source.id) ?? 0;
  const largestPa = pressureWith(basis, gas, c.source, rest);
  if (stopPa >= largestPa)
    fail({ code: 'split-stop', kind: 'over-allocation', ...where, stopPa, largestPa }, AT_ORDER);
  return molToStop(basis, gas, c.source, stopPa, rest);
}

/**
 * The reading the last charge of charge k's source reaches: the tank gas now plus what is
 * left of the allocation of every source charged from k up to that last charge (exact when
 * no other source has a stop in between; else an upper bound).
 */
function lastChargePressure(
  basis: PlanBasis,
  charges: readonly Charge[],
  k: number,
  gas: TankGas,
  left: ReadonlyMap<string, number>,
): number {
  const id = charges[k].source.id;
  let last = k;
  for (let j = k + 1; j < charges.length; j++) if (charges[j].source.id === id) last = j;
  const parts = [...gas.parts];
  let mol = gas.mol;
  const seen = new Set<string>();
  for (let j = k; j <= last; j++) {
    const s = charges[j].source;
    if (seen.has(s.id)) continue;
    seen.add(s.id);
    const a = left.get(s.id) ?? 0;
    parts.push({ source: s, mol: a });
    mol += a;
  }
  return pressureWith(basis, { parts, mol }, charges[k].source, 0);
}
