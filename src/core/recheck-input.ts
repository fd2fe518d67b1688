/**
 * The re-check's model input, built the same way for a logged batch (`check`) and for a
 * plan before any valve opens (the predicted uncertainty): the readings with their source
 * and gauge, the barometer and thermometer, the diluent group and a top-up's starting gas.
 * Pure: the shells read the files, this module checks that the records fit together.
 */
import type { GasSource } from './supply.js';
import type { Gauge } from './gauges.js';
import type { CheckedReading, InTank, UncertaintySettings } from './uncertainty.js';
import { fail } from './problems.js';

/** one reading as a record names it: its source and gauge by id */
export interface RecheckRecord {
  readonly step: number;
  readonly sourceId: string;
  readonly gaugeId: string;
  /** absolute pressure after the fill, Pa */
  readonly pressurePa: number;
  readonly temperatureK: number;
  /** line of the record in its file, for messages */
  readonly line?: number;
}

/** what the readings are re-checked with: the sources and gauges by id, the instruments, the design's diluent */
export interface RecheckBasis {
  readonly sources: ReadonlyMap<string, GasSource>;
  readonly gauges: ReadonlyMap<string, Gauge>;
  readonly barometer: { readonly pressurePa: number; readonly uPa: number };
  readonly thermometer: {
    readonly uK: number;
    readonly resolutionK: number;
    /** rectangular half-width of the gas-thermometer difference after settling, K (0 or undefined: none) */
    readonly settlingK?: number;
  };
  /** species counted in the diluent fraction */
  readonly diluent: readonly string[];
  /** a top-up: the gas in the tank before the first fill */
  readonly start?: InTank;
}

export interface RecheckModelInput {
  readonly readings: readonly CheckedReading[];
  readonly settings: UncertaintySettings;
  readonly diluent: readonly string[];
  readonly initial?: InTank;
}

/** the tank temperatures a reading may carry (the model's range), K */
export const READING_TEMPERATURE_RANGE_K = { min: 200, max: 600 } as const;

/**
 * Records and basis -> the uncertainty model's input. Refuses a record that names a source
 * or gauge the basis does not hold, a reading that is not above the one before it (or the
 * top-up's start), and a temperature outside 200-600 K; each refusal carries the record's line.
 */
export function recheckModelInput(
  basis: RecheckBasis,
  records: readonly RecheckRecord[],
  mc: { readonly trials: number; readonly seed: number },
): RecheckModelInput {
  const start = basis.start;
  let prev = start?.pressurePa ?? 0;
  const readings = records.map((r): CheckedReading => {
    const where = { line: r.line };
    const source = basis.sources.get(r.sourceId);
    if (!source) fail({ code: 'record-unknown-id', kind: 'source', id: r.sourceId, step: r.step }, where);
    const gauge = basis.gauges.get(r.gaugeId);
    if (!gauge) fail({ code: 'record-unknown-id', kind: 'gauge', id: r.gaugeId, step: r.step }, where);
    if (!(r.pressurePa > prev))
      fail(
        {
          code: 'reading-not-rising',
          step: r.step,
          pressurePa: r.pressurePa,
          previousPa: prev,
          afterStart: start !== undefined && prev === start.pressurePa,
        },
        where,
      );
    const { min, max } = READING_TEMPERATURE_RANGE_K;
    if (!(r.temperatureK >= min && r.temperatureK <= max))
      fail(
        { code: 'out-of-range', what: 'tank temperature', value: r.temperatureK, allowed: `${min}-${max} K` },
        where,
      );
    prev = r.pressurePa;
    return { step: r.step, source, pressurePa: r.pressurePa, temperatureK: r.temperatureK, gauge };
  });
  return {
    readings,
    settings: {
      barometricPa: basis.barometer.pressurePa,
      barometricUncertaintyPa: basis.barometer.uPa,
      thermometerUncertaintyK: basis.thermometer.uK,
      thermometerResolutionK: basis.thermometer.resolutionK,
      temperatureSettlingK: basis.thermometer.settlingK,
      trials: mc.trials,
      seed: mc.seed,
    },
    diluent: basis.diluent,
    initial: start,
  };
}
