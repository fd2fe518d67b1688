/**
 * Which data tables every species needs, and the explicit "not known" entries: a species
 * may lack a value only where this file says so (with why), and the review and `ready`
 * report each "not known" that matters as a finding. tests/core/data.test.ts checks that
 * every fuel has flammability limits, an autoignition temperature and Lennard-Jones
 * parameters, or an entry here, and names the species and the table when one is missing.
 */
import { FUEL_SAFETY } from './safety-data.js';
import { FULLER_FALLBACK, FULLER_VOLUMES, LENNARD_JONES } from './transport-data.js';

export type DataTable =
  'flammability limits' | 'autoignition temperature' | 'lennard-jones' | 'diffusion volume';

/** where each table lives (for messages and DEVELOPERS.md) */
export const TABLE_FILE: Readonly<Record<DataTable, string>> = {
  'flammability limits': 'src/core/data/safety-data.ts (FUEL_SAFETY: lflAir, uflAir)',
  'autoignition temperature': 'src/core/data/safety-data.ts (FUEL_SAFETY: ait via ait(nfpaK, iecK))',
  'lennard-jones': 'src/core/data/transport-data.ts (LENNARD_JONES)',
  'diffusion volume': 'src/core/data/transport-data.ts (FULLER_VOLUMES or FULLER_FALLBACK)',
};

export interface NotKnown {
  readonly species: string;
  readonly table: DataTable;
  /** why the value is not on file */
  readonly why: string;
}

export const NOT_KNOWN: readonly NotKnown[] = [
  {
    species: 'CH2O',
    table: 'lennard-jones',
    why:
      'not in the Lennard-Jones tables read (Poling et al. 2001 Appendix B; Magalhaes et ' +
      'al. 2013); the Fuller correlation alone gives its diffusion coefficients',
  },
  {
    species: 'SF6',
    table: 'lennard-jones',
    why:
      'not in the Lennard-Jones tables read here; the Fuller correlation with the atomic ' +
      'increments alone gives its diffusion coefficients',
  },
];

export function notKnown(species: string, table: DataTable): NotKnown | undefined {
  return NOT_KNOWN.find((n) => n.species === species && n.table === table);
}

/** is the table's value on file for this species? */
export function onFile(species: string, table: DataTable): boolean {
  switch (table) {
    case 'flammability limits':
      return FUEL_SAFETY.has(species);
    case 'autoignition temperature':
      return FUEL_SAFETY.get(species)?.ait !== undefined;
    case 'lennard-jones':
      return LENNARD_JONES.has(species);
    case 'diffusion volume':
      return FULLER_VOLUMES.has(species) || FULLER_FALLBACK.has(species);
  }
}

/** the tables a fuel needs, and those every species needs */
export const FUEL_TABLES: readonly DataTable[] = ['flammability limits', 'autoignition temperature'];
export const SPECIES_TABLES: readonly DataTable[] = ['lennard-jones', 'diffusion volume'];

/** each table a species needs that is neither on file nor declared "not known" (empty when covered) */
export function coverageGaps(species: string, fuel: boolean): DataTable[] {
  const need = fuel ? [...FUEL_TABLES, ...SPECIES_TABLES] : SPECIES_TABLES;
  return need.filter((t) => !onFile(species, t) && !notKnown(species, t));
}
