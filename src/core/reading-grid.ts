/**
 * What a gauge can show: its readings are whole multiples of its display resolution (above ambient
 * for a gauge-referenced sensor). A stop reading the tool chooses itself is put on that grid so that
 * a person can read it, rounded up: a chosen stop is the lowest one a rule accepts, and a higher
 * diluent stop before the oxidizer is the safe side.
 */

/** the display grid of a reading: shown = absolute - offsetPa, in steps of resolutionPa */
export interface ReadingGrid {
  /** display resolution, Pa (0: no grid) */
  readonly resolutionPa: number;
  /** what the gauge subtracts from the absolute pressure: 0 absolute, the barometer gauge-referenced */
  readonly offsetPa: number;
  /** the highest absolute pressure the gauge reads, Pa (its full scale plus offsetPa); undefined: not limited */
  readonly topPa?: number;
}

/** relative slack against floating-point noise: a value already on the grid stays where it is */
const ON_GRID = 1e-6;

/**
 * The lowest reading on the grid at or above an absolute pressure, Pa absolute.
 * Example: roundUpToGrid(461.0703 * 101325 / 760, { resolutionPa: 0.01 * 101325 / 760, offsetPa: 0 }) -> 461.08 Torr
 *   (a 0.01 Torr display shows 461.07 or 461.08; rounded up: common practice, our rule for stops)
 */
export function roundUpToGrid(absolutePa: number, grid: ReadingGrid): number {
  if (!(grid.resolutionPa > 0)) return absolutePa;
  const steps = (absolutePa - grid.offsetPa) / grid.resolutionPa;
  return grid.offsetPa + Math.ceil(steps - ON_GRID) * grid.resolutionPa;
}
