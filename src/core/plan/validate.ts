/**
 * Stage 1 of the fill plan: refuse what cannot be planned, and fix what every later
 * stage shares (the virial model of every species present, the gas already in the
 * tank, the working limit and the safety-review settings).
 */
import { bMix, cMix, densityFromPressure, virialModel, type VirialModel } from '../mixture-eos.js';
import { getSpecies } from '../lookup.js';
import type { SafetyContext } from '../safety.js';
import { fail, type Problem } from '../problems.js';
import type { InitialGas, PlanInput, PlanStep, TankSpec } from './types.js';

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
 * outside MODEL_T_RANGE_K, an unknown species, gas in the tank at or above the final
 * pressure, and a final pressure above the tank's rating (aboveRating).
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
  if (tank.ratedPressurePa !== undefined && Pf > tank.ratedPressurePa)
    fail(aboveRating(input, Pf), { field: 'pressure' });
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

/**
 * The above-rating problem of a pressure the plan would reach in input's tank. The rule of the
 * tank's rating (our rule, after common practice: a pressure vessel is never filled past its
 * maximum allowed working pressure): a plan whose final pressure, or the top of the band of any
 * of its readings, is above the tank's rating is refused, whatever the design; between the
 * working limit (rating x working fraction) and the rating the plan is made with the
 * tank-over-rating danger (review.ts), as the guided fill makes a reading past the working limit
 * a danger to vent from or accept. A tank of unknown rating is planned with tank-rating-unknown.
 */
function aboveRating(
  input: Pick<PlanInput, 'tank'>,
  pressurePa: number,
  bandPa?: number,
  what: 'final' | 'premix' = 'final',
): Problem {
  const { tank } = input;
  const ratedPa = tank.ratedPressurePa!;
  return {
    code: 'design-conflict',
    kind: 'above-rating',
    what,
    tank: tank.id,
    pressurePa,
    ratedPa,
    workingLimitPa: ratedPa * (tank.workingFraction ?? 1),
    bandPa,
  };
}

/**
 * Refuses a plan one of whose readings could be above the tank's rating: the top of its band
 * (a reading anywhere inside the band is accepted) above the rating (aboveRating); the final
 * pressure itself is refused by validatePlanInput.
 */
export function refuseBandsAboveRating(basis: PlanBasis, steps: readonly PlanStep[]): void {
  const rated = basis.input.tank.ratedPressurePa;
  if (rated === undefined) return;
  const over = steps.find((s) => s.targetPa + s.bandPa > rated);
  if (over) fail(aboveRating(basis.input, over.targetPa, over.bandPa), { field: 'pressure' });
}

/** refuses a premix tank's given final pressure above its rating (aboveRating), at the recipe's premix.pressure */
export function refusePremixAboveRating(tank: TankSpec, pressurePa: number): void {
  if (tank.ratedPressurePa !== undefined && pressurePa > tank.ratedPressurePa)
    fail(aboveRating({ tank }, pressurePa, undefined, 'premix'), { field: 'premix.pressure' });
}
