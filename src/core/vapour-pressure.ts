/**
 * Saturation pressure of condensable species, with the method that gave it.
 * Order of preference: water by the IAPWS equation; Antoine inside its range;
 * Wagner (valid up to Tc); Antoine up to 10 K outside its range (flagged as
 * extrapolated); else the Lee-Kesler corresponding-states correlation (flagged).
 * Above Tc a species cannot condense and undefined is returned.
 */
import { ANTOINE, IAPWS_WATER, WAGNER } from './data/vapour-data.js';
import { getSpecies } from './lookup.js';
import { PSAT_EXTRAPOLATION_K } from './thresholds.js';

export type PsatMethod = 'iapws' | 'antoine' | 'antoine-extrapolated' | 'wagner' | 'lee-kesler';

export interface Psat {
  readonly pressurePa: number;
  readonly method: PsatMethod;
  readonly source: string;
}

/**
 * IAPWS saturation pressure of water (Wagner & Pruss 1993):
 *   ln(P/Pc) = (Tc/T)(a1 t + a2 t^1.5 + a3 t^3 + a4 t^3.5 + a5 t^4 + a6 t^7.5), t = 1 - T/Tc.
 * Valid 273.16 K to Tc.
 * Example: waterPsatPa(298.15) -> 3169.8 Pa (25 degC; IAPWS, Wagner & Pruss: 3169.8 Pa, properties.md 6.2;
 *   IAPWS-95 through CoolProp 8.0.0: 3169.93 Pa).
 */
export function waterPsatPa(temperatureK: number): number {
  const { a, TcK, PcPa } = IAPWS_WATER;
  const t = 1 - temperatureK / TcK;
  const s = a[0] * t + a[1] * t ** 1.5 + a[2] * t ** 3 + a[3] * t ** 3.5 + a[4] * t ** 4 + a[5] * t ** 7.5;
  return PcPa * Math.exp((TcK / temperatureK) * s);
}

/**
 * Antoine, log10(P/Pa) = A - B/(T + C).
 * Example: antoinePa(9.02023, 1263.909, -56.718, 298.15) -> 6.10 kPa (n-heptane with the constants of
 *   data/vapour-data.ts, Poling et al. 2001; its reference EOS, CoolProp 8.0.0: 6.09 kPa).
 */
export function antoinePa(A: number, B: number, C: number, temperatureK: number): number {
  return 10 ** (A - B / (temperatureK + C));
}

/** Wagner, ln(P/Pc) = (a tau + b tau^1.5 + c tau^2.5 + d tau^5)/Tr. */
export function wagnerPa(
  w: { a: number; b: number; c: number; d: number; TcK: number; PcPa: number },
  temperatureK: number,
): number {
  const tr = temperatureK / w.TcK;
  const tau = 1 - tr;
  return w.PcPa * Math.exp((w.a * tau + w.b * tau ** 1.5 + w.c * tau ** 2.5 + w.d * tau ** 5) / tr);
}

/**
 * Lee-Kesler (1975): ln Pr = f0 + omega f1,
 *   f0 = 5.92714 - 6.09648/Tr - 1.28862 ln Tr + 0.169347 Tr^6
 *   f1 = 15.2518 - 15.6875/Tr - 13.4721 ln Tr + 0.43577 Tr^6.
 * A few % for non-polar species; worse for polar ones.
 */
export function leeKeslerPa(TcK: number, PcPa: number, omega: number, temperatureK: number): number {
  const tr = temperatureK / TcK;
  const lt = Math.log(tr);
  const f0 = 5.92714 - 6.09648 / tr - 1.28862 * lt + 0.169347 * tr ** 6;
  const f1 = 15.2518 - 15.6875 / tr - 13.4721 * lt + 0.43577 * tr ** 6;
  return PcPa * Math.exp(f0 + omega * f1);
}

export function saturationPressure(key: string, temperatureK: number): Psat | undefined {
  const sp = getSpecies(key);
  if (temperatureK >= sp.Tc) return undefined;
  if (sp.key === 'H2O' && temperatureK >= 273.16) {
    return { pressurePa: waterPsatPa(temperatureK), method: 'iapws', source: IAPWS_WATER.source };
  }
  const a = ANTOINE.get(sp.key);
  if (a && temperatureK >= a.TminK && temperatureK <= a.TmaxK) {
    return { pressurePa: antoinePa(a.A, a.B, a.C, temperatureK), method: 'antoine', source: a.source };
  }
  const w = WAGNER.get(sp.key);
  if (w && temperatureK < w.TcK)
    return { pressurePa: wagnerPa(w, temperatureK), method: 'wagner', source: w.source };
  if (a && temperatureK >= a.TminK - PSAT_EXTRAPOLATION_K && temperatureK <= a.TmaxK + PSAT_EXTRAPOLATION_K) {
    return {
      pressurePa: antoinePa(a.A, a.B, a.C, temperatureK),
      method: 'antoine-extrapolated',
      source: a.source,
    };
  }
  return {
    pressurePa: leeKeslerPa(sp.Tc, sp.Pc, sp.omega, temperatureK),
    method: 'lee-kesler',
    source: 'lee-kesler-1975',
  };
}
