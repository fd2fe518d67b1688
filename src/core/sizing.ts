/**
 * Batch sizing: how many experiments a batch serves, and the reverse. Each
 * experiment fills the reactor or driven section (plus the line to it) to its fill
 * pressure from the tank; the tank is used down to the fill pressure plus a margin,
 * below which the fill can no longer be made reliably. Amounts from the real-gas
 * equation of state of the batch composition.
 */
import type { Fractions } from './composition.js';
import { bMix, cMix, densityFromPressure, pressureFromDensity, virialModel } from './mixture-eos.js';
import { fail } from './problems.js';
import type { Finding } from './findings.js';

export interface ReactorSpec {
  readonly id: string;
  readonly label: string;
  /** reactor or driven-section volume, m3 */
  readonly volumeM3: number;
  /** line volume from the tank valve to the reactor, m3 (filled and lost with each experiment) */
  readonly lineVolumeM3: number;
  /** fill pressure of one experiment, Pa absolute */
  readonly fillPressurePa: number;
  /** temperature of reactor and line at fill, K (default: the tank temperature) */
  readonly temperatureK?: number;
}

export interface SizingInput {
  readonly composition: Fractions;
  readonly tankVolumeM3: number;
  readonly temperatureK: number;
  readonly reactor: ReactorSpec;
  /** the tank stays above fill pressure x (1 + margin) */
  readonly margin: number;
}

export interface Sizing {
  readonly perExperimentMol: number;
  readonly minTankPa: number;
  readonly reserveMol: number;
}

function density(y: Fractions, pressurePa: number, temperatureK: number): number {
  const m = virialModel(Object.keys(y), temperatureK);
  return densityFromPressure(pressurePa, temperatureK, bMix(m, y), cMix(m, y));
}

export function sizingBasis(input: SizingInput): Sizing {
  const r = input.reactor;
  if (!(r.volumeM3 > 0))
    fail({ code: 'not-positive', what: 'reactor volume', value: r.volumeM3 }, { field: 'reactor_volume' });
  if (!(r.lineVolumeM3 >= 0))
    fail(
      { code: 'out-of-range', what: 'line volume', value: r.lineVolumeM3, allowed: '>= 0' },
      { field: 'line_volume' },
    );
  if (!(r.fillPressurePa > 0))
    fail(
      { code: 'not-positive', what: 'fill pressure', value: r.fillPressurePa },
      { field: 'fill_pressure' },
    );
  if (!(input.margin >= 0))
    fail(
      { code: 'out-of-range', what: 'fill margin', value: input.margin, allowed: '>= 0' },
      { field: 'fill_margin' },
    );
  const Tr = r.temperatureK ?? input.temperatureK;
  const perExperimentMol = density(input.composition, r.fillPressurePa, Tr) * (r.volumeM3 + r.lineVolumeM3);
  const minTankPa = r.fillPressurePa * (1 + input.margin);
  const reserveMol = density(input.composition, minTankPa, input.temperatureK) * input.tankVolumeM3;
  return { perExperimentMol, minTankPa, reserveMol };
}

/**
 * Whole experiments a batch at `finalPressurePa` serves.
 * Example: experimentsServed({ composition: { N2: 1 }, tankVolumeM3: 0.01, temperatureK: 298.15,
 *   reactor: { id: 'R', label: 'R', volumeM3: 0.001, lineVolumeM3: 0.0001, fillPressurePa: 50 * 101325 / 760 },
 *   margin: 0.1 }, 1500 * 101325 / 760).experiments -> 262 (a 10 L tank at 1500 Torr, 1 L reactor + 0.1 L line
 *   filled to 50 Torr, margin 10 %: (1500 - 55) x 10 / (50 x 1.1) = 262.7 by hand for an ideal gas, whole
 *   experiments 262; N2 is within 0.05 % of ideal here).
 */
export function experimentsServed(
  input: SizingInput,
  finalPressurePa: number,
): { experiments: number; sizing: Sizing } {
  const sizing = sizingBasis(input);
  const have = density(input.composition, finalPressurePa, input.temperatureK) * input.tankVolumeM3;
  const n = Math.floor((have - sizing.reserveMol) / sizing.perExperimentMol + 1e-9);
  return { experiments: Math.max(0, n), sizing };
}

/**
 * The finding for a batch too small for even one experiment (a warning: the plan is
 * valid, but the batch serves nothing in this reactor); undefined when it serves one or more.
 */
export function batchSizeFinding(input: SizingInput, finalPressurePa: number): Finding | undefined {
  const { experiments, sizing } = experimentsServed(input, finalPressurePa);
  if (experiments > 0) return undefined;
  return {
    severity: 'warning',
    code: 'batch-too-small',
    reactor: input.reactor.id,
    finalPa: finalPressurePa,
    minTankPa: sizing.minTankPa,
  };
}

/** the final tank pressure that serves `count` experiments */
export function finalPressureForExperiments(
  input: SizingInput,
  count: number,
): { pressurePa: number; sizing: Sizing } {
  if (!(Number.isInteger(count) && count > 0))
    fail(
      {
        code: 'out-of-range',
        what: 'number of experiments',
        value: count,
        allowed: '1 and up, a whole number',
      },
      { field: 'experiments' },
    );
  if (!(input.tankVolumeM3 > 0))
    fail({ code: 'not-positive', what: 'tank volume', value: input.tankVolumeM3 }, { field: 'volume' });
  const sizing = sizingBasis(input);
  const need = sizing.reserveMol + count * sizing.perExperimentMol;
  const rho = need / input.tankVolumeM3;
  const m = virialModel(Object.keys(input.composition), input.temperatureK);
  const P = pressureFromDensity(
    rho,
    input.temperatureK,
    bMix(m, input.composition),
    cMix(m, input.composition),
  );
  return { pressurePa: P, sizing };
}

/**
 * The tank pressure before each of `count` experiments and after the last (count + 1 values, Pa):
 * the batch at `finalPressurePa` drawn by one experiment's amount at a time (real-gas EOS).
 * For instance the 10 L N2 tank of experimentsServed at 1500 Torr, 262 experiments: the values fall
 * by about 50 x 1.1 / 10 = 5.5 Torr each, to about 1500 - 262 x 5.5 = 59 Torr (ideal gas, by hand).
 */
export function drawDownPressures(input: SizingInput, finalPressurePa: number, count: number): number[] {
  const { perExperimentMol } = sizingBasis(input);
  const y = input.composition;
  const m = virialModel(Object.keys(y), input.temperatureK);
  const B = bMix(m, y);
  const C = cMix(m, y);
  const n0 = densityFromPressure(finalPressurePa, input.temperatureK, B, C) * input.tankVolumeM3;
  return Array.from({ length: count + 1 }, (_, k) =>
    pressureFromDensity((n0 - k * perExperimentMol) / input.tankVolumeM3, input.temperatureK, B, C),
  );
}
