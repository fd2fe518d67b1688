/**
 * Lennard-Jones parameters (sigma in angstrom, epsilon/k in K) and Fuller diffusion
 * volumes (cm3/mol, dimensionless in the correlation) with their sources.
 */
export interface LjRecord {
  readonly sigmaA: number;
  readonly epsK: number;
  readonly source: string;
}

const P = 'poling-2001-lj';
const G = 'magalhaes-2013-lj';
export const LENNARD_JONES: ReadonlyMap<string, LjRecord> = new Map(
  (
    [
      ['H2', 2.827, 59.7, P],
      ['He', 2.551, 10.22, P],
      ['Ne', 2.82, 32.8, P],
      ['Ar', 3.542, 93.3, P],
      ['Kr', 3.655, 178.9, P],
      ['Xe', 4.047, 231.0, P],
      ['N2', 3.798, 71.4, P],
      ['O2', 3.467, 106.7, P],
      ['CO', 3.69, 91.7, P],
      ['CO2', 3.941, 195.2, P],
      ['H2O', 2.641, 809.1, P],
      ['NH3', 2.9, 558.3, P],
      ['CH4', 3.758, 148.6, P],
      ['C2H6', 4.443, 215.7, P],
      ['C2H4', 4.163, 224.7, P],
      ['C2H2', 4.033, 231.8, P],
      ['C3H8', 5.118, 237.1, P],
      ['C3H6', 4.678, 298.9, P],
      ['n-C4H10', 4.687, 531.4, P],
      ['i-C4H10', 5.278, 330.1, P],
      ['n-C5H12', 5.784, 341.1, P],
      ['CH3OH', 3.626, 481.8, P],
      ['C2H5OH', 4.53, 362.6, P],
      ['CH3OCH3', 4.307, 395.0, P],
      ['N2O', 3.828, 232.4, P],
      ['NO', 3.492, 116.7, P],
      ['n-C7H16', 5.944, 404.1, G],
      ['i-C8H18', 6.104, 420.9, G],
      ['C7H8', 5.455, 350.7, G],
    ] as const
  ).map(([k, sigmaA, epsK, source]) => [k, { sigmaA, epsK, source }]),
);

const F = 'fuller-1966-volumes';
export const FULLER_VOLUMES: ReadonlyMap<string, { readonly volume: number; readonly source: string }> =
  new Map(
    (
      [
        ['He', 2.67],
        ['Ne', 5.98],
        ['Ar', 16.2],
        ['Kr', 24.5],
        ['Xe', 32.7],
        ['H2', 6.12],
        ['N2', 18.5],
        ['O2', 16.3],
        ['CO', 18.0],
        ['CO2', 26.9],
        ['N2O', 35.9],
        ['NH3', 20.7],
        ['H2O', 13.1],
        ['NO', 10.65],
        ['CH4', 25.14],
        ['C2H6', 45.66],
        ['C2H4', 41.04],
        ['C2H2', 36.42],
        ['C3H8', 66.18],
        ['C3H6', 61.56],
        ['n-C4H10', 86.7],
        ['i-C4H10', 86.7],
        ['n-C5H12', 107.22],
        ['n-C7H16', 148.26],
        ['i-C8H18', 168.78],
        ['C7H8', 111.48],
        ['CH3OH', 31.25],
        ['C2H5OH', 51.77],
        ['CH3OCH3', 51.77],
        ['CH2O', 26.63],
      ] as const
    ).map(([k, v]) => [k, { volume: v, source: F }]),
  );

/** SF6 from the atomic increments S 22.9 + 6 x F 14.7 (recalled) */
export const FULLER_FALLBACK: ReadonlyMap<string, { readonly volume: number; readonly source: string }> =
  new Map([['SF6', { volume: 22.9 + 6 * 14.7, source: 'fuller-increments-memory' }]]);
