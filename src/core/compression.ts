/**
 * Heating of the gas already in the tank when a fill compresses it. A fast fill
 * compresses the resident gas nearly adiabatically (the incoming gas acts as a
 * piston), from the tank pressure before the fill to the pressure after it:
 *   T2 = T1 (P2 / P1)^((gamma - 1) / gamma),
 * gamma = cp / (cp - R) of the resident gas at T1 from the NASA 7-coefficient fits.
 * Two hazards are judged:
 *  - the end temperature against the autoignition temperature of the fuels present
 *    after the fill (resident or incoming) that matter: at least 1 % of the fuel and
 *    at least 100 ppm of the tank, so a cylinder's trace impurity does not stand in for
 *    the fuel; only where an oxidizer is present after the fill;
 *  - many-fold compression of oxygen-rich gas: above about 200 degC the seats and
 *    seals of valves in oxygen service can ignite (adiabatic compression ignition;
 *    common practice, the threshold is ours and conservative).
 * The relation is an upper bound (walls take heat, mixing is not a piston); throttling
 * the fill is the usual remedy.
 */
import type { Fractions } from './composition.js';
import { FUEL_SAFETY } from './data/safety-data.js';
import { adiabaticCompressionK } from './combustion.js';
import { gammaMixture } from './thermo.js';
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import type { FillEvent, SafetyContext } from './safety.js';
import type { Finding } from './findings.js';

import {
  COMPRESSION_WARNING_MARGIN_K,
  FUEL_FRACTION_THAT_MATTERS,
  FUEL_SHARE_THAT_MATTERS,
  OXYGEN_COMPRESSION_LIMIT_K,
  OXYGEN_ENRICHED_ABOVE as OXYGEN_RICH_ABOVE,
} from './thresholds.js';

// the thresholds of this check live in thresholds.ts (each with its basis)
export {
  COMPRESSION_WARNING_MARGIN_K,
  FUEL_FRACTION_THAT_MATTERS,
  FUEL_SHARE_THAT_MATTERS,
  OXYGEN_COMPRESSION_LIMIT_K,
};

function oxygenEquivalent(y: Fractions): number {
  let o = 0;
  for (const [k, v] of Object.entries(y)) {
    const d = oxygenDemand(getSpecies(k).elements);
    if (d < 0) o += -d * v;
  }
  return o;
}

/**
 * The fuels of a composition that matter for ignition, lowest autoignition temperature first.
 * Example: fuelsThatMatter({ CH4: 0.9, C2H6: 9e-6, N2: 0.099991 }) -> { length: 1, 0.species: 'CH4',
 *   0.aitK: 873.15 K } (the 9 ppm of ethane is a trace; the AIT of CH4, 600 degC, is the NFPA 497 and
 *   IEC 60079-20-1 value).
 */
export function fuelsThatMatter(y: Fractions): { species: string; fraction: number; aitK?: number }[] {
  const fuels = Object.entries(y).filter(([k, v]) => v > 0 && oxygenDemand(getSpecies(k).elements) > 0);
  const total = fuels.reduce((a, [, v]) => a + v, 0);
  return fuels
    .filter(([, v]) => v >= FUEL_SHARE_THAT_MATTERS * total && v >= FUEL_FRACTION_THAT_MATTERS)
    .map(([k, v]) => ({ species: k, fraction: v, aitK: FUEL_SAFETY.get(k)?.ait?.value }))
    .sort((a, b) => (a.aitK ?? Infinity) - (b.aitK ?? Infinity));
}

/**
 * Compression findings of one fill: 0.1 bar O2 compressed to 10 bar by H2 at 298.15 K gives a danger
 * naming H2 and a warning for compressing oxygen-rich gas.
 * Example: reviewCompression({ step: 2, sourceId: 'H2', sourceComposition: { H2: 1 },
 *   before: { step: 1, composition: { O2: 1 }, pressurePa: 1e4, final: false },
 *   after: { step: 2, composition: { O2: 0.01, H2: 0.99 }, pressurePa: 1e6, final: true } },
 *   { temperatureK: 298.15, tankId: 'T' }) -> { 0.severity: 'danger', 0.fuel: 'H2', 0.gamma: 1.395,
 *   0.endK: 1098 K, 0.aitK: 773.15 K, 1.severity: 'warning', 1.code: 'oxygen-compression' }
 *   (gamma of O2 = 29.376 / (29.376 - 8.314) = 1.395 from its ideal-gas cp, CoolProp 8.0.0;
 *   298.15 K x 100^(0.395 / 1.395) = 1098 K by hand; the AIT of H2, 500 degC, is the NFPA 497 value).
 */
export function reviewCompression(e: FillEvent, ctx: SafetyContext): Finding[] {
  const out: Finding[] = [];
  if (!e.before || e.before.pressurePa <= 0 || e.after.pressurePa <= e.before.pressurePa) return out;
  const resident = e.before.composition;
  const gamma = gammaMixture(resident, ctx.temperatureK);
  const endK = adiabaticCompressionK(ctx.temperatureK, e.after.pressurePa / e.before.pressurePa, gamma);
  const step = e.step;
  if (oxygenEquivalent(e.after.composition) > 0) {
    const worst = fuelsThatMatter(e.after.composition).find((f) => f.aitK !== undefined);
    if (worst && endK >= worst.aitK! - COMPRESSION_WARNING_MARGIN_K) {
      out.push({
        severity: endK >= worst.aitK! ? 'danger' : 'warning',
        code: 'compression-heating',
        step,
        fuel: worst.species,
        fromPa: e.before.pressurePa,
        toPa: e.after.pressurePa,
        gamma,
        endK,
        aitK: worst.aitK!,
      });
    }
  }
  const o2 = oxygenEquivalent(resident);
  if (o2 > OXYGEN_RICH_ABOVE && endK >= OXYGEN_COMPRESSION_LIMIT_K) {
    out.push({
      severity: 'warning',
      code: 'oxygen-compression',
      step,
      oxygenFraction: o2,
      fromPa: e.before.pressurePa,
      toPa: e.after.pressurePa,
      gamma,
      endK,
      limitK: OXYGEN_COMPRESSION_LIMIT_K,
    });
  }
  return out;
}
