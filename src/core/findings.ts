/**
 * Findings of a plan as data: a severity, a stable code, the step they concern and
 * the numbers behind them. describeFinding() words each one, in one place.
 */

import { VIRIAL_U } from './mixture-eos.js';
import { describeBandEdges, describePredictedOver } from './predict-words.js';
import { describePreciseOption, describeSequenceChosen } from './search-words.js';
import type { ComponentAbout } from './uncertainty.js';
import { TWO_STAGE_WORDING } from './two-stage-words.js';
import { describeSaferOrder } from './order-words.js';

export type Severity = 'danger' | 'warning' | 'note';

interface Base {
  readonly severity: Severity;
  /** 1-based fill step the finding concerns; undefined for the whole batch */
  readonly step?: number;
}

export type Finding = Base &
  (
    | {
        readonly code: 'tank-over-rating';
        readonly pressurePa: number;
        readonly limitPa: number;
        readonly ratedPa: number;
        readonly tank: string;
      }
    | {
        readonly code: 'tank-warms-past-limit';
        /** the top of the last fill's band, at the fill temperature */
        readonly pressurePa: number;
        readonly fillK: number;
        /** the warmest temperature the filled tank reaches, and its pressure there (the same gas) */
        readonly warmK: number;
        readonly warmPa: number;
        /** true when the lab profile gives no warmest temperature (standard ambient or the fill's) */
        readonly assumed: boolean;
        /** the highest band top at the fill temperature that stays at the working limit when warm */
        readonly maxFillPa: number;
        /** the final pressure to plan with whose band's top is maxFillPa (about: the band scales with it) */
        readonly maxFinalPa: number;
        readonly limitPa: number;
        readonly ratedPa: number;
        readonly tank: string;
      }
    | { readonly code: 'no-gauge-covers'; readonly pressurePa: number }
    | { readonly code: 'purity-assumed'; readonly source: string; readonly species: string }
    | { readonly code: 'unidentified-impurity'; readonly fraction: number }
    | {
        readonly code: 'supply-mismatch';
        readonly species: string;
        readonly design: number;
        readonly actual: number;
      }
    | { readonly code: 'impurity-present'; readonly species: string; readonly fraction: number }
    | { readonly code: 'virial-correlation'; readonly species: string; readonly method: string }
    | {
        readonly code: 'cross-virial-estimate';
        readonly pairs: readonly string[];
        readonly relative: number;
        readonly shiftPa: number;
        readonly bandPa: number;
      }
    | {
        readonly code: 'ideal-gas-error';
        /** the design fraction an ideal-gas plan misses most: design, what it would fill, the allowed deviation */
        readonly species: string;
        readonly design: number;
        readonly idealFraction: number;
        readonly tolerance: number;
        /** the largest difference between an ideal-gas and a real-gas reading, Pa */
        readonly worstPa: number;
      }
    | {
        readonly code: 'supply-pressure-low';
        readonly source: string;
        readonly supplyPa: number;
        readonly targetPa: number;
        /** the supply the charge needs: the target plus the delivery margin (supply-check.ts), Pa */
        readonly requiredPa: number;
      }
    | { readonly code: 'tank-rating-unknown'; readonly tank: string }
    | {
        readonly code: 'batch-too-small';
        readonly reactor: string;
        readonly finalPa: number;
        readonly minTankPa: number;
      }
    | { readonly code: 'isolate-gauge'; readonly gauge: string; readonly topPa: number }
    | ({ readonly code: 'flammable-state' | 'flammable-mixture' | 'near-flammable' } & FlammabilityNumbers)
    | ({
        readonly code: 'detonable-state';
        readonly inertFraction: number;
        readonly pressurePa: number;
      } & DetonationNumbers)
    | ({
        readonly code: 'closed-vessel-pressure';
        readonly fromPa: number;
        readonly peakPa: number;
        readonly limitPa?: number;
      } & ClosedVesselNumbers)
    | {
        readonly code: 'compression-heating';
        readonly fuel: string;
        readonly fromPa: number;
        readonly toPa: number;
        readonly gamma: number;
        readonly endK: number;
        readonly aitK: number;
      }
    | {
        readonly code: 'condensation';
        readonly species: string;
        readonly partialPa: number;
        readonly psatPa: number;
        readonly fraction: number;
        readonly coldestK: number;
        readonly inLine: boolean;
        readonly method: string;
      }
    | {
        readonly code: 'psat-estimated';
        readonly species: string;
        readonly method: string;
        readonly coldestK: number;
      }
    | { readonly code: 'coldest-temperature-assumed'; readonly temperatureK: number }
    | { readonly code: 'no-flammability-data'; readonly species: string }
    | { readonly code: 'flammability-data-estimated'; readonly what: string }
    | { readonly code: 'inert-coefficient-unknown'; readonly species: string; readonly used: number }
    | { readonly code: 'no-with-o2'; readonly pressurePa: number }
    | {
        readonly code: 'acetylene-pressure';
        readonly partialPa: number;
        readonly limitPa: number;
        readonly inLine: boolean;
      }
    | { readonly code: 'n2o-decomposition'; readonly partialPa: number }
    | { readonly code: 'oxygen-service'; readonly source: string }
    | { readonly code: 'oxygen-enriched'; readonly oxygenFraction: number }
    | {
        readonly code: 'safer-order';
        readonly order: readonly string[];
        readonly reason: string;
        /** whose order it is, when nobody gave it (a premix's own order choice); else "the order given" */
        readonly of?: string;
      }
    | ({
        readonly code: 'flammable-fill-path';
        readonly source: string;
        readonly detonable: boolean;
        readonly inertFraction: number;
        readonly fromPa: number;
        readonly toPa: number;
        /** the detonable part of the flammable stretch, tank pressures */
        readonly detonableFromPa?: number;
        readonly detonableToPa?: number;
        /** tank pressure of the detonable point judged by the rule for detonable states */
        readonly detonationAtPa?: number;
      } & FlammabilityNumbers &
        DetonationNumbers)
    | ({ readonly code: 'near-flammable-fill-path'; readonly source: string } & FlammabilityNumbers)
    | ({
        /**
         * a fill that carries a flammable tank to a higher pressure than any flammable end state, or that
         * crosses the flammable region between two end states that are not flammable (`crossing`)
         */
        readonly code: 'closed-vessel-fill-path';
        readonly source: string;
        /** true: neither end state is flammable (the stretch flammable-fill-path reports) */
        readonly crossing?: boolean;
        /** the tank pressures between which the path is flammable */
        readonly flammableFromPa: number;
        readonly flammableToPa: number;
        /** the ignition point judged: the top of the flammable stretch, or its worst point inside the path */
        readonly fromPa: number;
        readonly peakPa: number;
        readonly limitPa?: number;
      } & ClosedVesselNumbers)
    | ({
        readonly code: 'flammable-at-inlet';
        readonly source: string;
        readonly incomingShare: number;
      } & FlammabilityNumbers)
    | ({
        /**
         * the finished gas does not burn by itself but does where it meets air (tank-gas.ts): flammable
         * from `tankShareFrom` to `tankShareTo` tank gas in its mixture with air; `tankShare` at the
         * worst point, whose numbers follow
         */
        readonly code: 'flammable-in-air';
        readonly tankShareFrom: number;
        readonly tankShareTo: number;
        readonly tankShare: number;
      } & FlammabilityNumbers)
    | ({
        /** its mixing line with air comes inside the data's uncertainty margin (not shown non-flammable in air) */
        readonly code: 'near-flammable-in-air';
        readonly tankShare: number;
      } & FlammabilityNumbers)
    | {
        readonly code: 'oxygen-compression';
        readonly oxygenFraction: number;
        readonly fromPa: number;
        readonly toPa: number;
        readonly gamma: number;
        readonly endK: number;
        readonly limitK: number;
      }
    | { readonly code: 'no-safe-order'; readonly reason: string }
    // raised where a data table has no value for a species present (data coverage)
    | { readonly code: 'no-autoignition-data'; readonly species: string }
    | {
        readonly code: 'transport-data-not-known';
        readonly species: string;
        /** the transport data missing: Lennard-Jones parameters, the Fuller diffusion volume, or both */
        readonly missing: readonly ('lennard-jones' | 'diffusion volume')[];
        /** the pairs with this species left out of the slowest pair (no diffusion coefficient at all) */
        readonly pairsLeftOut: readonly string[];
      }
    // raised by the predicted uncertainty (predict.ts)
    | {
        readonly code: 'predicted-u-over-tolerance';
        readonly species: string;
        readonly design: number;
        /** predicted U (k = 2) of the mole fraction, and the tolerance half-width, both as fractions */
        readonly expandedU: number;
        readonly tolerance: number;
        /** the largest contribution, its share of u^2, and what it is */
        readonly dominant: string;
        readonly dominantShare: number;
        readonly about?: ComponentAbout;
      }
    // raised by the predicted uncertainty (predict.ts): every reading at its band's edge
    | {
        readonly code: 'band-edges-past-tolerance';
        /** the quantity worst hit: a species key, 'phi' or 'dilution' */
        readonly species: string;
        readonly design: number;
        /** how far it can end from its design with every reading at a band edge the worst way */
        readonly stack: number;
        readonly tolerance: number;
        readonly expandedU: number;
        /** the share of every band inside which every quantity stays within its tolerance less U */
        readonly share: number;
        /**
         * each fill's band half-width times the share, Pa; its gauge and display step, and whether the
         * half-width is at most half that step (no displayed value can be read to it)
         */
        readonly bands: readonly {
          readonly step: number;
          readonly halfWidthPa: number;
          readonly gauge?: string;
          readonly displayStepPa?: number;
          readonly finerThanDisplay: boolean;
        }[];
      }
    // raised by the split-point search (plan/split-point.ts)
    | {
        readonly code: 'split-point-chosen';
        readonly source: string;
        /** the stop reading chosen, Pa absolute */
        readonly stopPa: number;
        /** the highest stop found below it that is more hazardous, Pa (undefined: the lowest stop searched) */
        readonly hazardousBelowPa?: number;
        /**
         * when the hazards set the stop: the lowest stop found as free of them as any, Pa; the stop is
         * one band above it, so no reading inside the band is below it
         */
        readonly lowestSafePa?: number;
        /** the band half-width of the stop's reading when lowestSafePa is given, Pa */
        readonly bandPa?: number;
        /**
         * the lowest reading to stop at when lowestSafePa is given: lowestSafePa, rounded up to the
         * display resolution of the gauge that reads the stop where it has one (round-stops.ts), Pa
         */
        readonly floorPa?: number;
        /** no danger or warning that a stop can change (states, paths, gauges, supply) remains at this stop */
        readonly clean: boolean;
      }
    // raised by the choice of cylinders (supply.ts): a premix filled in place of single gases
    | {
        readonly code: 'premix-in-place';
        readonly source: string;
        readonly label: string;
        /** the gases it fills together, in a single-gas order (inerts first, oxidizers last) */
        readonly gases: readonly string[];
        /** design and filled mole fraction of each of those gases */
        readonly changes: readonly {
          readonly species: string;
          readonly design: number;
          readonly filled: number;
        }[];
        /** the plan's order with the premix replaced by its gases */
        readonly order: readonly string[];
      }
    // raised by two-stage preparation (plan/two-stage.ts)
    | {
        readonly code: 'premix-runs-low' | 'premix-cools-low';
        /** the premix tank, its pressure before and after the delivery (Pa absolute), the amount drawn */
        readonly tank: string;
        readonly startPa: number;
        readonly endPa: number;
        /** the gas temperature at the end of a fast delivery (premix-cools-low), K */
        readonly endK?: number;
        readonly deliveredMol: number;
        /** the batch reading the charge must reach, and the end pressure it needs with the margin */
        readonly targetPa: number;
        readonly requiredPa: number;
      }
    | {
        readonly code: 'two-stage-proposed';
        readonly premixTank: string;
        /** the premix, as the plan names it ("1.34 % O2 in Ar") */
        readonly premix: string;
        /** the design fraction it helps most, its relative U (k = 2) now and in two stages, its tolerance */
        readonly species: string;
        readonly singleU: number;
        readonly twoStageU: number;
        readonly tolerance: number;
        /** the two-stage batch's worst U / tolerance over its design fractions */
        readonly twoStageWorst: number;
        /**
         * the command line that plans it (the recipe or the design options as given, --premix-tank);
         * absent when no such command can run: the recipe file fixes a fill order (`recipeOrder`)
         */
        readonly command?: string;
        /** the --order given, which the command leaves out (a premix tank takes no fill order) */
        readonly orderLeftOut?: string;
        /** the recipe file's own fill order, which a premix tank refuses: why no command is given */
        readonly recipeOrder?: { readonly file: string; readonly order: string };
        /** the codes of the warnings either stage of the proposed plan carries (none: empty) */
        readonly warnings: readonly string[];
      }
    // raised by the sequence search (plan/search.ts)
    | {
        readonly code: 'sequence-chosen';
        /** the design fraction whose U the chosen sequence improved (the advised order's worst) */
        readonly species: string;
        /** the fill that delivers it, its reading (absolute) and gauge in the chosen sequence */
        readonly source: string;
        readonly readingPa: number;
        readonly gauge: string;
        /** U (k = 2) of the fraction relative to its design value, chosen and advised order */
        readonly relativeU: number;
        readonly baselineReadingPa: number;
        readonly baselineGauge: string;
        readonly baselineRelativeU: number;
        /** the advised single-charge order, by fill label */
        readonly baselineOrder: readonly string[];
        /** the largest relative U of the design fractions and phi, chosen and advised order */
        readonly worst: string;
        readonly worstRelativeU: number;
        readonly baselineWorst: string;
        readonly baselineWorstRelativeU: number;
      }
    | {
        readonly code: 'precise-sequence-hazard';
        /** the charges in fill order: fill label, and the stop reading of a charge that is not its source's last */
        readonly charges: readonly { readonly label: string; readonly stopPa?: number }[];
        readonly worst: string;
        readonly worstRelativeU: number;
        readonly toleranceRelative: number;
        /** the hazards it passes (dangers and warnings), by code and step */
        readonly hazards: readonly { readonly code: string; readonly step?: number }[];
      }
  );

export interface FlammabilityNumbers {
  readonly method: 'envelope' | 'flame temperature' | 'envelope and flame temperature';
  /** diagram coordinates after N2-equivalent conversion */
  readonly fuelFraction: number;
  readonly oxygenFraction: number;
  readonly lfl?: number;
  readonly loc?: number;
  readonly flameK?: number;
  readonly limitFlameK?: number;
  /**
   * equilibrium adiabatic flame temperature at constant pressure (what the flame reaches;
   * flameK is the complete-combustion value the method compares)
   */
  readonly flameEquilibriumK?: number;
  readonly pressurePa: number;
  /** how far the state is from the flammable region (set by the state review) */
  readonly side?: 'lean' | 'rich';
  readonly equivalenceRatio?: number;
  /** fuel / LFL on the diagram */
  readonly fuelOverLfl?: number;
  /** O2 / LOC on the diagram; undefined when the LOC is 0 */
  readonly oxygenOverLoc?: number;
  /** the envelope's UFL at the state's O2 share (O2 / (O2 + inert)) */
  readonly uflHere?: number;
  readonly fuelOverUfl?: number;
  /** true when the verdict was raised to near-limit only because a fuel has no limits on file */
  readonly missingData?: boolean;
  /**
   * the flammability data's uncertainty margin (FLAMMABILITY_DATA_MARGIN) when the state lies inside
   * it: outside the listed limits, inside them lowered by this share (a warning, not shown non-flammable)
   */
  readonly withinMargin?: number;
  /** inside that margin by the envelope: how much lower the LFL and the LOC would hold it (0.077: 7.7 %) */
  readonly limitsLowerBy?: number;
  /** on the lean side between the LOC and the air line: the lean boundary's fuel fraction at this O2 */
  readonly leanLimitHere?: number;
  /** inside it by flame temperature: the temperature rise over the limit flame's (1 at the limit) */
  readonly flameRiseShare?: number;
}

/** how the detonation was judged and what it would do (all optional: a path review may give only the basics) */
export interface DetonationNumbers {
  /** published detonation limits, or the conservative inert rule */
  readonly basis?: 'published-limits' | 'inert-rule';
  /** fuel/O2 with less than 10 % N2-equivalent inert */
  readonly undiluted?: boolean;
  readonly phi?: number;
  /** the limits applied, as equivalence ratios, and their source keys */
  readonly phiLow?: number;
  readonly phiHigh?: number;
  readonly limitSources?: readonly string[];
  /** the oxidizers the limits applied were published for (['O2']: in O2 only) */
  readonly limitsIn?: readonly ('air' | 'O2')[];
  /** Chapman-Jouguet state from the equilibrium Hugoniot */
  readonly cjPa?: number;
  readonly cjK?: number;
  readonly cjVelocityMPerS?: number;
  /** about 2.5 x P_CJ (common practice) */
  readonly reflectedPa?: number;
  readonly limitPa?: number;
  /** why the CJ state could not be computed */
  readonly cjMissing?: string;
}

/** the closed-vessel end state: constant-volume adiabatic equilibrium, complete combustion as a cross-check */
export interface ClosedVesselNumbers {
  /** 'equilibrium' (UV) or, where the equilibrium data are missing, 'complete-combustion' */
  readonly method?: 'equilibrium' | 'complete-combustion';
  readonly temperatureK?: number;
  /** complete combustion at constant volume, a cross-check */
  readonly completePa?: number;
  readonly completeK?: number;
  /** graphite (soot) formed at equilibrium, mol per mol of gas filled */
  readonly graphiteMol?: number;
  readonly equilibriumMissing?: string;
}

export type FindingCode = Finding['code'];

/** what every output that carries findings must also say */
export const STANDING_CAUTION =
  'This plan is an engineering estimate, not a hazard review. Follow the gas ' +
  "suppliers' safety data sheets, your institution's rules, local codes and " +
  'licensed practice; have the procedure reviewed before the first fill.';

export type PressureFormatter = (pa: number) => string;

/** the id the loader gives a tank known only by its volume (--volume, no tank of the lab profile) */
export const GIVEN_VOLUME_TANK = 'given-volume';

/** a tank as a sentence names it: "tank T-30", or the tank of the given volume (it has no name) */
const tankPhrase = (id: string) => (id === GIVEN_VOLUME_TANK ? 'the tank of the given volume' : `tank ${id}`);

const pct = (x: number) => `${(x * 100).toPrecision(3)} %`;
const kelvin = (k: number) => `${k.toFixed(0)} K (${(k - 273.15).toFixed(0)} degC)`;
/** "296.65 K (23.5 degC)": a fill temperature as given, to 0.1 degC */
const kelvinTenth = (k: number) => `${k.toFixed(2)} K (${(k - 273.15).toFixed(1)} degC)`;

/**
 * A limit of the blend as a percentage, or "not known": with no limit data for any fuel of the
 * blend, Le Chatelier's mean has nothing to average (the LFL comes out infinite, the LOC 0).
 */
function limitPct(f: FlammabilityNumbers, v: number): string {
  return limitsKnown(f) && Number.isFinite(v) ? pct(v) : 'not known';
}
const limitsKnown = (f: FlammabilityNumbers) => f.lfl === undefined || Number.isFinite(f.lfl);

function flammabilityDetail(f: FlammabilityNumbers): string {
  const parts = [`fuel ${pct(f.fuelFraction)}, O2 ${pct(f.oxygenFraction)} on the N2-equivalent diagram`];
  if (f.lfl !== undefined) parts.push(`LFL ${limitPct(f, f.lfl)}`);
  if (f.loc !== undefined) parts.push(`LOC ${limitPct(f, f.loc)}`);
  if (f.side === 'rich' && f.uflHere !== undefined)
    parts.push(`rich side: UFL ${limitPct(f, f.uflHere)} at this O2 share`);
  if (f.flameEquilibriumK !== undefined)
    parts.push(`flame ${f.flameEquilibriumK.toFixed(0)} K (equilibrium)`);
  if (f.flameK !== undefined && f.limitFlameK !== undefined)
    parts.push(
      `flame-temperature method: ${f.flameK.toFixed(0)} K by complete combustion ` +
        `(a cross-check, no dissociation) vs limit ${f.limitFlameK.toFixed(0)} K`,
    );
  return `${parts.join('; ')}; by ${f.method}`;
}

const times = (x: number) => `${x.toFixed(2)} x`;

/**
 * What keeps a near-limit state out of the flammable region, in the terms of each limit:
 * "fuel at 0.68 x LFL (3.00 % against 4.40 %)", "O2 at 0.75 x LOC", "fuel at 1.18 x the UFL
 * at this O2 share". Only the limits the state is outside of are named.
 */
function nearLimitDistance(f: FlammabilityNumbers): string {
  if (!limitsKnown(f))
    return 'no flammability limits on file for any fuel it holds, so its distance from them is not known';
  const parts: string[] = [];
  if (f.fuelOverLfl !== undefined && f.lfl !== undefined && f.fuelOverLfl < 1)
    parts.push(`fuel at ${times(f.fuelOverLfl)} LFL (${pct(f.fuelFraction)} against ${pct(f.lfl)})`);
  if (f.oxygenOverLoc !== undefined && f.loc !== undefined && f.oxygenOverLoc < 1)
    parts.push(`O2 at ${times(f.oxygenOverLoc)} LOC (${pct(f.oxygenFraction)} against ${pct(f.loc)})`);
  if (f.side === 'rich' && f.fuelOverUfl !== undefined && f.uflHere !== undefined && f.fuelOverUfl > 1)
    parts.push(
      `fuel at ${times(f.fuelOverUfl)} the UFL at this O2 share (${pct(f.fuelFraction)} ` +
        `against ${pct(f.uflHere)}): too rich to burn, but air or O2 let in would ` +
        `bring it into the region`,
    );
  if (
    f.flameK !== undefined &&
    f.limitFlameK !== undefined &&
    f.flameK < f.limitFlameK &&
    (parts.length === 0 || f.method !== 'envelope')
  ) {
    parts.push(
      `flame ${f.flameK.toFixed(0)} K against a limit of ${f.limitFlameK.toFixed(0)} K (complete combustion)`,
    );
  }
  if (f.missingData)
    parts.push('no flammability limits on file for a fuel it holds, so it cannot be judged non-flammable');
  if (!parts.length)
    parts.push('outside the envelope between its corners, within the margins of the LFL and the LOC');
  return parts.join('; ');
}

/**
 * a state inside the flammability data's uncertainty margin: how close it is, and that the listed
 * limits do not show it non-flammable
 */
function withinMarginWords(f: FlammabilityNumbers, margin: number): string {
  const m = `${(margin * 100).toFixed(0)} %`;
  const close: string[] = [];
  // above the LFL and the LOC yet outside: the lean boundary at this O2 lies above the LFL; name it
  const lean = f.leanLimitHere;
  const named =
    lean !== undefined && f.fuelFraction < lean && (f.lfl === undefined || f.fuelFraction >= f.lfl);
  if (named)
    close.push(
      `fuel at ${times(f.fuelFraction / lean)} the lean limit at ${pct(f.oxygenFraction)} O2: ` +
        `${pct(f.fuelFraction)} against ${pct(lean)} on the envelope's edge from the LFL in air` +
        (f.lfl !== undefined ? ` (${pct(f.lfl)})` : '') +
        ` to the LOC` +
        (f.loc !== undefined ? ` (${pct(f.loc)})` : '') +
        `, so above the LFL yet outside the region`,
    );
  if (f.limitsLowerBy !== undefined)
    close.push(
      named
        ? `it would be inside the region with both ${(f.limitsLowerBy * 100).toFixed(1)} % lower`
        : `it would be inside the flammable region with the LFL` +
            (f.lfl !== undefined ? ` (${pct(f.lfl)})` : '') +
            ` and the LOC` +
            (f.loc !== undefined ? ` (${pct(f.loc)})` : '') +
            ` ${(f.limitsLowerBy * 100).toFixed(1)} % lower`,
    );
  if (f.flameRiseShare !== undefined && f.flameK !== undefined && f.limitFlameK !== undefined)
    close.push(
      `its flame temperature rise is ${times(f.flameRiseShare)} the limit flame's ` +
        `(${f.flameK.toFixed(0)} K against ${f.limitFlameK.toFixed(0)} K, complete combustion)`,
    );
  return (
    `this state is NOT shown non-flammable: it lies inside the ${m} uncertainty margin of the ` +
    `flammability limits (${close.join('; ')}). Handbook LFL and LOC values scatter by around ${m} ` +
    `(common practice) and the fill has its own errors, so it may burn. Diagram point: fuel ` +
    `${pct(f.fuelFraction)}, O2 ${pct(f.oxygenFraction)} (N2-equivalent). Treat it as possibly ` +
    `flammable, or choose an order or dilution that keeps it farther from the limits`
  );
}

/** the tank's working limit against a pressure, or that the rating is unknown */
function againstLimit(peakPa: number, limitPa: number | undefined, p: PressureFormatter): string {
  if (limitPa === undefined) return ', and the tank rating is unknown';
  return `, ${peakPa > limitPa ? 'above' : 'below'} the tank's working limit ${p(limitPa)}`;
}

/** the detonation numbers of a detonable fill path, judged like a detonable state */
function pathDetonation(f: Extract<Finding, { code: 'flammable-fill-path' }>, p: PressureFormatter): string {
  const at = f.detonationAtPa !== undefined ? ` at ${p(f.detonationAtPa)}` : '';
  if (f.undiluted) return `; undiluted fuel/O2${at} is a danger whatever the tank's rating (common practice)`;
  if (f.cjPa !== undefined && f.reflectedPa !== undefined)
    return (
      `; a detonation${at} would reach about ${p(f.cjPa)} (Chapman-Jouguet) and ` +
      `about ${p(f.reflectedPa)} where it reflects (2.5 x P_CJ, common practice)` +
      againstLimit(f.reflectedPa, f.limitPa, p)
    );
  if (f.cjMissing) return `; its detonation pressure could not be estimated (${f.cjMissing})`;
  return '';
}

type DetonableState = Extract<Finding, { code: 'detonable-state' }>;

/** why a state counts as detonable: inside published limits, or by our inert rule */
function detonationBasis(f: DetonableState): string {
  const inO2Only = f.limitsIn?.length === 1 && f.limitsIn[0] === 'O2';
  const sources = f.limitSources?.length ? `; ${f.limitSources.join(', ')}, recalled values` : '';
  const within =
    f.phiLow !== undefined && f.phiHigh !== undefined
      ? `equivalence ratio ${f.phi?.toFixed(2)} within ${f.phiLow.toFixed(2)}-${f.phiHigh.toFixed(2)}`
      : undefined;
  const rule =
    `detonable when flammable with less than 50 % N2-equivalent inert, or with an oxidizer ` +
    `about as rich in O2 as air or richer`;
  if (f.basis !== 'published-limits')
    return (
      `with ${pct(f.inertFraction)} N2-equivalent inert, by our conservative rule where ` +
      // limits on file in O2 only hold for O2 with a trace of inert at most, not for O2 this diluted
      (inO2Only && within
        ? 'limits are on file for this fuel in pure O2 only'
        : 'no detonation limits are on file for this fuel in this oxidizer') +
      ` (${rule})`
    );
  if (!within) return 'inside the published detonation limits';
  // in O2: a trace of inert (ppm of cylinder N2) leaves the limits in O2 in force, said so
  const trace =
    inO2Only && f.inertFraction > 0 ? `; with ${pct(f.inertFraction)} N2-equivalent inert, a trace` : '';
  return `inside the published detonation limits${inO2Only ? ' in O2' : ''} (${within}${sources}${trace})`;
}

/** the Chapman-Jouguet and reflected pressures of a detonable state, or why they are missing */
function detonationPressures(f: DetonableState, p: PressureFormatter): string {
  if (f.cjPa !== undefined && f.reflectedPa !== undefined) {
    const limit =
      f.limitPa !== undefined
        ? ` against the tank's working limit ${p(f.limitPa)}`
        : ', and the tank rating is unknown';
    return (
      `; a detonation would reach about ${p(f.cjPa)} (Chapman-Jouguet, equilibrium, ` +
      `${f.cjK?.toFixed(0)} K, ${f.cjVelocityMPerS?.toFixed(0)} m/s) and about ` +
      `${p(f.reflectedPa)} where it reflects (2.5 x P_CJ, common practice)${limit}`
    );
  }
  return f.cjMissing ? `; its detonation pressure could not be estimated (${f.cjMissing})` : '';
}

function describeDetonation(f: DetonableState, p: PressureFormatter): string {
  const basis = detonationBasis(f);
  const what = f.undiluted
    ? `undiluted fuel/O2 at ${p(f.pressurePa)}, ${basis}`
    : `fuel and oxidizer at ${p(f.pressurePa)} ${basis}`;
  const advice = f.undiluted
    ? ' - fuel/O2 mixtures without diluent are not made in a mixing tank (common ' +
      'practice; gauges and valves on the manifold are rated far below the tank): ' +
      'add the bath gas before the oxidizer, or do not make this state'
    : f.severity === 'danger'
      ? ' - the tank would not hold it: lower the pressure of this state, dilute it more, or change the fill order'
      : ' - keep ignition sources away and consider a lower pressure or more diluent';
  return `this state can detonate: ${what}${detonationPressures(f, p)}${advice}`;
}

type ClosedVessel = Extract<Finding, { code: 'closed-vessel-pressure' }>;

/** how the closed-vessel peak was computed */
function closedVesselMethod(
  f: ClosedVessel | Extract<Finding, { code: 'closed-vessel-fill-path' }>,
  p: PressureFormatter,
): string {
  if (f.method === 'complete-combustion')
    return (
      `complete combustion at constant volume from ${p(f.fromPa)}; no equilibrium: ` +
      `${f.equilibriumMissing ?? 'data missing'}`
    );
  const at = f.temperatureK !== undefined ? `, ${f.temperatureK.toFixed(0)} K` : '';
  const soot = f.graphiteMol ? `, with soot (graphite) forming` : '';
  const cross =
    f.completePa !== undefined ? `; complete combustion, a cross-check, gives ${p(f.completePa)}` : '';
  return `constant-volume adiabatic equilibrium from ${p(f.fromPa)}${at}${soot}${cross}`;
}

/** a fill that carries a flammable tank to a higher pressure than its flammable end states */
function describeClosedVesselPath(
  f: Extract<Finding, { code: 'closed-vessel-fill-path' }>,
  p: PressureFormatter,
): string {
  const how = closedVesselMethod(f, p);
  const stretch =
    `during this fill (${f.source}) the tank is flammable from ${p(Math.min(f.flammableFromPa, f.flammableToPa))} ` +
    `up to ${p(Math.max(f.flammableFromPa, f.flammableToPa))}, ` +
    (f.crossing
      ? `between end states that are not flammable (flammable-fill-path); ignited at ${p(f.fromPa)} the ` +
        `closed tank can reach ${p(f.peakPa)} (${how})`
      : `above the flammable state before or after it; ignited at ${p(f.fromPa)} the closed tank can reach ` +
        `${p(f.peakPa)}, more than that state ignited (${how})`);
  if (f.limitPa !== undefined && f.peakPa > f.limitPa)
    return (
      `${stretch}, above the tank's working limit ${p(f.limitPa)} - change the fill order or the stops ` +
      `so that the tank is not flammable at these pressures`
    );
  const limit = f.limitPa !== undefined ? `; working limit ${p(f.limitPa)}` : '; the tank rating is unknown';
  return `${stretch}${limit}`;
}

function describeClosedVessel(f: ClosedVessel, p: PressureFormatter): string {
  const how = closedVesselMethod(f, p);
  const reach = `if this state ignites in the closed tank the pressure can reach ${p(f.peakPa)} `;
  if (f.limitPa !== undefined && f.peakPa > f.limitPa)
    return (
      `${reach}(${how}), above the tank's working limit ${p(f.limitPa)} - lower the pressure ` +
      `of this state or change the fill order`
    );
  const limit = f.limitPa !== undefined ? `; working limit ${p(f.limitPa)}` : '; the tank rating is unknown';
  return `${reach}(${how})${limit}`;
}

/** the wording of one finding code */
type Wording<C extends FindingCode> = (f: Finding & { readonly code: C }, p: PressureFormatter) => string;
/** the wording of a family of finding codes, one entry per code (a missing code does not compile) */
type WordingTable<C extends FindingCode> = { readonly [K in C]: Wording<K> };

const TANK_AND_GAUGES: WordingTable<
  'tank-over-rating' | 'tank-warms-past-limit' | 'no-gauge-covers' | 'tank-rating-unknown' | 'isolate-gauge'
> = {
  'tank-warms-past-limit': (f, p) => {
    const why = f.assumed
      ? 'standard ambient: the lab profile gives no warmest temperature'
      : "the lab profile's warmest";
    const rated = f.warmPa > f.ratedPa;
    const above = rated ? `its rating ${p(f.ratedPa)}` : `the allowed working pressure ${p(f.limitPa)}`;
    return (
      `filled to ${p(f.pressurePa)} (the top of the last fill's band) at ${kelvinTenth(f.fillK)}, the tank warms ` +
      `to ${kelvinTenth(f.warmK)} (${why}) and holds ${p(f.warmPa)} there, above ${above} ` +
      `of ${tankPhrase(f.tank)}${rated ? '' : ` (rated ${p(f.ratedPa)})`}; at this fill temperature keep the ` +
      `band's top at or below ${p(f.maxFillPa)} (plan a final pressure below about ${p(f.maxFinalPa)}), ` +
      `or fill at the warmer temperature`
    );
  },
  // pressurePa is the top of the fill's band (core/plan/review.ts ratingFindings), said as such
  'tank-over-rating': (f, p) =>
    `the top of ${f.step !== undefined ? "this fill's" : "a fill's"} band (its target plus the band), ` +
    `${p(f.pressurePa)}, exceeds the allowed working pressure ${p(f.limitPa)} of ${tankPhrase(f.tank)} ` +
    `(rated ${p(f.ratedPa)}): a reading inside the band may take the tank over it; lower the final ` +
    `pressure or use a tank rated for it`,
  'no-gauge-covers': (f, p) =>
    `no gauge in the lab profile covers a reading of ${p(f.pressurePa)}; add ` +
    `a gauge with that range or change the final pressure`,
  'tank-rating-unknown': (f) =>
    `the lab profile gives no pressure rating for ${tankPhrase(f.tank)}; no rating is ` +
    `assumed, so the pressure checks cannot be made - add its rating (maximum ` +
    `allowed working pressure) to the profile, or give --rating with --volume`,
  'isolate-gauge': (f, p) =>
    `close off ${f.gauge} before this fill: it reads only up to ${p(f.topPa)} absolute`,
};

const SUPPLY: WordingTable<
  | 'purity-assumed'
  | 'unidentified-impurity'
  | 'supply-mismatch'
  | 'impurity-present'
  | 'supply-pressure-low'
  | 'batch-too-small'
> = {
  'purity-assumed': (f) =>
    `no purity is given for ${f.source} (${f.species}); 100 % was assumed - enter ` +
    `the certificate purity and impurities in the lab profile`,
  'unidentified-impurity': (f) =>
    `up to ${(f.fraction * 1e6).toPrecision(3)} ppm of the batch is cylinder ` +
    `impurity that the lab profile does not identify (1 - purity minus listed impurities)`,
  'supply-mismatch': (f) =>
    `with the cylinders chosen, ${f.species} can only reach x = ${f.actual.toPrecision(5)} ` +
    `instead of the design ${f.design.toPrecision(5)}; check the cylinders' compositions`,
  'impurity-present': (f) =>
    `the finished batch carries ${(f.fraction * 1e6).toPrecision(3)} ppm ${f.species} ` +
    `from cylinder impurities`,
  'supply-pressure-low': (f, p) =>
    `${f.source} delivers at ${p(f.supplyPa)}, below the ${p(f.requiredPa)} this fill needs ` +
    `(the ${p(f.targetPa)} the tank must reach plus a ${marginPercent(f)} % margin, so that the end of the fill ` +
    `still flows through the metering valve at a controllable rate)` +
    (f.supplyPa <= f.targetPa ? `; the fill cannot be completed from it` : '') +
    ` - raise the regulator setting (within the cylinder's and line's ratings) or ` +
    `lower the final pressure`,
  'batch-too-small': (f, p) =>
    `the batch serves no experiment in ${f.reactor}: at ${p(f.finalPa)} the tank ` +
    `holds less than one fill plus the reserve (it is used down to ${p(f.minTankPa)}); ` +
    `raise the final pressure, use a larger tank, or size the batch with --experiments`,
};

const REAL_GAS: WordingTable<'cross-virial-estimate' | 'virial-correlation' | 'ideal-gas-error'> = {
  'cross-virial-estimate': (f, p) =>
    `the cross virial coefficients ${f.pairs.join(', ')} come from the combining ` +
    `rules (no reference mixture model qualifies for them); their uncertainty ` +
    `(calibrated on the fitted pairs: max(${VIRIAL_U.cross.absolute * 1e6} cm3/mol, ` +
    `${VIRIAL_U.cross.relative * 100} %) each, standard, more at low reduced ` +
    `temperature; ${VIRIAL_U.crossUncalibrated.relative * 100} % for pairs with ` +
    `He, H2, Ne or a hydrogen-bonding species) could move this target by about ` +
    `+-${p(f.shiftPa)} (${f.relative.toPrecision(2)} relative) against a band ` +
    `of +-${p(f.bandPa)}` +
    (f.severity === 'warning'
      ? ' - the target is less certain than its band; check the batch afterwards ' +
        'with mixwright check, or widen the tolerance'
      : ''),
  'virial-correlation': (f) =>
    `no reference virial coefficient for ${f.species} at this temperature; B ` +
    `from the ${f.method} correlation (less certain)`,
  'ideal-gas-error': (f, p) =>
    `an ideal-gas plan (the same fills read to partial pressures scaled to the final pressure, up to ` +
    `${p(f.worstPa)} off the real-gas targets) would fill x(${f.species}) ${f.idealFraction.toPrecision(4)} ` +
    `instead of ${f.design.toPrecision(4)} (${(((f.idealFraction - f.design) / f.design) * 100).toFixed(2)} %, ` +
    `tolerance +-${((f.tolerance / f.design) * 100).toPrecision(2)} %): use the real-gas targets`,
};

/** the two flammable-path dangers: a fill that crosses the region, a fill that enters it at the inlet */
function describeFillPath(
  f: Extract<Finding, { code: 'flammable-fill-path' }>,
  p: PressureFormatter,
): string {
  const range = (a: number, b: number) => `between ${p(Math.min(a, b))} and ${p(Math.max(a, b))}`;
  const detonableRange =
    f.detonable && f.detonableFromPa !== undefined && f.detonableToPa !== undefined
      ? `, detonable ones ${range(f.detonableFromPa, f.detonableToPa)}`
      : '';
  const inert = f.detonable ? ` (only ${pct(f.inertFraction)} N2-equivalent inert at the worst point)` : '';
  return (
    `during this fill (${f.source}) the tank passes through flammable compositions ` +
    `while it is ${range(f.fromPa, f.toPa)}${detonableRange}, ` +
    `although the states before and after it are not${inert} ` +
    `(worst point: ${flammabilityDetail(f)})${f.detonable ? pathDetonation(f, p) : ''}; ` +
    `change the fill order, or charge a diluent first so the path stays outside ` +
    `the flammable region`
  );
}

const FLAMMABILITY: WordingTable<
  | 'flammable-state'
  | 'flammable-mixture'
  | 'near-flammable'
  | 'detonable-state'
  | 'closed-vessel-pressure'
  | 'no-flammability-data'
  | 'flammability-data-estimated'
  | 'inert-coefficient-unknown'
  | 'flammable-fill-path'
  | 'near-flammable-fill-path'
  | 'closed-vessel-fill-path'
  | 'flammable-at-inlet'
  | 'flammable-in-air'
  | 'near-flammable-in-air'
> = {
  'flammable-state': (f, p) =>
    `the tank is flammable after this fill (${flammabilityDetail(f)}); choose ` +
    `a fill order that avoids it, or treat this state as a flammable, possibly ` +
    `explosive gas at ${p(f.pressurePa)}`,
  'flammable-mixture': (f) =>
    `the finished batch is flammable (${flammabilityDetail(f)}): store and handle ` +
    `it as a flammable gas, keep ignition sources away, and vent it to a safe exhaust`,
  'near-flammable': (f) =>
    f.withinMargin !== undefined
      ? withinMarginWords(f, f.withinMargin)
      : `this state is not flammable but near the flammable region: ${nearLimitDistance(f)}. ` +
        `Diagram point: fuel ${pct(f.fuelFraction)}, O2 ${pct(f.oxygenFraction)} ` +
        `(N2-equivalent); the NFPA 69 margins are 60 % of the LFL and 2 %-points ` +
        `below the LOC (60 % of a LOC under 5 %) - a small fill error or a wrong ` +
        `gas could make it flammable`,
  'detonable-state': describeDetonation,
  'closed-vessel-pressure': describeClosedVessel,
  'no-flammability-data': (f) =>
    `no flammability limits are on file for ${f.species}; the safety review is ` +
    `incomplete for it - treat every state holding it as flammable`,
  'flammability-data-estimated': (f) => `flammability data estimated, not measured: ${f.what}`,
  'inert-coefficient-unknown': (f) =>
    `no ISO 10156 nitrogen-equivalence coefficient for ${f.species}; the smallest ` +
    `listed value ${f.used} was used (conservative)`,
  'flammable-fill-path': describeFillPath,
  'near-flammable-fill-path': (f, p) =>
    `while ${f.source} is filled the tank passes, at about ${p(f.pressurePa)}, a composition that is ` +
    `${withinMarginWords(f, f.withinMargin ?? 0).replace(/^this state is /, '')}`,
  'closed-vessel-fill-path': describeClosedVesselPath,
  'flammable-at-inlet': (f) =>
    `where ${f.source} enters the tank it mixes with the tank gas into flammable ` +
    `compositions (about ${pct(f.incomingShare)} incoming gas: ${flammabilityDetail(f)}), ` +
    `although the tank itself stays outside the flammable region; fill it in ` +
    `another order, or dilute the tank gas first, and open the valve slowly`,
  'flammable-in-air': (f) =>
    `the finished batch does not burn by itself, but it is flammable in air: released into air (a ` +
    `leak, a vent, the tank opened) it makes flammable mixtures from ${pct(f.tankShareFrom)} to ` +
    `${pct(f.tankShareTo)} tank gas in air (worst at ${pct(f.tankShare)}: ${flammabilityDetail(f)}); ` +
    `handle it as a flammable gas: vent it only to a safe exhaust, keep ignition sources away, and ` +
    `follow the supplier safety data and local codes`,
  'near-flammable-in-air': (f) =>
    `released into air the finished batch passes, at about ${pct(f.tankShare)} of it in the mixture, ` +
    `a composition that is ` +
    withinMarginWords(f, f.withinMargin ?? 0)
      .replace(/^this state is /, '')
      .replace(/ Treat it as possibly flammable, .*$/, '') +
    ` Handle it as possibly flammable in air: vent it only to a safe exhaust, keep ignition sources ` +
    `away, and follow the supplier safety data and local codes`,
};

/** condensation of a vapour: in its own fill line, or in the tank */
function describeCondensation(f: Extract<Finding, { code: 'condensation' }>, p: PressureFormatter): string {
  // above the vapour pressure itself it will condense, not "may"
  const saturated = f.partialPa >= f.psatPa;
  const share = saturated
    ? `above its vapour pressure ${p(f.psatPa)} itself (${((f.partialPa / f.psatPa) * 100).toFixed(0)} %)`
    : `above ${(f.fraction * 100).toFixed(0)} % of its vapour pressure ${p(f.psatPa)}`;
  const will = saturated ? 'will' : 'may';
  const where = `at the coldest point (${kelvin(f.coldestK)}, ${f.method})`;
  if (!f.inLine)
    return (
      `${f.species} partial pressure ${p(f.partialPa)} is ${share} ${where}; it ${will} ` +
      `condense - lower its partial pressure or heat the tank and lines`
    );
  const advice =
    f.step === 1
      ? 'it is the first fill already: heat the lines, or lower its partial pressure'
      : 'fill the vapour first or heat the lines';
  return (
    `during its own fill the line holds pure ${f.species} at ${p(f.partialPa)}, ` +
    `${share} ${where}; it ${will} condense in the line - ${advice}`
  );
}

const HEAT_AND_VAPOUR: WordingTable<
  | 'compression-heating'
  | 'condensation'
  | 'psat-estimated'
  | 'coldest-temperature-assumed'
  | 'oxygen-compression'
> = {
  'compression-heating': (f, p) =>
    `this fill compresses the gas already in the tank from ${p(f.fromPa)} to ` +
    `${p(f.toPa)}; done fast (adiabatically, gamma ${f.gamma.toFixed(3)}) it ` +
    `heats it to ${kelvin(f.endK)}, against the autoignition temperature ${kelvin(f.aitK)} ` +
    `of ${f.fuel}, the fuel in the tank after this fill that ignites first. Throttle ` +
    `the fill (open the valve slowly) or change the order`,
  condensation: describeCondensation,
  'psat-estimated': (f) =>
    `the vapour pressure of ${f.species} at ${kelvin(f.coldestK)} comes from ` +
    `${f.method} (outside the range of its measured constants); the condensation ` +
    `check is less certain`,
  'coldest-temperature-assumed': (f) =>
    `the lab profile gives no coldest temperature for tank and lines; the condensation ` +
    `check used the fill temperature ${kelvin(f.temperatureK)} - add "coldest" ` +
    `to the profile`,
  'oxygen-compression': (f, p) =>
    `this fill compresses oxygen-rich gas (${pct(f.oxygenFraction)} O2-equivalent) ` +
    `from ${p(f.fromPa)} to ${p(f.toPa)}; done fast (adiabatically, gamma ${f.gamma.toFixed(3)}) ` +
    `it reaches ${kelvin(f.endK)}, above ${kelvin(f.limitK)}, where seats and ` +
    `seals in oxygen service can ignite. Fill the oxidizer later, throttle this ` +
    `fill, or use only oxygen-compatible parts`,
};

const REACTIVE_GASES: WordingTable<
  'no-with-o2' | 'acetylene-pressure' | 'n2o-decomposition' | 'oxygen-service' | 'oxygen-enriched'
> = {
  'no-with-o2': () => `NO and O2 in one tank react to NO2; never premix them - fill them in separate batches`,
  'acetylene-pressure': (f, p) =>
    `${f.inLine ? 'the acetylene line' : 'acetylene'} reaches ${p(f.partialPa)} ` +
    `absolute, above about 15 psig (${p(f.limitPa)} absolute), where acetylene ` +
    `can decompose explosively`,
  'n2o-decomposition': (f, p) =>
    `N2O at ${p(f.partialPa)} partial pressure: it can decompose exothermically ` +
    `at elevated pressure and temperature - keep its pressure low and its lines clean`,
  'oxygen-service': (f) =>
    `${f.source} is an oxidizer: open its valve slowly, use only parts cleaned ` +
    `for oxygen service and no hydrocarbon grease`,
  'oxygen-enriched': (f) =>
    `the tank holds ${pct(f.oxygenFraction)} oxygen (above 23.5 %, oxygen-enriched): ` +
    `materials burn far more readily - oxygen-clean parts and slow valves`,
};

const ORDER: WordingTable<'safer-order' | 'no-safe-order'> = {
  'safer-order': describeSaferOrder,
  'no-safe-order': (f) => f.reason,
};

/** every finding code's wording, by family; a code without one does not compile */
/** raised where a data table has no value for a species present (data coverage) */
const DATA_COVERAGE: WordingTable<'no-autoignition-data' | 'transport-data-not-known'> = {
  'no-autoignition-data': (f) =>
    `no autoignition temperature is on file for ${f.species}; the compression-heating ` +
    `check cannot judge it - take its autoignition temperature from the supplier's ` +
    `safety data sheet and throttle every fill that compresses gas holding it`,
  'transport-data-not-known': (f) =>
    f.pairsLeftOut.length
      ? `no diffusion data (${f.missing.join(', ')}) are on file for ${f.species}: the ` +
        `pairs ${f.pairsLeftOut.join(', ')} are left out of the slowest pair, so the ` +
        `mixing time may be too short - stir the tank or wait well beyond it`
      : `no ${f.missing.join(', ')} data are on file for ${f.species}: its diffusion ` +
        `coefficients rest on ${f.missing.includes('lennard-jones') ? 'Fuller' : 'Chapman-Enskog'} ` +
        `alone, not the smaller of the two methods`,
};

/** raised by the split-point search (plan/split-point.ts) */
const SPLIT: WordingTable<'split-point-chosen'> = {
  'split-point-chosen': (f, p) => {
    const still = f.clean
      ? ''
      : `; the sequence still has dangers or warnings at this stop - see the other findings ` +
        `and consider another order`;
    const head = `the planner chose to stop this charge of ${f.source} at ${p(f.stopPa)}: `;
    if (f.hazardousBelowPa === undefined || f.lowestSafePa === undefined || f.bandPa === undefined)
      return (
        head +
        `the lowest stop searched (1/32 of the source's charge); no lower stop is needed for safety` +
        `${still}; give the stop after "@" to set it yourself`
      );
    const floor = p(f.floorPa ?? f.lowestSafePa);
    return (
      head +
      `one band (+-${p(f.bandPa)}) above the lowest stop at which every state and fill path stays as ` +
      `free of the hazards checked as any stop can make it (found between ${p(f.hazardousBelowPa)}, ` +
      `where the review finds more, and ${floor}), so that a reading anywhere inside its band is at or ` +
      `above that stop${still} - do not stop this charge below ${floor}, and give the stop after "@" ` +
      `to set it yourself`
    );
  },
};

/** raised by the sequence search (plan/search.ts) */
const SEARCH: WordingTable<'sequence-chosen' | 'precise-sequence-hazard'> = {
  'sequence-chosen': describeSequenceChosen,
  'precise-sequence-hazard': describePreciseOption,
};

const WORDING: WordingTable<FindingCode> = {
  'predicted-u-over-tolerance': describePredictedOver,
  'band-edges-past-tolerance': describeBandEdges,
  'premix-in-place': describePremixInPlace,
  ...DATA_COVERAGE,
  ...TANK_AND_GAUGES,
  ...SUPPLY,
  ...REAL_GAS,
  ...FLAMMABILITY,
  ...HEAT_AND_VAPOUR,
  ...REACTIVE_GASES,
  ...ORDER,
  ...SPLIT,
  ...TWO_STAGE_WORDING,
  ...SEARCH,
};

/** a finding in one sentence: what, the numbers behind it, what to do */
export function describeFinding(f: Finding, p: PressureFormatter): string {
  const word = WORDING[f.code] as (f: Finding, p: PressureFormatter) => string;
  return word(f, p);
}

export function worstSeverity(findings: readonly Finding[]): Severity | undefined {
  if (findings.some((f) => f.severity === 'danger')) return 'danger';
  if (findings.some((f) => f.severity === 'warning')) return 'warning';
  if (findings.length) return 'note';
  return undefined;
}

// raised by the choice of cylinders (supply.ts)
/** a premix filled in place of single gases: which, why, the composition change, how to avoid it */
function describePremixInPlace(f: Extract<Finding, { code: 'premix-in-place' }>): string {
  const change = f.changes
    .map((c) => {
      const rel =
        c.design > 0
          ? ` (${c.filled >= c.design ? '+' : ''}${((c.filled / c.design - 1) * 100).toPrecision(2)} %)`
          : '';
      return `x(${c.species}) ${c.design.toPrecision(6)} designed, ${c.filled.toPrecision(6)} filled${rel}`;
    })
    .join('; ');
  const verdict = f.severity === 'warning' ? 'outside the tolerance' : 'within the tolerance';
  return (
    `${f.source}, ${f.label}, fills ${f.gases.join(' and ')} together, in place of single-gas ` +
    `cylinders, because the design holds them in the cylinder's ratio (within 0.1 %): ${change} - ` +
    `${verdict}. ` +
    `To fill each gas from its own cylinder, name them one by one in the fill order, e.g. ` +
    `--order ${f.order.join(',')} (or order: in the recipe); the safety review then judges that order`
  );
}

/** the delivery margin a supply finding applied, in per cent */
function marginPercent(f: { readonly requiredPa: number; readonly targetPa: number }): number {
  return Math.round((f.requiredPa / f.targetPa - 1) * 100);
}
