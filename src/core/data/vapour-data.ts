/**
 * Vapour-pressure constants of the condensable species.
 * Antoine (Poling et al. 2001, App. A, via the chemicals data library): log10(P/Pa) = A - B/(T/K + C).
 * Wagner (Poling et al. 2001): ln(P/Pc) = (a tau + b tau^1.5 + c tau^2.5 + d tau^5)/Tr, tau = 1 - Tr.
 */
export interface AntoineRecord {
  readonly A: number;
  readonly B: number; // K
  readonly C: number; // K
  readonly TminK: number;
  readonly TmaxK: number;
  readonly source: string;
}

export interface WagnerRecord {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly d: number;
  readonly TcK: number;
  readonly PcPa: number;
  readonly source: string;
}

const P = 'poling-2001-antoine';
export const ANTOINE: ReadonlyMap<string, AntoineRecord> = new Map(
  (
    [
      ['n-C5H12', 8.97786, 1064.84, -41.136, 228.7, 330.8],
      ['n-C7H16', 9.02023, 1263.909, -56.718, 277.7, 396.5],
      ['i-C8H18', 8.93646, 1257.85, -52.383, 275.5, 398.4],
      ['C7H8', 9.05043, 1327.62, -55.525, 286.4, 409.6],
      ['CH3OH', 10.20277, 1580.08, -33.65, 262.6, 356.0],
      ['C2H5OH', 10.33675, 1648.22, -42.232, 276.5, 369.5],
      ['H2O', 10.11564, 1687.537, -42.98, 273.2, 473.2],
      ['n-C4H10', 8.93266, 935.773, -34.361, 200.5, 292.0],
      ['i-C4H10', 9.00272, 947.54, -24.28, 190.4, 280.3],
      ['C3H8', 8.92828, 803.997, -26.11, 168.9, 247.8],
      ['CH3OCH3', 9.44136, 1025.56, -17.1, 184.1, 264.8],
    ] as const
  ).map(([k, A, B, C, TminK, TmaxK]) => [k, { A, B, C, TminK, TmaxK, source: P }]),
);

const W = 'poling-2001-wagner';
export const WAGNER: ReadonlyMap<string, WagnerRecord> = new Map(
  (
    [
      ['n-C5H12', -7.30698, 1.75845, -2.1629, -2.913, 469.8, 3.375e6],
      ['C7H8', -7.316, 1.59425, -1.93165, -3.7222, 591.8, 4.106e6],
      ['CH3OH', -8.63571, 1.17982, -2.479, -1.024, 512.64, 8.092e6],
      ['C2H5OH', -8.68587, 1.17831, -4.8762, 1.588, 513.92, 6.132e6],
      ['n-C4H10', -7.01763, 1.6777, -1.9739, -2.172, 425.25, 3.792e6],
      ['C3H8', -6.76368, 1.55481, -1.5872, -2.024, 369.85, 4.247e6],
    ] as const
  ).map(([k, a, b, c, d, TcK, PcPa]) => [k, { a, b, c, d, TcK, PcPa, source: W }]),
);

/** IAPWS saturation-pressure equation of water (Wagner & Pruss 1993) */
export const IAPWS_WATER = {
  a: [-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502] as const,
  TcK: 647.096,
  PcPa: 22.064e6,
  source: 'iapws-wagner-pruss',
} as const;
