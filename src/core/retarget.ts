/**
 * Re-targeting during a fill: after the actual readings of the first fills, the
 * remaining targets that keep the design as close as possible. Priorities: phi
 * first, then the dilution (diluent fraction), then the final pressure; the tank's
 * working limit is never passed. Solved as one weighted non-negative least-squares
 * problem in the amounts of the remaining fills, the weights 1e6 : 1e3 : 1 : 1e-3
 * (phi : dilution : total amount : each design fraction) standing in for the
 * strict priority order. Says which property had to give. A split source's charges share one
 * column; a charge that is not its source's last is held at its stop reading (the split point is
 * part of the plan's safety design), and a stop that cannot be kept is said with its numbers.
 */
import type { Design } from './composition.js';
import { equivalenceRatio } from './composition.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { nnls } from './nnls.js';
import { bMix, cMix, densityFromPressure, pressureFromDensity, virialModel } from './mixture-eos.js';
import { inverseSetup, invertReadings } from './recheck.js';
import type { GasSource } from './supply.js';
import type { Tolerance } from './planner.js';
import { fail } from './problems.js';

export interface RetargetInput {
  readonly design: Design;
  readonly tolerance: Tolerance;
  /** every fill of the plan, in fill order */
  readonly sources: readonly GasSource[];
  /** actual readings of the first fills (absolute Pa, K) */
  readonly done: readonly { readonly pressurePa: number; readonly temperatureK: number }[];
  /** temperature expected for the remaining fills, K */
  readonly temperatureK: number;
  readonly finalPressurePa: number;
  readonly volumeM3: number;
  readonly workingLimitPa?: number;
  /**
   * the last fill's pressure band (Pa): when the working limit holds the final pressure, the final
   * target is put this far below the limit, so that a reading inside the band never passes the
   * limit. Default 0.
   */
  readonly finalBandPa?: number;
  /** a top-up: the gas in the tank before the first fill (its composition, and its reading) */
  readonly initial?: {
    readonly composition: Readonly<Record<string, number>>;
    readonly pressurePa: number;
    readonly temperatureK: number;
  };
  /**
   * amounts in the tank scaled by this factor (0 < f <= 1): the tank vented or pumped back after
   * the last reading, which removes gas of the same composition. Default 1.
   */
  readonly ventFactor?: number;
  /** words a pressure in the message (default: Pa) */
  readonly formatPressure?: (pressurePa: number) => string;
  /**
   * how the message writes the final pressure the working limit holds (the shell: on the last fill's
   * gauge, to its display step, so the stop screen says one number); default formatPressure
   */
  readonly formatFinalPressure?: (pressurePa: number) => string;
  /**
   * the charge of each fill, in the order of `sources` (needed when a source is filled in more
   * than one charge): a charge that is not its source's last carries its stop reading (absolute,
   * at the fill temperature, Pa), which the re-target keeps where it can (see `retarget`)
   */
  readonly charges?: readonly RetargetCharge[];
}

/** charge `number` of the `of` charges of a fill's source; `stopPa` on every charge but the last */
export interface RetargetCharge {
  readonly number: number;
  readonly of: number;
  readonly stopPa?: number;
}

/** a stop reading of a charge still ahead: kept, or not (and why) */
export interface RetargetStop {
  /** 1-based step of the charge */
  readonly step: number;
  readonly stopPa: number;
  /** the tank pressure the re-targeted fills reach before this charge, Pa */
  readonly beforePa: number;
  /** passed: the tank is past the stop before the charge; limit: the stop is at or above the working limit */
  readonly kept: true | 'passed' | 'limit';
}

export type Kept = 'phi' | 'dilution' | 'pressure';

export interface RetargetResult {
  readonly remaining: readonly {
    readonly step: number;
    readonly source: GasSource;
    readonly targetPa: number;
    readonly incrementPa: number;
    readonly amountMol: number;
    /** the tank's composition after this fill (a source's unidentified remainder as its main gas) */
    readonly compositionAfter: Readonly<Record<string, number>>;
  }[];
  /** the tank's composition now (after the readings, and the vent if any); empty for an empty tank */
  readonly nowComposition: Readonly<Record<string, number>>;
  readonly predicted: {
    readonly composition: Record<string, number>;
    readonly phi?: number;
    readonly diluentFraction: number;
    readonly pressurePa: number;
  };
  readonly gave: readonly Kept[];
  /** the working limit holds the final pressure (or the tank is at or above it already) */
  readonly limitBinds: boolean;
  /** tank pressure now (after the readings, and the vent if any), at the fill temperature, Pa */
  readonly nowPa: number;
  readonly message: string;
  /** the stops of the charges still ahead that are not their source's last, in fill order */
  readonly stops: readonly RetargetStop[];
}

const W_LIMIT = 1e9;
const W_PHI = 1e6;
const W_DIL = 1e3;
const W_TOTAL = 1;
const W_SPECIES = 1e-3;

/** the problem the remaining fills are solved in: species, what is in the tank now, what each fill adds */
interface RetargetProblem {
  readonly input: RetargetInput;
  readonly species: readonly string[];
  readonly model: ReturnType<typeof virialModel>;
  readonly T: number;
  readonly V: number;
  /** amount of each species in the tank now (after the readings, and the vent if any), mol */
  readonly have: Float64Array;
  /** molar density in the tank now, mol/m^3 */
  readonly rhoNow: number;
  readonly rest: readonly GasSource[];
  /**
   * the distinct sources of the remaining fills (the charges of one source share one column: their
   * columns would be equal), and the column of each remaining fill
   */
  readonly cols: readonly GasSource[];
  readonly colOf: readonly number[];
  /** the species amounts one mole of each column's source adds */
  readonly w: readonly Float64Array[];
  /** target total amount at the design pressure, with the design composition, mol */
  readonly Ntarget: number;
  readonly dil: ReadonlySet<string>;
  /** oxygen demand of each species, and of the design's fuel at Ntarget */
  readonly d: readonly number[];
  readonly fuelDemand: number;
}

type Prediction = {
  n: Float64Array;
  comp: Record<string, number>;
  P: number;
  phi: number | undefined;
  dilF: number;
};

/** iterations of the search for amounts that end at the working limit (aim, then scale back) */
const AIM_ITERATIONS = 8;
const SCALE_HALVINGS = 60;

/**
 * The remaining targets after the readings done (module comment). A source filled in more than one
 * charge needs `charges`: its charges share one column of the solve, a charge that is not its
 * source's last keeps its stop reading where it can (`retargetHolding`), and its last charge takes
 * the rest of its gas. Throws a RangeError for charges that do not match the fills.
 */
export function retarget(input: RetargetInput): RetargetResult {
  checkCharges(input);
  const k = nextStop(input);
  return k === undefined ? retargetFree(input).result : retargetHolding(input, k);
}

/** the re-target with every remaining fill free (no stop of a charge ahead), and its problem and amounts */
function retargetFree(input: RetargetInput): { result: RetargetResult; pr: RetargetProblem } {
  const pr = retargetProblem(input);
  const { rest, T } = pr;
  const limit = input.workingLimitPa;
  // significant digits without an exponent (205050 Pa, not 2.0505e+5 Pa)
  const fmtP = input.formatPressure ?? ((p: number) => `${Number(p.toPrecision(5))} Pa`);
  const haveComp = compOf(pr, pr.have);
  const filled = input.done.length > 0 || input.initial !== undefined;
  const nowPa = filled
    ? pressureFromDensity(pr.rhoNow, T, bMix(pr.model, haveComp), cMix(pr.model, haveComp))
    : 0;
  const { a, pred, limitBinds } = amountsWithinLimit(pr, nowPa);
  const gave = gaveOf(pr, pred);
  const atLimit = limit !== undefined && nowPa >= limit;
  const message = atLimit
    ? `the tank is at ${fmtP(nowPa)}, at or above its working limit ${fmtP(limit)}` +
      (rest.length === 0 ? '' : `: no further fill can be made within the limit`)
    : messageOf(pr, pred, gave, limitBinds, fmtP);
  const result = {
    remaining: remainingTargets(pr, a, filled),
    predicted: { composition: pred.comp, phi: pred.phi, diluentFraction: pred.dilF, pressurePa: pred.P },
    gave,
    limitBinds,
    nowPa,
    nowComposition: haveComp,
    message,
    stops: [],
  };
  return { result, pr };
}

/** a source in more than one remaining fill needs the charges, and each charge but the last its stop */
function checkCharges(input: RetargetInput): void {
  const { sources, charges } = input;
  if (charges !== undefined && charges.length !== sources.length)
    throw new RangeError(`charges: ${charges.length} given for ${sources.length} fills`);
  sources.forEach((s, j) => {
    if (j < input.done.length) return;
    const c = charges?.[j];
    const again = sources.some((x, i) => i > j && x.id === s.id);
    if (again && (c === undefined || !(c.number < c.of) || !(c.stopPa! > 0)))
      throw new RangeError(
        `fill ${j + 1} (${s.id}) is not its source's last charge: its charge and stop reading are needed`,
      );
  });
}

/** the index of the first remaining fill that is a charge, not its source's last, with a stop */
function nextStop(input: RetargetInput): number | undefined {
  const { charges } = input;
  for (let k = input.done.length; k < (charges?.length ?? 0); k++)
    if (charges![k].number < charges![k].of && charges![k].stopPa !== undefined) return k;
  return undefined;
}

/**
 * The re-target with the stop of charge k (not its source's last) held: the fills before it as the
 * free re-target puts them (each of them is its source's last charge), charge k to its stop reading
 * (the amount found by bisection on the real-gas pressure), and the fills after it re-targeted from
 * the tank at the stop (as a top-up, so a vent before it is counted once), their later stops in turn.
 * A stop the tank is already past before the charge, or one at or above the working limit, cannot be
 * kept: the charge adds no gas, the source's gas goes to its later charges, and the message says so.
 */
function retargetHolding(input: RetargetInput, k: number): RetargetResult {
  const { result: free, pr } = retargetFree(input);
  const m = input.done.length;
  const n = Float64Array.from(pr.have);
  for (let j = m; j < k; j++)
    pr.w[pr.colOf[j - m]].forEach((v, i) => (n[i] += free.remaining[j - m].amountMol * v));
  const pressureOf = (v: Float64Array) => {
    const comp = compOf(pr, v);
    const tot = v.reduce((p, q) => p + q, 0);
    return tot > 0 ? pressureFromDensity(tot / pr.V, pr.T, bMix(pr.model, comp), cMix(pr.model, comp)) : 0;
  };
  const beforePa = pressureOf(n);
  const stopPa = input.charges![k].stopPa!;
  const limit = input.workingLimitPa;
  const kept: RetargetStop['kept'] =
    limit !== undefined && stopPa >= limit ? 'limit' : beforePa >= stopPa ? 'passed' : true;
  const wk = pr.w[pr.colOf[k - m]];
  const ak = kept === true ? amountToStop(n, wk, stopPa, pressureOf) : 0;
  wk.forEach((v, i) => (n[i] += ak * v));
  const atPa = kept === true ? stopPa : beforePa;
  const tail = retarget({
    ...input,
    sources: input.sources.slice(k + 1),
    charges: input.charges!.slice(k + 1),
    done: [],
    ventFactor: undefined,
    initial: { composition: compOf(pr, n), pressurePa: atPa, temperatureK: pr.T },
  });
  const stop: RetargetStop = { step: k + 1, stopPa, beforePa, kept };
  const fmtP = input.formatPressure ?? ((p: number) => `${Number(p.toPrecision(5))} Pa`);
  const note = kept === true ? '' : stopNote(input, stop, fmtP);
  return {
    ...tail,
    remaining: [
      ...free.remaining.slice(0, k - m),
      {
        step: k + 1,
        source: input.sources[k],
        targetPa: atPa,
        incrementPa: atPa - beforePa,
        amountMol: ak,
        compositionAfter: compOf(pr, n),
      },
      ...tail.remaining.map((x) => ({ ...x, step: x.step + k + 1 })),
    ],
    // the tank now, and whether the limit holds it, are the actual readings' (not the held stop's)
    nowPa: free.nowPa,
    nowComposition: free.nowComposition,
    limitBinds: free.limitBinds || tail.limitBinds,
    message: note ? `${note}; ${tail.message}` : tail.message,
    stops: [stop, ...tail.stops.map((x) => ({ ...x, step: x.step + k + 1 }))],
  };
}

/** the amount of a fill (adding w per mole to the tank n) that brings the tank to stopPa: bisection */
function amountToStop(
  n: Float64Array,
  w: Float64Array,
  stopPa: number,
  pressureOf: (v: Float64Array) => number,
): number {
  const at = (x: number) => pressureOf(n.map((v, i) => v + x * w[i]));
  let hi = 1e-6 + n.reduce((p, q) => p + q, 0);
  for (let it = 0; at(hi) < stopPa; it++) {
    if (it > 200)
      fail({
        code: 'not-converged',
        computation: 'amount to a stop reading',
        iterations: it,
        residual: stopPa - at(hi),
        tolerance: 0,
      });
    hi *= 2;
  }
  let lo = 0;
  for (let it = 0; it < SCALE_HALVINGS; it++) {
    const mid = (lo + hi) / 2;
    if (at(mid) < stopPa) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** a stop that cannot be kept, in words: the numbers, and what it means for the safety design */
function stopNote(input: RetargetInput, stop: RetargetStop, fmtP: (p: number) => string): string {
  const k = stop.step - 1;
  const src = input.sources[k];
  const c = input.charges![k];
  const last = input.sources.map((x) => x.id).lastIndexOf(src.id) + 1;
  const why =
    stop.kept === 'limit'
      ? `its stop ${fmtP(stop.stopPa)} is at or above the tank's working limit ${fmtP(input.workingLimitPa!)}`
      : `the tank is at ${fmtP(stop.beforePa)} before it, past its stop ${fmtP(stop.stopPa)}`;
  return (
    `the stop of fill ${stop.step} (charge ${c.number} of ${c.of} of ${src.id}) cannot be kept: ${why}; ` +
    `that charge adds no gas and the rest of ${src.id} goes in its later charges (the last is fill ${last}). ` +
    `The stop is part of the plan's safety design (the split point keeps the later fills out of the ` +
    `flammable region): the fills after it start from another tank than the plan reviewed, so have the ` +
    `remaining sequence reviewed before going on`
  );
}

function retargetProblem(input: RetargetInput): RetargetProblem {
  const { design, sources, volumeM3: V } = input;
  const T = input.temperatureK;
  const species = [
    ...new Set([
      ...sources.flatMap((s) => Object.keys(s.composition)),
      ...Object.keys(design.composition),
      ...Object.keys(input.initial?.composition ?? {}),
    ]),
  ];
  const model = virialModel(species, T);
  const f = input.ventFactor ?? 1;
  if (!(f > 0 && f <= 1)) throw new RangeError(`ventFactor ${f} must be in (0, 1]`);
  const { have, rhoNow } = tankNow(input, species, f);
  const rest = sources.slice(input.done.length);
  const cols = rest.filter((s, j) => rest.findIndex((x) => x.id === s.id) === j);
  const colOf = rest.map((s) => cols.findIndex((x) => x.id === s.id));
  const w = cols.map((s) => {
    const v = new Float64Array(species.length);
    for (const [k, x] of Object.entries(s.composition)) v[species.indexOf(k)] += x;
    v[species.indexOf(s.mainSpecies)] += s.unidentified;
    return v;
  });
  const yd = design.composition;
  const Ntarget = densityFromPressure(input.finalPressurePa, T, bMix(model, yd), cMix(model, yd)) * V;
  const dil = new Set(Object.keys(design.groups.diluent));
  const d = species.map((k) => oxygenDemand(getSpecies(k).elements));
  const fuelDemand = species.reduce((a, k, i) => a + Math.max(d[i], 0) * (yd[k] ?? 0), 0) * Ntarget;
  return { input, species, model, T, V, have, rhoNow, rest, cols, colOf, w, Ntarget, dil, d, fuelDemand };
}

/** what is in the tank now (mol of each species, and the molar density), scaled by the vent factor f */
function tankNow(
  input: RetargetInput,
  species: readonly string[],
  f: number,
): { have: Float64Array; rhoNow: number } {
  const { sources, done, volumeM3: V } = input;
  const init = input.initial;
  const m = done.length;
  const have = new Float64Array(species.length);
  if (m > 0) {
    const setup = inverseSetup(
      sources
        .slice(0, m)
        .map((s, i) => ({ source: s, pressurePa: done[i].pressurePa, temperatureK: done[i].temperatureK })),
      init
        ? {
            composition: { ...init.composition },
            pressurePa: init.pressurePa,
            temperatureK: init.temperatureK,
          }
        : undefined,
    );
    const res = invertReadings(
      setup,
      undefined,
      done.map((d) => d.pressurePa),
    );
    setup.species.forEach((k, i) => (have[species.indexOf(k)] = res.amounts[i] * V * f));
    return { have, rhoNow: res.rho[m - 1] * f };
  }
  if (init) {
    // the gas already in the tank, from its reading at its own temperature
    const m0 = virialModel([...species], init.temperatureK);
    const rho0 = densityFromPressure(
      init.pressurePa,
      init.temperatureK,
      bMix(m0, init.composition),
      cMix(m0, init.composition),
    );
    for (const [k, y] of Object.entries(init.composition)) have[species.indexOf(k)] += y * rho0 * V * f;
    return { have, rhoNow: rho0 * f };
  }
  return { have, rhoNow: 0 };
}

/** the weighted least-squares solve for the amounts of the remaining fills, aiming the total at totalTarget */
function solveAmounts(pr: RetargetProblem, totalTarget: number, totalWeight: number): number[] {
  const { species, have, w, Ntarget, dil, d, fuelDemand } = pr;
  const { design } = pr.input;
  const yd = design.composition;
  const phi = design.phi;
  const xd = design.diluentFraction;
  const rows: number[][] = [];
  const rhs: number[] = [];
  const addRow = (coef: (i: number) => number, constant: number, scale: number, weight: number) => {
    rows.push(w.map((wj) => (weight * wj.reduce((a, v, i) => a + v * coef(i), 0)) / scale));
    rhs.push((weight * -constant) / scale);
  };
  const constantOf = (coef: (i: number) => number) => have.reduce((a, v, i) => a + v * coef(i), 0);
  if (phi !== undefined && fuelDemand > 0) {
    const g = (i: number) => Math.max(d[i], 0) + phi * Math.min(d[i], 0);
    addRow(g, constantOf(g), fuelDemand, W_PHI);
  }
  if (dil.size > 0) {
    const g = (i: number) => (dil.has(species[i]) ? 1 : 0) - xd;
    addRow(g, constantOf(g), Ntarget, W_DIL);
  }
  const one = () => 1;
  addRow(one, constantOf(one) - totalTarget, Ntarget, totalWeight);
  for (const [k, x] of Object.entries(yd)) {
    if (!(x > 0)) continue;
    const idx = species.indexOf(k);
    const g = (i: number) => (i === idx ? 1 : 0);
    addRow(g, constantOf(g) - x * totalTarget, Ntarget * x, W_SPECIES);
  }
  // the rows are weighted over 12 orders of magnitude: each column's gradient is judged against its own
  // rounding noise, not one threshold set by the phi row (which hid the dilution and total rows' pull)
  return pr.cols.length ? nnls(rows, rhs, undefined, { gradientTest: 'per-column' }).x : [];
}

function compOf(pr: RetargetProblem, v: Float64Array): Record<string, number> {
  const t = v.reduce((p, q) => p + q, 0);
  const c: Record<string, number> = {};
  pr.species.forEach((k, i) => {
    if (v[i] > 0) c[k] = v[i] / t;
  });
  return c;
}

/** the tank after the remaining fills with amounts a: species amounts, composition, pressure, phi, dilution */
function predict(pr: RetargetProblem, a: readonly number[]): Prediction {
  const n = Float64Array.from(pr.have);
  a.forEach((aj, j) => pr.w[j].forEach((v, i) => (n[i] += aj * v)));
  const tot = n.reduce((p, q) => p + q, 0);
  const comp = compOf(pr, n);
  const P = pressureFromDensity(tot / pr.V, pr.T, bMix(pr.model, comp), cMix(pr.model, comp));
  let dilF = 0;
  for (const k of pr.dil) dilF += comp[k] ?? 0;
  return { n, comp, P, phi: equivalenceRatio(comp), dilF };
}

/**
 * the amounts of the remaining fills: the design's, unless they would pass the working limit;
 * then the total is aimed at the limit (the limit outranks everything and the rest gives), and
 * if the weighted solve still ends above it, every remaining fill is scaled back by bisection.
 * Raises `not-converged` if the result is still above the limit (it never should be: no fill
 * at all leaves the tank at nowPa, below the limit).
 */
function amountsWithinLimit(
  pr: RetargetProblem,
  nowPa: number,
): { a: number[]; pred: Prediction; limitBinds: boolean } {
  const limit = capOf(pr.input);
  if (limit !== undefined && nowPa >= limit) {
    // at or past the limit already: any further fill would raise the pressure more; none is proposed
    const a = pr.cols.map(() => 0);
    return { a, pred: predict(pr, a), limitBinds: true };
  }
  let a = solveAmounts(pr, pr.Ntarget, W_TOTAL);
  let pred = predict(pr, a);
  if (limit === undefined || pred.P <= limit) return { a, pred, limitBinds: false };
  let aim = densityFromPressure(limit, pr.T, bMix(pr.model, pred.comp), cMix(pr.model, pred.comp)) * pr.V;
  aim *= 1 - 1e-6;
  for (let it = 0; it < AIM_ITERATIONS; it++) {
    a = solveAmounts(pr, aim, W_LIMIT);
    pred = predict(pr, a);
    if (pred.P <= limit) break;
    aim *= limit / pred.P;
  }
  if (pred.P > limit) {
    // the weighted solve still ends above the limit: propose less of every remaining fill
    let lo = 0;
    let hi = 1;
    const a0 = a;
    for (let it = 0; it < SCALE_HALVINGS; it++) {
      const mid = (lo + hi) / 2;
      if (predict(pr, scaled(a0, mid)).P <= limit) lo = mid;
      else hi = mid;
    }
    a = scaled(a0, lo);
    pred = predict(pr, a);
  }
  if (!(pred.P <= limit))
    fail({
      code: 'not-converged',
      computation: 're-target of the remaining fills within the working limit',
      iterations: AIM_ITERATIONS + SCALE_HALVINGS,
      residual: pred.P - limit,
      tolerance: 0,
    });
  return { a, pred, limitBinds: true };
}

/**
 * the highest final target the re-target proposes: the working limit less the last fill's band (a
 * reading anywhere inside the band stays within the limit); undefined without a limit
 */
export function capOf(input: RetargetInput): number | undefined {
  const limit = input.workingLimitPa;
  return limit === undefined ? undefined : limit - Math.max(0, input.finalBandPa ?? 0);
}

const scaled = (a: readonly number[], k: number) => a.map((x) => x * k);

/** cumulative targets of the remaining fills at the fill temperature */
function remainingTargets(
  pr: RetargetProblem,
  a: readonly number[],
  filled: boolean,
): RetargetResult['remaining'][number][] {
  const { model, T, V } = pr;
  const m = pr.input.done.length;
  const remaining: RetargetResult['remaining'][number][] = [];
  const n = Float64Array.from(pr.have);
  const c0 = compOf(pr, n);
  let prevP = filled ? pressureFromDensity(pr.rhoNow, T, bMix(model, c0), cMix(model, c0)) : 0;
  pr.rest.forEach((s, j) => {
    // a source's remaining gas goes in its last remaining charge (the earlier ones are held at their stops)
    const last = pr.colOf.lastIndexOf(pr.colOf[j]) === j;
    const aj = last ? a[pr.colOf[j]] : 0;
    pr.w[pr.colOf[j]].forEach((v, i) => (n[i] += aj * v));
    const comp = compOf(pr, n);
    const tot = n.reduce((p, q) => p + q, 0);
    const P = pressureFromDensity(tot / V, T, bMix(model, comp), cMix(model, comp));
    remaining.push({
      step: m + j + 1,
      source: s,
      targetPa: P,
      incrementPa: P - prevP,
      amountMol: aj,
      compositionAfter: comp,
    });
    prevP = P;
  });
  return remaining;
}

/** which of the design's properties the remaining fills cannot keep within tolerance */
function gaveOf(pr: RetargetProblem, pred: Prediction): Kept[] {
  const { design, tolerance: tol, finalPressurePa } = pr.input;
  const phi = design.phi;
  const xd = design.diluentFraction;
  const gave: Kept[] = [];
  if (phi !== undefined && pred.phi !== undefined && Math.abs(pred.phi / phi - 1) > tol.relative)
    gave.push('phi');
  if (pr.dil.size > 0 && Math.abs(pred.dilF - xd) > Math.max(tol.relative * xd, tol.absolute))
    gave.push('dilution');
  if (Math.abs(pred.P / finalPressurePa - 1) > tol.relative) gave.push('pressure');
  return gave;
}

/** the re-target in words: what is kept, or what gives and why */
function messageOf(
  pr: RetargetProblem,
  pred: Prediction,
  gave: readonly Kept[],
  limitBinds: boolean,
  fmtP: (p: number) => string,
): string {
  const { design, finalPressurePa } = pr.input;
  const phi = design.phi;
  const hasDil = pr.dil.size > 0;
  const fmt = (x: number) => String(Number(x.toPrecision(5)));
  if (gave.length === 0) {
    // name only what the design has: a design without phi is not told about phi
    const kept = [
      ...(phi !== undefined ? ['phi'] : []),
      ...(hasDil ? ['the dilution'] : []),
      'the final pressure',
    ];
    const listed = kept.length > 1 ? `${kept.slice(0, -1).join(', ')} and ${kept[kept.length - 1]}` : kept[0];
    return `the remaining fills keep ${listed} within tolerance`;
  }
  const parts: string[] = [];
  if (gave.includes('phi'))
    parts.push(`phi becomes ${fmt(pred.phi ?? NaN)} (design ${fmt(phi!)}): the fills that set it are done`);
  if (gave.includes('dilution'))
    parts.push(`the diluent fraction becomes ${fmt(pred.dilF)} (design ${fmt(design.diluentFraction)})`);
  if (gave.includes('pressure')) {
    const keeps =
      [
        ...(phi !== undefined && !gave.includes('phi') ? ['phi'] : []),
        ...(hasDil ? ['the dilution'] : []),
      ].join(' and ') || 'the composition';
    parts.push(
      limitBinds
        ? `the final pressure is held at ${heldAt(pr.input, pred.P, fmtP, ` (design ${fmtP(finalPressurePa)})`)}`
        : `the final pressure becomes ${fmtP(pred.P)} (design ${fmtP(finalPressurePa)}) to keep ${keeps}`,
    );
  }
  const message = parts.join('; ');
  return limitBinds && !gave.includes('pressure')
    ? `the final pressure is held at ${heldAt(pr.input, pred.P, fmtP)}; ${message}`
    : message;
}

/**
 * where the limit holds the final pressure, in words: the final pressure the remaining fills end at
 * (one number), and how far below the working limit it stays (at least the last fill's band, if any)
 */
function heldAt(input: RetargetInput, finalPa: number, fmtP: (p: number) => string, design = ''): string {
  const limit = input.workingLimitPa!;
  const band = Math.max(0, input.finalBandPa ?? 0);
  const final = `${(input.formatFinalPressure ?? fmtP)(finalPa)}${design}`;
  return band > 0
    ? `${final}, at least the last fill's band ${fmtP(band)} below the tank's working limit ` +
        `${fmtP(limit)} (a reading inside the band stays within the limit)`
    : `${final}, within the tank's working limit ${fmtP(limit)}`;
}

export interface VentBack {
  /** vent or pump the tank back to at most this pressure (absolute, at the fill temperature), Pa */
  readonly targetPa: number;
  /** the fraction of the tank's gas that stays */
  readonly ventFactor: number;
  /** the re-target from the vented tank */
  readonly after: RetargetResult;
}

/**
 * After a reading at or above the working limit: how far to vent (or pump) back. Venting removes
 * gas of the tank's own composition, so every amount scales by f = rho_after / rho_now and the
 * composition stays. First choice: the f from which the re-targeted remaining fills end at the
 * design pressure (bisection on f, 60 halvings; the final pressure rises with f), when the limit
 * does not bind there. Otherwise (the design pressure is out of reach within the limit) the largest
 * f from which the re-target ends below the limit without the limit binding. With no fill left the
 * composition is final: vent to the design pressure, or just below the limit if that is not below it.
 * Raises `not-converged` when no vent keeps the limit from holding the remaining fills (a design
 * pressure at or above the working limit), rather than propose a vent to an empty tank.
 * A worked case: CH4 10.01 Torr, then Ar read 2800 Torr in a 10 L tank (limit 3.6 bar = 2700.2 Torr; design
 * 1500 Torr, 2 % CH4 + O2 at phi 1): vent back to 1489 Torr, from where O2 keeps phi and ends at 1500 Torr;
 * the dilution stays as the Ar overshoot made it:
 * Example: ventBack({ design: designMixture({ kind: 'phi', fuel: { CH4: 1 }, oxidizer: { O2: 1 },
 *   diluent: { Ar: 1 }, phi: 1, basis: { kind: 'dilution', value: 0.98 } }),
 *   tolerance: { relative: 0.005, absolute: 0 }, sources: [pureCylinder({ id: 'CH4', species: 'CH4' }),
 *   pureCylinder({ id: 'Ar', species: 'Ar' }), pureCylinder({ id: 'O2', species: 'O2' })],
 *   done: [{ pressurePa: 10.01 * 101325 / 760, temperatureK: 298.15 },
 *   { pressurePa: 2800 * 101325 / 760, temperatureK: 298.15 }], temperatureK: 298.15,
 *   finalPressurePa: 1500 * 101325 / 760, volumeM3: 0.01, workingLimitPa: 3.6e5 })
 *   -> { targetPa: 1489 Torr, after.predicted.pressurePa: 1500.0 Torr, after.predicted.phi: 1.0000 }
 *   (by hand for an ideal gas: venting by f keeps CH4:Ar, and O2 = 2 x CH4 ends at 1500 Torr when
 *   f (2800 + 2 x 10.01) = 1500, so f = 0.5319 and the tank is vented to 0.5319 x 2800 = 1489.3 Torr).
 */
export function ventBack(input: RetargetInput & { readonly workingLimitPa: number }): VentBack {
  const limit = input.workingLimitPa;
  const at = (f: number) => retarget({ ...input, ventFactor: f });
  if (input.done.length >= input.sources.length) {
    const now = at(1).nowPa;
    const targetPa = input.finalPressurePa < limit ? input.finalPressurePa : limit * (1 - 1e-3);
    const f = Math.min(1, targetPa / now);
    return { targetPa: at(f).nowPa, ventFactor: f, after: at(f) };
  }
  const bisect = (good: (r: RetargetResult) => boolean): number => {
    let lo = VENT_FLOOR;
    let hi = 1;
    for (let it = 0; it < VENT_HALVINGS; it++) {
      const mid = Math.sqrt(lo * hi) > 0.01 ? (lo + hi) / 2 : Math.sqrt(lo * hi);
      if (good(at(mid))) lo = mid;
      else hi = mid;
    }
    return lo;
  };
  const below = (r: RetargetResult) => r.nowPa < limit && !r.limitBinds;
  const fDesign = bisect((r) => r.predicted.pressurePa <= input.finalPressurePa);
  const f = below(at(fDesign)) ? fDesign : bisect(below);
  const after = at(f);
  if (!below(after))
    // even a tank vented to almost nothing cannot be filled on without the limit holding it:
    // no vent target exists (the design pressure is at or above the working limit)
    fail({
      code: 'not-converged',
      computation: 'vent-back target below the working limit',
      iterations: 2 * VENT_HALVINGS,
      // how far above the limit the remaining fills would end, from the emptiest tank tried
      residual: retarget({ ...input, ventFactor: f, workingLimitPa: undefined }).predicted.pressurePa - limit,
      tolerance: 0,
    });
  return { targetPa: after.nowPa, ventFactor: f, after };
}

/** the smallest fraction of the tank's gas a vent back keeps, and the halvings of the search for it */
const VENT_FLOOR = 1e-6;
const VENT_HALVINGS = 60;
