/**
 * Quantities at the edge: "1500 Torr", "22 degC", "30 L" parsed with mathjs
 * units into SI numbers. Torr and psi are redefined exactly on our own mathjs
 * instance (mathjs' torr is the rounded mmHg, 133.322 Pa; its psi is off by 6e-11).
 */
import type { Unit } from 'mathjs';
import { fail, type Where } from '../core/index.js';
import { createMath, type MathJs } from './mathjs-instance.js';
import { TORR_PA } from '../core/index.js';

let instance: MathJs | undefined;

/** whether the mathjs instance has been built (start-up guard in the tests) */
export function mathjsBuilt(): boolean {
  return instance !== undefined;
}

/** our own mathjs instance, built on first use (building it costs ~0.1 s of start-up) */
export function mathjs(): MathJs {
  instance ??= createMath();
  return instance;
}

/**
 * The units labs type most, with their exact SI factors (offset for temperatures),
 * read without building mathjs; anything else goes to mathjs. A test checks every
 * entry against mathjs on our instance.
 */
const PSI = (0.45359237 * 9.80665) / (0.0254 * 0.0254);
export const FAST_UNITS: Readonly<Record<string, { dim: Dimension; factor: number; offset?: number }>> = {
  Pa: { dim: 'pressure', factor: 1 },
  hPa: { dim: 'pressure', factor: 100 },
  kPa: { dim: 'pressure', factor: 1e3 },
  MPa: { dim: 'pressure', factor: 1e6 },
  bar: { dim: 'pressure', factor: 1e5 },
  mbar: { dim: 'pressure', factor: 100 },
  atm: { dim: 'pressure', factor: 101325 },
  Torr: { dim: 'pressure', factor: TORR_PA },
  torr: { dim: 'pressure', factor: TORR_PA },
  mTorr: { dim: 'pressure', factor: TORR_PA / 1000 },
  psi: { dim: 'pressure', factor: PSI },
  K: { dim: 'temperature', factor: 1 },
  degC: { dim: 'temperature', factor: 1, offset: 273.15 },
  degF: { dim: 'temperature', factor: 5 / 9, offset: 459.67 },
  L: { dim: 'volume', factor: 1e-3 },
  l: { dim: 'volume', factor: 1e-3 },
  mL: { dim: 'volume', factor: 1e-6 },
  'm^3': { dim: 'volume', factor: 1 },
  'cm^3': { dim: 'volume', factor: 1e-6 },
  'Pa/s': { dim: 'pressure rate', factor: 1 },
  'Pa/min': { dim: 'pressure rate', factor: 1 / 60 },
  'Torr/s': { dim: 'pressure rate', factor: TORR_PA },
  'Torr/min': { dim: 'pressure rate', factor: TORR_PA / 60 },
  'Torr/h': { dim: 'pressure rate', factor: TORR_PA / 3600 },
  'mbar/min': { dim: 'pressure rate', factor: 100 / 60 },
  'mTorr/min': { dim: 'pressure rate', factor: TORR_PA / 1000 / 60 },
  s: { dim: 'time', factor: 1 },
  min: { dim: 'time', factor: 60 },
  h: { dim: 'time', factor: 3600 },
  m: { dim: 'length', factor: 1 },
  cm: { dim: 'length', factor: 0.01 },
  mm: { dim: 'length', factor: 0.001 },
  kg: { dim: 'mass', factor: 1 },
  g: { dim: 'mass', factor: 1e-3 },
};

export type Dimension = 'pressure' | 'volume' | 'temperature' | 'pressure rate' | 'time' | 'mass' | 'length';

const SI: Record<Dimension, string> = {
  pressure: 'Pa',
  volume: 'm^3',
  temperature: 'K',
  'pressure rate': 'Pa/s',
  time: 's',
  mass: 'kg',
  length: 'm',
};

const PROBES: readonly Dimension[] = [
  'pressure',
  'volume',
  'temperature',
  'pressure rate',
  'time',
  'mass',
  'length',
];

function dimensionOf(u: Unit): string {
  const math = mathjs();
  for (const d of PROBES) if (u.equalBase(math.unit(SI[d]))) return d;
  return `quantity in ${u.formatUnits() || 'no unit'}`;
}

/**
 * Other spellings people type, read as a fast-path unit: the degree sign, and the
 * explicit absolute suffixes ("psia", "bara", "bar(a)").
 */
const SPELLINGS: Readonly<Record<string, string>> = {
  '°C': 'degC',
  '℃': 'degC',
  '°F': 'degF',
  '℉': 'degF',
  '°K': 'K',
  psia: 'psi',
  'psi(a)': 'psi',
  bara: 'bar',
  'bar(a)': 'bar',
  mbara: 'mbar',
  'mbar(a)': 'mbar',
  kPaa: 'kPa',
  'kPa(a)': 'kPa',
};

/** whether a quantity is written with an explicit absolute unit ("29.7 psia", "2 bar(a)") */
export function isAbsoluteSpelling(text: string): boolean {
  const m = /[A-Za-z()]+$/.exec(text.trim());
  return m !== null && Object.prototype.hasOwnProperty.call(SPELLINGS, m[0]) && /a\)?$/.test(m[0]);
}

/** whether a quantity is written with a gauge unit ("15 psig", "1.2 bar(g)") */
export function isGaugeSpelling(text: string): boolean {
  const m = /[A-Za-z()]+$/.exec(text.trim());
  return m !== null && Object.prototype.hasOwnProperty.call(GAUGE_UNITS, m[0]);
}

/** gauge pressures (above the ambient pressure): the unit they are read in */
export const GAUGE_UNITS: Readonly<Record<string, string>> = {
  psig: 'psi',
  'psi(g)': 'psi',
  barg: 'bar',
  'bar(g)': 'bar',
  mbarg: 'mbar',
  'mbar(g)': 'mbar',
  kPag: 'kPa',
  'kPa(g)': 'kPa',
};

/** bare letters that unit libraries read as something else than the lab meant */
const MISREAD: Readonly<Record<string, { meant: string; library: string }>> = {
  C: { meant: 'degC', library: 'the coulomb, a unit of charge' },
  F: { meant: 'degF', library: 'the farad, a unit of capacitance' },
  c: { meant: 'degC', library: 'not a unit' },
  f: { meant: 'degF', library: 'not a unit' },
};

/**
 * The physical window of each dimension, SI: a non-zero magnitude below `min` or above
 * `max` is refused as a typing error rather than carried into the model (a denormal
 * pressure or 1e999 Torr would otherwise surface as NaN or a hang far from the input).
 * The limits are far outside any mixing lab (common practice, not a standard).
 */
export const PHYSICAL_RANGE: Readonly<Record<Dimension, { min: number; max: number; text: string }>> = {
  pressure: { min: 1e-12, max: 1e10, text: 'from 1e-12 Pa to 1e10 Pa (1e-14 Torr to 100000 bar)' },
  temperature: { min: 1, max: 1e5, text: 'from 1 K to 100000 K (absolute zero, 0 K, is -273.15 degC)' },
  volume: { min: 1e-12, max: 1e6, text: 'from 1e-12 m^3 (1 nL) to 1e6 m^3' },
  'pressure rate': { min: 1e-15, max: 1e10, text: 'from 1e-15 Pa/s to 1e10 Pa/s' },
  time: { min: 1e-9, max: 1e10, text: 'from 1 ns to 1e10 s' },
  mass: { min: 1e-15, max: 1e6, text: 'from 1e-15 kg to 1e6 kg' },
  length: { min: 1e-9, max: 1e6, text: 'from 1 nm to 1000 km' },
};

/**
 * The volumes a mixing tank, a reactor or its line can have: a positive volume outside this window
 * is refused as a slip of unit or exponent ("1e9 L"), not planned (our limit: lab mixing tanks and
 * reactors hold from a few mL to a few m^3; common practice, not a standard).
 */
export const PLAUSIBLE_VOLUME_M3 = {
  min: 1e-6,
  max: 10,
  text:
    '1 mL to 10 m^3 (10000 L), the sizes of lab mixing tanks and reactors (our limit, so that ' +
    'a slip of unit or exponent is caught); check the number and the unit',
} as const;

/** refuse a positive volume outside PLAUSIBLE_VOLUME_M3 (zero or less is the core's to refuse) */
export function checkPlausibleVolume(volumeM3: number, what: string, text: string, where: Where): number {
  const r = PLAUSIBLE_VOLUME_M3;
  if (volumeM3 > 0 && (volumeM3 < r.min || volumeM3 > r.max))
    fail({ code: 'out-of-range', what, value: volumeM3, text, allowed: r.text }, where);
  return volumeM3;
}

export interface QuantityContext {
  /**
   * barometric pressure, Pa, for converting gauge pressures ("15 psig") to absolute;
   * undefined when none was given, and a gauge pressure is then refused
   */
  readonly barometricPa?: number;
  /** whose barometric pressure that is, as the statement of a conversion names it ("the lab profile's") */
  readonly barometerFrom?: string;
  /** every gauge pressure converted is recorded here, so the caller states what was assumed */
  readonly conversions?: GaugeConversion[];
}

/** a gauge pressure ("15 psig") made absolute with a barometric pressure: what the output states */
export interface GaugeConversion {
  /** as typed */
  readonly text: string;
  /** the field or option it was typed in */
  readonly field?: string;
  readonly absolutePa: number;
  readonly barometricPa: number;
  /** whose barometer ("the lab profile's", "--barometer", "today's, logged by AB") */
  readonly barometerFrom: string;
}

/** "15 psig (pressure) read as 1535.7 Torr absolute with the lab profile's barometer 760.0 Torr" */
export function gaugeConversionWords(c: GaugeConversion): string {
  const torr = (pa: number) => `${(pa / TORR_PA).toFixed(1)} Torr`;
  const from = c.barometerFrom.startsWith('--')
    ? `the barometer of ${c.barometerFrom}`
    : `${c.barometerFrom} barometer`;
  return (
    `${c.text}${c.field ? ` (${c.field})` : ''} read as ${torr(c.absolutePa)} absolute with ` +
    `${from} ${torr(c.barometricPa)}`
  );
}

/** what a temperature below the physical window is */
function coldText(k: number): string {
  return k === 0 ? 'absolute zero' : k < 0 ? 'below absolute zero' : 'colder than any gas in a lab';
}

function checkRange(v: number, s: string, expected: Dimension, where: Where): number {
  const r = PHYSICAL_RANGE[expected];
  if (!Number.isFinite(v))
    return fail(
      {
        code: 'bad-quantity',
        text: s,
        expected,
        fault: { kind: 'unrepresentable', range: r.text },
      },
      where,
    );
  if (expected === 'temperature') {
    if (!(v >= r.min))
      return fail(
        {
          code: 'out-of-range',
          what: `temperature`,
          value: v,
          text: s,
          allowed: `${r.text}; ${s} is ${coldText(v)}`,
        },
        where,
      );
  } else if (v !== 0 && Math.abs(v) < r.min) {
    return fail(
      {
        code: 'out-of-range',
        what: expected,
        value: v,
        text: s,
        allowed: `${r.text}; this is too small to be measured, check the exponent and the unit`,
      },
      where,
    );
  }
  if (Math.abs(v) > r.max)
    return fail(
      {
        code: 'out-of-range',
        what: expected,
        value: v,
        text: s,
        allowed: `${r.text}; check the exponent and the unit`,
      },
      where,
    );
  return v;
}

const own = (o: object, k: string) => Object.prototype.hasOwnProperty.call(o, k);

/** "22 deg C": two words to a unit library (deg times coulomb); refused, saying what to write instead */
function spacedDegrees(s: string, where: Where): void {
  const m = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*deg\s+([CF])$/i.exec(s);
  if (!m) return;
  const fault = {
    kind: 'ambiguous-unit',
    unit: `deg ${m[2]}`,
    means: 'two words, not a unit',
    meant: `deg${m[2].toUpperCase()}`,
    number: m[1],
  } as const;
  fail({ code: 'bad-quantity', text: s, expected: 'temperature', fault }, where);
}

/**
 * Parse "<number> <unit>" into the SI value of the expected dimension.
 * A bare number is refused: a pressure without a unit is the classic wrong-target error.
 * Gauge pressures ("15 psig", "1.2 barg", "2 bar(g)") are converted to absolute with
 * ctx.barometricPa and refused when it is not given; "psia", "bara" are absolute.
 * Temperatures take K, degC, degF, °C and °F; a bare "C" (the coulomb to a unit
 * library) is refused with a hint. Every value is checked against PHYSICAL_RANGE.
 */
export function parseQuantity(
  text: string | number,
  expected: Dimension,
  where: Where = {},
  ctx: QuantityContext = {},
): number {
  if (typeof text === 'number') {
    return fail(
      { code: 'bad-quantity', text: String(text), expected, fault: { kind: 'unit-missing' } },
      where,
    );
  }
  const s = text.trim();
  if (s.length > 200)
    return fail(
      {
        code: 'bad-quantity',
        text: `${s.slice(0, 40)}...`,
        expected,
        fault: { kind: 'too-long', length: s.length },
      },
      where,
    );
  if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s)) {
    return fail({ code: 'bad-quantity', text: s, expected, fault: { kind: 'unit-missing' } }, where);
  }
  const typed =
    /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([\u00B0\u2103\u2109]?[A-Za-z]*(?:\([ag]\))?)$/.exec(s);
  if (typed && own(MISREAD, typed[2]) && expected === 'temperature') {
    const m = MISREAD[typed[2]];
    return fail(
      {
        code: 'bad-quantity',
        text: s,
        expected,
        fault: { kind: 'ambiguous-unit', unit: typed[2], means: m.library, meant: m.meant, number: typed[1] },
      },
      where,
    );
  }
  if (expected === 'temperature') spacedDegrees(s, where);
  if (typed && own(GAUGE_UNITS, typed[2])) {
    const unit = GAUGE_UNITS[typed[2]];
    if (expected !== 'pressure')
      return fail({ code: 'wrong-dimension', text: s, expected, got: 'pressure' }, where);
    const above = Number(typed[1]) * FAST_UNITS[unit].factor;
    if (ctx.barometricPa === undefined)
      return fail({ code: 'needs-barometer', text: s, field: where.field ?? 'this field' }, where);
    const absolutePa = checkRange(above + ctx.barometricPa, s, expected, where);
    ctx.conversions?.push({
      text: s,
      field: where.field,
      absolutePa,
      barometricPa: ctx.barometricPa,
      barometerFrom: ctx.barometerFrom ?? 'the assumed',
    });
    return absolutePa;
  }
  if (typed && own(SPELLINGS, typed[2]))
    return parseQuantity(`${typed[1]} ${SPELLINGS[typed[2]]}`, expected, where, ctx);
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*[A-Za-z^/ 0-9*.]+$/.test(s)) {
    return fail({ code: 'bad-quantity', text: s, expected, fault: { kind: 'not-number-and-unit' } }, where);
  }
  const fast = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([A-Za-z^0-9/]+)$/.exec(s);
  const known = fast && own(FAST_UNITS, fast[2]) ? FAST_UNITS[fast[2]] : undefined;
  if (fast && known) {
    if (known.dim !== expected)
      return fail({ code: 'wrong-dimension', text: s, expected, got: known.dim }, where);
    const v = Number(fast[1]);
    // offset units: (v + offset) x factor, e.g. degF: (v + 459.67) x 5/9 K
    return checkRange(
      known.offset === undefined ? v * known.factor : (v + known.offset) * known.factor,
      s,
      expected,
      where,
    );
  }
  const math = mathjs();
  let u: Unit;
  try {
    u = math.unit(s);
  } catch (e) {
    return fail(
      {
        code: 'bad-quantity',
        text: s,
        expected,
        fault: { kind: 'library', message: (e as Error).message.replace(/^Error: /, '') },
      },
      where,
    );
  }
  if (!u.equalBase(math.unit(SI[expected]))) {
    return fail({ code: 'wrong-dimension', text: s, expected, got: dimensionOf(u) }, where);
  }
  const v = u.toNumber(SI[expected]);
  return checkRange(v, s, expected, where);
}

// the display half (units a renderer shows, Pa to a display unit) lives beside the renderers
export { fromPa, isPressureUnit, paPerUnit, PRESSURE_UNITS, type PressureUnit } from '../report/units.js';

/** convert a value in unit to SI through mathjs (tests compare this path against fromPa) */
export function toSI(value: number, unit: string): number {
  return mathjs().unit(value, unit).toSI().toNumber();
}

/** a length, m */
export function parseLength(text: string, where: Where = {}): number {
  return parseQuantity(text, 'length', where);
}
