/**
 * Stage 1 of the fill plan: refuse what cannot be planned, and fix what every later
 * stage shares (the virial model of every species present, the gas already in the
 * tank, the working limit and the safety-review settings).
 */
import { bMix, cMix, densityFromPressure, virialModel, type VirialModel } from '../mixture-eos.js';
import { getSpecies } from '../lookup.js';
import type { SafetyContext } from '../safety.js';
import { fail } from '../problems.js';
import type { InitialGas, PlanInput } from './types.js';

/** temperatures the virial model is used at (reference table 230-480 K, correlation beyond) */
export const MODEL_T_RANGE_K = { min: 200, max: 600 } as const;

/** what every later stage works from */
export interface PlanBasis {
  readonly input: PlanInput;
  readonly finalPressurePa: number;
  readonly temperatureK: number;
  readonly volumeM3: number;
  /** every species of the sources and of the gas in the tank, by key */
  readonly species: readonly string[];
  readonly model: VirialModel;
  readonly initial?: InitialGas;
  /** the tank's working limit, Pa absolute; undefined when its rating is unknown */
  readonly workingLimitPa?: number;
  readonly safety: SafetyContext;
}

/**
 * Check the plan's inputs and build its basis. Refuses (as problems) a final pressure,
 * temperature or tank volume that is not positive, a plan without fills, a temperature
 * outside MODEL_T_RANGE_K, an unknown species, and gas in the tank at or above the final
 * pressure.
 */
export function validatePlanInput(input: PlanInput): PlanBasis {
  const { finalPressurePa: Pf, temperatureK: T, tank } = input;
  if (!(Pf > 0)) fail({ code: 'not-positive', what: 'final pressure', value: Pf }, { field: 'pressure' });
  if (!(T > 0)) fail({ code: 'not-positive', what: 'temperature', value: T }, { field: 'temperature' });
  if (!(tank.volumeM3 > 0))
    fail({ code: 'not-positive', what: 'tank volume', value: tank.volumeM3 }, { field: 'volume' });
  if (input.sources.length === 0) fail({ code: 'design-missing', kind: 'no-fills' });
  if (T < MODEL_T_RANGE_K.min || T > MODEL_T_RANGE_K.max) {
    fail(
      {
        code: 'model-range',
        kind: 'temperature',
        temperatureK: T,
        minK: MODEL_T_RANGE_K.min,
        maxK: MODEL_T_RANGE_K.max,
      },
      { field: 'temperature' },
    );
  }
  const V = tank.volumeM3;
  const speciesSet = new Set<string>();
  for (const s of input.sources)
    for (const k of Object.keys(s.composition)) speciesSet.add(getSpecies(k).key);
  for (const k of Object.keys(input.inTank?.composition ?? {})) speciesSet.add(getSpecies(k).key);
  const species = [...speciesSet];
  const model = virialModel(species, T);

  let initial: InitialGas | undefined;
  if (input.inTank) {
    const y0 = input.inTank.composition;
    const rho0 = densityFromPressure(input.inTank.pressurePa, T, bMix(model, y0), cMix(model, y0));
    initial = { pressurePa: input.inTank.pressurePa, amountMol: rho0 * V, composition: y0 };
    if (input.inTank.pressurePa >= Pf) {
      fail(
        { code: 'design-conflict', kind: 'in-tank-at-final', inTankPa: input.inTank.pressurePa, finalPa: Pf },
        { field: 'in_tank.pressure' },
      );
    }
  }
  const workingLimitPa =
    tank.ratedPressurePa === undefined ? undefined : tank.ratedPressurePa * (tank.workingFraction ?? 1);
  const safety: SafetyContext = {
    temperatureK: T,
    workingLimitPa,
    tankId: tank.id,
    coldestK: input.safety?.coldestK,
    condensationFraction: input.safety?.condensationFraction,
  };
  return {
    input,
    finalPressurePa: Pf,
    temperatureK: T,
    volumeM3: V,
    species,
    model,
    initial,
    workingLimitPa,
    safety,
  };
}
