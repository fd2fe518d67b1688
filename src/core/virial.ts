/**
 * Second virial coefficients: the Tsonopoulos (1974) corresponding-states
 * correlation with its polar terms, the Prausnitz combining rules for the
 * cross coefficients, and effective constants for the quantum gases.
 */
import { R, ATM_PA } from './constants.js';
import type { PolarClass, SpeciesRecord } from './data/species.js';
import { molarMassKgPerMol } from './formula.js';

/** reduced constants that enter the correlation for one species or one pair */
export interface CorrelationConstants {
  readonly Tc: number; // K
  readonly Pc: number; // Pa
  readonly Vc: number; // m3/mol
  readonly omega: number;
  /** polar-term constants of Tsonopoulos' f2 = a/Tr^6 - b/Tr^8 */
  readonly a: number;
  readonly b: number;
}

/**
 * Tsonopoulos (1974), AIChE J. 20, 263:
 *   B Pc / (R Tc) = f0(Tr) + omega f1(Tr) + f2(Tr)
 *   f0 = 0.1445 - 0.330/Tr - 0.1385/Tr^2 - 0.0121/Tr^3 - 0.000607/Tr^8
 *   f1 = 0.0637 + 0.331/Tr^2 - 0.423/Tr^3 - 0.008/Tr^8
 *   f2 = a/Tr^6 - b/Tr^8
 * @param temperatureK T in K; meaningful for roughly Tr > 0.5 in the gas phase
 * @returns B in m3/mol
 * Example: tsonopoulosB({ Tc: 150.687, Pc: 4.863e6, Vc: 74.59e-6, omega: -0.0022, a: 0, b: 0 }, 298.15)
 *   -> -15.3 cm3/mol (argon; its reference EOS, CoolProp 8.0.0, gives -15.55 cm3/mol).
 */
export function tsonopoulosB(c: CorrelationConstants, temperatureK: number): number {
  const tr = c.Tc / temperatureK; // 1/Tr
  const tr2 = tr * tr;
  const tr3 = tr2 * tr;
  const tr6 = tr3 * tr3;
  const tr8 = tr6 * tr2;
  const f0 = 0.1445 - 0.33 * tr - 0.1385 * tr2 - 0.0121 * tr3 - 0.000607 * tr8;
  const f1 = 0.0637 + 0.331 * tr2 - 0.423 * tr3 - 0.008 * tr8;
  const f2 = c.a * tr6 - c.b * tr8;
  return ((f0 + c.omega * f1 + f2) * R * c.Tc) / c.Pc;
}

/**
 * Reduced dipole moment of Tsonopoulos: mu_r = 1e5 mu^2 (Pc/atm) / Tc^2,
 * mu in debye, Tc in K.
 */
export function reducedDipole(dipoleDebye: number, PcPa: number, TcK: number): number {
  return (1e5 * dipoleDebye * dipoleDebye * (PcPa / ATM_PA)) / (TcK * TcK);
}

/** polar constants (a, b) of f2 for one species (Tsonopoulos 1974; water: Tsonopoulos & Heidman 1990) */
export function polarConstants(polarClass: PolarClass, muR: number): { a: number; b: number } {
  switch (polarClass) {
    case 'nonpolar':
      return { a: 0, b: 0 };
    case 'polar-aprotic':
      return { a: -2.14e-4 * muR - 4.308e-21 * muR ** 8, b: 0 };
    case 'alkanol':
      return { a: 0.0878, b: 0.00908 + 0.0006957 * muR };
    case 'methanol':
      return { a: 0.0878, b: 0.0525 };
    case 'water':
      return { a: -0.0109, b: 0 };
  }
}

/**
 * Effective critical constants of a quantum gas (Gunn, Chueh & Prausnitz 1966, as
 * given by Prausnitz et al. 1999): Tc = Tc0/(1 + 21.8/(M T)), Pc = Pc0/(1 + 44.2/(M T)),
 * Vc = Vc0/(1 - 9.91/(M T)), omega = 0; M in g/mol, T in K. Used only inside cross
 * terms: the pure B of He, H2 and Ne comes from reference values.
 */
const CLASSICAL: Record<string, { Tc: number; PcAtm: number; VcCm3: number }> = {
  He: { Tc: 10.47, PcAtm: 6.76, VcCm3: 37.5 },
  H2: { Tc: 43.6, PcAtm: 20.5, VcCm3: 51.5 },
  Ne: { Tc: 45.5, PcAtm: 27.3, VcCm3: 40.3 },
};

export function correlationConstants(sp: SpeciesRecord, temperatureK: number): CorrelationConstants {
  const classical = CLASSICAL[sp.key];
  if (sp.quantum && classical) {
    const mT = molarMassKgPerMol(sp.elements) * 1000 * temperatureK; // g/mol * K, as the rule is written
    return {
      Tc: classical.Tc / (1 + 21.8 / mT),
      Pc: (classical.PcAtm * ATM_PA) / (1 + 44.2 / mT),
      Vc: (classical.VcCm3 * 1e-6) / (1 - 9.91 / mT), // cm3/mol -> m3/mol
      omega: 0,
      a: 0,
      b: 0,
    };
  }
  const { a, b } = polarConstants(sp.polarClass, reducedDipole(sp.dipole, sp.Pc, sp.Tc));
  return { Tc: sp.Tc, Pc: sp.Pc, Vc: sp.Vc, omega: sp.omega, a, b };
}

/**
 * Pseudo-critical constants of a pair (Prausnitz et al. 1999; Vc by the Lee-Kesler cube-root rule):
 *   Tcij = sqrt(Tci Tcj)(1 - kij); Vcij = ((Vci^1/3 + Vcj^1/3)/2)^3;
 *   Zcij = (Zci + Zcj)/2; Pcij = Zcij R Tcij / Vcij; omega_ij = (omega_i + omega_j)/2.
 * Polar terms: both polar -> a_ij = (a_i + a_j)/2, b_ij = 0; otherwise a = b = 0 (Tsonopoulos).
 */
export function pairConstants(
  ci: CorrelationConstants,
  cj: CorrelationConstants,
  kij = 0,
): CorrelationConstants {
  const Tc = Math.sqrt(ci.Tc * cj.Tc) * (1 - kij);
  const Vc = ((Math.cbrt(ci.Vc) + Math.cbrt(cj.Vc)) / 2) ** 3;
  const Zc = ((ci.Pc * ci.Vc) / (R * ci.Tc) + (cj.Pc * cj.Vc) / (R * cj.Tc)) / 2;
  const Pc = (Zc * R * Tc) / Vc;
  const bothPolar = ci.a !== 0 && cj.a !== 0;
  return {
    Tc,
    Pc,
    Vc,
    omega: (ci.omega + cj.omega) / 2,
    a: bothPolar ? (ci.a + cj.a) / 2 : 0,
    b: 0,
  };
}

/**
 * The size-difference binary parameter of Chueh & Prausnitz (1967), as used by Tarakad &
 * Danner (1977): k_ij = 1 - 8 sqrt(Vci Vcj) / (Vci^(1/3) + Vcj^(1/3))^3. Zero for equal
 * critical volumes; 0.0036 for CH4-O2, 0.027 for C3H8-N2.
 */
export function sizeDifferenceKij(ci: CorrelationConstants, cj: CorrelationConstants): number {
  return 1 - (8 * Math.sqrt(ci.Vc * cj.Vc)) / (Math.cbrt(ci.Vc) + Math.cbrt(cj.Vc)) ** 3;
}

/**
 * How the relative uncertainty of the cross-B rule grows at low reduced temperature, where the
 * correlation leaves its range (calibrated with scripts/cross-rule-lib.ts):
 *   factor = max(1, Tcij / (CROSS_RULE_LOW_T.tr T))^CROSS_RULE_LOW_T.power, Tcij = sqrt(Tci Tcj).
 * Example: crossRuleLowTFactor(565.4, 250) -> 3.43 (n-C7H16-C7H8 at 250 K: Tcij = sqrt(540.2 x 591.75 K)
 *   = 565.4 K from the critical temperatures of data/species.ts; (565.4 / (1.5 x 250))^3 = 3.43 by hand).
 */
export const CROSS_RULE_LOW_T = { tr: 1.5, power: 3 } as const;
export function crossRuleLowTFactor(TcijK: number, temperatureK: number): number {
  return Math.max(1, TcijK / (CROSS_RULE_LOW_T.tr * temperatureK)) ** CROSS_RULE_LOW_T.power;
}

/**
 * Extra binary parameter of the cross-B rule, added to the size-difference k_ij for classical
 * pairs: a corresponding-states rule fitted (least squares in relative B, 250-350 K) on the pairs
 * the reference library fits to mixture data, and validated by leaving each pair out
 * (scripts/cross-rule-lib.ts; tests/core/virial-rule.test.ts). CO2, quadrupolar, takes its own
 * addition, as the published k_ij of CO2 with hydrocarbons are larger than those of like pairs
 * (Tsonopoulos 1974 - from memory). Not for quantum gases (He, H2, Ne) or hydrogen-bonding species.
 */
export const CROSS_RULE_KIJ = { general: 0.0099, co2: 0.0575 } as const;

/** whether the fitted rule and its calibrated uncertainty apply to a pair (classical, not hydrogen-bonding) */
export function crossRuleCalibrated(a: SpeciesRecord, b: SpeciesRecord): boolean {
  const hb = (s: SpeciesRecord) =>
    s.polarClass === 'alkanol' || s.polarClass === 'methanol' || s.polarClass === 'water';
  return !a.quantum && !b.quantum && !hb(a) && !hb(b);
}

/** k_ij of the cross-B rule: size difference, plus the fitted additions where the rule is calibrated */
export function crossRuleKij(
  a: SpeciesRecord,
  b: SpeciesRecord,
  ci: CorrelationConstants,
  cj: CorrelationConstants,
): number {
  const size = sizeDifferenceKij(ci, cj);
  if (!crossRuleCalibrated(a, b)) return size;
  return size + CROSS_RULE_KIJ.general + (a.key === 'CO2' || b.key === 'CO2' ? CROSS_RULE_KIJ.co2 : 0);
}
