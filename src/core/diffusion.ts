/**
 * Binary diffusion coefficients and the diffusion mixing time of a tank.
 *  - Fuller, Schettler & Giddings (1966), Poling et al. (2001) eq. 11-4.4:
 *      D_AB [cm2/s] = 0.00143 T^1.75 / (P[bar] M_AB^0.5 [(Sv)_A^(1/3) + (Sv)_B^(1/3)]^2)
 *  - Chapman-Enskog, Poling et al. (2001) eq. 11-3.2, Neufeld (1972) collision integral:
 *      D_AB [cm2/s] = 0.00266 T^1.5 / (P[bar] M_AB^0.5 sigma_AB^2 Omega_D)
 *    M_AB = 2/(1/M_A + 1/M_B) in g/mol, sigma_AB = (sigma_A + sigma_B)/2 in angstrom,
 *    eps_AB = sqrt(eps_A eps_B).
 * Both scale as 1/P. Results here in m2/s.
 */
import { FULLER_FALLBACK, FULLER_VOLUMES, LENNARD_JONES } from './data/transport-data.js';
import { getSpecies } from './lookup.js';
import { molarMassKgPerMol } from './formula.js';

const CM2_TO_M2 = 1e-4;
const PA_PER_BAR = 1e5;
/** species below this mole fraction do not count for the slowest pair */
export const SLOWEST_PAIR_MIN_FRACTION = 1e-3;

function mAB(a: string, b: string): number {
  const ma = molarMassKgPerMol(getSpecies(a).elements) * 1000; // kg/mol -> g/mol, as the correlations are written
  const mb = molarMassKgPerMol(getSpecies(b).elements) * 1000;
  return 2 / (1 / ma + 1 / mb);
}

function fullerVolume(k: string): number | undefined {
  return (FULLER_VOLUMES.get(k) ?? FULLER_FALLBACK.get(k))?.volume;
}

/**
 * Fuller D_AB, m2/s; undefined without diffusion volumes.
 * Example: fullerD('O2', 'N2', 298.15, 101325) -> 2.06e-5 m2/s (properties.md section 8: 0.206 cm2/s).
 */
export function fullerD(a: string, b: string, temperatureK: number, pressurePa: number): number | undefined {
  const va = fullerVolume(getSpecies(a).key);
  const vb = fullerVolume(getSpecies(b).key);
  if (va === undefined || vb === undefined) return undefined;
  const pBar = pressurePa / PA_PER_BAR;
  const s = Math.cbrt(va) + Math.cbrt(vb);
  return ((0.00143 * temperatureK ** 1.75) / (pBar * Math.sqrt(mAB(a, b)) * s * s)) * CM2_TO_M2;
}

/** Neufeld et al. (1972) fit of the diffusion collision integral Omega_D(T*) */
export function neufeldOmegaD(tStar: number): number {
  return (
    1.06036 / tStar ** 0.1561 +
    0.193 / Math.exp(0.47635 * tStar) +
    1.03587 / Math.exp(1.52996 * tStar) +
    1.76474 / Math.exp(3.89411 * tStar)
  );
}

/**
 * Chapman-Enskog D_AB, m2/s; undefined without Lennard-Jones data.
 * Example: chapmanEnskogD('O2', 'N2', 298.15, 101325) -> 2.04e-5 m2/s (properties.md section 8: 0.204 cm2/s).
 */
export function chapmanEnskogD(
  a: string,
  b: string,
  temperatureK: number,
  pressurePa: number,
): number | undefined {
  const la = LENNARD_JONES.get(getSpecies(a).key);
  const lb = LENNARD_JONES.get(getSpecies(b).key);
  if (!la || !lb) return undefined;
  const sigma = (la.sigmaA + lb.sigmaA) / 2;
  const eps = Math.sqrt(la.epsK * lb.epsK);
  const pBar = pressurePa / PA_PER_BAR;
  return (
    ((0.00266 * temperatureK ** 1.5) /
      (pBar * Math.sqrt(mAB(a, b)) * sigma * sigma * neufeldOmegaD(temperatureK / eps))) *
    CM2_TO_M2
  );
}

export interface PairDiffusion {
  readonly a: string;
  readonly b: string;
  readonly fullerM2s?: number;
  readonly chapmanEnskogM2s?: number;
  /** the smaller of the two (the conservative one for a mixing time) */
  readonly governingM2s: number;
}

/**
 * The slowest binary pair among the species that make up at least `minFraction` of the
 * mixture: the one that governs how long diffusion takes to homogenise the tank. A pair
 * with neither method's data is left out here; `transportGaps` names it (readiness.ts
 * reports it as a finding).
 */
export function slowestPair(
  y: Readonly<Record<string, number>>,
  temperatureK: number,
  pressurePa: number,
  minFraction = SLOWEST_PAIR_MIN_FRACTION,
): PairDiffusion | undefined {
  const ks = Object.keys(y).filter((k) => y[k] >= minFraction);
  let worst: PairDiffusion | undefined;
  for (let i = 0; i < ks.length; i++) {
    for (let j = i + 1; j < ks.length; j++) {
      const f = fullerD(ks[i], ks[j], temperatureK, pressurePa);
      const c = chapmanEnskogD(ks[i], ks[j], temperatureK, pressurePa);
      const vals = [f, c].filter((v): v is number => v !== undefined);
      if (!vals.length) continue;
      const g = Math.min(...vals);
      if (!worst || g < worst.governingM2s)
        worst = { a: ks[i], b: ks[j], fullerM2s: f, chapmanEnskogM2s: c, governingM2s: g };
    }
  }
  return worst;
}

/** species of at least `minFraction` without Lennard-Jones parameters or a diffusion volume, and why */
export function transportGaps(
  y: Readonly<Record<string, number>>,
  minFraction = SLOWEST_PAIR_MIN_FRACTION,
): { species: string; lennardJones: boolean; fullerVolume: boolean }[] {
  return Object.keys(y)
    .filter((k) => y[k] >= minFraction)
    .map((k) => {
      const key = getSpecies(k).key;
      return {
        species: k,
        lennardJones: LENNARD_JONES.has(key),
        fullerVolume: fullerVolume(key) !== undefined,
      };
    })
    .filter((g) => !g.lennardJones || !g.fullerVolume);
}

/**
 * Time for a layered tank of height L to homogenise by diffusion to a residual
 * non-uniformity eps: the slowest 1-D mode decays as exp(-pi^2 D t / L^2), so
 * t = L^2 / (pi^2 D) ln(1/eps).
 * Example: diffusionMixingTimeS(0.3, 0.206e-4, 0.01) -> 34 min (D = 0.206 cm2/s, L = 30 cm, eps = 0.01:
 *   0.3^2 / (pi^2 x 2.06e-5) x ln 100 = 2039 s by hand).
 */
export function diffusionMixingTimeS(heightM: number, dM2s: number, eps: number): number {
  return ((heightM * heightM) / (Math.PI * Math.PI * dM2s)) * Math.log(1 / eps);
}
