/**
 * Complete-combustion thermochemistry from NASA 7-coefficient data: the products
 * of a tank state, its adiabatic flame temperature (constant pressure) and its
 * closed-vessel (constant volume) end state. No dissociation: these are upper
 * bounds of the flame temperature, as the calculated adiabatic flame temperature
 * method for flammability wants. The safety review's closed-vessel pressure and the
 * flame temperatures it shows come from chemical equilibrium (equilibrium.ts); the
 * complete-combustion values here are its labelled cross-checks.
 */
import { R } from './constants.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { enthalpyMolar, enthalpySum, thermoRangeK } from './thermo.js';
import { oxygenBalance, type Fractions } from './composition.js';

/**
 * Products per mole of mixture. Fuels burn to CO2, H2O and N2 as far as the oxygen
 * reaches (a rich state burns the fraction lambda = supply/demand of every fuel);
 * oxygen carriers (N2O, NO) give up their oxygen and nitrogen; inerts pass through.
 */
export function completeCombustion(y: Fractions): {
  products: Record<string, number>;
  burntFraction: number;
} {
  const { need: demand, supply } = oxygenBalance(y);
  const lambda = demand > 0 ? Math.min(1, supply / demand) : 0;
  const p: Record<string, number> = {};
  const add = (k: string, n: number) => {
    if (n !== 0) p[k] = (p[k] ?? 0) + n;
  };
  for (const [k, v] of Object.entries(y)) {
    const el = getSpecies(k).elements;
    const d = oxygenDemand(el);
    if (d > 0) {
      add(k, v * (1 - lambda));
      add('CO2', v * lambda * (el.C ?? 0));
      add('H2O', (v * lambda * (el.H ?? 0)) / 2);
      add('N2', (v * lambda * (el.N ?? 0)) / 2);
    } else if (d < 0 && k !== 'O2') {
      // N2O -> N2 + 1/2 O2, NO -> 1/2 N2 + 1/2 O2
      add('N2', (v * (el.N ?? 0)) / 2);
      add('O2', (v * (el.O ?? 0)) / 2);
    } else {
      add(k, v);
    }
  }
  add('O2', -lambda * demand);
  if (p.O2 !== undefined && Math.abs(p.O2) < 1e-15) delete p.O2;
  return { products: p, burntFraction: lambda };
}

function totalEnthalpy(n: Fractions, temperatureK: number): number {
  let h = 0;
  for (const [k, v] of Object.entries(n)) h += v * enthalpyMolar(k, temperatureK);
  return h;
}

function totalMoles(n: Fractions): number {
  return Object.values(n).reduce((a, b) => a + b, 0);
}

/** highest temperature every species' NASA fit covers */
function fitCeilingK(n: Fractions): number {
  let hi = 6000;
  for (const k of Object.keys(n)) hi = Math.min(hi, thermoRangeK(k)?.max ?? hi);
  return hi;
}

/** the temperature tolerance of the flame temperatures here, K */
const FLAME_TOLERANCE_K = 1e-6;

/**
 * solve f(T) = target for T on [lo, hi], f increasing, to FLAME_TOLERANCE_K: the Illinois variant
 * of regula falsi (Dowell & Jarratt, BIT 11, 168 (1971)), as the equilibrium roots. Returns hi
 * when even hi falls short, lo when lo is already past the target.
 */
function solveIncreasing(f: (t: number) => number, target: number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  let fa = f(a) - target;
  let fb = f(b) - target;
  if (fb < 0) return hi;
  if (fa >= 0) return lo;
  let side = 0;
  for (let i = 0; i < 100 && b - a >= FLAME_TOLERANCE_K; i++) {
    let m = b - (fb * (b - a)) / (fb - fa);
    if (!(m > a && m < b)) m = (a + b) / 2;
    const fm = f(m) - target;
    if (fm === 0) return m;
    if (fm < 0) {
      a = m;
      fa = fm;
      if (side === -1) fb /= 2;
      side = -1;
    } else {
      b = m;
      fb = fm;
      if (side === 1) fa /= 2;
      side = 1;
    }
  }
  return (a + b) / 2;
}

/**
 * Adiabatic flame temperature at constant pressure, complete combustion:
 * sum_products n h(T_ad) = sum_reactants n h(T0).
 * Example: flameTemperatureK({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15) -> 2325.6 K
 *   (stoichiometric CH4-air, no dissociation; Cantera 3.2.0 with frozen products: 2325.6 K,
 *   tests/fixtures/reference/flame-cantera.json).
 * Capped at the top of the NASA fits (5000-6000 K): undiluted fuel/O2 reaches the cap.
 */
export function flameTemperatureK(y: Fractions, initialK: number): number {
  const { products } = completeCombustion(y);
  const h0 = totalEnthalpy(y, initialK);
  return solveIncreasing(enthalpySum(products), h0, initialK, fitCeilingK(products));
}

/**
 * Closed-vessel complete combustion (constant volume, the worst-case deflagration):
 * sum_p n u(T_v) = sum_r n u(T0), u = h - R T; P_v/P0 = (n_p T_v)/(n_r T0) (ideal gas).
 * Example: closedVesselCombustion({ CH4: 1 / 10.5238, O2: 2 / 10.5238, N2: 7.5238 / 10.5238 }, 298.15)
 *   .pressureRatio -> 9.449
 *   (stoichiometric CH4-air from 1 atm ends at 9.449 atm without dissociation; Cantera 3.2.0 with frozen
 *   products: 9.449, tests/fixtures/reference/flame-cantera.json).
 */
export function closedVesselCombustion(
  y: Fractions,
  initialK: number,
): { temperatureK: number; pressureRatio: number } {
  const { products } = completeCombustion(y);
  const nr = totalMoles(y);
  const np = totalMoles(products);
  const u0 = totalEnthalpy(y, initialK) - nr * R * initialK;
  const hp = enthalpySum(products);
  const t = solveIncreasing((tt) => hp(tt) - np * R * tt, u0, initialK, fitCeilingK(products));
  return { temperatureK: t, pressureRatio: (np * t) / (nr * initialK) };
}

/**
 * T0 (P2/P1)^((gamma-1)/gamma): the end temperature of adiabatic compression.
 * Example: adiabaticCompressionK(293, 10, 1.4) -> 565.7 K (293 K x 10^(0.4/1.4) = 565.69 K by hand;
 *   properties.md 7.6: about 566 K).
 */
export function adiabaticCompressionK(initialK: number, pressureRatio: number, gamma: number): number {
  return initialK * pressureRatio ** ((gamma - 1) / gamma);
}
