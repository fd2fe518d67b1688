/**
 * Pure-species constants. Each value carries its source key (data/sources.ts).
 * SI units: temperatures K, pressures Pa, molar volumes m3/mol, dipole debye.
 * Tables are read through core/lookup.ts, never directly by the shells.
 */

/**
 * Tsonopoulos (1974) polar classes, which pick the form of the polar term f2:
 * nonpolar (f2 = 0); 'polar-aprotic' (ketones, aldehydes, ethers, esters, NH3:
 * a from the reduced dipole, b = 0); 'alkanol' (1-alkanols but methanol);
 * 'methanol'; 'water' (Tsonopoulos & Heidman 1990).
 */
export type PolarClass = 'nonpolar' | 'polar-aprotic' | 'alkanol' | 'methanol' | 'water';

export interface SpeciesRecord {
  readonly key: string;
  readonly name: string;
  readonly elements: Readonly<Record<string, number>>;
  readonly Tc: number; // K
  readonly Pc: number; // Pa
  readonly Vc: number; // m3/mol
  readonly omega: number;
  readonly criticalSource: string;
  readonly dipole: number; // debye
  readonly dipoleSource: string;
  readonly polarClass: PolarClass;
  /** quantum gases: pure B from reference values only; effective constants in cross terms */
  readonly quantum: boolean;
  readonly aliases: readonly string[];
}

type Row = [
  key: string,
  name: string,
  elements: Record<string, number>,
  TcK: number,
  PcMPa: number,
  VcCm3: number,
  omega: number,
  critSrc: string,
  dipoleD: number,
  dipoleSrc: string,
  polar: PolarClass,
  aliases?: string[],
];

const H = 'refprop-heos-constants';
const P = 'poling-2001-dipole';
const M = 'dipole-memory';

// critical constants: the "HEOS" columns of the reference table (properties.md section 5);
// NO and CH2O from PSRK rev. 4; SF6 from its CoolProp 8.0 reference EOS.
const rows: Row[] = [
  ['H2', 'hydrogen', { H: 2 }, 33.145, 1.2964, 64.48, -0.219, H, 0, M, 'nonpolar'],
  ['He', 'helium', { He: 1 }, 5.1953, 0.22832, 57.53, -0.3836, H, 0, M, 'nonpolar'],
  ['Ne', 'neon', { Ne: 1 }, 44.4, 2.6616, 41.49, -0.0355, H, 0, M, 'nonpolar'],
  ['Ar', 'argon', { Ar: 1 }, 150.687, 4.863, 74.59, -0.0022, H, 0, M, 'nonpolar'],
  ['Kr', 'krypton', { Kr: 1 }, 209.48, 5.525, 92.17, -0.0009, H, 0, M, 'nonpolar'],
  ['Xe', 'xenon', { Xe: 1 }, 289.733, 5.842, 119.05, 0.0036, H, 0, M, 'nonpolar'],
  ['N2', 'nitrogen', { N: 2 }, 126.192, 3.3958, 89.41, 0.0372, H, 0, M, 'nonpolar'],
  ['O2', 'oxygen', { O: 2 }, 154.581, 5.043, 73.37, 0.0222, H, 0, M, 'nonpolar'],
  ['CO', 'carbon monoxide', { C: 1, O: 1 }, 132.86, 3.494, 92.17, 0.0497, H, 0.1, P, 'nonpolar'],
  ['CO2', 'carbon dioxide', { C: 1, O: 2 }, 304.128, 7.3773, 94.12, 0.2239, H, 0, M, 'nonpolar'],
  ['H2O', 'water', { H: 2, O: 1 }, 647.096, 22.064, 55.95, 0.3443, H, 1.85, M, 'water'],
  ['NH3', 'ammonia', { N: 1, H: 3 }, 405.56, 11.3634, 73.01, 0.256, H, 1.47, M, 'polar-aprotic'],
  ['N2O', 'nitrous oxide', { N: 2, O: 1 }, 309.52, 7.245, 97.37, 0.162, H, 0.17, M, 'nonpolar'],
  ['NO', 'nitric oxide', { N: 1, O: 1 }, 180.0, 6.48, 58.0, 0.588, 'psrk-rev4', 0.16, M, 'nonpolar'],
  ['CH4', 'methane', { C: 1, H: 4 }, 190.564, 4.5992, 98.63, 0.0114, H, 0, M, 'nonpolar'],
  ['C2H6', 'ethane', { C: 2, H: 6 }, 305.322, 4.8722, 145.84, 0.0995, H, 0, M, 'nonpolar'],
  ['C2H4', 'ethylene', { C: 2, H: 4 }, 282.35, 5.0418, 130.95, 0.0866, H, 0, M, 'nonpolar', ['ethene']],
  ['C2H2', 'acetylene', { C: 2, H: 2 }, 308.3, 5.9882, 113.25, 0.178, H, 0, M, 'nonpolar', ['ethyne']],
  ['C3H8', 'propane', { C: 3, H: 8 }, 369.89, 4.2512, 200.0, 0.1521, H, 0, M, 'nonpolar'],
  ['C3H6', 'propylene', { C: 3, H: 6 }, 364.211, 4.555, 183.25, 0.146, H, 0.4, P, 'nonpolar', ['propene']],
  ['n-C4H10', 'n-butane', { C: 4, H: 10 }, 425.125, 3.796, 254.92, 0.201, H, 0, M, 'nonpolar', ['butane']],
  [
    'i-C4H10',
    'isobutane',
    { C: 4, H: 10 },
    407.81,
    3.629,
    257.75,
    0.184,
    H,
    0.1,
    P,
    'nonpolar',
    ['isobutane'],
  ],
  ['n-C5H12', 'n-pentane', { C: 5, H: 12 }, 469.7, 3.3675, 311.53, 0.251, H, 0, M, 'nonpolar', ['pentane']],
  ['n-C7H16', 'n-heptane', { C: 7, H: 16 }, 540.2, 2.7357, 429.18, 0.349, H, 0, M, 'nonpolar', ['heptane']],
  [
    'i-C8H18',
    'iso-octane (2,2,4-trimethylpentane)',
    { C: 8, H: 18 },
    544.0,
    2.572,
    471.7,
    0.303,
    H,
    0,
    M,
    'nonpolar',
    ['isooctane'],
  ],
  ['C7H8', 'toluene', { C: 7, H: 8 }, 591.75, 4.1263, 315.56, 0.2657, H, 0.4, P, 'nonpolar', ['toluene']],
  [
    'CH3OH',
    'methanol',
    { C: 1, H: 4, O: 1 },
    513.38,
    8.2159,
    113.83,
    0.5625,
    H,
    1.7,
    P,
    'methanol',
    ['methanol'],
  ],
  [
    'C2H5OH',
    'ethanol',
    { C: 2, H: 6, O: 1 },
    514.71,
    6.268,
    168.63,
    0.646,
    H,
    1.7,
    P,
    'alkanol',
    ['ethanol'],
  ],
  [
    'CH3OCH3',
    'dimethyl ether',
    { C: 2, H: 6, O: 1 },
    400.378,
    5.3368,
    168.35,
    0.196,
    H,
    1.3,
    P,
    'polar-aprotic',
    ['DME'],
  ],
  [
    'CH2O',
    'formaldehyde',
    { C: 1, H: 2, O: 1 },
    408.0,
    6.586,
    101.0,
    0.248,
    'psrk-rev4',
    2.33,
    M,
    'polar-aprotic',
    ['HCHO'],
  ],
  [
    'SF6',
    'sulfur hexafluoride',
    { S: 1, F: 6 },
    318.7232,
    3.754983,
    196.76,
    0.21,
    'coolprop-8-critical',
    0,
    M,
    'nonpolar',
  ],
];

const QUANTUM = new Set(['He', 'H2', 'Ne']);

export const SPECIES: ReadonlyMap<string, SpeciesRecord> = new Map(
  rows.map(
    ([
      key,
      name,
      elements,
      Tc,
      PcMPa,
      VcCm3,
      omega,
      criticalSource,
      dipole,
      dipoleSource,
      polarClass,
      aliases,
    ]) => [
      key,
      {
        key,
        name,
        elements,
        Tc,
        Pc: PcMPa * 1e6, // MPa -> Pa
        Vc: VcCm3 * 1e-6, // cm3/mol -> m3/mol
        omega,
        criticalSource,
        dipole,
        dipoleSource,
        polarClass,
        quantum: QUANTUM.has(key),
        aliases: aliases ?? [],
      },
    ],
  ),
);
