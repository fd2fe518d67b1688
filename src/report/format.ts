/** Number and pressure formatting shared by every renderer. */
import { GIVEN_VOLUME_TANK, type Plan } from '../core/index.js';
import { fromPa, type PressureUnit } from './units.js';

/**
 * a fixed number of decimals that keeps about `sig` significant digits, counted on the printed
 * value: 0.99999999 and 1.00000001 both print 1.00000 (the magnitude is the rounded value's)
 */
export function fixedSig(v: number, sig = 6): string {
  if (v === 0 || !Number.isFinite(v)) return String(v);
  const decimalsAt = (mag: number) => Math.min(10, Math.max(0, sig - 1 - mag));
  const mag = Math.floor(Math.log10(Math.abs(v)));
  const rounded = Math.abs(Number(v.toFixed(decimalsAt(mag))));
  const up = rounded > 0 && Math.floor(Math.log10(rounded)) > mag;
  return v.toFixed(decimalsAt(up ? mag + 1 : mag));
}

/** decimals that a display resolution supports: 0.01 -> 2 */
export function decimalsFor(resolution: number): number {
  if (!(resolution > 0)) return 3;
  return Math.max(0, Math.min(8, Math.ceil(-Math.log10(resolution) - 1e-9)));
}

/**
 * A pressure band's ends as printed at a display's decimals, rounded inward (the low end up, the
 * high end down), so that any reading printed inside them lies inside the true band: target
 * 10.01276 Torr +- 0.05 at 2 decimals prints 9.97 - 10.06, never 9.96; an end that
 * falls on a display step is printed one step in. `undefined` where the band
 * is narrower than the display step (no printed reading lies inside it). Shared by the sheet and
 * the fill screens.
 */
export function inwardBand(
  centerPa: number,
  halfWidthPa: number,
  unit: PressureUnit,
  decimals: number,
): { readonly low: string; readonly high: string } | undefined {
  const f = 10 ** decimals;
  // 1e-7 of a step further in: an end that falls on a step (to rounding noise) moves one step in,
  // so the reading judged in Pa can never land a hair outside an end that was printed
  const low = Math.ceil(fromPa(centerPa - halfWidthPa, unit) * f + 1e-7) / f;
  const high = Math.floor(fromPa(centerPa + halfWidthPa, unit) * f - 1e-7) / f;
  if (!(low <= high)) return undefined;
  return { low: low.toFixed(decimals), high: high.toFixed(decimals) };
}

/**
 * a band in words, as the sheet and the fill screen say it: its inward-rounded ends, or, where no two
 * display steps fit in it, its half-width said to be finer than the display step (and the one reading
 * inside it, where there is one: a band "42.54 - 42.54" would read as a band of zero width). `u`
 * follows each number (the fill screen's " psi"; the sheet's columns carry the unit: none)
 */
export function bandWords(
  inward: ReturnType<typeof inwardBand>,
  bandPa: number,
  stepPa: number,
  unit: PressureUnit,
  dec: number,
  u = '',
): string {
  if (inward && inward.low !== inward.high) return `${inward.low} - ${inward.high}${u}`;
  const step = fromPa(stepPa, unit).toFixed(dec);
  const finer = `+-${fixedSig(fromPa(bandPa, unit), 2)}${u}: finer than the display step ${step}${u}`;
  return inward ? `${finer}; only ${inward.low}${u} reads inside it` : finer;
}

/**
 * where no value the gauge displays lies inside a fill's band (inwardBand gives none): the sentence the
 * fill screen says before the reading and the sheet under the fill, with the nearest displayed value
 * and on which side of the band it reads (never a stop the gauge cannot show as inside); undefined
 * where a displayed value lies inside. `shared`: the sheet's shared band (band-edges-past-tolerance),
 * which the log does not judge a reading by: said so, with the guided fill as the other way
 */
export function noneInsideWords(
  gaugeId: string,
  centerPa: number,
  bandPa: number,
  unit: PressureUnit,
  dec: number,
  shared = false,
): string | undefined {
  if (inwardBand(centerPa, bandPa, unit, dec)) return undefined;
  const f = 10 ** dec;
  const center = fromPa(centerPa, unit);
  const near = Math.round(center * f) / f;
  const side = `reads ${near < center ? 'BELOW' : 'ABOVE'} it`;
  return (
    `NO value ${gaugeId} shows is inside the ${shared ? 'shared ' : ''}band: the nearest, ` +
    `${near.toFixed(dec)} ${unit}, ` +
    (shared
      ? `${side}. Use a finer gauge, or fill with \`mixwright fill\``
      : `${side} and is logged outside it. Use a finer gauge if you can`)
  );
}

export function pressure(pa: number, unit: PressureUnit, sig = 6): string {
  return `${fixedSig(fromPa(pa, unit), sig)} ${unit}`;
}

export function signed(v: string): string {
  return v.startsWith('-') ? v : `+${v}`;
}

export function padTable(rows: readonly (readonly string[])[], rightAlign: readonly boolean[]): string[] {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) =>
    r
      .map((cell, c) => (rightAlign[c] ? cell.padStart(widths[c]) : cell.padEnd(widths[c])))
      .join('  ')
      .trimEnd(),
  );
}

/** a tank as a lab member reads its name: a tank known only by its volume is said to be so */
export function tankName(id: string): string {
  return id === GIVEN_VOLUME_TANK ? 'unnamed tank (volume given)' : id;
}

/** "rated 3000 Torr, working limit 2700 Torr" (plan and sheet alike), or "rating not known" */
export function tankRating(plan: Pick<Plan, 'tank'>, P: (pa: number, sig?: number) => string): string {
  const t = plan.tank;
  const limit =
    t.ratedPressurePa !== undefined && t.workingFraction && t.workingFraction < 1
      ? `, working limit ${P(t.ratedPressurePa * t.workingFraction, 4)}`
      : '';
  return t.ratedPressurePa === undefined ? 'rating not known' : `rated ${P(t.ratedPressurePa, 4)}${limit}`;
}

/**
 * a mixture's title: its gases, phi and dilution, pressure and tank ("CH4/O2 phi 1 in 98 % Ar, 1500 Torr
 * in MT-1"), or its fractions where it has no phi; the sheet's title of a design given by options and
 * the certificate's of a batch, from the batch's own values
 */
export function mixtureTitle(
  d: {
    readonly composition: Readonly<Record<string, number>>;
    readonly phi?: number;
    readonly diluentFraction: number;
    readonly groups: {
      readonly fuel: Readonly<Record<string, number>>;
      readonly oxidizer: Readonly<Record<string, number>>;
      readonly diluent: Readonly<Record<string, number>>;
    };
  },
  pressurePa: number,
  tank: string,
  unit: PressureUnit,
): string {
  const names = (g: Readonly<Record<string, number>>) => Object.keys(g).join('+');
  const num = (v: number) => String(Number(v.toPrecision(3)));
  const at = `${pressure(pressurePa, unit, 4)} in ${tank}`;
  if (d.phi !== undefined && Object.keys(d.groups.fuel).length && Object.keys(d.groups.oxidizer).length) {
    const dil = Object.keys(d.groups.diluent).length
      ? ` in ${num(d.diluentFraction * 100)} % ${names(d.groups.diluent)}`
      : '';
    return `${names(d.groups.fuel)}/${names(d.groups.oxidizer)} phi ${num(d.phi)}${dil}, ${at}`;
  }
  const parts = Object.entries(d.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => `${k} ${num(v * 100)} %`);
  return `${parts.join(', ')}, ${at}`;
}
