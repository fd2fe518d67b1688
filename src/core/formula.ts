/** Element bookkeeping of species: molar mass and oxygen demand. */
import { ELEMENTS } from './data/elements.js';

/**
 * Molar mass from IUPAC 2021 conventional atomic weights.
 * @returns kg/mol.
 * Example: molarMassKgPerMol({ C: 1, H: 4 }) -> 0.016043 kg/mol (CH4: 12.011 + 4 x 1.008 g/mol, the IUPAC
 *   conventional atomic weights).
 */
export function molarMassKgPerMol(elements: Readonly<Record<string, number>>): number {
  let g = 0;
  for (const [sym, n] of Object.entries(elements)) {
    const el = ELEMENTS.get(sym);
    if (!el) throw new Error(`no atomic weight for element "${sym}"`);
    g += el.atomicWeight * n;
  }
  return g / 1000; // g/mol -> kg/mol
}

/**
 * Moles of O2 a species needs for complete combustion to CO2, H2O and N2:
 * d = c + h/4 - o/2 for CcHhOoNn. Positive for fuels, negative for species
 * that carry oxygen to spare (O2: -1, N2O: -1/2, NO: -1/2), zero for inerts,
 * CO2 and H2O. This puts oxidizers such as N2O on an O-atom basis.
 * Species with other elements (S, F, ...) and no C, H or O count as zero.
 */
export function oxygenDemand(elements: Readonly<Record<string, number>>): number {
  const c = elements.C ?? 0;
  const h = elements.H ?? 0;
  const o = elements.O ?? 0;
  return c + h / 4 - o / 2;
}
