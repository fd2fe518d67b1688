/**
 * Atomic weights, g/mol: IUPAC 2021 conventional / abridged values
 * (Prohaska et al., Pure Appl. Chem. 94, 573 (2022)).
 */
export interface ElementRecord {
  readonly symbol: string;
  readonly atomicWeight: number; // g/mol
  readonly source: string;
}

export const ELEMENTS: ReadonlyMap<string, ElementRecord> = new Map(
  (
    [
      ['H', 1.008, 'iupac-2021'],
      ['He', 4.0026, 'iupac-2021'],
      ['C', 12.011, 'iupac-2021'],
      ['N', 14.007, 'iupac-2021'],
      ['O', 15.999, 'iupac-2021'],
      ['F', 18.998, 'iupac-2021-memory'],
      ['Ne', 20.18, 'iupac-2021'],
      ['S', 32.06, 'iupac-2021'],
      ['Cl', 35.45, 'iupac-2021'],
      ['Ar', 39.95, 'iupac-2021'],
      ['Kr', 83.798, 'iupac-2021'],
      ['Xe', 131.293, 'iupac-2021'],
    ] as const
  ).map(([symbol, atomicWeight, source]) => [symbol, { symbol, atomicWeight, source }]),
);
