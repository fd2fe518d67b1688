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

/** a limit in vol % from Lewis & von Elbe (1987), recalled */
const lewisVonElbe = (pct: number): SourcedNumber => ({
  value: pct / 100,
  source: 'lewis-von-elbe-1987-memory',
});
/** a limit in vol % from Kuchta, USBM Bulletin 680 (1985), recalled */
const kuchta = (pct: number): SourcedNumber => ({ value: pct / 100, source: 'kuchta-1985-memory' });
/** a fuel-air limit in vol % from large-tube and cell-size data, recalled */
const fuelAirCellSize = (pct: number): SourcedNumber => ({
  value: pct / 100,
  source: 'fuel-air-detonability-memory',
});

const rows: DetonationLimits[] = [
  { fuel: 'H2', oxidizer: 'air', low: lewisVonElbe(18.3), high: lewisVonElbe(59) },
  { fuel: 'H2', oxidizer: 'O2', low: lewisVonElbe(15), high: lewisVonElbe(90) },
  { fuel: 'CH4', oxidizer: 'O2', low: kuchta(8.3), high: kuchta(55) },
  { fuel: 'C2H4', oxidizer: 'air', low: fuelAirCellSize(3.3), high: fuelAirCellSize(14.7) },
  { fuel: 'C2H4', oxidizer: 'O2', low: kuchta(3.0), high: kuchta(80) },
  { fuel: 'C2H2', oxidizer: 'air', low: lewisVonElbe(4.2), high: lewisVonElbe(50) },
  { fuel: 'C2H2', oxidizer: 'O2', low: lewisVonElbe(3.5), high: lewisVonElbe(92) },
  { fuel: 'C3H8', oxidizer: 'air', low: fuelAirCellSize(2.5), high: fuelAirCellSize(7.4) },
  { fuel: 'C3H8', oxidizer: 'O2', low: lewisVonElbe(3.2), high: lewisVonElbe(37) },
];

export const DETONATION_LIMITS: readonly DetonationLimits[] = rows;

// the detonability rule's thresholds and the reflected-pressure ratio live with the other thresholds
export {
  DETONABLE_INERT_BELOW,
  DETONABLE_OXYGEN_SHARE_FROM,
  REFLECTED_OVER_CJ,
  UNDILUTED_INERT_BELOW,
} from '../thresholds.js';
