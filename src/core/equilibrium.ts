/**
 * Ideal-gas chemical equilibrium by Gibbs (Helmholtz) energy minimisation, in the
 * element-potential form (W.C. Reynolds, STANJAN, Stanford ME 270 HO 7, 1986; S. Gordon &
 * B.J. McBride, NASA RP-1311, 1994, ch. 2): the states the review asks for.
 * Modules: equilibrium-species.ts (the species, their NASA fits and the element matrix),
 * equilibrium-solver.ts (the element-potential solver at fixed T and V, with the method),
 * root-increasing.ts (the 1-D root search), and this file: TV is the core; UV (closed
 * vessel: iterate T on U), TP (iterate V on P) and HP (iterate T on H at TP) are built on
 * it. Species: every C/H/O/N/noble-gas species of data/nasa7-thermo.json and
 * data/nasa7-products.json (NASA TM-4513). Amounts are per mole of initial mixture; ideal
 * gas throughout (the virial correction is below 1 % at combustion temperatures and tank
 * pressures).
 */
import { R } from './constants.js';
import { getSpecies } from './lookup.js';
import { fail } from './problems.js';
import { molarMassKgPerMol } from './formula.js';
import { closedVesselCombustion, completeCombustion, flameTemperatureK } from './combustion.js';
import type { Fractions } from './composition.js';
import { elementTotals, GAS_FITS, hsc, systemFor, T_MAX_K } from './equilibrium-species.js';
import { Solver, type EquilibriumState } from './equilibrium-solver.js';
import { rootNear } from './root-increasing.js';

export { equilibriumGaps, EQUILIBRIUM_SPECIES_COUNT } from './equilibrium-species.js';
export type { EquilibriumState } from './equilibrium-solver.js';
export { rootIncreasing as rootOfIncreasing } from './root-increasing.js';

function initialState(y: Fractions, temperatureK: number, pressurePa: number) {
  const { elements, b, sum } = elementTotals(y);
  const sys = systemFor(elements);
  const tmp = { h: 0, s: 0, cp: 0 };
  let hRT = 0;
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    hsc(
      GAS_FITS.find((f) => f.key === k)!,
      temperatureK,
      tmp,
    );
    hRT += (v / sum) * tmp.h;
  }
  const h0 = hRT * R * temperatureK;
  const v0 = (R * temperatureK) / pressurePa;
  const products = new Map(Object.entries(completeCombustion(y).products).map(([k, v]) => [k, v / sum]));
  return { sys, b, h0, u0: h0 - R * temperatureK, v0, products };
}

/** start temperature: the complete-combustion value, pulled down where dissociation matters */
function completeGuessK(y: Fractions, temperatureK: number, kind: 'UV' | 'HP'): number {
  const t =
    kind === 'UV' ? closedVesselCombustion(y, temperatureK).temperatureK : flameTemperatureK(y, temperatureK);
  // above about 2200 K dissociation takes a growing share of the heat
  // (fitted loosely on stoichiometric fuel/air and fuel/O2)
  return t > 2200 ? 2200 + (kind === 'UV' ? 0.5 : 0.3) * (t - 2200) : t;
}

function notConverged(what: string): never {
  return fail({ code: 'equilibrium-not-converged', what });
}

function checkInputs(y: Fractions, temperatureK: number, pressurePa: number) {
  if (!(temperatureK >= 150 && temperatureK <= 1000))
    fail({
      code: 'out-of-range',
      what: 'initial temperature for the equilibrium (K)',
      value: temperatureK,
      allowed: '150-1000 K',
    });
  if (!(pressurePa > 0 && pressurePa <= 1e8))
    fail({
      code: 'out-of-range',
      what: 'initial pressure for the equilibrium (Pa)',
      value: pressurePa,
      allowed: '0-1e8 Pa',
    });
  if (!Object.values(y).some((v) => v > 0)) fail({ code: 'fractions-sum', sum: 0 });
}

const cache = new Map<string, EquilibriumState>();
function memo(
  kind: string,
  y: Fractions,
  a: number,
  b: number,
  run: () => EquilibriumState,
): EquilibriumState {
  const key = `${kind}|${a.toPrecision(12)}|${b.toPrecision(12)}|${Object.entries(y)
    .filter(([, v]) => v > 0)
    .sort(([p], [q]) => (p < q ? -1 : 1))
    .map(([k, v]) => `${k}:${v.toPrecision(12)}`)
    .join(',')}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const s = run();
  if (cache.size > 2000) cache.clear();
  cache.set(key, s);
  return s;
}

/**
 * Constant-volume adiabatic equilibrium (UV): the end state of a closed vessel whose
 * contents burn completely to equilibrium without heat loss, U(T_e, V, n_e) = U(T0, V, n0).
 * y: mole fractions of the initial gas; temperatureK, pressurePa: initial state.
 * Valid for 150-1000 K and up to 1e8 Pa initially, end states up to 6000 K; ideal gas.
 * Example: equilibriumUV({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15, 101325)
 *   -> { pressurePa: 8.799 atm, temperatureK: 2586.3 K } (stoichiometric CH4-air from 1 atm; Cantera 3.2.0
 *   on the same data, tests/fixtures/reference/equilibrium-cantera.json).
 * Refuses (ProblemError) species without data or with elements other than C, H, O, N
 * and the noble gases.
 */
export function equilibriumUV(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  checkInputs(y, temperatureK, pressurePa);
  return memo('UV', y, temperatureK, pressurePa, () => {
    const { sys, b, u0, v0, products } = initialState(y, temperatureK, pressurePa);
    const s = new Solver(sys, b, products);
    let last = NaN;
    const f = (t: number) => {
      if (!s.solveTV(t, v0)) notConverged(`closed-vessel equilibrium at ${t.toFixed(0)} K`);
      last = t;
      return s.totals(t).u - u0;
    };
    const lo = Math.max(120, temperatureK - 50);
    const t = rootNear(f, lo, T_MAX_K, completeGuessK(y, temperatureK, 'UV'), 1e-5, 100);
    if (t === undefined) notConverged('closed-vessel equilibrium: end temperature outside 120-6000 K');
    if (t !== last) f(t);
    return s.state(t, v0);
  });
}

/** equilibrium at fixed T and P: secant iteration on ln V until the gas fills V at P */
function solveTP(s: Solver, t: number, pressurePa: number, vGuess: number): number {
  // err(ln V) = ln(n R T / (V P)); its slope d ln n/d ln V - 1 lies in (-1, 0]
  const err = (lnV: number) => {
    if (!s.solveTV(t, Math.exp(lnV))) notConverged(`equilibrium at ${t.toFixed(0)} K`);
    return Math.log((s.totals(t).nGas * R * t) / (Math.exp(lnV) * pressurePa));
  };
  let x0 = Math.log(vGuess);
  let e0 = err(x0);
  if (Math.abs(e0) < 1e-10) return Math.exp(x0);
  let x1 = x0 + e0;
  let e1 = err(x1);
  for (let it = 0; it < 100 && Math.abs(e1) >= 1e-10; it++) {
    const slope = (e1 - e0) / (x1 - x0);
    const next = Number.isFinite(slope) && slope < -0.05 ? x1 - e1 / slope : x1 + e1;
    [x0, e0] = [x1, e1];
    x1 = next;
    e1 = err(x1);
  }
  return Math.exp(x1);
}

/**
 * Equilibrium at fixed temperature and pressure (TP), per mole of initial mixture.
 * Example: equilibriumTP({ H2: 2 / 3, O2: 1 / 3 }, 3000, 1e5).gas
 *   -> { H2O: 0.645, H2: 0.134, OH: 0.092, H: 0.058, O2: 0.046 } (stoichiometric H2-O2 at 3000 K, 1 bar;
 *   Cantera 3.2.0 equilibrate('TP') on the same data, run with scripts/reference/gen_equilibrium.py's
 *   species: H2O 0.64485, H2 0.13428, OH 0.09229, H 0.05786, O2 0.04632).
 */
export function equilibriumTP(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  if (!(temperatureK >= 150 && temperatureK <= T_MAX_K))
    fail({
      code: 'out-of-range',
      what: 'equilibrium temperature (K)',
      value: temperatureK,
      allowed: `150-${T_MAX_K} K`,
    });
  checkInputs(y, 300, pressurePa);
  return memo('TP', y, temperatureK, pressurePa, () => {
    const { sys, b, products } = initialState(y, 298.15, pressurePa);
    const s = new Solver(sys, b, products);
    const v = solveTP(s, temperatureK, pressurePa, (R * temperatureK) / pressurePa);
    return s.state(temperatureK, v);
  });
}

/**
 * Adiabatic flame temperature at constant pressure with equilibrium products (HP):
 * H(T_ad, P, n_e) = H(T0, P, n0).
 * Example: equilibriumHP({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15, 101325)
 *   .temperatureK -> 2225.0 K (stoichiometric CH4-air at 1 atm; Cantera 3.2.0 on the same data,
 *   tests/fixtures/reference/equilibrium-cantera.json).
 */
export function equilibriumHP(y: Fractions, temperatureK: number, pressurePa: number): EquilibriumState {
  checkInputs(y, temperatureK, pressurePa);
  return memo('HP', y, temperatureK, pressurePa, () => {
    const { sys, b, h0, products } = initialState(y, temperatureK, pressurePa);
    const s = new Solver(sys, b, products);
    let v = (R * temperatureK) / pressurePa;
    let tLast = temperatureK;
    const f = (t: number) => {
      v = solveTP(s, t, pressurePa, (v * t) / tLast);
      tLast = t;
      return s.totals(t).h - h0;
    };
    const t = rootNear(
      f,
      Math.max(120, temperatureK - 50),
      T_MAX_K,
      completeGuessK(y, temperatureK, 'HP'),
      1e-4,
      100,
    );
    if (t === undefined) notConverged('flame equilibrium: temperature outside 120-6000 K');
    if (t !== tLast) f(t);
    return s.state(t, v);
  });
}

/** a solver positioned on one initial state, for the detonation module (fixed-volume equilibria) */
export function equilibriumWorkspace(y: Fractions, temperatureK: number, pressurePa: number) {
  checkInputs(y, temperatureK, pressurePa);
  const init = initialState(y, temperatureK, pressurePa);
  const s = new Solver(init.sys, init.b, init.products);
  let mass = 0;
  let sum = 0;
  for (const [k, v] of Object.entries(y)) {
    if (v <= 0) continue;
    mass += v * molarMassKgPerMol(getSpecies(k).elements);
    sum += v;
  }
  return {
    /** enthalpy and volume of the initial state per mole, J and m3; mass per mole, kg */
    h0: init.h0,
    v0: init.v0,
    massKg: mass / sum,
    /** equilibrium at (t, v): pressure and enthalpy per mole of initial mixture */
    at(t: number, v: number): { pressurePa: number; enthalpyJ: number } {
      if (!s.solveTV(t, v)) notConverged(`equilibrium at ${t.toFixed(0)} K`);
      const { nGas, h } = s.totals(t);
      return { pressurePa: (nGas * R * t) / v, enthalpyJ: h };
    },
    state: (t: number, v: number) => s.state(t, v),
  };
}
