/**
 * Stage 2 of the fill plan: how many mol each source delivers, so that the finished
 * batch reads the final pressure.
 *
 * The amounts follow from the design by allocation (supply.ts, least squares on the
 * species amounts) for a total N; the finished composition y then gives the density
 * rho_f from P_f = rho R T (1 + B_mix(y) rho + C_mix(y) rho^2), and N is rescaled by
 * rho_f V / (amount allocated + amount already in the tank) until it stops moving.
 * Without gas in the tank y does not depend on N and one rescaling settles it; with
 * gas in the tank a few more are needed.
 */
import { R } from '../constants.js';
import type { Fractions } from '../composition.js';
import { allocate, type Allocation, type GasSource } from '../supply.js';
import { bMix, cMix, compressibility, densityFromPressure } from '../mixture-eos.js';
import { fail } from '../problems.js';
import type { PlanBasis } from './validate.js';

/** beyond this departure from ideal gas the truncated virial series is not trusted */
export const MAX_NON_IDEALITY = 0.05;

/** the amount loop stops when a rescaling moves the total by at most this (relative) */
export const AMOUNT_TOLERANCE = 1e-13;
/** and gives up (a not-converged problem) after this many rescalings */
export const AMOUNT_MAX_ITERATIONS = 30;

/** what the amount stage hands on */
export interface PlanAmounts {
  /** mol from each source, in the order of `input.sources`, and the composition they make */
  readonly allocation: Allocation;
  /** composition of the finished batch for the equation of state (unidentified parts as main gas) */
  readonly composition: Record<string, number>;
  readonly densityMolPerM3: number;
  /** mol in the finished batch, gas already in the tank included */
  readonly totalMol: number;
  readonly bMixM3PerMol: number;
  readonly cMixM6PerMol2: number;
  readonly compressibility: number;
  /** rescalings the loop took */
  readonly iterations: number;
}

/**
 * The composition the equation of state sees for a set of parts (sources with their mol,
 * or plain compositions): a source's unidentified remainder is counted as its main gas.
 */
export function eosComposition(
  parts: readonly { source: GasSource | Fractions; mol: number }[],
): Record<string, number> {
  const y: Record<string, number> = {};
  let total = 0;
  for (const { source, mol } of parts) {
    const isSource = 'composition' in source && 'mainSpecies' in source;
    const comp = isSource ? (source as GasSource).composition : (source as Fractions);
    for (const [k, v] of Object.entries(comp)) {
      y[k] = (y[k] ?? 0) + v * mol;
      total += v * mol;
    }
    if (isSource) {
      const s = source as GasSource;
      y[s.mainSpecies] = (y[s.mainSpecies] ?? 0) + s.unidentified * mol;
      total += s.unidentified * mol;
    }
  }
  for (const k of Object.keys(y)) y[k] /= total;
  return y;
}

/**
 * The amounts of the plan. Refuses a finished batch with |1 - Z| > MAX_NON_IDEALITY
 * (model-range) and a loop that has not settled within `limits.maxIterations`
 * (not-converged, with the last relative step as the residual).
 * @param limits the loop's tolerance and iteration cap (defaults AMOUNT_TOLERANCE, AMOUNT_MAX_ITERATIONS)
 */
export function planAmounts(
  basis: PlanBasis,
  limits: { readonly maxIterations?: number; readonly tolerance?: number } = {},
): PlanAmounts {
  const { input, finalPressurePa: Pf, temperatureK: T, volumeM3: V, model, initial } = basis;
  const maxIterations = limits.maxIterations ?? AMOUNT_MAX_ITERATIONS;
  const tolerance = limits.tolerance ?? AMOUNT_TOLERANCE;
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  let N = (Pf * V) / (R * T);
  let step = Infinity;
  for (let it = 0; it < maxIterations; it++) {
    const allocation = allocate(input.sources, input.design.composition, N, inTank);
    const parts = input.sources.map((s, i) => ({
      source: s as GasSource | Fractions,
      mol: allocation.amountsMol[i],
    }));
    if (initial) parts.push({ source: initial.composition, mol: initial.amountMol });
    const y = eosComposition(parts);
    const rho = densityFromPressure(Pf, T, bMix(model, y), cMix(model, y));
    const have = allocation.amountsMol.reduce((a, b) => a + b, 0) + (initial?.amountMol ?? 0);
    const next = N * ((rho * V) / have);
    step = Math.abs(next - N) / N;
    if (Math.abs(next - N) <= tolerance * N)
      return settled(basis, { y, rho, allocation, iterations: it + 1 });
    N = next;
  }
  return fail({
    code: 'not-converged',
    computation: 'fill amounts',
    iterations: maxIterations,
    residual: step,
    tolerance,
  });
}

/** the settled amounts, refused when the finished batch is too far from ideal gas for the model */
function settled(
  basis: PlanBasis,
  r: { y: Record<string, number>; rho: number; allocation: Allocation; iterations: number },
): PlanAmounts {
  const B = bMix(basis.model, r.y);
  const C = cMix(basis.model, r.y);
  const Z = compressibility(r.rho, B, C);
  if (Math.abs(1 - Z) > MAX_NON_IDEALITY) {
    fail(
      { code: 'model-range', kind: 'non-ideal', compressibility: Z, maxDeviation: MAX_NON_IDEALITY },
      { field: 'pressure' },
    );
  }
  return {
    allocation: r.allocation,
    composition: r.y,
    densityMolPerM3: r.rho,
    totalMol: r.rho * basis.volumeM3,
    bMixM3PerMol: B,
    cMixM6PerMol2: C,
    compressibility: Z,
    iterations: r.iterations,
  };
}
