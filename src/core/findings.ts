/**
 * Findings of a plan as data: a severity, a stable code, the step they concern and
 * the numbers behind them. describeFinding() words each one, in one place.
 */

import { VIRIAL_U } from './mixture-eos.js';

export type Severity = 'danger' | 'warning' | 'note';

interface Base {
  readonly severity: Severity;
  /** 1-based fill step the finding concerns; undefined for the whole batch */
  readonly step?: number;
}

export type Finding = Base &
  (
    | { readonly code: 'tank-over-rating'; readonly pressurePa: number; readonly limitPa: number; readonly ratedPa: number; readonly tank: string }
    | { readonly code: 'no-gauge-covers'; readonly pressurePa: number }
    | { readonly code: 'gauge-coarser-than-band'; readonly gauge: string; readonly uncertaintyPa: number; readonly bandPa: number }
    | { readonly code: 'purity-assumed'; readonly source: string; readonly species: string }
    | { readonly code: 'unidentified-impurity'; readonly fraction: number }
    | { readonly code: 'supply-mismatch'; readonly species: string; readonly design: number; readonly actual: number }
    | { readonly code: 'impurity-present'; readonly species: string; readonly fraction: number }
    | { readonly code: 'virial-correlation'; readonly species: string; readonly method: string }
    | { readonly code: 'cross-virial-estimate'; readonly pairs: readonly string[]; readonly relative: number; readonly shiftPa: number; readonly bandPa: number }
    | { readonly code: 'ideal-gas-error'; readonly worstPa: number; readonly bandPa: number }
    | { readonly code: 'supply-pressure-low'; readonly source: string; readonly supplyPa: number; readonly targetPa: number }
    | { readonly code: 'tank-rating-unknown'; readonly tank: string }
    | { readonly code: 'isolate-gauge'; readonly gauge: string; readonly topPa: number }
    | ({ readonly code: 'flammable-state' | 'flammable-mixture' | 'near-flammable' } & FlammabilityNumbers)
    | { readonly code: 'detonable-state'; readonly inertFraction: number; readonly pressurePa: number }
    | { readonly code: 'closed-vessel-pressure'; readonly fromPa: number; readonly peakPa: number; readonly limitPa?: number }
    | { readonly code: 'compression-heating'; readonly fuel: string; readonly fromPa: number; readonly toPa: number; readonly gamma: number; readonly endK: number; readonly aitK: number }
    | { readonly code: 'condensation'; readonly species: string; readonly partialPa: number; readonly psatPa: number; readonly fraction: number; readonly coldestK: number; readonly inLine: boolean; readonly method: string }
    | { readonly code: 'psat-estimated'; readonly species: string; readonly method: string; readonly coldestK: number }
    | { readonly code: 'coldest-temperature-assumed'; readonly temperatureK: number }
    | { readonly code: 'no-flammability-data'; readonly species: string }
    | { readonly code: 'flammability-data-estimated'; readonly what: string }
    | { readonly code: 'inert-coefficient-unknown'; readonly species: string; readonly used: number }
    | { readonly code: 'no-with-o2'; readonly pressurePa: number }
    | { readonly code: 'acetylene-pressure'; readonly partialPa: number; readonly limitPa: number; readonly inLine: boolean }
    | { readonly code: 'n2o-decomposition'; readonly partialPa: number }
    | { readonly code: 'oxygen-service'; readonly source: string }
    | { readonly code: 'oxygen-enriched'; readonly oxygenFraction: number }
    | { readonly code: 'safer-order'; readonly order: readonly string[]; readonly reason: string }
    | { readonly code: 'no-safe-order'; readonly reason: string }
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
  readonly pressurePa: number;
}

export type FindingCode = Finding['code'];

/** what every output that carries findings must also say */
export const STANDING_CAUTION =
  'This plan is an engineering estimate, not a hazard review. Follow the gas suppliers\' safety data sheets, your institution\'s rules, local codes and licensed practice; have the procedure reviewed before the first fill.';

export type PressureFormatter = (pa: number) => string;

const pct = (x: number) => `${(x * 100).toPrecision(3)} %`;
const kelvin = (k: number) => `${k.toFixed(0)} K (${(k - 273.15).toFixed(0)} degC)`;

function flammabilityDetail(f: FlammabilityNumbers): string {
  const parts = [`fuel ${pct(f.fuelFraction)}, O2 ${pct(f.oxygenFraction)} on the N2-equivalent diagram`];
  if (f.lfl !== undefined) parts.push(`LFL ${pct(f.lfl)}`);
  if (f.loc !== undefined) parts.push(`LOC ${pct(f.loc)}`);
  if (f.flameK !== undefined && f.limitFlameK !== undefined) parts.push(`flame ${f.flameK.toFixed(0)} K vs limit ${f.limitFlameK.toFixed(0)} K`);
  return `${parts.join('; ')}; by ${f.method}`;
}

export function describeFinding(f: Finding, p: PressureFormatter): string {
  switch (f.code) {
    case 'tank-over-rating':
      return `pressure ${p(f.pressurePa)} exceeds the allowed working pressure ${p(f.limitPa)} of tank ${f.tank} (rated ${p(f.ratedPa)}); lower the final pressure or use a tank rated for it`;
    case 'no-gauge-covers':
      return `no gauge in the lab profile covers a reading of ${p(f.pressurePa)}; add a gauge with that range or change the final pressure`;
    case 'gauge-coarser-than-band':
      return `gauge ${f.gauge} has a standard uncertainty of ${p(f.uncertaintyPa)} at this reading, as large as a third or more of the tolerance band +-${p(f.bandPa)}; the composition tolerance may not be met - use a lower-range gauge or widen the tolerance`;
    case 'purity-assumed':
      return `no purity is given for ${f.source} (${f.species}); 100 % was assumed - enter the certificate purity and impurities in the lab profile`;
    case 'unidentified-impurity':
      return `up to ${(f.fraction * 1e6).toPrecision(3)} ppm of the batch is cylinder impurity that the lab profile does not identify (1 - purity minus listed impurities)`;
    case 'supply-mismatch':
      return `with the cylinders chosen, ${f.species} can only reach x = ${f.actual.toPrecision(5)} instead of the design ${f.design.toPrecision(5)}; check the cylinders' compositions`;
    case 'impurity-present':
      return `the finished batch carries ${(f.fraction * 1e6).toPrecision(3)} ppm ${f.species} from cylinder impurities`;
    case 'cross-virial-estimate':
      return `the cross virial coefficients ${f.pairs.join(', ')} come from the combining rules (no reference mixture model qualifies for them); their uncertainty (calibrated on the fitted pairs: max(${VIRIAL_U.cross.absolute * 1e6} cm3/mol, ${VIRIAL_U.cross.relative * 100} %) each, standard, more at low reduced temperature; ${VIRIAL_U.crossUncalibrated.relative * 100} % for pairs with He, H2, Ne or a hydrogen-bonding species) could move this target by about +-${p(f.shiftPa)} (${f.relative.toPrecision(2)} relative) against a band of +-${p(f.bandPa)}${f.severity === 'warning' ? ' - the target is less certain than its band; check the batch afterwards with mixwright check, or widen the tolerance' : ''}`;
    case 'virial-correlation':
      return `no reference virial coefficient for ${f.species} at this temperature; B from the ${f.method} correlation (less certain)`;
    case 'ideal-gas-error':
      return `an ideal-gas plan would be off by up to ${p(f.worstPa)} at one reading, against a tolerance band of +-${p(f.bandPa)}: use the real-gas targets`;
    case 'supply-pressure-low':
      return `${f.source} delivers at ${p(f.supplyPa)}, not above the ${p(f.targetPa)} the tank must reach in this fill; the fill cannot be completed from it - raise the regulator setting (within the cylinder's and line's ratings) or lower the final pressure`;
    case 'tank-rating-unknown':
      return `the lab profile gives no pressure rating for tank ${f.tank}; no rating is assumed, so the pressure checks cannot be made - add its rating (maximum allowed working pressure) to the profile`;
    case 'isolate-gauge':
      return `close off ${f.gauge} before this fill: it reads only up to ${p(f.topPa)} absolute`;
    case 'flammable-state':
      return `the tank is flammable after this fill (${flammabilityDetail(f)}); choose a fill order that avoids it, or treat this state as a flammable, possibly explosive gas at ${p(f.pressurePa)}`;
    case 'flammable-mixture':
      return `the finished batch is flammable (${flammabilityDetail(f)}): store and handle it as a flammable gas, keep ignition sources away, and vent it to a safe exhaust`;
    case 'near-flammable':
      return `this state is outside the flammable region but within the safety margin of it (${flammabilityDetail(f)}); a small fill error or a wrong gas could make it flammable`;
    case 'detonable-state':
      return `fuel and oxidizer with only ${pct(f.inertFraction)} N2-equivalent inert at ${p(f.pressurePa)}: such mixtures can detonate, and a reflected detonation exceeds the closed-vessel pressure several times - add the bath gas before the oxidizer, or do not make this state`;
    case 'closed-vessel-pressure':
      return f.limitPa !== undefined && f.peakPa > f.limitPa
        ? `if this state ignites in the closed tank the pressure can reach ${p(f.peakPa)} (complete combustion, constant volume, from ${p(f.fromPa)}), above the tank's working limit ${p(f.limitPa)}`
        : `if this state ignites in the closed tank the pressure can reach ${p(f.peakPa)} (complete combustion, constant volume, from ${p(f.fromPa)})${f.limitPa !== undefined ? `; working limit ${p(f.limitPa)}` : ''}`;
    case 'compression-heating':
      return `this fill compresses gas holding ${f.fuel} from ${p(f.fromPa)} to ${p(f.toPa)}; done fast (adiabatically, gamma ${f.gamma.toFixed(3)}) it heats it to ${kelvin(f.endK)}, against an autoignition temperature of ${kelvin(f.aitK)}. Throttle the fill (open the valve slowly) or change the order`;
    case 'condensation':
      return f.inLine
        ? `during its own fill the line holds pure ${f.species} at ${p(f.partialPa)}, above ${(f.fraction * 100).toFixed(0)} % of its vapour pressure ${p(f.psatPa)} at the coldest point (${kelvin(f.coldestK)}, ${f.method}); it may condense in the line - fill the vapour first or heat the lines`
        : `${f.species} partial pressure ${p(f.partialPa)} exceeds ${(f.fraction * 100).toFixed(0)} % of its vapour pressure ${p(f.psatPa)} at the coldest point (${kelvin(f.coldestK)}, ${f.method}); it may condense - lower its partial pressure or heat the tank and lines`;
    case 'psat-estimated':
      return `the vapour pressure of ${f.species} at ${kelvin(f.coldestK)} comes from ${f.method} (outside the range of its measured constants); the condensation check is less certain`;
    case 'coldest-temperature-assumed':
      return `the lab profile gives no coldest temperature for tank and lines; the condensation check used the fill temperature ${kelvin(f.temperatureK)} - add "coldest" to the profile`;
    case 'no-flammability-data':
      return `no flammability limits are on file for ${f.species}; the safety review is incomplete for it - treat every state holding it as flammable`;
    case 'flammability-data-estimated':
      return `flammability data estimated, not measured: ${f.what}`;
    case 'inert-coefficient-unknown':
      return `no ISO 10156 nitrogen-equivalence coefficient for ${f.species}; the smallest listed value ${f.used} was used (conservative)`;
    case 'no-with-o2':
      return `NO and O2 in one tank react to NO2; never premix them - fill them in separate batches`;
    case 'acetylene-pressure':
      return `${f.inLine ? 'the acetylene line' : 'acetylene'} reaches ${p(f.partialPa)} absolute, above about 15 psig (${p(f.limitPa)} absolute), where acetylene can decompose explosively`;
    case 'n2o-decomposition':
      return `N2O at ${p(f.partialPa)} partial pressure: it can decompose exothermically at elevated pressure and temperature - keep its pressure low and its lines clean`;
    case 'oxygen-service':
      return `${f.source} is an oxidizer: open its valve slowly, use only parts cleaned for oxygen service and no hydrocarbon grease`;
    case 'oxygen-enriched':
      return `the tank holds ${pct(f.oxygenFraction)} oxygen (above 23.5 %, oxygen-enriched): materials burn far more readily - oxygen-clean parts and slow valves`;
    case 'safer-order':
      return `the order given makes flammable or hazardous intermediate states; ${f.order.join(' -> ')} avoids them (${f.reason})`;
    case 'no-safe-order':
      return f.reason;
  }
}

export function worstSeverity(findings: readonly Finding[]): Severity | undefined {
  if (findings.some((f) => f.severity === 'danger')) return 'danger';
  if (findings.some((f) => f.severity === 'warning')) return 'warning';
  if (findings.length) return 'note';
  return undefined;
}
