/**
 * Readings typed from a paper record: CSV with the header
 *   species,pressure,temperature[,gauge][,time][,by][,note]
 * one row per fill (a charge of its source) in fill order: a source filled in two charges has
 * two rows. The species column names a gas, a premix fill by its gases ("N2+O2") or a
 * cylinder id of the lab profile. Pressure is the reading after that fill and
 * temperature the tank temperature at that reading, both with units. The pressure is
 * absolute, unless the row's gauge is gauge-referenced in the lab profile (then it is
 * what that sensor shows, above the ambient pressure) or its unit says so ("15 psig");
 * such readings are made absolute with the barometric pressure given.
 */
import { fail, getSpecies, ProblemError, relocate, TORR_PA } from '../core/index.js';
import { readTextFile } from './read-text.js';
import { isAbsoluteSpelling, isGaugeSpelling, parseQuantity, type GaugeConversion } from './quantity.js';

export interface CsvContext {
  /** barometric pressure, Pa, to make gauge readings absolute; undefined when none was given */
  readonly barometricPa?: number;
  /** whose barometer that is ("--barometer", "the lab profile's"), for the statement of a conversion */
  readonly barometerFrom?: string;
  /** every reading made absolute with the barometer is recorded here (the report states each) */
  readonly conversions?: GaugeConversion[];
  /** how the named gauge is referenced, from the lab profile (undefined: not known) */
  readonly referenceOf?: (gaugeId: string) => 'absolute' | 'gauge' | undefined;
  /** true for a name that is not a species but names a source (a cylinder id, a premix label "N2+O2") */
  readonly acceptsName?: (name: string) => boolean;
  /** the named gauge's full scale, Pa (what it shows), when the lab profile gives it */
  readonly fullScaleOf?: (gaugeId: string) => number | undefined;
  /** the highest absolute pressure a gauge of the lab profile reads, Pa: past it, no gauge reads a row */
  readonly widestFullScalePa?: number;
  /** the tank's working limit, Pa, and its id, when known */
  readonly tank?: { readonly id: string; readonly limitPa?: number };
  /** the named gauge's readout unit ("Torr"), when the lab profile gives it */
  readonly gaugeUnitOf?: (gaugeId: string) => string | undefined;
  /** the recipe's planned tank pressures after each fill, Pa (absolute), when a recipe is given */
  readonly targetsPa?: readonly number[];
}

/** the row before, as the rule that readings rise needs it */
interface PrevRow {
  readonly reading: CsvReading;
  readonly text: string;
  /** the reading before it (its pressure), if any */
  readonly beforePa?: number;
  /** the units of the rows before it, as typed ("Torr") */
  readonly earlierUnits?: readonly string[];
}

const torr = (pa: number) => `${(pa / TORR_PA).toPrecision(6)} Torr`;

/** what the named gauge shows of an absolute pressure (a gauge-referenced one: above the barometer) */
function shownOf(pa: number, gauge: string | undefined, ctx: CsvContext): number {
  return gauge !== undefined && ctx.referenceOf?.(gauge) === 'gauge' && ctx.barometricPa !== undefined
    ? pa - ctx.barometricPa
    : pa;
}

/** what a pressure on a row's gauge goes past (the gauge's range, the tank's working limit), in words */
function pastOf(pressurePa: number, gauge: string | undefined, ctx: CsvContext): string[] {
  const out: string[] = [];
  const fs = gauge !== undefined ? ctx.fullScaleOf?.(gauge) : undefined;
  if (fs !== undefined && shownOf(pressurePa, gauge, ctx) > fs)
    out.push(`the range of ${gauge} (${torr(fs)})`);
  // a row that names no gauge: past the widest of the lab profile's gauges, no gauge reads it
  const widest = ctx.widestFullScalePa;
  if (gauge === undefined && widest !== undefined && pressurePa > widest)
    out.push(
      `the range of every gauge of the lab profile (the highest any reads is ${torr(widest)} absolute)`,
    );
  if (ctx.tank?.limitPa !== undefined && pressurePa > ctx.tank.limitPa)
    out.push(`tank ${ctx.tank.id}'s working limit (${torr(ctx.tank.limitPa)})`);
  return out;
}

const numberOf = (text: string) => text.trim().split(/\s+/)[0];
const unitOfText = (text: string) => text.trim().split(/\s+/).slice(1).join(' ');

/** a row's number read in another unit, Pa; undefined where the units agree or it does not parse */
function readAs(text: string, unit: string, line: number): number | undefined {
  if (!unit || unitOfText(text) === unit) return undefined;
  try {
    return parseQuantity(`${numberOf(text)} ${unit}`, 'pressure', { file: '', line, field: 'pressure' });
  } catch {
    return undefined;
  }
}

/** one of the two rows that may hold the wrong value or unit, with what points at it */
interface Suspect {
  readonly line: number;
  readonly text: string;
  /** the limits its value as typed goes past */
  readonly past: readonly string[];
  /** read in the other row's unit, it would rise in order (within its gauge's range and the tank's limit) */
  readonly fits: boolean;
  /** its unit is that of no row before the two, where those rows agree on the other row's */
  readonly oddUnit: boolean;
  /** the other row, whose unit it would take */
  readonly other: { readonly line: number; readonly unit: string };
  readonly earlier: readonly string[];
}

/** how strongly a suspect is pointed at: past a limit as typed most, then rising in the other's unit, then its unit */
const weight = (x: Suspect) => (x.past.length ? 4 : 0) + (x.fits ? 2 : 0) + (x.oddUnit ? 1 : 0);

/** "line 3's value or unit (1480.02 kPa): it is past ...; read as 1480.02 Torr, like line 4, it would rise in order" */
function suspectWords(x: Suspect): string {
  const why: string[] = [];
  if (x.past.length) why.push(`it is past ${x.past.join(' and ')}`);
  if (x.fits)
    why.push(
      `read as ${numberOf(x.text)} ${x.other.unit}, like line ${x.other.line}, it would rise in order`,
    );
  if (x.oddUnit)
    why.push(`the rows before are in ${[...new Set(x.earlier)].join(', ')}, not ${unitOfText(x.text)}`);
  return `line ${x.line}'s value or unit (${x.text})${why.length ? `: ${why.join('; ')}` : ''}`;
}

/**
 * The likely cause of a reading not above the one before, and what to do. Either row may be the
 * wrong one: the row before (too high) or this row (too low). Each is weighed: its value as typed
 * past its gauge's range or the tank's working limit; its number in the other row's unit rising in
 * order (a unit typed wrong: "1480.02 kPa" for Torr above, "1500.0 Pa" for Torr here), within its
 * gauge's range and the tank's limit; its unit unlike the rows before. The row with more against it
 * is named with its reasons, both where they weigh the same; neither, when nothing points at one.
 */
function notRisingCause(
  prev: PrevRow,
  text: string,
  pressurePa: number,
  line: number,
  gauge: string | undefined,
  ctx: CsvContext,
) {
  const p = prev.reading;
  const earlier = prev.earlierUnits ?? [];
  const [prevUnit, thisUnit] = [unitOfText(prev.text), unitOfText(text)];
  const agree = (u: string) => earlier.length > 0 && earlier.every((e) => e === u);
  const prevAs = readAs(prev.text, thisUnit, p.line);
  const thisAs = readAs(text, prevUnit, line);
  const suspects: Suspect[] = [
    {
      line: p.line,
      text: prev.text,
      past: pastOf(p.pressurePa, p.gauge, ctx),
      fits:
        prevAs !== undefined &&
        prevAs < pressurePa &&
        prevAs > (prev.beforePa ?? 0) &&
        !pastOf(prevAs, p.gauge, ctx).length,
      oddUnit: prevUnit !== thisUnit && agree(thisUnit),
      other: { line, unit: thisUnit },
      earlier,
    },
    {
      line,
      text,
      past: pastOf(pressurePa, gauge, ctx),
      fits: thisAs !== undefined && thisAs > p.pressurePa && !pastOf(thisAs, gauge, ctx).length,
      oddUnit: prevUnit !== thisUnit && agree(prevUnit),
      other: { line: p.line, unit: prevUnit },
      earlier,
    },
  ];
  const [a, b] = suspects.map(weight);
  if (a === 0 && b === 0)
    return (
      `Either line ${p.line} or line ${line} has a wrong value or unit, or the rows are not in fill ` +
      `order: correct them from the paper record and check again; nothing was checked`
    );
  const named = a === b ? suspects : [a > b ? suspects[0] : suspects[1]];
  if (named.length === 1)
    return (
      `Likely cause: ${suspectWords(named[0])}. Correct line ${named[0].line} from the paper record ` +
      `(the reading as the gauge showed it, with its unit) and check again; nothing was checked`
    );
  return (
    `Likely cause, one of the two: ${suspectWords(named[0])}; or ${suspectWords(named[1])}. Correct the ` +
    `wrong one from the paper record (the reading as the gauge showed it, with its unit) and check ` +
    `again; nothing was checked`
  );
}

export interface CsvReading {
  readonly line: number;
  /** the species key, or the source name as typed when the context accepts it (acceptsName) */
  readonly species: string;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly gauge?: string;
  readonly time?: string;
  /** who read the gauge (initials, as the guided fill's --by); undefined: the row names nobody */
  readonly by?: string;
  readonly note?: string;
  /** a likely unit slip of this row's reading, in words (what, why, what to do), where one fits */
  readonly unitSlip?: string;
}

const REQUIRED = ['species', 'pressure', 'temperature'];
const OPTIONAL = ['gauge', 'time', 'by', 'note'];

/** a row's `by`: initials as the guided fill takes them (1-6 letters), refused otherwise; empty: nobody named */
function byOf(text: string | undefined, where: At): string | undefined {
  if (!text) return undefined;
  if (!/^[A-Za-z]{1,6}$/.test(text)) fail({ code: 'bad-initials', text, column: true }, where('by'));
  return text;
}

/** split one CSV line; double quotes protect commas, "" is a literal quote */
export function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let q = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (q) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') q = false;
      else cur += ch;
    } else if (ch === '"') q = true;
    else if (ch === ',') {
      out.push(cur.trim());
      cur = '';
    } else cur += ch;
  }
  out.push(cur.trim());
  return out;
}

/** the header line's columns (lower case) and its index; refuses a missing required or unknown column */
function readHeader(lines: readonly string[], file: string): { header: string[]; at: number } {
  const at = lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'));
  if (at < 0) fail({ code: 'csv-empty' }, { file });
  const header = splitCsvLine(lines[at]).map((h) => h.toLowerCase());
  for (const r of REQUIRED)
    if (!header.includes(r))
      fail({ code: 'csv-missing-column', column: r, optional: OPTIONAL }, { file, line: at + 1 });
  for (const h of header)
    if (![...REQUIRED, ...OPTIONAL].includes(h))
      fail({ code: 'unknown-key', key: h, allowed: [...REQUIRED, ...OPTIONAL] }, { file, line: at + 1 });
  return { header, at };
}

type At = (field: string) => { file: string; line: number; field: string };

/**
 * a row's absolute pressure: a gauge-referenced sensor's reading, or a gauge unit ("15 psig"), made
 * absolute with the barometer; each such conversion is recorded with its line (ctx.conversions)
 */
function rowPressurePa(text: string, gaugeId: string | undefined, ctx: CsvContext, where: At): number {
  const at = where('pressure');
  const local: GaugeConversion[] = [];
  const parse = () => parseQuantity(text, 'pressure', at, { ...ctx, conversions: local });
  let pressurePa: number;
  if (gaugeId !== undefined && ctx.referenceOf?.(gaugeId) === 'gauge' && !isAbsoluteSpelling(text)) {
    // a gauge-referenced sensor shows the pressure above ambient: add the barometer
    const shown = parse();
    if (isGaugeSpelling(text))
      pressurePa = shown; // "psig" was already made absolute
    else if (ctx.barometricPa === undefined)
      return fail(
        { code: 'needs-barometer', text: `${text} on ${gaugeId}`, field: 'the pressure column' },
        at,
      );
    else {
      pressurePa = shown + ctx.barometricPa;
      local.push({
        text: `${text.trim()} on ${gaugeId}`,
        absolutePa: pressurePa,
        barometricPa: ctx.barometricPa,
        barometerFrom: ctx.barometerFrom ?? 'the assumed',
      });
    }
  } else pressurePa = parse();
  ctx.conversions?.push(...local.map((c) => ({ ...c, field: `line ${at.line}` })));
  return pressurePa;
}

/** refuses a row's values outside the re-check's range (after both are parsed, as the columns read) */
function checkRow(pressurePa: number, pressureText: string, temperatureK: number, text: string, where: At) {
  if (!(pressurePa > 0))
    fail(
      { code: 'not-positive', what: 'absolute pressure', value: pressurePa, text: pressureText },
      where('pressure'),
    );
  if (!(temperatureK >= 200 && temperatureK <= 600)) {
    fail(
      {
        code: 'out-of-range',
        what: `tank temperature "${text}" (${temperatureK.toFixed(2)} K)`,
        value: temperatureK,
        allowed: '200-600 K',
      },
      where('temperature'),
    );
  }
}

/** one data row; `prev` is the row before it (readings must rise) */
function parseRow(
  cells: readonly string[],
  header: readonly string[],
  where: At,
  ctx: CsvContext,
  prev: PrevRow | undefined,
): CsvReading {
  const cell = (name: string) => (header.indexOf(name) >= 0 ? cells[header.indexOf(name)] : undefined);
  let species: string;
  const name = cell('species')!;
  try {
    species = getSpecies(name).key;
  } catch (e) {
    if (!(e instanceof ProblemError)) throw e;
    if (!ctx.acceptsName?.(name)) throw relocate(e, where('species'));
    species = name;
  }
  const gaugeId = cell('gauge') || undefined;
  const pressurePa = rowPressurePa(cell('pressure')!, gaugeId, ctx, where);
  const temperatureK = parseQuantity(cell('temperature')!, 'temperature', where('temperature'));
  checkRow(pressurePa, cell('pressure')!, temperatureK, cell('temperature')!, where);
  if (prev && pressurePa <= prev.reading.pressurePa) {
    const text = cell('pressure')!;
    const line = where('').line;
    fail(
      {
        code: 'csv-not-rising',
        text,
        ...(/torr$/i.test(text.trim()) ? {} : { torr: torr(pressurePa) }),
        previous: {
          line: prev.reading.line,
          text: prev.text,
          ...(/torr$/i.test(prev.text.trim()) ? {} : { torr: torr(prev.reading.pressurePa) }),
        },
        cause: notRisingCause(prev, text, pressurePa, line, gaugeId, ctx),
      },
      where('pressure'),
    );
  }
  return {
    line: where('').line,
    species,
    pressurePa,
    temperatureK,
    gauge: gaugeId,
    time: cell('time') || undefined,
    by: byOf(cell('by'), where),
    note: cell('note') || undefined,
  };
}

export function parseReadingsCsv(text: string, file: string, ctx: CsvContext = {}): CsvReading[] {
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  const { header, at } = readHeader(lines, file);
  const out: CsvReading[] = [];
  const texts: string[] = [];
  const col = header.indexOf('pressure');
  for (let i = at + 1; i < lines.length; i++) {
    const raw = lines[i];
    if (raw.trim() === '' || raw.trim().startsWith('#')) continue;
    const line = i + 1;
    const cells = splitCsvLine(raw);
    if (cells.length !== header.length)
      fail({ code: 'csv-field-count', got: cells.length, expected: header.length }, { file, line });
    const n = out.length;
    const prev = n
      ? {
          reading: out[n - 1],
          text: texts[n - 1],
          beforePa: n > 1 ? out[n - 2].pressurePa : undefined,
          earlierUnits: texts.slice(0, n - 1).map(unitOfText),
        }
      : undefined;
    out.push(parseRow(cells, header, (field) => ({ file, line, field }), ctx, prev));
    texts.push(cells[col]);
  }
  if (out.length === 0) fail({ code: 'csv-no-rows' }, { file });
  return out.map((r, i) => {
    const slip = unitSlipOf(out, texts, i, ctx);
    return slip ? { ...r, unitSlip: slip } : r;
  });
}

/** the nearest planned pressure within 2 % (our own margin for "near its target") of `pa`, with its fill */
function nearTarget(pa: number, targets: readonly number[]): { pa: number; fill: number } | undefined {
  const near = targets
    .map((t, k) => ({ pa: t, fill: k + 1 }))
    .filter((t) => Math.abs(pa - t.pa) <= 0.02 * t.pa)
    .sort((a, b) => Math.abs(pa - a.pa) - Math.abs(pa - b.pa));
  return near[0];
}

/** the close of a likely unit slip's words where the re-check goes on with the row as typed */
const SLIP_STANDS = '; until then the record stands as typed, a danger';

/**
 * a likely unit slip's words where the re-check refuses the row (no gauge reads it as typed): nothing
 * was computed on it, so it does not "stand as typed"
 */
export function slipRefused(slip: string): string {
  return slip.endsWith(SLIP_STANDS)
    ? `${slip.slice(0, -SLIP_STANDS.length)}; nothing is checked until then`
    : slip;
}

/**
 * A row whose reading as typed goes past its gauge's range or the tank's working limit, while its
 * number read in the unit of the other rows (or of its gauge's readout) would be a plausible reading:
 * above the row before, below the row after, within the range and the limit, and (a recipe given)
 * within 2 % of one of the plan's tank pressures. The likely unit slip in words, or undefined.
 */
function unitSlipOf(rows: readonly CsvReading[], texts: readonly string[], i: number, ctx: CsvContext) {
  const r = rows[i];
  const past = pastOf(r.pressurePa, r.gauge, ctx);
  if (!past.length) return undefined;
  const own = unitOfText(texts[i]);
  const gaugeUnit = r.gauge !== undefined ? ctx.gaugeUnitOf?.(r.gauge) : undefined;
  const units = [...new Set([...(gaugeUnit ? [gaugeUnit] : []), ...texts.map(unitOfText)])];
  const where: At = (field) => ({ file: '', line: r.line, field });
  for (const unit of units.filter((u) => u && u !== own)) {
    let asPa: number;
    try {
      asPa = rowPressurePa(
        `${numberOf(texts[i])} ${unit}`,
        r.gauge,
        { ...ctx, conversions: undefined },
        where,
      );
    } catch {
      continue;
    }
    if (i > 0 && !(asPa > rows[i - 1].pressurePa)) continue;
    if (i + 1 < rows.length && !(asPa < rows[i + 1].pressurePa)) continue;
    if (pastOf(asPa, r.gauge, ctx).length) continue;
    const target = ctx.targetsPa?.length ? nearTarget(asPa, ctx.targetsPa) : undefined;
    if (ctx.targetsPa?.length && !target) continue;
    const lines = rows.filter((_x, j) => j !== i && unitOfText(texts[j]) === unit).map((x) => x.line);
    const whose = [
      ...(lines.length ? [`line${lines.length > 1 ? 's' : ''} ${lines.join(', ')}`] : []),
      ...(unit === gaugeUnit ? [`gauge ${r.gauge}'s readout`] : []),
    ].join(' and ');
    const within = [
      ...(r.gauge && ctx.fullScaleOf?.(r.gauge) !== undefined ? [`the range of ${r.gauge}`] : []),
      ...(!r.gauge && ctx.widestFullScalePa !== undefined ? ['the range of a gauge of the lab profile'] : []),
      ...(ctx.tank?.limitPa !== undefined ? [`tank ${ctx.tank.id}'s working limit`] : []),
    ];
    const fits = [
      ...(i > 0 ? [`above line ${rows[i - 1].line}`] : []),
      ...(i + 1 < rows.length ? [`below line ${rows[i + 1].line}`] : []),
      `within ${within.join(' and ')}`,
      ...(target
        ? [
            `${((100 * (asPa - target.pa)) / target.pa).toFixed(2)} % from the plan's ${torr(target.pa)} ` +
              `after its fill ${target.fill}`,
          ]
        : []),
    ];
    const as = `${numberOf(texts[i])} ${unit}`;
    return (
      `LIKELY UNIT SLIP on line ${r.line}: as typed, ${texts[i]} is past ${past.join(' and ')}; read as ` +
      `${as}, the unit of ${whose}, it would be ${torr(asPa)} absolute: ${fits.join(', ')}. If the ` +
      `gauge showed ${as}, correct line ${r.line} to "${as}" from the paper record and check again` +
      SLIP_STANDS
    );
  }
  return undefined;
}

/**
 * The first column of each data row as typed, with its file line, read before the rows are (a
 * row's name decides which premix log the readings need); the header is checked as for the rows
 */
export function csvRowNames(file: string): { name: string; line: number }[] {
  const lines = readTextFile(file).replace(/\r\n?/g, '\n').split('\n');
  const { header, at } = readHeader(lines, file);
  const col = header.indexOf('species');
  const out: { name: string; line: number }[] = [];
  for (let i = at + 1; i < lines.length; i++) {
    const raw = lines[i];
    if (raw.trim() === '' || raw.trim().startsWith('#')) continue;
    const name = splitCsvLine(raw)[col];
    if (name !== undefined) out.push({ name, line: i + 1 });
  }
  return out;
}

export function readReadingsCsv(file: string, ctx: CsvContext = {}): CsvReading[] {
  const text = readTextFile(file);
  return parseReadingsCsv(text, file, ctx);
}
