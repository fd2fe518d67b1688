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
 * Air leaking in per day at tank pressure P, as a mole fraction of the batch: the leak-up rate R
 * measured under vacuum scaled by the driving pressure difference (P_atm - P)/P_atm (an estimate for
 * viscous leaks), R x 86400 s x (P_atm - P)/P_atm / P; none at or above ambient.
 * Example: ingressPerDayAt(44 * 101325 / 760, 101325, 2e-5 * 101325 / 760 / 60) -> 0.0006167
 *   (by hand: 2e-5 Torr/min x 1440 min x 716/760 / 44 Torr = 6.1665e-4 of the batch per day).
 */
export function ingressPerDayAt(pressurePa: number, atmosphericPa: number, leakRatePaPerS: number): number {
  if (pressurePa >= atmosphericPa) return 0;
  return (leakRatePaPerS * 86400 * (atmosphericPa - pressurePa)) / atmosphericPa / pressurePa;
}

/** the batch with `extraAir` mol of air per mol of batch mixed in, as mole fractions */
function withAir(y: Fractions, air: Fractions, extraAir: number): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(y)) out[k] = v / (1 + extraAir);
  for (const [k, v] of Object.entries(air)) out[k] = (out[k] ?? 0) + (v * extraAir) / (1 + extraAir);
  return out;
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
  const ingressPerDay = ingressPerDayAt(c.tankPressurePa, c.atmosphericPa, c.leakRatePaPerS);
  const airO2 = c.air.O2 ?? 0;
  const mix = (extraAir: number) => withAir(c.composition, c.air, extraAir);
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

export interface DrawDownInput {
  readonly composition: Fractions;
  /** the tank pressure before each experiment, then after the last (count + 1 values, Pa; sizing.ts) */
  readonly pressuresPa: readonly number[];
  /** residual air from the base vacuum, mole fraction of the batch */
  readonly residualFraction: number;
  readonly leakRatePaPerS: number;
  readonly days: number;
  readonly atmosphericPa: number;
  readonly air: Fractions;
}

/** the air and phi the last experiment draws */
export interface DrawnState {
  /** air in the batch (the base vacuum's included), mole fraction */
  readonly airFraction: number;
  readonly phi?: number;
  /** the batch with that air in it, mole fractions */
  readonly composition: Record<string, number>;
}

export interface DrawDown {
  readonly experiments: number;
  /** the first experiment drawn from the tank below ambient, and the tank pressure before it */
  readonly belowFrom?: { readonly experiment: number; readonly pressurePa: number };
  /** the tank pressure before the last experiment: the lowest the batch is drawn from */
  readonly lowestPa: number;
  /** air leaking in per day there, mole fraction of the batch */
  readonly ingressPerDayAtLowest: number;
  /** O2 leaking in per day there, over the batch's own O2 (undefined: the batch has no O2) */
  readonly o2ShareAddedPerDayAtLowest?: number;
  /** the experiments spread evenly over the storage time, the first at once, the last at its end */
  readonly evenly: DrawnState;
  /** the bound: the tank held at the lowest pressure for the whole storage time */
  readonly heldAtLowest: DrawnState;
}

/**
 * The batch as it is drawn down by its experiments: where the tank goes below ambient (air then
 * leaks in, by the rule of ingressPerDayAt) and the air the last experiment draws. The air
 * fraction grows at the ingress rate of the tank pressure at the time (an experiment draws the
 * gas as it is, so it leaves the fractions as they are): with the experiments spread evenly over
 * `days`, the sum of rate x interval over the pressures between experiments; held at the lowest
 * pressure for all `days`, residual + rate x days, a bound (the rate is largest at the lowest
 * pressure), linear in the small air fraction.
 * For instance 43 experiments drawn from 1500 Torr with 760 Torr ambient: below ambient from the
 * experiment whose tank pressure before it is first under 760 Torr (tests/core/readiness-draw-down.test.ts).
 */
export function drawDown(d: DrawDownInput): DrawDown {
  const n = d.pressuresPa.length - 1;
  const rate = (p: number) => ingressPerDayAt(p, d.atmosphericPa, d.leakRatePaPerS);
  const before = d.pressuresPa.slice(0, n);
  const k = before.findIndex((p) => p < d.atmosphericPa);
  const lowestPa = before[n - 1] ?? d.pressuresPa[0];
  const interval = n > 1 ? d.days / (n - 1) : d.days;
  // between experiment j and j + 1 the tank holds the pressure after j (the one before j + 1)
  let evenly = d.residualFraction;
  for (let j = 1; j < n; j++) evenly += rate(d.pressuresPa[j]) * interval;
  if (n <= 1) evenly += rate(lowestPa) * d.days;
  const held = d.residualFraction + rate(lowestPa) * d.days;
  const o2 = d.composition.O2 ?? 0;
  const state = (air: number): DrawnState => {
    const composition = withAir(d.composition, d.air, air);
    return { airFraction: air / (1 + air), phi: equivalenceRatio(composition), composition };
  };
  return {
    experiments: n,
    belowFrom: k >= 0 ? { experiment: k + 1, pressurePa: before[k] } : undefined,
    lowestPa,
    ingressPerDayAtLowest: rate(lowestPa),
    o2ShareAddedPerDayAtLowest: o2 > 0 ? ((d.air.O2 ?? 0) * rate(lowestPa)) / o2 : undefined,
    evenly: state(evenly),
    heldAtLowest: state(held),
  };
}
