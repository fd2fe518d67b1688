// The house caution of a gas by what it does (oxidizer, fuel, both), one row under 80 columns: the guided
// fill's screen for each fill and the fill sheet's checks before filling say the same words.
import { getSpecies, oxygenDemand } from '../core/index.js';

/**
 * what a fill's gas does and the house advice for it: an oxidizer (negative oxygen demand) and a fuel
 * (positive) each their own, both for a gas that carries both; none for an inert gas. Common practice
 * (oxygen service: clean, compatible parts, valves opened slowly against adiabatic compression); the
 * lab's procedure and local rules govern.
 */
export function gasHazard(
  composition: Readonly<Record<string, number>>,
): { readonly kind: string; readonly advice: string } | undefined {
  const demands = Object.entries(composition)
    .filter(([, x]) => x > 0)
    .map(([k]) => oxygenDemand(getSpecies(k).elements));
  const oxidizer = demands.some((d) => d < 0);
  const fuel = demands.some((d) => d > 0);
  if (oxidizer && fuel) return { kind: 'Fuel + oxidizer', advice: 'no ignition sources, open slowly' };
  if (oxidizer) return { kind: 'Oxidizer', advice: 'oxygen-service parts only, open slowly' };
  if (fuel) return { kind: 'Flammable gas', advice: 'no ignition sources, no leaks' };
  return undefined;
}

/** the house caution of a fill's gas (gasHazard), one row under 80 columns, as the fill screen shows it */
export function gasCaution(composition: Readonly<Record<string, number>>): string | undefined {
  const h = gasHazard(composition);
  // "follow your lab's procedure and local rules" said short
  return h && `! ${h.kind}: ${h.advice}; lab procedure, local rules`;
}
