/**
 * The limit flame temperatures of the flame-temperature method of the flammability review:
 * calibrations on a fuel's listed limits (complete combustion, NASA data, from 298.15 K) and
 * the threshold a state is judged against, by the side of stoichiometric it is on.
 *  - LFL: the flame temperature at the lowest listed LFL in air;
 *  - nose: stoichiometric fuel in N2 with O2 at the listed LOC;
 *  - rich: at the highest listed UFL in air, and at the UFL in O2 where one is on file.
 * A limit flame temperature is roughly constant along a limit (White's rule; Zlochower,
 * J. Loss Prev. Process Ind. 2012, for flame temperatures at measured limits); calibrating
 * each side on its own limit keeps the method from judging a rich state by the lean limit.
 */
import { FUEL_SAFETY } from './data/safety-data.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { flameTemperatureK } from './combustion.js';

/** O2 in air on the diagram's air line */
const AIR_O2 = 0.21;

const limitCache = new Map<string, number>();

/**
 * Limit flame temperature of a fuel: the complete-combustion flame temperature of its
 * lowest listed LFL in air (21 % O2 / 79 % N2) from 298.15 K.
 */
export function limitFlameTemperatureK(fuel: string): number | undefined {
  const cached = limitCache.get(fuel);
  if (cached !== undefined) return cached;
  const rec = FUEL_SAFETY.get(fuel);
  if (!rec) return undefined;
  const L = Math.min(...rec.lflAir.map((v) => v.value));
  const t = flameTemperatureK({ [fuel]: L, O2: AIR_O2 * (1 - L), N2: (1 - AIR_O2) * (1 - L) }, 298.15);
  limitCache.set(fuel, t);
  return t;
}

/** the rich-side calibration of one fuel: flame temperature and equivalence ratio at its UFL */
export interface RichCalibration {
  /** at the highest listed UFL in air */
  readonly air: { readonly flameK: number; readonly phi: number; readonly ufl: number };
  /** at the UFL in O2, where one is on file */
  readonly oxygen?: { readonly flameK: number; readonly phi: number; readonly ufl: number };
}

const richCache = new Map<string, RichCalibration | null>();

/**
 * Rich-limit calibration of a fuel: the complete-combustion flame temperature (excess fuel
 * unburnt, from 298.15 K) of its highest listed UFL in air, and of its UFL in O2 where one is
 * on file; undefined when the UFL in air is 100 % (no rich limit: acetylene).
 * Example: richLimitCalibration('CH4').air -> { ufl: 17 %, flameK: 2.04e3 K, phi: 1.95 } (the UFL of CH4 in
 *   air, 17 %, is the IEC 60079-20-1 value; phi = 0.17 x 2 / (0.83 x 0.21) = 1.95 by hand).
 */
export function richLimitCalibration(fuel: string): RichCalibration | undefined {
  const cached = richCache.get(fuel);
  if (cached !== undefined) return cached ?? undefined;
  const rec = FUEL_SAFETY.get(fuel);
  let out: RichCalibration | undefined;
  if (rec) {
    const z = oxygenDemand(getSpecies(fuel).elements);
    const U = Math.max(...rec.uflAir.map((v) => v.value));
    if (U < 1) {
      const air = {
        flameK: flameTemperatureK({ [fuel]: U, O2: AIR_O2 * (1 - U), N2: (1 - AIR_O2) * (1 - U) }, 298.15),
        phi: (z * U) / (AIR_O2 * (1 - U)),
        ufl: U,
      };
      const UO = rec.uflO2?.value;
      const oxygen =
        UO !== undefined && UO < 1 && UO > U
          ? {
              flameK: flameTemperatureK({ [fuel]: UO, O2: 1 - UO }, 298.15),
              phi: (z * UO) / (1 - UO),
              ufl: UO,
            }
          : undefined;
      out = { air, oxygen };
    }
  }
  richCache.set(fuel, out ?? null);
  return out;
}

const locCache = new Map<string, number | null>();

/**
 * Limit flame temperature at the nose of a fuel's envelope: the complete-combustion flame
 * temperature of the stoichiometric fuel in N2 with O2 at its listed LOC (from 298.15 K);
 * undefined without a listed LOC above 0 (estimated LOCs do not calibrate).
 * Example: locFlameTemperatureK('H2') -> 1.04e3 K (H2 at its LOC, 4.6 %, ASTM E2079), against 627 K at its
 * LFL in air: the lean-limit temperature of H2 does not hold near stoichiometric.
 */
export function locFlameTemperatureK(fuel: string): number | undefined {
  const cached = locCache.get(fuel);
  if (cached !== undefined) return cached ?? undefined;
  const rec = FUEL_SAFETY.get(fuel);
  let t: number | undefined;
  if (rec?.loc && rec.loc.value > 0) {
    const z = oxygenDemand(getSpecies(fuel).elements);
    const o = rec.loc.value;
    t = flameTemperatureK({ [fuel]: o / z, O2: o, N2: 1 - o - o / z }, 298.15);
  }
  locCache.set(fuel, t ?? null);
  return t;
}

/**
 * The lean-side limit flame temperature of one fuel at equivalence ratio phi <= 1: the LFL
 * calibration up to the LFL in air's phi, then a linear ramp in phi to the LOC calibration at
 * phi = 1 where a LOC is listed (else the LFL calibration throughout).
 */
export function leanThresholdK(fuel: string, leanK: number, phi: number): number {
  const nose = locFlameTemperatureK(fuel);
  const rec = FUEL_SAFETY.get(fuel);
  if (nose === undefined || !rec) return leanK;
  const L = Math.min(...rec.lflAir.map((v) => v.value));
  const phiL = (oxygenDemand(getSpecies(fuel).elements) * L) / (AIR_O2 * (1 - L));
  if (phi <= phiL || phiL >= 1) return leanK;
  return leanK + ((nose - leanK) * (Math.min(phi, 1) - phiL)) / (1 - phiL);
}

/**
 * The rich-side limit flame temperature of one fuel at equivalence ratio phi > 1 and oxygen
 * share r: the calibration at the UFL (air at r <= 0.21, interpolated linearly in r up to the
 * O2 calibration at r = 1), reached by a linear ramp in phi from the limit temperature at
 * phi = 1 (`noseK`: the LOC calibration where a LOC is listed, else the LFL one).
 */
export function richThresholdK(c: RichCalibration, noseK: number, phi: number, r: number): number {
  const s = c.oxygen ? Math.min(1, Math.max(0, (r - AIR_O2) / (1 - AIR_O2))) : 0;
  const richK = c.oxygen ? c.air.flameK + s * (c.oxygen.flameK - c.air.flameK) : c.air.flameK;
  const phiU = c.oxygen ? c.air.phi + s * (c.oxygen.phi - c.air.phi) : c.air.phi;
  if (phiU <= 1 || phi >= phiU) return richK;
  return noseK + ((richK - noseK) * (phi - 1)) / (phiU - 1);
}
