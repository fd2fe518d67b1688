// The house caution of a gas by what it does (oxidizer, fuel, both), one row under 80 columns: the guided
// fill's screen for each fill and the fill sheet's checks before filling say the same words.
import { getSpecies, oxygenDemand } from '../core/index.js';

/**
 * the house caution of a fill's gas, one row (under 80 columns): an oxidizer (negative oxygen demand) and a
 * fuel (positive) each their own, both for a gas that carries both; none for an inert gas. Common practice
 * (oxygen service: clean, compatible parts, valves opened slowly against adiabatic compression); the
 * lab's procedure and local rules govern.
 */
export function gasCaution(composition: Readonly<Record<string, number>>): string | undefined {
  const demands = Object.entries(composition)
    .filter(([, x]) => x > 0)
    .map(([k]) => oxygenDemand(getSpecies(k).elements));
  const oxidizer = demands.some((d) => d < 0);
  const fuel = demands.some((d) => d > 0);
  // each under 80 columns: "follow your lab's procedure and local rules" said short
  const rules = 'lab procedure, local rules';
  if (oxidizer && fuel) return `! Fuel + oxidizer: no ignition sources, open slowly; ${rules}`;
  if (oxidizer) return `! Oxidizer: oxygen-service parts only, open slowly; ${rules}`;
  if (fuel) return `! Flammable gas: no ignition sources, no leaks; ${rules}`;
  return undefined;
}
