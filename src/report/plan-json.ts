/** plan --json: one object, SI units in the key names (the contract other tools read). */
import {
  allStageFindings,
  describeFinding,
  STANDING_CAUTION,
  type Plan,
  type PlanStep,
} from '../core/index.js';
import { pressure } from './format.js';
import { withJsonKeys } from './json-keys.js';
import type { PressureUnit } from './units.js';
import { predictedJson } from './predicted-text.js';
import { twoStageJson } from './two-stage-text.js';
import { premixLogJson } from './premix-log-text.js';

import type { ReactorSpec } from '../core/index.js';

export interface PlanMeta {
  readonly recipeId: string;
  readonly labName: string;
  readonly orderRecommended: boolean;
  readonly version: string;
  /** how many experiments the batch serves, when a reactor is known */
  readonly experiments?: {
    readonly count: number;
    readonly sizedFor?: number;
    readonly reactor: ReactorSpec;
    readonly perExperimentMol: number;
    readonly minTankPa: number;
    readonly margin: number;
  };
  /**
   * the barometric pressure gauge-referenced targets assume, and whether it was given
   * (--barometer) or is the lab profile's
   */
  readonly barometer?: {
    readonly pressurePa: number;
    readonly uncertaintyPa: number;
    readonly given: boolean;
  };
}

function mixtureJson(plan: Plan) {
  return {
    composition: plan.design.composition,
    phi: plan.design.phi ?? null,
    fuel_fraction: plan.design.fuelFraction,
    oxidizer_fraction: plan.design.oxidizerFraction,
    diluent_fraction: plan.design.diluentFraction,
    stoich_O2_per_fuel: plan.design.stoichO2PerFuel ?? null,
    fuel: plan.design.groups.fuel,
    oxidizer: plan.design.groups.oxidizer,
    diluent: plan.design.groups.diluent,
    filled_composition: plan.composition,
    unidentified_fraction: plan.unidentifiedFraction,
  };
}

function finalJson(plan: Plan) {
  return {
    pressure_Pa: plan.final.pressurePa,
    temperature_K: plan.final.temperatureK,
    compressibility: plan.final.compressibility,
    amount_mol: plan.final.amountMol,
    ideal_amount_mol: plan.final.idealAmountMol,
    density_mol_per_m3: plan.final.densityMolPerM3,
    B_mix_m3_per_mol: plan.final.bMixM3PerMol,
    C_mix_m6_per_mol2: plan.final.cMixM6PerMol2,
  };
}

function barometerJson(plan: Plan, meta: PlanMeta) {
  return meta.barometer
    ? {
        pressure_Pa: meta.barometer.pressurePa,
        u_Pa: meta.barometer.uncertaintyPa,
        source: meta.barometer.given ? 'option' : 'lab profile',
        gauge_referenced_steps: plan.steps.filter((s) => s.gauge?.reference === 'gauge').map((s) => s.index),
      }
    : null;
}

function experimentsJson(meta: PlanMeta) {
  return meta.experiments
    ? {
        count: meta.experiments.count,
        sized_for: meta.experiments.sizedFor ?? null,
        reactor: meta.experiments.reactor.id,
        reactor_volume_m3: meta.experiments.reactor.volumeM3,
        line_volume_m3: meta.experiments.reactor.lineVolumeM3,
        fill_pressure_Pa: meta.experiments.reactor.fillPressurePa,
        per_experiment_mol: meta.experiments.perExperimentMol,
        min_tank_pressure_Pa: meta.experiments.minTankPa,
      }
    : null;
}

function stepJson(s: PlanStep) {
  return {
    step: s.index,
    species: s.species,
    source: s.source.id,
    source_kind: s.source.kind,
    // the gases the source delivers, mole fractions (a premix: every gas, `species` names them all)
    source_composition: s.source.composition,
    // charge `number` of the `of` charges of this source (1 of 1 unless the source is split)
    charge: { number: s.charge.number, of: s.charge.of },
    target_Pa: s.targetPa,
    increment_Pa: s.incrementPa,
    amount_mol: s.amountMol,
    mass_kg: s.massKg,
    ideal_target_Pa: s.idealTargetPa,
    real_minus_ideal_Pa: s.targetPa - s.idealTargetPa,
    band_Pa: s.bandPa,
    compressibility: s.compressibilityAfter,
    composition_after: s.compositionAfter,
    gauge: s.gauge?.id ?? null,
    gauge_reference: s.gauge?.reference ?? null,
    gauge_reading_Pa: s.gauge?.readingPa ?? null,
    gauge_unit: s.gauge?.unit ?? null,
    gauge_u_Pa: s.gauge?.uncertaintyPa ?? null,
    isolate_before: s.isolateBefore.map((g) => g.id),
  };
}

/** the second and third virial coefficients used, with their sources */
function virialJson(plan: Plan) {
  return {
    virial: plan.virial.entries.map((e) => ({
      i: e.i,
      j: e.j,
      B_m3_per_mol: e.valueM3PerMol,
      method: e.method,
      source: e.source,
      model: e.model ?? null,
    })),
    third_virial: {
      pure: plan.virial.species.map((k, i) => ({ species: k, C_m6_per_mol2: plan.virial.C[i] })),
      pairs: plan.virial.cPairs.map((p) => ({
        twice: plan.virial.species[p.i],
        once: plan.virial.species[p.j],
        C_m6_per_mol2: p.value,
        source: 'coolprop-8-mixture',
        model: p.model,
      })),
      rule:
        'C_mix = sum y_i y_j y_k C_ijk; untabulated C_ijk = (C_ii C_jj C_kk)^(1/3); ' +
        'C of polar species and of species without a reference value is 0',
    },
  };
}

export function planToJson(plan: Plan, meta: PlanMeta, unit: PressureUnit = 'Torr'): object {
  const fmt = (pa: number) => pressure(pa, unit);
  return {
    tool: 'mixwright',
    version: meta.version,
    kind: 'plan',
    recipe: meta.recipeId,
    lab: meta.labName,
    mixture: mixtureJson(plan),
    tank: {
      id: plan.tank.id,
      label: plan.tank.label,
      volume_m3: plan.tank.volumeM3,
      rated_pressure_Pa: plan.tank.ratedPressurePa ?? null,
    },
    initial: plan.initial
      ? {
          pressure_Pa: plan.initial.pressurePa,
          amount_mol: plan.initial.amountMol,
          composition: plan.initial.composition,
        }
      : null,
    final: finalJson(plan),
    order: {
      fills: plan.steps.map((s) => s.species),
      reason: plan.orderReason,
      recommended: meta.orderRecommended,
    },
    tolerance: { relative: plan.tolerance.relative, absolute: plan.tolerance.absolute },
    barometer: barometerJson(plan, meta),
    experiments: experimentsJson(meta),
    steps: plan.steps.map(stepJson),
    ...virialJson(plan),
    predicted: predictedJson(plan),
    two_stage: twoStageJson(plan, meta, unit, planToJson),
    premix_log: premixLogJson(plan),
    // how many danger findings stand, a two-stage plan's premix's included (the DANGER headline; exit 3 when > 0)
    dangers: allStageFindings(plan).filter((f) => f.severity === 'danger').length,
    // a finding's numbers keep their names, in the JSON key style (uncertaintyPa -> uncertainty_Pa)
    findings: plan.findings.map((f) => ({
      ...(withJsonKeys(f) as object),
      step: f.step ?? null,
      message: describeFinding(f, fmt),
    })),
    caution: STANDING_CAUTION,
  };
}
