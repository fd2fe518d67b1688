/**
 * A premix tank emptying into the batch tank: its pressure falls as it delivers. Gas flows from
 * the premix tank only while its pressure is above the batch tank's, so the premix tank must end
 * the delivery above the batch reading it has to reach, with room to spare for a throttled flow.
 *
 * Settled (the gas back at the tank temperature):
 *   n0 = rho(P0, T) V,   n1 = n0 - dn,   P1 = rho1 R T (1 + B_mix rho1 + C_mix rho1^2),  rho1 = n1 / V
 * with the density-form virial equation of the premix (mixture-eos.ts).
 * Fast (the gas left in the tank expands adiabatically and reversibly while it delivers, ideal-gas
 * gamma of the premix from the NASA polynomials, thermo.ts):
 *   T1 = T (rho1 / rho0)^(gamma - 1),   P1,fast = P(rho1, T1)
 * the lowest the tank pressure falls before it warms back to the tank temperature.
 */
import type { Fractions } from './composition.js';
import { bMix, cMix, densityFromPressure, pressureFromDensity, virialModel } from './mixture-eos.js';
import { gammaMixture, hasThermo } from './thermo.js';

/**
 * Our own choice (no published source): the premix tank must end the delivery at least 10 % above
 * the batch reading it has to reach, so that the last part of the charge still flows through a
 * metering valve at a controllable rate.
 */
export const PREMIX_DELIVERY_MARGIN = 0.1;

export interface DeliveryInput {
  /** the premix's composition (mole fractions) */
  readonly composition: Fractions;
  readonly volumeM3: number;
  readonly temperatureK: number;
  /** absolute pressure of the premix tank before the delivery, Pa */
  readonly startPa: number;
  /** amount drawn from the premix tank, mol */
  readonly deliveredMol: number;
}

export interface Delivery {
  readonly startAmountMol: number;
  readonly endAmountMol: number;
  /** settled end pressure (tank temperature), Pa absolute; 0 when the tank cannot deliver that much */
  readonly endPa: number;
  /** end pressure while the gas is still cold from its own expansion, Pa absolute */
  readonly endFastPa: number;
  /** the gas temperature at the end of a fast delivery, K */
  readonly endFastK: number;
  readonly gamma: number;
}

/**
 * The premix tank's pressure after it has delivered `deliveredMol`.
 * Valid where the virial equation is (up to about 10 bar for permanent gases, 200-600 K).
 * Example: premixDelivery({ composition: { Ar: 0.98657718121, O2: 0.01342281879 }, volumeM3: 0.0302,
 *   temperatureK: 298.15, startPa: 4500 * 133.322368, deliveredMol: 0.8 }) -> { startAmountMol: 7.336,
 *   endPa: 4010.9 Torr } (CoolProp 8.0.0 HEOS Ar-O2 mixture: 7.3362 mol, 534741 Pa = 4010.88 Torr); delivered
 * fast, the gas left cools to about 276 K and 3712 Torr.
 */
export function premixDelivery(input: DeliveryInput): Delivery {
  const { composition: y, volumeM3: V, temperatureK: T, startPa } = input;
  const species = Object.keys(y).filter((k) => y[k] > 0);
  const at = (t: number) => {
    const m = virialModel(species, t);
    return { B: bMix(m, y), C: cMix(m, y) };
  };
  const here = at(T);
  const rho0 = densityFromPressure(startPa, T, here.B, here.C);
  const n0 = rho0 * V;
  const n1 = n0 - input.deliveredMol;
  const withThermo = Object.fromEntries(Object.entries(y).filter(([k, v]) => v > 0 && hasThermo(k)));
  const gamma = gammaMixture(withThermo, T);
  if (!(n1 > 0)) return { startAmountMol: n0, endAmountMol: 0, endPa: 0, endFastPa: 0, endFastK: 0, gamma };
  const rho1 = n1 / V;
  const endPa = pressureFromDensity(rho1, T, here.B, here.C);
  const endFastK = T * (rho1 / rho0) ** (gamma - 1);
  const cold = at(endFastK);
  return {
    startAmountMol: n0,
    endAmountMol: n1,
    endPa,
    endFastPa: pressureFromDensity(rho1, endFastK, cold.B, cold.C),
    endFastK,
    gamma,
  };
}

export interface StartForEndInput {
  /** the premix's composition (mole fractions) */
  readonly composition: Fractions;
  readonly volumeM3: number;
  readonly temperatureK: number;
  /** the settled pressure the premix tank must still hold after the delivery, Pa absolute */
  readonly endPa: number;
  /** amount drawn from the premix tank, mol */
  readonly deliveredMol: number;
}

/**
 * The lowest premix-tank pressure before a delivery of `deliveredMol` that still leaves it, settled,
 * at `endPa` (premixDelivery solved for its start): the reading a lab member checks before the
 * premix is opened to the batch tank.
 *   rho1 = rho(P_end, T),   rho0 = rho1 + dn / V,   P0 = rho0 R T (1 + B_mix rho0 + C_mix rho0^2)
 * Valid where premixDelivery is (virial equation: up to about 10 bar for permanent gases, 200-600 K).
 * Example: premixStartForEndPa({ composition: { Ar: 0.8657718121, O2: 0.1342281879 }, volumeM3: 0.0302,
 *   temperatureK: 298.15, endPa: 245416.3056, deliveredMol: 0.0802 }) -> 1890.0 Torr (CoolProp 8.0.0
 *   HEOS Ar-O2 mixture: the start of that delivery, 251979.28 Pa = 1890.0 Torr)
 */
export function premixStartForEndPa(input: StartForEndInput): number {
  const { composition: y, volumeM3: V, temperatureK: T } = input;
  const species = Object.keys(y).filter((k) => y[k] > 0);
  const m = virialModel(species, T);
  const B = bMix(m, y);
  const C = cMix(m, y);
  const rho1 = densityFromPressure(input.endPa, T, B, C);
  return pressureFromDensity(rho1 + input.deliveredMol / V, T, B, C);
}

/** the least stirring time asked of a stirred premix tank before a batch draws from it (common practice: 15-30 min) */
export const PREMIX_STIR_MIN_S = 15 * 60;

/**
 * The time from the premix log's close to `now` (ISO) against the least mixing time asked (stirred:
 * PREMIX_STIR_MIN_S; unstirred: the rest time, diffusion alone to 0.1 %): undefined when either is not
 * known (an older log, no tank height). Shared by the guided fill (which asks `mixed early` to go on)
 * and the re-check (which does not call a batch drawn early a pass).
 */
export function premixMixingElapsed(
  pc: {
    readonly premixClosed?: string;
    readonly mixing?: { readonly stirred: boolean; readonly restS: number };
  },
  now: string,
): { readonly elapsedS: number; readonly neededS: number; readonly early: boolean } | undefined {
  const closed = pc.premixClosed ? Date.parse(pc.premixClosed) : NaN;
  const at = Date.parse(now);
  if (!Number.isFinite(closed) || !Number.isFinite(at) || !pc.mixing) return undefined;
  const elapsedS = (at - closed) / 1000;
  const neededS = pc.mixing.stirred ? PREMIX_STIR_MIN_S : pc.mixing.restS;
  return { elapsedS, neededS, early: elapsedS < neededS };
}
