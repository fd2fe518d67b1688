/**
 * Fire and explosion data of the fuels, and the nitrogen-equivalence
 * coefficients of the inerts. Mole fractions (0.05 = 5 vol %), temperatures K.
 * Every value names its source key (data/sources.ts).
 */

export interface SourcedNumber {
  readonly value: number;
  readonly source: string;
}

export interface FuelSafetyRecord {
  readonly key: string;
  /** lower flammability limit in air, ~25 degC, 1 atm: the lower of the listed values is used for safety */
  readonly lflAir: readonly SourcedNumber[];
  /** upper flammability limit in air: the higher of the listed values is used */
  readonly uflAir: readonly SourcedNumber[];
  /**
   * upper flammability limit in oxygen. H2: 95.8 % is the widest of Coward & Jones's values
   * (closed tubes; 93.9 % upward in an open 2-inch tube); CH4: 60.5 % (upward, 2-inch tube).
   */
  readonly uflO2?: SourcedNumber;
  /** limiting oxygen concentration with N2 as diluent (already adjusted to large-vessel practice) */
  readonly loc?: SourcedNumber;
  /** autoignition temperature in air: the lowest listed value (the one the compression check uses) */
  readonly ait?: SourcedNumber;
  /** every listed autoignition temperature (NFPA 497 and IEC 60079-20-1 where both list one) */
  readonly aitListed?: readonly SourcedNumber[];
}

/** a limit as listed by NFPA 497 (2008) */
const nfpa497 = (value: number): SourcedNumber => ({ value, source: 'nfpa-497-2008' });
/** a limit as listed by IEC 60079-20-1 (2010) */
const iec60079 = (value: number): SourcedNumber => ({ value, source: 'iec-60079-20-1-2010' });
/** a limit in oxygen from Zabetakis, USBM Bulletin 627, recalled */
const zabetakisRecalled = (value: number): SourcedNumber => ({ value, source: 'zabetakis-1965-memory' });
/** Coward & Jones, USBM Bulletin 503: limits in oxygen, read (quoted) from the Bulletin's pages */
const cowardJones = (value: number): SourcedNumber => ({ value, source: 'coward-jones-1952' });
/** a large-vessel limiting oxygen concentration of ASTM E2079-19 */
const astmE2079 = (value: number): SourcedNumber => ({ value, source: 'astm-e2079-19' });
/** NFPA 69 tube value (vol %) adjusted by TIA 1211: -2 vol % for LOC >= 10 %, x0.85 below */
const nfpa69Adjusted = (tubePct: number): SourcedNumber => ({
  value: (tubePct >= 10 ? tubePct - 2 : tubePct * 0.85) / 100,
  source: 'nfpa-69-memory',
});
/**
 * Autoignition temperatures, K, as listed by NFPA 497 (2008) and IEC 60079-20-1 (2010), both
 * read in the tables of the chemicals data library; `ait` is the lower (a lower AIT is
 * conservative for the compression-heating check), `aitListed` keeps both.
 */
function ait(
  nfpaK: number | undefined,
  iecK: number | undefined,
): Pick<FuelSafetyRecord, 'ait' | 'aitListed'> {
  const listed = [
    ...(nfpaK !== undefined ? [{ value: nfpaK, source: 'nfpa-497-2008' }] : []),
    ...(iecK !== undefined ? [{ value: iecK, source: 'iec-60079-20-1-2010' }] : []),
  ];
  const low = listed.reduce((a, b) => (b.value < a.value ? b : a));
  return { ait: low, aitListed: listed };
}

const rows: FuelSafetyRecord[] = [
  {
    key: 'H2',
    lflAir: [nfpa497(0.04), iec60079(0.04)],
    uflAir: [nfpa497(0.75), iec60079(0.77)],
    uflO2: cowardJones(0.958),
    loc: astmE2079(0.046),
    ...ait(773.15, 833.15),
  },
  {
    key: 'CO',
    lflAir: [nfpa497(0.125), iec60079(0.109)],
    uflAir: [nfpa497(0.74), iec60079(0.74)],
    uflO2: zabetakisRecalled(0.94),
    loc: astmE2079(0.051),
    ...ait(882.15, 880.15),
  },
  {
    key: 'CH4',
    lflAir: [nfpa497(0.05), iec60079(0.044)],
    uflAir: [nfpa497(0.15), iec60079(0.17)],
    uflO2: cowardJones(0.605),
    loc: astmE2079(0.107),
    ...ait(873.15, 873.15),
  },
  {
    key: 'C2H6',
    lflAir: [nfpa497(0.03), iec60079(0.024)],
    uflAir: [nfpa497(0.125), iec60079(0.155)],
    uflO2: zabetakisRecalled(0.66),
    loc: nfpa69Adjusted(11),
    ...ait(745.15, 788.15),
  },
  {
    key: 'C2H4',
    lflAir: [nfpa497(0.027), iec60079(0.023)],
    uflAir: [nfpa497(0.36), iec60079(0.36)],
    uflO2: zabetakisRecalled(0.8),
    loc: astmE2079(0.085),
    ...ait(763.15, 713.15),
  },
  {
    key: 'C2H2',
    lflAir: [nfpa497(0.025), iec60079(0.023)],
    uflAir: [nfpa497(1.0), iec60079(1.0)],
    uflO2: zabetakisRecalled(1.0),
    loc: { value: 0, source: 'acetylene-practice' },
    ...ait(578.15, 578.15),
  },
  {
    key: 'C3H8',
    lflAir: [nfpa497(0.021), iec60079(0.017)],
    uflAir: [nfpa497(0.095), iec60079(0.109)],
    uflO2: zabetakisRecalled(0.55),
    loc: astmE2079(0.105),
    ...ait(723.15, 723.15),
  },
  {
    key: 'C3H6',
    lflAir: [nfpa497(0.024), iec60079(0.02)],
    uflAir: [nfpa497(0.103), iec60079(0.111)],
    uflO2: zabetakisRecalled(0.53),
    loc: nfpa69Adjusted(11.5),
    ...ait(733.15, 728.15),
  },
  {
    key: 'n-C4H10',
    lflAir: [nfpa497(0.019), iec60079(0.014)],
    uflAir: [nfpa497(0.085), iec60079(0.093)],
    uflO2: zabetakisRecalled(0.49),
    loc: nfpa69Adjusted(12),
    ...ait(561.15, 645.15),
  },
  {
    key: 'i-C4H10',
    lflAir: [nfpa497(0.018), iec60079(0.013)],
    uflAir: [nfpa497(0.084), iec60079(0.098)],
    loc: nfpa69Adjusted(12),
    ...ait(733.15, 733.15),
  },
  {
    key: 'n-C5H12',
    lflAir: [nfpa497(0.015), iec60079(0.011)],
    uflAir: [nfpa497(0.078), iec60079(0.087)],
    loc: nfpa69Adjusted(12),
    ...ait(516.15, 516.15),
  },
  {
    key: 'n-C7H16',
    lflAir: [nfpa497(0.01), iec60079(0.0085)],
    uflAir: [nfpa497(0.067), iec60079(0.067)],
    ...ait(477.15, 477.15),
  },
  { key: 'i-C8H18', lflAir: [iec60079(0.007)], uflAir: [iec60079(0.06)], ...ait(undefined, 686.15) },
  {
    key: 'C7H8',
    lflAir: [nfpa497(0.011), iec60079(0.01)],
    uflAir: [nfpa497(0.071), iec60079(0.078)],
    ...ait(753.15, 803.15),
  },
  {
    key: 'CH3OH',
    lflAir: [nfpa497(0.06), iec60079(0.06)],
    uflAir: [nfpa497(0.36), iec60079(0.36)],
    loc: nfpa69Adjusted(10),
    ...ait(658.15, 713.15),
  },
  {
    key: 'C2H5OH',
    lflAir: [nfpa497(0.033), iec60079(0.031)],
    uflAir: [nfpa497(0.19), iec60079(0.19)],
    loc: nfpa69Adjusted(10.5),
    ...ait(636.15, 673.15),
  },
  {
    key: 'CH3OCH3',
    lflAir: [nfpa497(0.034), iec60079(0.027)],
    uflAir: [nfpa497(0.27), iec60079(0.32)],
    ...ait(623.15, 513.15),
  },
  {
    key: 'NH3',
    lflAir: [nfpa497(0.15), iec60079(0.15)],
    uflAir: [nfpa497(0.28), iec60079(0.336)],
    uflO2: zabetakisRecalled(0.79),
    ...ait(924.15, 903.15),
  },
  {
    key: 'CH2O',
    lflAir: [nfpa497(0.07), iec60079(0.07)],
    uflAir: [nfpa497(0.73), iec60079(0.73)],
    ...ait(703.15, 697.15),
  },
];

export const FUEL_SAFETY: ReadonlyMap<string, FuelSafetyRecord> = new Map(rows.map((r) => [r.key, r]));

/** ISO 10156:2017 nitrogen-equivalence coefficients K of inert gases */
export const INERT_K: ReadonlyMap<string, SourcedNumber> = new Map(
  (
    [
      ['N2', 1.0],
      ['CO2', 1.5],
      ['He', 0.9],
      ['Ar', 0.55],
      ['Ne', 0.7],
      ['Kr', 0.5],
      ['Xe', 0.5],
      ['SF6', 4.0],
    ] as const
  ).map(([k, v]) => [k, { value: v, source: 'iso-10156-2017' }]),
);

// the inert fallback, the NFPA 69 margins and the acetylene limit live with the other thresholds
export { ACETYLENE_LIMIT_PA, INERT_K_FALLBACK, MARGINS } from '../thresholds.js';
