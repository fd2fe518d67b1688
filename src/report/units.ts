/**
 * Pressure display units: the units a user may choose with --units (and a gauge may be
 * read in), and the conversion from Pa for display. Plain arithmetic with exact factors,
 * no unit library, so every renderer can use it without the parsing shell (src/io).
 * Parsing ("1500 Torr") stays in src/io/quantity.ts, which re-exports these names.
 */
import { TORR_PA } from '../core/index.js';

/** the display units a user may choose with --units */
export const PRESSURE_UNITS = ['Torr', 'kPa', 'bar', 'psi', 'mbar', 'Pa', 'atm'] as const;
export type PressureUnit = (typeof PRESSURE_UNITS)[number];

const PA_PER: Record<PressureUnit, number> = {
  Torr: TORR_PA,
  kPa: 1000,
  bar: 1e5,
  psi: (0.45359237 * 9.80665) / (0.0254 * 0.0254), // lb x g_n / in^2, all exact
  mbar: 100,
  Pa: 1,
  atm: 101325,
};

export function isPressureUnit(u: string): u is PressureUnit {
  return (PRESSURE_UNITS as readonly string[]).includes(u);
}

export function paPerUnit(unit: PressureUnit): number {
  return PA_PER[unit];
}

/** convert Pa to a display unit; plain arithmetic, no mathjs on the hot path */
export function fromPa(pa: number, unit: PressureUnit): number {
  return pa / PA_PER[unit];
}
