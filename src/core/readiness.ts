/**
 * Readiness of a filled tank: how long diffusion takes to make it homogeneous, and
 * how much the base vacuum and the leak-up over the storage time contaminate it.
 */
import type { Fractions } from './composition.js';
import { equivalenceRatio } from './composition.js';
import {
  diffusionMixingTimeS,
  slowestPair,
  SLOWEST_PAIR_MIN_FRACTION,
  transportGaps,
  type PairDiffusion,
} from './diffusion.js';
import type { Finding } from './findings.js';

export interface MixingEstimate {
  readonly pair?: PairDiffusion;
  /** seconds to 1 % and 0.1 % residual non-uniformity, by diffusion alone */
  readonly to1PercentS?: number;
  readonly to01PercentS?: number;
  readonly stirred: boolean;
  /**
   * species whose transport data are not on file: a note where one method is left, a
   * warning where pairs are left out of the slowest pair (the time may then be too short)
   */
  readonly findings: readonly Finding[];
}

/** the transport-data gaps of the species that count for the slowest pair, as findings */
function transportFindings(y: Fractions): Finding[] {
  const gaps = transportGaps(y);
  const blind = new Set(gaps.filter((g) => !g.lennardJones && !g.fullerVolume).map((g) => g.species));
  const present = Object.keys(y).filter((k) => y[k] >= SLOWEST_PAIR_MIN_FRACTION);
  return gaps.map((g): Finding => {
    const pairsLeftOut = blind.has(g.species)
      ? present.filter((k) => k !== g.species).map((k) => `${g.species}-${k}`)
      : [];
    return {
      severity: pairsLeftOut.length ? 'warning' : 'note',
      code: 'transport-data-not-known',
      species: g.species,
      missing: [
        ...(g.lennardJones ? [] : ['lennard-jones' as const]),
        ...(g.fullerVolume ? [] : ['diffusion volume' as const]),
      ],
      pairsLeftOut,
    };
  });
}

export function mixingEstimate(
  y: Fractions,
  temperatureK: number,
  pressurePa: number,
  heightM: number,
  stirred: boolean,
): MixingEstimate {
  const pair = slowestPair(y, temperatureK, pressurePa);
  const findings = transportFindings(y);
  if (!pair) return { stirred, findings };
  return {
    pair,
    to1PercentS: diffusionMixingTimeS(heightM, pair.governingM2s, 0.01),
    to01PercentS: diffusionMixingTimeS(heightM, pair.governingM2s, 0.001),
    stirred,
    findings,
  };
}

export interface ContaminationInput {
  readonly composition: Fractions;
  readonly tankPressurePa: number;
  /** pressure before the first fill, Pa (its gas taken as air) */
  readonly baseVacuumPa: number;
  /** leak-up rate measured under vacuum, Pa/s */
  readonly leakRatePaPerS: number;
  readonly days: number;
  readonly atmosphericPa: number;
  readonly air: Fractions;
}

export interface Contamination {
  /** mole fraction of residual air from the base vacuum */
  readonly residualFraction: number;
  /** mole fraction of air leaking in per day at the tank pressure (0 above ambient) */
  readonly ingressPerDay: number;
  /** O2 added per day, mole fraction of the batch */
  readonly o2PerDay: number;
  readonly phiStart?: number;
  readonly phiAfter?: number;
  /** relative change of phi per day (negative: leaner) */
  readonly phiDriftPerDay?: number;
  readonly aboveAmbient: boolean;
}

/**
 * Residual air = P_base / P_tank. Air ingress: the leak-up rate R measured under vacuum,
 * scaled by the driving pressure difference (P_atm - P_tank)/P_atm while the tank is
 * below ambient (an estimate for viscous leaks); none above ambient, where gas leaks
 * out and the composition keeps. Per day: R x 86400 s x (P_atm - P)/P_atm / P.
 */
export function contamination(c: ContaminationInput): Contamination {
  const residualFraction = c.baseVacuumPa / c.tankPressurePa;
  const aboveAmbient = c.tankPressurePa >= c.atmosphericPa;
  const drive = aboveAmbient ? 0 : (c.atmosphericPa - c.tankPressurePa) / c.atmosphericPa;
  const ingressPerDay = (c.leakRatePaPerS * 86400 * drive) / c.tankPressurePa;
  const airO2 = c.air.O2 ?? 0;
  const mix = (extraAir: number): Record<string, number> => {
    const y: Record<string, number> = {};
    for (const [k, v] of Object.entries(c.composition)) y[k] = v / (1 + extraAir);
    for (const [k, v] of Object.entries(c.air)) y[k] = (y[k] ?? 0) + (v * extraAir) / (1 + extraAir);
    return y;
  };
  const phiStart = equivalenceRatio(mix(residualFraction));
  const phiAfter = equivalenceRatio(mix(residualFraction + ingressPerDay * c.days));
  const phiDay = equivalenceRatio(mix(residualFraction + ingressPerDay));
  return {
    residualFraction,
    ingressPerDay,
    o2PerDay: airO2 * ingressPerDay,
    phiStart,
    phiAfter,
    phiDriftPerDay: phiStart !== undefined && phiDay !== undefined ? phiDay / phiStart - 1 : undefined,
    aboveAmbient,
  };
}
