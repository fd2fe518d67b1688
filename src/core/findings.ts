/**
 * Findings of a plan as data: a severity, a stable code, the step they concern and
 * the numbers behind them. describeFinding() words each one, in one place.
 */

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
    | { readonly code: 'ideal-gas-error'; readonly worstPa: number; readonly bandPa: number }
    | { readonly code: 'supply-pressure-low'; readonly source: string; readonly supplyPa: number; readonly targetPa: number }
  );

export type FindingCode = Finding['code'];

/** what every output that carries findings must also say */
export const STANDING_CAUTION =
  'This plan is an engineering estimate, not a hazard review. Follow the gas suppliers\' safety data sheets, your institution\'s rules, local codes and licensed practice; have the procedure reviewed before the first fill.';

export type PressureFormatter = (pa: number) => string;

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
    case 'virial-correlation':
      return `no reference virial coefficient for ${f.species} at this temperature; B from the ${f.method} correlation (less certain)`;
    case 'ideal-gas-error':
      return `an ideal-gas plan would be off by up to ${p(f.worstPa)} at one reading, against a tolerance band of +-${p(f.bandPa)}: use the real-gas targets`;
    case 'supply-pressure-low':
      return `${f.source} delivers at ${p(f.supplyPa)}, below the ${p(f.targetPa)} the tank must reach in this fill; the fill cannot be completed from it`;
  }
}

export function worstSeverity(findings: readonly Finding[]): Severity | undefined {
  if (findings.some((f) => f.severity === 'danger')) return 'danger';
  if (findings.some((f) => f.severity === 'warning')) return 'warning';
  if (findings.length) return 'note';
  return undefined;
}
