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

// the detonability rule's thresholds and the reflected-pressure ratio live with the other thresholds
export {
  DETONABLE_INERT_BELOW,
  DETONABLE_OXYGEN_SHARE_FROM,
  REFLECTED_OVER_CJ,
  UNDILUTED_INERT_BELOW,
} from '../thresholds.js';
