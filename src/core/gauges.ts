/**
 * Pressure gauges: the uncertainty of a reading and the choice of gauge for it.
 *
 * Gauge model: the maker's accuracy statement +-(r % of reading + f % of full
 * scale) is read as the half-width of a rectangular distribution (GUM, JCGM
 * 100:2008, 4.3.7: u = a/sqrt(3)); the display resolution d adds u = d/sqrt(12)
 * (GUM F.2.2.1). A gauge-referenced sensor reads P - P_baro, so its absolute
 * value also carries the barometer's standard uncertainty.
 */

export type GaugeReference = 'absolute' | 'gauge';

export interface Gauge {
  readonly id: string;
  readonly label: string;
  readonly reference: GaugeReference;
  /** full-scale reading, Pa (for a gauge-referenced sensor: above ambient) */
  readonly fullScalePa: number;
  /** lowest reading it shows, Pa (0 for absolute heads; may be negative for compound gauges) */
  readonly minimumPa: number;
  /** accuracy, fraction of reading (0.0012 for 0.12 %) */
  readonly accuracyOfReading: number;
  /** accuracy, fraction of full scale */
  readonly accuracyOfFullScale: number;
  /** display resolution, Pa */
  readonly resolutionPa: number;
  /** display unit of the readout, e.g. "Torr", "psi" */
  readonly unit: string;
  /** pressure it survives without damage, Pa absolute (default: its full scale) */
  readonly overpressurePa?: number;
}

export interface ReadingContext {
  /** barometric pressure, Pa */
  readonly barometricPa: number;
  /** standard uncertainty of the barometric pressure, Pa */
  readonly barometricUncertaintyPa: number;
}

/** What the gauge shows for an absolute tank pressure, Pa. */
export function gaugeReadingPa(g: Gauge, absolutePa: number, ctx: ReadingContext): number {
  return g.reference === 'absolute' ? absolutePa : absolutePa - ctx.barometricPa;
}

/** Highest absolute tank pressure the gauge can show, Pa. */
export function gaugeTopAbsolutePa(g: Gauge, ctx: ReadingContext): number {
  return g.reference === 'absolute' ? g.fullScalePa : g.fullScalePa + ctx.barometricPa;
}

/**
 * Standard uncertainty of the absolute pressure inferred from one reading, Pa.
 * Example: readingUncertaintyPa({ id: 'h', label: 'h', reference: 'absolute', fullScalePa: 1000 * 101325 / 760,
 *   minimumPa: 0, accuracyOfReading: 0.0012, accuracyOfFullScale: 0, resolutionPa: 0.01 * 101325 / 760,
 *   unit: 'Torr' }, 150 * 101325 / 760, { barometricPa: 101325, barometricUncertaintyPa: 10 }) -> 0.1040 Torr
 *   (a 1000 Torr absolute head at 0.12 % of reading, resolution 0.01 Torr, reading 150 Torr; GUM 4.3.7 and
 *   F.2.2.1: sqrt((0.18/sqrt 3)^2 + (0.01/sqrt 12)^2) = 0.1040 Torr by hand).
 */
export function readingUncertaintyPa(g: Gauge, absolutePa: number, ctx: ReadingContext): number {
  const reading = gaugeReadingPa(g, absolutePa, ctx);
  const halfWidth = g.accuracyOfReading * Math.abs(reading) + g.accuracyOfFullScale * g.fullScalePa;
  const uSpec = halfWidth / Math.sqrt(3);
  const uRes = g.resolutionPa / Math.sqrt(12);
  const uBaro = g.reference === 'gauge' ? ctx.barometricUncertaintyPa : 0;
  return Math.sqrt(uSpec * uSpec + uRes * uRes + uBaro * uBaro);
}

export function canRead(g: Gauge, absolutePa: number, ctx: ReadingContext): boolean {
  const r = gaugeReadingPa(g, absolutePa, ctx);
  return r <= g.fullScalePa && r >= g.minimumPa;
}

/**
 * The gauge for a reading: among those whose range covers it (up to the upper edge
 * of the tolerance band), the one with the smallest standard uncertainty.
 * @returns undefined when no gauge covers the reading.
 */
export function chooseGauge(
  gauges: readonly Gauge[],
  absolutePa: number,
  upperPa: number,
  ctx: ReadingContext,
): { gauge: Gauge; uncertaintyPa: number } | undefined {
  let best: { gauge: Gauge; uncertaintyPa: number } | undefined;
  for (const g of gauges) {
    if (!canRead(g, absolutePa, ctx) || !canRead(g, upperPa, ctx)) continue;
    const u = readingUncertaintyPa(g, absolutePa, ctx);
    if (!best || u < best.uncertaintyPa) best = { gauge: g, uncertaintyPa: u };
  }
  return best;
}
