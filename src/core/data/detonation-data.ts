/**
 * Published detonation limits of single fuels in air and in oxygen near 1 atm and room
 * temperature, as fuel mole fractions. Detonation limits lie inside the flammability
 * limits and widen with the size of the vessel and with pressure; where sources differ
 * the wider range is kept. Every value names its source key (data/sources.ts); all of
 * them are recalled (quality "from-memory") until checked against a stored copy.
 */
import type { SourcedNumber } from './safety-data.js';

export interface DetonationLimits {
  readonly fuel: string;
  readonly oxidizer: 'air' | 'O2';
  readonly low: SourcedNumber;
  readonly high: SourcedNumber;
}

const L = (v: number) => ({ value: v / 100, source: 'lewis-von-elbe-1987-memory' });
const K = (v: number) => ({ value: v / 100, source: 'kuchta-1985-memory' });
const B = (v: number) => ({ value: v / 100, source: 'fuel-air-detonability-memory' });

const rows: DetonationLimits[] = [
  { fuel: 'H2', oxidizer: 'air', low: L(18.3), high: L(59) },
  { fuel: 'H2', oxidizer: 'O2', low: L(15), high: L(90) },
  { fuel: 'CH4', oxidizer: 'O2', low: K(8.3), high: K(55) },
  { fuel: 'C2H4', oxidizer: 'air', low: B(3.3), high: B(14.7) },
  { fuel: 'C2H4', oxidizer: 'O2', low: K(3.0), high: K(80) },
  { fuel: 'C2H2', oxidizer: 'air', low: L(4.2), high: L(50) },
  { fuel: 'C2H2', oxidizer: 'O2', low: L(3.5), high: L(92) },
  { fuel: 'C3H8', oxidizer: 'air', low: B(2.5), high: B(7.4) },
  { fuel: 'C3H8', oxidizer: 'O2', low: L(3.2), high: L(37) },
];

export const DETONATION_LIMITS: readonly DetonationLimits[] = rows;

/** the conservative rule where no limits are published: a flammable state with less N2-equivalent inert than this can detonate */
export const DETONABLE_INERT_BELOW = 0.5;
/**
 * ... or whose oxidizer is about as rich as air or richer: O2 / (O2 + N2-equivalent inert)
 * at least this (air is 0.21). Stoichiometric fuel-air mixtures of the alkanes detonate
 * in large enough geometries (common practice), so a flammable state with air's oxygen
 * share or more is not called non-detonable without published limits (our conservative rule).
 */
export const DETONABLE_OXYGEN_SHARE_FROM = 0.2;
/** a fuel/oxidizer state with less N2-equivalent inert than this counts as undiluted fuel/O2 (our threshold) */
export const UNDILUTED_INERT_BELOW = 0.1;
/** reflected detonation pressure over P_CJ: about 2.5 (common practice; properties.md 7.6) */
export const REFLECTED_OVER_CJ = 2.5;
