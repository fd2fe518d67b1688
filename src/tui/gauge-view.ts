/**
 * How a fill's pressures show on its gauge: the unit, the reading the gauge displays for an absolute tank
 * pressure, and whether any value it displays lies inside the fill's band (the fill, below-band and review
 * screens say it with the same words). Pure.
 */
import { gaugeReadingPa } from '../core/index.js';
import { fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import { decimalsFor, noneInsideWords } from '../report/format.js';
import type { FillState, FillStep } from './fill-state.js';

/** the unit a fill is read in: its gauge's, Torr without one */
export function gaugeUnit(step: FillStep): PressureUnit {
  return step.gauge && isPressureUnit(step.gauge.unit) ? step.gauge.unit : 'Torr';
}

/** what the operator should read on the gauge for an absolute tank pressure */
export function shownPa(s: FillState, step: FillStep, absolutePa: number): number {
  const ctx = { barometricPa: s.barometerPa, barometricUncertaintyPa: s.setup.header.barometer.u_Pa };
  return step.gauge ? gaugeReadingPa(step.gauge, absolutePa, ctx) : absolutePa;
}

/**
 * where no value the fill's gauge displays lies inside its band around the absolute pressure `targetPa`: the
 * words that say so (the nearest displayed value and on which side of the band it reads); undefined where
 * one does or the fill has no gauge
 */
export function noneInsideOnGauge(s: FillState, step: FillStep, targetPa: number): string | undefined {
  if (!step.gauge) return undefined;
  const unit = gaugeUnit(step);
  const dec = decimalsFor(fromPa(step.gauge.resolutionPa, unit));
  return noneInsideWords(step.gauge.id, shownPa(s, step, targetPa), step.bandPa, unit, dec);
}
