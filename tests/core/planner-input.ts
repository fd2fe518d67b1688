// inputs shared by the planner's stage tests (tests/core/planner-*.test.ts): the demo lab's style
// of absolute heads (invented instruments) and single-species cylinders of purity 1
import {
  designMixture,
  ProblemError,
  pureCylinder,
  type Gauge,
  type PlanInput,
  type Problem,
} from '../../src/core/index.js';
import { TORR } from '../helpers.js';

export const READING = { barometricPa: 101325, barometricUncertaintyPa: 50 };

export const head = (id: string, fsTorr: number, resTorr: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: 0.0012,
  accuracyOfFullScale: 0,
  resolutionPa: resTorr * TORR,
  unit: 'Torr',
});

export const GAUGES = [head('h10', 10, 1e-4), head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)];

export function pureInput(
  x: Record<string, number>,
  order: readonly string[],
  temperatureK: number,
  finalPa: number,
  volumeM3 = 0.01,
): PlanInput {
  return {
    design: designMixture({ kind: 'fractions', fractions: x }),
    finalPressurePa: finalPa,
    temperatureK,
    tank: { id: 'T', label: 'T', volumeM3 },
    sources: order.map((s) => pureCylinder({ id: s, species: s, purity: 1 })),
    order: 'given',
    gauges: GAUGES,
    reading: READING,
    tolerance: { relative: 0.005, absolute: 0 },
  };
}

/** the worked vector of properties.md 1.2 (CoolProp 8.0): 10 L, 298.15 K, CH4/O2/Ar 0.05/0.10/0.85, 1000 Torr */
export function workedInput(): PlanInput {
  return pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 1000 * TORR, 0.01);
}

/** the problem and field `f` is refused with (throws when it is not refused) */
export function refusal(f: () => unknown): { problem: Problem; field?: string } {
  try {
    f();
  } catch (e) {
    if (e instanceof ProblemError) return { problem: e.problem, field: e.where.field };
    throw e;
  }
  throw new Error('not refused');
}
