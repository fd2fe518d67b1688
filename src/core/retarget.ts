/**
 * Re-targeting during a fill: after the actual readings of the first fills, the
 * remaining targets that keep the design as close as possible. Priorities: phi
 * first, then the dilution (diluent fraction), then the final pressure; the tank's
 * working limit is never passed. Solved as one weighted non-negative least-squares
 * problem in the amounts of the remaining fills, the weights 1e6 : 1e3 : 1 : 1e-3
 * (phi : dilution : total amount : each design fraction) standing in for the
 * strict priority order. Says which property had to give.
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
}

export type Kept = 'phi' | 'dilution' | 'pressure';

export interface RetargetResult {
  readonly remaining: readonly {
    readonly step: number;
    readonly source: GasSource;
    readonly targetPa: number;
    readonly incrementPa: number;
    readonly amountMol: number;
  }[];
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
}

const W_LIMIT = 1e9;
const W_PHI = 1e6;
const W_DIL = 1e3;
const W_TOTAL = 1;
const W_SPECIES = 1e-3;

export function retarget(input: RetargetInput): RetargetResult {
  const { design, sources, done, volumeM3: V } = input;
  const m = done.length;
  const T = input.temperatureK;
  const init = input.initial;
  const species = [
    ...new Set([
      ...sources.flatMap((s) => Object.keys(s.composition)),
      ...Object.keys(design.composition),
      ...Object.keys(init?.composition ?? {}),
    ]),
  ];
  const S = species.length;
  const model = virialModel(species, T);
  // what is in the tank now (mol)
  const have = new Float64Array(S);
  let rhoNow = 0;
  const f = input.ventFactor ?? 1;
  if (!(f > 0 && f <= 1)) throw new RangeError(`ventFactor ${f} must be in (0, 1]`);
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
    rhoNow = res.rho[m - 1] * f;
  } else if (init) {
    // the gas already in the tank, from its reading at its own temperature
    const m0 = virialModel(species, init.temperatureK);
    const rho0 = densityFromPressure(
      init.pressurePa,
      init.temperatureK,
      bMix(m0, init.composition),
      cMix(m0, init.composition),
    );
    for (const [k, y] of Object.entries(init.composition)) have[species.indexOf(k)] += y * rho0 * V * f;
    rhoNow = rho0 * f;
  }
  const rest = sources.slice(m);
  const w = rest.map((s) => {
    const v = new Float64Array(S);
    for (const [k, x] of Object.entries(s.composition)) v[species.indexOf(k)] += x;
    v[species.indexOf(s.mainSpecies)] += s.unidentified;
    return v;
  });
  // target total amount at the design pressure, with the design composition
  const yd = design.composition;
  const Ntarget = densityFromPressure(input.finalPressurePa, T, bMix(model, yd), cMix(model, yd)) * V;
  const d = species.map((k) => oxygenDemand(getSpecies(k).elements));
  const phi = design.phi;
  const dil = new Set(Object.keys(design.groups.diluent));
  const xd = design.diluentFraction;
  const fuelDemand = species.reduce((a, k, i) => a + Math.max(d[i], 0) * (yd[k] ?? 0), 0) * Ntarget;

  const solve = (totalTarget: number, totalWeight: number) => {
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
    return rest.length ? nnls(rows, rhs).x : [];
  };

  function compOf(v: Float64Array): Record<string, number> {
    const t = v.reduce((p, q) => p + q, 0);
    const c: Record<string, number> = {};
    species.forEach((k, i) => {
      if (v[i] > 0) c[k] = v[i] / t;
    });
    return c;
  }

  const predict = (a: number[]) => {
    const n = Float64Array.from(have);
    a.forEach((aj, j) => w[j].forEach((v, i) => (n[i] += aj * v)));
    const tot = n.reduce((p, q) => p + q, 0);
    const comp: Record<string, number> = {};
    species.forEach((k, i) => {
      if (n[i] > 0) comp[k] = n[i] / tot;
    });
    const rho = tot / V;
    const P = pressureFromDensity(rho, T, bMix(model, comp), cMix(model, comp));
    let dilF = 0;
    for (const k of dil) dilF += comp[k] ?? 0;
    return { n, comp, P, phi: equivalenceRatio(comp), dilF };
  };

  const limit = input.workingLimitPa;
  // significant digits without an exponent (205050 Pa, not 2.0505e+5 Pa)
  const fmtP = input.formatPressure ?? ((p: number) => `${Number(p.toPrecision(5))} Pa`);
  const haveComp = compOf(have);
  const nowPa =
    m > 0 || init ? pressureFromDensity(rhoNow, T, bMix(model, haveComp), cMix(model, haveComp)) : 0;
  let limitBinds = false;
  let a: number[];
  let pred: ReturnType<typeof predict>;
  if (limit !== undefined && nowPa >= limit) {
    // at or past the limit already: any further fill would raise the pressure more; none is proposed
    a = rest.map(() => 0);
    pred = predict(a);
    limitBinds = true;
  } else {
    a = solve(Ntarget, W_TOTAL);
    pred = predict(a);
    if (limit !== undefined && pred.P > limit) {
      // the limit outranks everything: aim the total at the limit and let the rest give
      limitBinds = true;
      let aim =
        densityFromPressure(limit, T, bMix(model, pred.comp), cMix(model, pred.comp)) * V * (1 - 1e-6);
      for (let it = 0; it < 8; it++) {
        a = solve(aim, W_LIMIT);
        pred = predict(a);
        if (pred.P <= limit) break;
        aim *= limit / pred.P;
      }
      if (pred.P > limit) {
        // the weighted solve still ends above the limit: propose less of every remaining fill
        let lo = 0;
        let hi = 1;
        const a0 = a;
        for (let it = 0; it < 60; it++) {
          const mid = (lo + hi) / 2;
          if (predict(a0.map((x) => x * mid)).P <= limit) lo = mid;
          else hi = mid;
        }
        a = a0.map((x) => x * lo);
        pred = predict(a);
      }
    }
  }

  // cumulative targets of the remaining fills at the fill temperature
  const remaining: RetargetResult['remaining'][number][] = [];
  const n = Float64Array.from(have);
  let prevP =
    m > 0 || init ? pressureFromDensity(rhoNow, T, bMix(model, compOf(n)), cMix(model, compOf(n))) : 0;
  rest.forEach((s, j) => {
    w[j].forEach((v, i) => (n[i] += a[j] * v));
    const comp = compOf(n);
    const tot = n.reduce((p, q) => p + q, 0);
    const P = pressureFromDensity(tot / V, T, bMix(model, comp), cMix(model, comp));
    remaining.push({ step: m + j + 1, source: s, targetPa: P, incrementPa: P - prevP, amountMol: a[j] });
    prevP = P;
  });

  const gave: Kept[] = [];
  const tol = input.tolerance;
  if (phi !== undefined && pred.phi !== undefined && Math.abs(pred.phi / phi - 1) > tol.relative)
    gave.push('phi');
  if (dil.size > 0 && Math.abs(pred.dilF - xd) > Math.max(tol.relative * xd, tol.absolute))
    gave.push('dilution');
  if (Math.abs(pred.P / input.finalPressurePa - 1) > tol.relative) gave.push('pressure');
  const fmt = (x: number) => String(Number(x.toPrecision(5)));
  let message: string;
  if (limit !== undefined && nowPa >= limit) {
    message =
      `the tank is at ${fmtP(nowPa)}, at or above its working limit ${fmtP(limit)}: ` +
      `no further fill can be made within the limit`;
    if (rest.length === 0)
      message = `the tank is at ${fmtP(nowPa)}, at or above its working limit ${fmtP(limit)}`;
  } else if (gave.length === 0) {
    // name only what the design has: a design without phi is not told about phi
    const kept = [
      ...(phi !== undefined ? ['phi'] : []),
      ...(dil.size > 0 ? ['the dilution'] : []),
      'the final pressure',
    ];
    message =
      `the remaining fills keep ${kept.length > 1 ? `${kept.slice(0, -1).join(', ')} and ${kept[kept.length - 1]}` : kept[0]} ` +
      `within tolerance`;
  } else {
    const parts: string[] = [];
    if (gave.includes('phi'))
      parts.push(`phi becomes ${fmt(pred.phi ?? NaN)} (design ${fmt(phi!)}): the fills that set it are done`);
    if (gave.includes('dilution'))
      parts.push(`the diluent fraction becomes ${fmt(pred.dilF)} (design ${fmt(xd)})`);
    if (gave.includes('pressure')) {
      parts.push(
        limitBinds
          ? `the final pressure is held at the tank's working limit ${fmtP(limit!)} (design ` +
              `${fmtP(input.finalPressurePa)})`
          : `the final pressure becomes ${fmtP(pred.P)} (design ${fmtP(input.finalPressurePa)}) ` +
              `to keep ${[...(phi !== undefined && !gave.includes('phi') ? ['phi'] : []), ...(dil.size > 0 ? ['the dilution'] : [])].join(' and ') || 'the composition'}`,
      );
    }
    message = parts.join('; ');
    if (limitBinds && !gave.includes('pressure'))
      message = `the tank's working limit ${fmtP(limit!)} holds the final pressure; ${message}`;
  }
  return {
    remaining,
    predicted: { composition: pred.comp, phi: pred.phi, diluentFraction: pred.dilF, pressurePa: pred.P },
    gave,
    limitBinds,
    nowPa,
    message,
  };
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
    let lo = 1e-6;
    let hi = 1;
    for (let it = 0; it < 60; it++) {
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
  return { targetPa: after.nowPa, ventFactor: f, after };
}
