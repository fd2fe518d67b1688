/**
 * Readings typed from a paper record: CSV with the header
 *   species,pressure,temperature[,gauge][,time][,note]
 * one row per fill in fill order; pressure is the reading after that fill and
 * temperature the tank temperature at that reading, both with units. The pressure is
 * absolute, unless the row's gauge is gauge-referenced in the lab profile (then it is
 * what that sensor shows, above the ambient pressure) or its unit says so ("15 psig");
 * such readings are made absolute with the barometric pressure given.
 */
import { fail, getSpecies, ProblemError, relocate } from '../core/index.js';
import { readTextFile } from './read-text.js';
import { isAbsoluteSpelling, isGaugeSpelling, parseQuantity } from './quantity.js';

export interface CsvContext {
  /** barometric pressure, Pa, to make gauge readings absolute; undefined when none was given */
  readonly barometricPa?: number;
  /** how the named gauge is referenced, from the lab profile (undefined: not known) */
  readonly referenceOf?: (gaugeId: string) => 'absolute' | 'gauge' | undefined;
}

export interface CsvReading {
  readonly line: number;
  readonly species: string;
  readonly pressurePa: number;
  readonly temperatureK: number;
  readonly gauge?: string;
  readonly time?: string;
  readonly note?: string;
}

const REQUIRED = ['species', 'pressure', 'temperature'];
const OPTIONAL = ['gauge', 'time', 'note'];

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

export function parseReadingsCsv(text: string, file: string, ctx: CsvContext = {}): CsvReading[] {
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  const headerLine = lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'));
  if (headerLine < 0)
    fail(
      {
        code: 'schema',
        reason: 'the file is empty; it needs the header species,pressure,temperature and one row per fill',
      },
      { file },
    );
  const header = splitCsvLine(lines[headerLine]).map((h) => h.toLowerCase());
  for (const r of REQUIRED)
    if (!header.includes(r))
      fail(
        {
          code: 'schema',
          reason:
            `the header lacks the column "${r}"; it must be species,pressure,temperature ` +
            `(optional: ${OPTIONAL.join(', ')})`,
        },
        { file, line: headerLine + 1 },
      );
  for (const h of header)
    if (![...REQUIRED, ...OPTIONAL].includes(h))
      fail(
        { code: 'unknown-key', key: h, allowed: [...REQUIRED, ...OPTIONAL] },
        { file, line: headerLine + 1 },
      );
  const col = (name: string) => header.indexOf(name);
  const out: CsvReading[] = [];
  for (let i = headerLine + 1; i < lines.length; i++) {
    const raw = lines[i];
    if (raw.trim() === '' || raw.trim().startsWith('#')) continue;
    const line = i + 1;
    const cells = splitCsvLine(raw);
    if (cells.length !== header.length)
      fail(
        { code: 'schema', reason: `${cells.length} fields where the header has ${header.length}` },
        { file, line },
      );
    const cell = (name: string) => (col(name) >= 0 ? cells[col(name)] : undefined);
    const where = (field: string) => ({ file, line, field });
    let species: string;
    try {
      species = getSpecies(cell('species')!).key;
    } catch (e) {
      if (e instanceof ProblemError) throw relocate(e, where('species'));
      throw e;
    }
    const gaugeId = cell('gauge') || undefined;
    const pressureText = cell('pressure')!;
    let pressurePa: number;
    if (
      gaugeId !== undefined &&
      ctx.referenceOf?.(gaugeId) === 'gauge' &&
      !isAbsoluteSpelling(pressureText)
    ) {
      // a gauge-referenced sensor shows the pressure above ambient: add the barometer
      const shown = parseQuantity(pressureText, 'pressure', where('pressure'), ctx);
      if (isGaugeSpelling(pressureText))
        pressurePa = shown; // "psig" was already made absolute
      else if (ctx.barometricPa === undefined)
        return fail(
          { code: 'needs-barometer', text: `${pressureText} on ${gaugeId}`, field: 'the pressure column' },
          where('pressure'),
        );
      else pressurePa = shown + ctx.barometricPa;
    } else pressurePa = parseQuantity(pressureText, 'pressure', where('pressure'), ctx);
    const temperatureK = parseQuantity(cell('temperature')!, 'temperature', where('temperature'));
    if (!(pressurePa > 0))
      fail(
        { code: 'not-positive', what: 'absolute pressure', value: pressurePa, text: pressureText },
        where('pressure'),
      );
    if (!(temperatureK >= 200 && temperatureK <= 600)) {
      fail(
        {
          code: 'out-of-range',
          what: `tank temperature "${cell('temperature')}" (${temperatureK.toFixed(2)} K)`,
          value: temperatureK,
          allowed: '200-600 K',
        },
        where('temperature'),
      );
    }
    const prev = out[out.length - 1];
    if (prev && pressurePa <= prev.pressurePa) {
      fail(
        {
          code: 'schema',
          reason:
            `the reading ${cell('pressure')} is not above the previous one; each row ` +
            `is the absolute pressure after a fill, so readings must increase`,
        },
        where('pressure'),
      );
    }
    out.push({
      line,
      species,
      pressurePa,
      temperatureK,
      gauge: gaugeId,
      time: cell('time') || undefined,
      note: cell('note') || undefined,
    });
  }
  if (out.length === 0) fail({ code: 'schema', reason: 'no readings below the header' }, { file });
  return out;
}

export function readReadingsCsv(file: string, ctx: CsvContext = {}): CsvReading[] {
  const text = readTextFile(file);
  return parseReadingsCsv(text, file, ctx);
}
