/**
 * The shapes of the fill plan: what the planner is given (PlanInput) and what it
 * returns (Plan, one PlanStep per charge). The stages between them hand on their own
 * small types, declared beside each stage.
 */
import type { Design, Fractions } from '../composition.js';
import type { GasSource } from '../supply.js';
import type { Gauge, ReadingContext } from '../gauges.js';
import type { VirialModel } from '../mixture-eos.js';
import type { Finding } from '../findings.js';
import type { TwoStagePlan } from './two-stage.js';
import type { PremixLogUse } from './premix-log.js';

export interface Tolerance {
  /** allowed relative deviation of each mole fraction (0.005 = 0.5 %) */
  readonly relative: number;
  /** floor on the allowed absolute deviation of a mole fraction */
  readonly absolute: number;
}

/** the allowed absolute deviation of a mole fraction whose design value is `design` */
export function allowedDeviation(tol: Tolerance, design: number): number {
  return Math.max(tol.relative * design, tol.absolute);
}

export interface TankSpec {
  readonly id: string;
  readonly label: string;
  readonly volumeM3: number;
  /** maximum allowed working pressure, Pa absolute */
  readonly ratedPressurePa?: number;
  /** fraction of the rating used as the working limit (default 1) */
  readonly workingFraction?: number;
}

/** one opening of a source's valve, as asked for */
export interface ChargeRequest {
  readonly source: GasSource;
  /** absolute tank pressure to stop this charge at, Pa; only on a charge that is not its source's last */
  readonly stopPa?: number;
}

export interface PlanInput {
  readonly design: Design;
  readonly finalPressurePa: number;
  readonly temperatureK: number;
  readonly tank: TankSpec;
  /** the fills: in fill order when `order` is 'given', in any order when 'recommend' */
  readonly sources: readonly GasSource[];
  readonly order: 'given' | 'recommend';
  /**
   * With order 'given': the charges in fill order, when a source is filled in more than one
   * charge. Every source of `sources` appears at least once; `stopPa` (absolute tank pressure
   * to stop at) only on a charge that is not its source's last (without it the planner
   * chooses the split point). Absent: one charge per source, in the order of `sources`.
   */
  readonly charges?: readonly ChargeRequest[];
  /** safety-review settings beyond the tank and temperature */
  readonly safety?: {
    readonly coldestK?: number;
    readonly condensationFraction?: number;
    /** the warmest temperature the filled tank reaches (storage, use), K: its pressure there is checked */
    readonly warmestK?: number;
  };
  readonly inTank?: { readonly composition: Fractions; readonly pressurePa: number };
  readonly gauges: readonly Gauge[];
  /**
   * every head on the manifold, read or not (default: `gauges`): a plan read on some of them (the
   * premix stage on one head) still closes off the others before a fill passes their range
   */
  readonly manifoldGauges?: readonly Gauge[];
  readonly reading: ReadingContext;
  readonly tolerance: Tolerance;
  /**
   * The lab's tank thermometer (standard uncertainty, display resolution, gas-thermometer
   * difference left after settling, K): with it, a recommended order is chosen by the
   * sequence search (plan/search.ts) for the smallest predicted U; without it, by the
   * safety advice alone.
   */
  readonly thermometer?: { readonly uK: number; readonly resolutionK: number; readonly settlingK: number };
}

export interface GaugeAssignment {
  readonly id: string;
  readonly label: string;
  readonly unit: string;
  readonly reference: Gauge['reference'];
  /** what the gauge should show, Pa (gauge-referenced: above ambient) */
  readonly readingPa: number;
  readonly uncertaintyPa: number;
  /** display resolution, Pa: the sheet shows targets to this step */
  readonly resolutionPa: number;
}

export interface PlanStep {
  readonly kind: 'fill';
  /** 1-based */
  readonly index: number;
  readonly source: GasSource;
  readonly species: string;
  /** this step is charge `number` of the `of` charges its source is filled in (1 of 1 for most) */
  readonly charge: { readonly number: number; readonly of: number };
  /** absolute tank pressure after this fill, Pa */
  readonly targetPa: number;
  readonly incrementPa: number;
  readonly amountMol: number;
  readonly massKg: number;
  /** what an ideal-gas spreadsheet would give: P_f times the cumulative amount fraction */
  readonly idealTargetPa: number;
  readonly compositionAfter: Record<string, number>;
  readonly compressibilityAfter: number;
  /** half-width of the tolerance band on the absolute reading, Pa */
  readonly bandPa: number;
  readonly gauge?: GaugeAssignment;
  /** gauges to close off before this fill, so they are not over-ranged */
  readonly isolateBefore: readonly { id: string; label: string; topPa: number }[];
}

/** gas already in the tank before the first fill */
export interface InitialGas {
  readonly pressurePa: number;
  readonly amountMol: number;
  readonly composition: Fractions;
}

export interface Plan {
  readonly design: Design;
  readonly temperatureK: number;
  readonly tank: TankSpec;
  readonly orderReason: string;
  readonly orderRecommended: boolean;
  /** composition the tank will hold, with cylinder impurities */
  readonly composition: Record<string, number>;
  readonly unidentifiedFraction: number;
  readonly initial?: InitialGas;
  readonly final: {
    readonly pressurePa: number;
    readonly temperatureK: number;
    readonly compressibility: number;
    readonly amountMol: number;
    readonly idealAmountMol: number;
    readonly densityMolPerM3: number;
    readonly bMixM3PerMol: number;
    readonly cMixM6PerMol2: number;
  };
  readonly steps: readonly PlanStep[];
  readonly virial: VirialModel;
  readonly findings: readonly Finding[];
  readonly tolerance: Tolerance;
  /** a two-stage preparation: this plan is its stage 2 (the batch); stage 1 made the premix it draws from */
  readonly twoStage?: Omit<TwoStagePlan, 'batch'>;
  /** a batch drawing from an existing premix tank: the premix log it was planned from */
  readonly premixLog?: PremixLogUse;
}
