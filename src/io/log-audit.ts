/**
 * The audit of a batch log as a record, beside the chemistry of the re-check: readings past
 * the tank's working limit or past their gauge's range (danger), lines changed after they
 * were written (the hash chain), typed text that disagrees with the number logged beside it,
 * torn last lines set aside, a top-up whose starting pressure was never read, a vent whose
 * pressure after venting was never read. Findings are data, worded once in describeLogFinding.
 */
import { ProblemError } from '../core/index.js';
import {
  describeRecordIssue,
  recordIssueSeverity,
  tornSideFiles,
  workingLimitOf,
  type InForceReading,
  type LogVentReading,
  OVER_RANGE_CODE,
  type ParsedLog,
  type RecordIssue,
} from './batch-log.js';
import { fromPa, isGaugeSpelling, isPressureUnit, parseQuantity, type PressureUnit } from './quantity.js';

export type LogFindingSeverity = 'danger' | 'warning' | 'note';

export type LogFinding =
  | {
      readonly code: 'above-working-limit';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number;
      readonly pressurePa: number;
      readonly limitPa: number;
      /** the tank's pressure rating, when known: a reading above it is said so */
      readonly ratedPa?: number;
      readonly unit: PressureUnit;
      /** the reading was later corrected or withdrawn, or (a reading after venting) read again after venting more */
      readonly replaced: boolean;
      /** a reading after venting, read again after it (the tank was vented more): not corrected, a real reading */
      readonly ventedAgain?: boolean;
      /** an acknowledgement of this code and fill in the log: who accepted it at the manifold, and when */
      readonly accepted?: { readonly by: string; readonly time: string };
      /** a CSV row's likely unit slip, in words (the danger stands as typed; this says how to correct it) */
      readonly unitSlip?: string;
    }
  | {
      readonly code: 'above-gauge-range';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number;
      readonly gauge: string;
      readonly shownPa: number;
      readonly fullScalePa: number;
      readonly unit: PressureUnit;
      readonly replaced: boolean;
      /** a reading after venting, read again after it (the tank was vented more): not corrected, a real reading */
      readonly ventedAgain?: boolean;
      readonly accepted?: { readonly by: string; readonly time: string };
      /** a CSV row's likely unit slip, in words (the danger stands as typed; this says how to correct it) */
      readonly unitSlip?: string;
    }
  | {
      readonly code: 'text-number-mismatch';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number;
      readonly field: 'reading' | 'temperature';
      readonly text: string;
      readonly textSI: number;
      readonly loggedSI: number;
      readonly siUnit: 'Pa' | 'K';
    }
  | {
      readonly code: 'text-unreadable';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number;
      readonly field: 'reading' | 'temperature';
      readonly text: string;
    }
  | {
      readonly code: 'record';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number | null;
      readonly issue: RecordIssue;
    }
  | {
      readonly code: 'torn-side-file';
      readonly severity: LogFindingSeverity;
      readonly step: null;
      readonly line: null;
      readonly file: string;
    }
  | {
      readonly code: 'start-not-read';
      readonly severity: LogFindingSeverity;
      readonly step: null;
      readonly line: null;
      readonly plannedPa: number;
      readonly unit: PressureUnit;
    }
  | {
      /**
       * the header names a format without line hashes (/1), but the log carries fields or events that
       * only writers with line hashes write: its hashes were stripped and the format set back, so the
       * record was altered after it was written
       */
      readonly code: 'format-set-back';
      readonly severity: LogFindingSeverity;
      readonly step: null;
      readonly line: 1;
      readonly format: string;
      /** what gives it away, e.g. "thermometer.settling_K", "steps[].charge", "barometer line (line 2)" */
      readonly fields: readonly string[];
    }
  | {
      /**
       * a value typed past the range of its fill's gauge (the guided fill logs it as typed): never re-read
       * on a gauge that covers it nor said to be a slip (danger: the tank may hold more than the readings
       * say), re-read (note: the reading on that gauge is the fill's), or said to be a typing slip (note)
       */
      readonly code: 'over-range-typed';
      readonly severity: LogFindingSeverity;
      readonly step: number | null;
      readonly line: number;
      readonly typed: string;
      readonly gauge: string;
      readonly shownPa: number;
      readonly absolutePa: number;
      readonly fullScalePa: number;
      readonly overpressurePa?: number;
      readonly unit: PressureUnit;
      /** how it ended: not read, re-read on a gauge (with who), or a slip (with who) */
      readonly outcome: 'not-read' | 're-read' | 'slip';
      readonly by?: string;
      readonly readOn?: string;
    }
  | {
      readonly code: 'vent-not-read';
      readonly severity: LogFindingSeverity;
      readonly step: number;
      /** the vent's line; null when only an older log's close note records the vent */
      readonly line: number | null;
      /** the reading before venting (absolute) */
      readonly beforePa: number;
      readonly unit: PressureUnit;
    };

const show = (pa: number, unit: PressureUnit) => `${Number(fromPa(pa, unit).toPrecision(6))} ${unit}`;

function acceptedText(a: { by: string; time: string } | undefined): string {
  return a ? ` (accepted at the manifold by ${a.by} at ${a.time}; it stands all the same)` : '';
}

export function describeLogFinding(f: LogFinding): string {
  const at = f.line ? `line ${f.line}${f.step ? `, fill ${f.step}` : ''}: ` : '';
  switch (f.code) {
    case 'above-working-limit':
      // a reading after venting says so once, in its first words ("still above"), not again after them
      return (
        `${at}the tank ${f.ventedAgain ? 'reading after venting' : 'reading'} ${show(f.pressurePa, f.unit)} ` +
        `(absolute) is ${f.ventedAgain ? 'still ' : ''}above the tank's working limit of ${show(f.limitPa, f.unit)}` +
        (f.ratedPa !== undefined && f.pressurePa > f.ratedPa
          ? ` and above its pressure rating of ${show(f.ratedPa, f.unit)}`
          : '') +
        (f.ventedAgain
          ? ': the tank was vented again and read again after it'
          : f.replaced
            ? '; the reading was later corrected or withdrawn - if the tank really reached it, treat it as a danger'
            : ': have the tank and its fittings inspected under local practice before the batch is used') +
        acceptedText(f.accepted) +
        (f.unitSlip ? `. ${f.unitSlip}` : '')
      );
    case 'above-gauge-range':
      return (
        `${at}gauge ${f.gauge} shows ${show(f.shownPa, f.unit)}, above its full scale ` +
        `of ${show(f.fullScalePa, f.unit)}: the reading is not trustworthy and the ` +
        `gauge head may be damaged` +
        (f.ventedAgain
          ? ' (a reading after venting; the tank was vented again and read again after it)'
          : f.replaced
            ? ' (the reading was later corrected or withdrawn)'
            : '; check the gauge before it is used again') +
        acceptedText(f.accepted) +
        (f.unitSlip ? `. ${f.unitSlip}` : '')
      );
    case 'text-number-mismatch':
      return (
        `${at}the ${f.field} as typed, "${f.text}", is ${distinct(f.textSI, f.loggedSI)[0]} ` +
        `${f.siUnit}, but the line logs ${distinct(f.textSI, f.loggedSI)[1]} ${f.siUnit}: ` +
        `the line was changed, or written wrongly; the logged number is what the ` +
        `re-check uses`
      );
    case 'text-unreadable':
      return (
        `${at}the ${f.field} as typed, "${f.text}", cannot be read as a quantity, ` +
        `so it cannot be checked against the number logged beside it`
      );
    case 'record':
      return describeRecordIssue(f.issue);
    case 'torn-side-file':
      return (
        `a fill found the log's last line cut off mid-write and moved it to ${f.file}; ` +
        `it was never confirmed and is not used`
      );
    case 'start-not-read':
      return (
        `this is a top-up, but the log holds no reading of the starting pressure; ` +
        `the re-check assumes the planned ${show(f.plannedPa, f.unit)} already in the tank`
      );
    case 'format-set-back':
      return (
        `line 1: the header says format ${f.format}, which has no line hashes, but the log carries what ` +
        `only the writers of hashed logs write (${f.fields.join(', ')}): it is not an old log but a ` +
        `hashed one whose hashes were removed and whose format was set back, so the record was altered ` +
        `after it was written and its lines cannot be trusted`
      );
    case 'over-range-typed':
      return overRangeText(at, f);
    case 'vent-not-read':
      return (
        (f.line === null
          ? `the close note says the tank was vented after fill ${f.step}`
          : `${at}the tank was vented`) +
        `, but its pressure after venting was not read and logged: the tank's final pressure and amount ` +
        `are NOT known (${show(f.beforePa, f.unit)} absolute was read before venting; venting keeps the ` +
        `composition, which is checked). Read the tank now and write it on the label by hand`
      );
  }
}

function overRangeText(at: string, f: Extract<LogFinding, { code: 'over-range-typed' }>): string {
  const typed =
    `${at}"${f.typed}" (${show(f.shownPa, f.unit)}) was typed for ${f.gauge}, past its range of ` +
    `${show(f.fullScalePa, f.unit)}` +
    (f.overpressurePa !== undefined && f.shownPa > f.overpressurePa
      ? ` and past its overpressure rating of ${show(f.overpressurePa, f.unit)} (if real, the head may be damaged)`
      : '');
  if (f.outcome === 're-read') return `${typed}; the tank was read again on ${f.readOn} (by ${f.by})`;
  if (f.outcome === 'slip')
    return `${typed}; ${f.by} said it was a typing slip, and the reading was typed again`;
  return (
    `${typed}, and the tank was NOT read on a gauge that covers it: it may hold more gas than the readings ` +
    `say (${show(f.absolutePa, f.unit)} absolute as typed). Read it now on a gauge that covers it; the ` +
    `composition above does not account for it`
  );
}

/** the values typed past their gauge's range (acknowledge "over-range"), each with how it ended */
function overRangeTyped(log: ParsedLog, unitOf: (gaugeId: string) => PressureUnit): LogFinding[] {
  const acks = log.acknowledgements.filter((a) => a.code === OVER_RANGE_CODE && a.over_range);
  return acks
    .filter((a) => a.over_range!.outcome === 'typed')
    .map((a) => {
      const o = a.over_range!;
      // its resolution: the next over-range line of the same fill that is not another value typed
      const end = acks.find((x) => x.line > a.line && x.step === a.step);
      const eo = end?.over_range;
      const outcome = !eo || eo.outcome === 'typed' ? 'not-read' : eo.outcome;
      return {
        code: 'over-range-typed',
        severity: outcome === 'not-read' ? 'danger' : 'note',
        step: a.step,
        line: a.line,
        typed: o.typed,
        gauge: o.gauge,
        shownPa: o.shown_Pa,
        absolutePa: o.pressure_Pa,
        fullScalePa: o.full_scale_Pa,
        ...(o.overpressure_Pa !== undefined ? { overpressurePa: o.overpressure_Pa } : {}),
        unit: unitOf(o.gauge),
        outcome,
        ...(end && outcome !== 'not-read' ? { by: end.by } : {}),
        ...(eo?.read_on ? { readOn: eo.read_on } : {}),
      };
    });
}

const SEVERITY_ORDER: Record<LogFindingSeverity, number> = { danger: 0, warning: 1, note: 2 };

function close(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
}

/** the typed text as SI, or undefined when it cannot be read (a bare number is read in the fallback unit) */
function textSI(
  text: string,
  dim: 'pressure' | 'temperature',
  fallbackUnit: string,
  barometricPa?: number,
): number | undefined {
  const t = text.trim();
  try {
    return /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)
      ? parseQuantity(`${t} ${fallbackUnit}`, dim)
      : parseQuantity(t, dim, {}, { barometricPa });
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
}

type Logged = Pick<
  InForceReading,
  'gauge' | 'reading' | 'pressure_Pa' | 'barometer_Pa' | 'temperature' | 'temperature_K' | 'line'
> & { step: number | null; replaced: boolean; afterVent?: boolean };

/** what every check of a log line needs to know about the log */
interface AuditContext {
  readonly log: ParsedLog;
  readonly gauges: ReadonlyMap<string, ParsedLog['header']['gauges'][number]>;
  readonly limitPa: number | undefined;
  readonly baroOf: (r: { barometer_Pa?: number }) => number;
  readonly unitOf: (gaugeId: string) => PressureUnit;
  /** the line of the last reading of a step (null: the starting pressure) logged before a line, if any */
  readonly lastReadingBefore: (step: number | null, line: number) => number | undefined;
}

/**
 * the line of the last reading of a step (null: the starting pressure) logged before a line, if any: the
 * reading an acknowledgement written at that line accepts (never one of another line of the same step)
 */
export function lastReadingBefore(log: ParsedLog, step: number | null, line: number): number | undefined {
  const read: { step: number | null; line: number }[] = [
    ...(log.start ? [{ step: null, line: log.start.line }] : []),
    ...log.allReadings,
    ...log.vents.flatMap((v) => v.readings),
  ];
  return read
    .filter((r) => r.step === step && r.line < line)
    .reduce<number | undefined>((last, r) => Math.max(last ?? r.line, r.line), undefined);
}

/** whether an acknowledgement accepts the reading on a line: of its step, the last one logged before it */
export function acknowledges(
  log: ParsedLog,
  ack: { readonly step: number | null; readonly line: number },
  reading: { readonly step: number | null; readonly line: number },
): boolean {
  return ack.step === reading.step && lastReadingBefore(log, ack.step, ack.line) === reading.line;
}

function contextOf(log: ParsedLog): AuditContext {
  const h = log.header;
  const gauges = new Map(h.gauges.map((g) => [g.id, g]));
  return {
    log,
    gauges,
    lastReadingBefore: (step, line) => lastReadingBefore(log, step, line),
    limitPa: workingLimitOf(h),
    baroOf: (r) => r.barometer_Pa ?? log.barometer?.pressure_Pa ?? h.barometer.pressure_Pa,
    unitOf: (gaugeId) => {
      const u = gauges.get(gaugeId)?.unit;
      return u && isPressureUnit(u) ? u : 'Torr';
    },
  };
}

/** what an older guided fill wrote in its close note when the operator vented (no vent line then) */
const OLDER_VENT_NOTE =
  /(?:^|\s)fill (\d+)\b.*(?:the operator chose to vent back|the tank is vented back to)/;

/** the vent that stands after the last reading, and the tank as read after it (its last reading after venting) */
export interface LogVentOf {
  readonly step: number;
  readonly line: number | null;
  readonly by?: string;
  readonly time?: string;
  readonly targetPa?: number;
  readonly after?: LogVentReading & { readonly line: number };
}

/**
 * The vent of a log: its last vent line (a fill reading never follows one: the reader refuses it),
 * with the last reading after it; for an older log without vent lines, a close note that says the
 * operator vented (then nothing after venting was read).
 */
export function ventOf(log: ParsedLog): LogVentOf | undefined {
  const v = log.vents[log.vents.length - 1];
  if (v)
    return {
      step: v.step,
      line: v.line,
      by: v.by,
      time: v.time,
      targetPa: v.target_Pa,
      after: v.readings.at(-1),
    };
  const m = log.closeNote !== undefined ? OLDER_VENT_NOTE.exec(log.closeNote) : null;
  return m ? { step: Number(m[1]), line: null } : undefined;
}

/**
 * What a log whose header names a format without line hashes (/1) carries that no /1 writer wrote:
 * header fields, events and event fields that came with the hash chain (format /2) or after it.
 * A /1 writer wrote the header (id, created, lab, tank {id, volume_m3, rated_pressure_Pa}, design,
 * tolerance, temperature, final pressure, barometer, thermometer {u_K, resolution_K}, gauges,
 * sources, steps {step, source, species, target_Pa, band_Pa, gauge}, recipe, findings), `reading`
 * and `correction` (no `by`, no `replaces_line`), `acknowledge` (no `review`, `cap`) and `close`
 * lines, and no `chain`. Empty for a hashed log, and for a /1 log as a /1 writer made it.
 */
export function hashedOnlyMarks(log: ParsedLog): string[] {
  if (log.version >= 2) return [];
  const h = log.header;
  const out: string[] = [];
  const has = (v: unknown) => v !== undefined;
  if (has(h.tank.working_limit_Pa)) out.push('tank.working_limit_Pa');
  if (has(h.thermometer.settling_K)) out.push('thermometer.settling_K');
  if (h.steps.some((x) => has(x.charge))) out.push('steps[].charge');
  if (has(h.in_tank)) out.push('in_tank');
  if (has(h.premix_logs)) out.push('premix_logs');
  if (has(h.stage)) out.push('stage');
  if (has(h.safety)) out.push('safety');
  const lines = (what: string, ls: readonly number[]) => {
    if (ls.length) out.push(`${what} (line${ls.length === 1 ? '' : 's'} ${ls.join(', ')})`);
  };
  lines(
    'a reading or correction with by, charge or replaces_line',
    log.allReadings
      .filter((r) => has(r.by) || has(r.charge) || ('replaces_line' in r && has(r.replaces_line)))
      .map((r) => r.line),
  );
  lines(
    'a line with a hash (chain)',
    log.allReadings.filter((r) => has(r.chain)).map((r) => r.line),
  );
  lines('a barometer line', log.barometer ? [log.barometer.line] : []);
  lines('a start-pressure line', log.start ? [log.start.line] : []);
  lines(
    'a withdraw line',
    log.amendments.filter((a) => a.kind === 'withdraw').map((a) => a.line),
  );
  lines(
    'a vent line',
    log.vents.map((v) => v.line),
  );
  lines(
    'a vent-reading line',
    log.vents.flatMap((v) => v.readings.map((r) => r.line)),
  );
  lines(
    'a premix-mixed line',
    log.premixMixed.map((m) => m.line),
  );
  lines(
    'a premix-reading line',
    log.premixReadings.map((m) => m.line),
  );
  if (log.acknowledgements.some((a) => a.review || a.cap)) out.push('an acknowledge line with review or cap');
  return out;
}

export function auditLog(log: ParsedLog): LogFinding[] {
  const h = log.header;
  const cx = contextOf(log);
  const inForce = new Set(log.readings.map((r) => r.line));
  const vent = ventOf(log);
  // the readings after venting are checked as any reading (limits, typed text); only the last stands
  const afterVent = log.vents.flatMap((v) => v.readings);
  const logged: Logged[] = [
    ...(log.start ? [{ ...log.start, step: null, replaced: false }] : []),
    ...log.allReadings.map((r) => ({ ...r, replaced: !inForce.has(r.line) })),
    ...afterVent.map((r) => ({ ...r, replaced: r.line !== vent?.after?.line, afterVent: true })),
  ];
  const out: LogFinding[] = [
    ...logged.flatMap((r) => [...pastLimits(cx, r), ...typedTextOf(cx, r)]),
    ...barometerText(log),
    ...overRangeTyped(log, cx.unitOf),
  ];
  const setBack = hashedOnlyMarks(log);
  if (setBack.length)
    out.push({
      code: 'format-set-back',
      severity: 'warning',
      step: null,
      line: 1,
      format: h.format,
      fields: setBack,
    });
  for (const issue of log.issues) {
    // "predates the line hashes" is not true of a log whose format was set back
    if (setBack.length && issue.code === 'log-unhashed') continue;
    out.push({
      code: 'record',
      severity: recordIssueSeverity(issue),
      step: 'step' in issue ? issue.step : null,
      line: 'line' in issue ? issue.line : null,
      issue,
    });
  }
  for (const file of tornSideFiles(log.file))
    out.push({ code: 'torn-side-file', severity: 'note', step: null, line: null, file });
  if (h.in_tank && !log.start)
    out.push({
      code: 'start-not-read',
      severity: 'warning',
      step: null,
      line: null,
      plannedPa: h.in_tank.pressure_Pa,
      unit: cx.unitOf(h.steps[0]?.gauge ?? ''),
    });
  const last = log.readings[log.readings.length - 1];
  if (vent && !vent.after && last)
    out.push({
      code: 'vent-not-read',
      severity: 'warning',
      step: vent.step,
      line: vent.line,
      beforePa: last.pressure_Pa,
      unit: cx.unitOf(last.gauge),
    });
  return out.sort(
    (a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity] || (a.line ?? 0) - (b.line ?? 0),
  );
}

/** a reading past the tank's working limit or past its gauge's full scale (danger unless replaced) */
function pastLimits(cx: AuditContext, r: Logged): LogFinding[] {
  const out: LogFinding[] = [];
  const unit = cx.unitOf(r.gauge);
  const g = cx.gauges.get(r.gauge);
  const severity: LogFindingSeverity = r.replaced ? 'warning' : 'danger';
  const again = r.afterVent && r.replaced ? { ventedAgain: true } : {};
  // an acknowledgement accepts the reading of its step in force when it was written: the last reading
  // of that step logged before the acknowledgement's line (never a reading withdrawn before it)
  const acceptedOf = (code: string) => {
    const a = cx.log.acknowledgements.find((x) => x.code === code && acknowledges(cx.log, x, r));
    return a ? { accepted: { by: a.by, time: a.time } } : {};
  };
  const { limitPa } = cx;
  if (limitPa !== undefined && r.pressure_Pa > limitPa)
    out.push({
      code: 'above-working-limit',
      severity,
      step: r.step,
      line: r.line,
      pressurePa: r.pressure_Pa,
      limitPa,
      ...(cx.log.header.tank.rated_pressure_Pa ? { ratedPa: cx.log.header.tank.rated_pressure_Pa } : {}),
      unit,
      replaced: r.replaced,
      ...again,
      ...acceptedOf('above-working-limit'),
    });
  const shownPa = g?.reference === 'gauge' ? r.pressure_Pa - cx.baroOf(r) : r.pressure_Pa;
  if (g && shownPa > g.full_scale_Pa)
    out.push({
      code: 'above-gauge-range',
      severity,
      step: r.step,
      line: r.line,
      gauge: g.id,
      shownPa,
      fullScalePa: g.full_scale_Pa,
      unit,
      replaced: r.replaced,
      ...again,
      ...acceptedOf('above-gauge-range'),
    });
  return out;
}

/** the typed text of a reading and its temperature against the numbers logged beside them */
function typedTextOf(cx: AuditContext, r: Logged): LogFinding[] {
  const g = cx.gauges.get(r.gauge);
  const at = { step: r.step, line: r.line };
  // a gauge pressure typed ("15 psig", the fill says with which barometer in the note) is absolute once
  // read with the barometer in force; a gauge-referenced sensor's plain reading gets it added
  const typedGauge = isGaugeSpelling(r.reading);
  const p = textSI(r.reading, 'pressure', cx.unitOf(r.gauge), typedGauge ? cx.baroOf(r) : undefined);
  const absolute = p !== undefined && g?.reference === 'gauge' && !typedGauge ? p + cx.baroOf(r) : p;
  return [
    ...textAgainst(at, 'reading', r.reading, absolute, r.pressure_Pa, 'Pa'),
    ...textAgainst(
      at,
      'temperature',
      r.temperature,
      textSI(r.temperature, 'temperature', 'degC'),
      r.temperature_K,
      'K',
    ),
  ];
}

function barometerText(log: ParsedLog): LogFinding[] {
  const b = log.barometer;
  if (!b) return [];
  const at = { step: null, line: b.line };
  return textAgainst(at, 'reading', b.reading, textSI(b.reading, 'pressure', 'Torr'), b.pressure_Pa, 'Pa');
}

/** a note when the typed text cannot be read, a warning when it disagrees with the logged number */
function textAgainst(
  at: { step: number | null; line: number },
  field: 'reading' | 'temperature',
  text: string,
  textValue: number | undefined,
  loggedSI: number,
  siUnit: 'Pa' | 'K',
): LogFinding[] {
  if (textValue === undefined) return [{ code: 'text-unreadable', severity: 'note', ...at, field, text }];
  if (close(textValue, loggedSI)) return [];
  return [
    {
      code: 'text-number-mismatch',
      severity: 'warning',
      ...at,
      field,
      text,
      textSI: textValue,
      loggedSI,
      siUnit,
    },
  ];
}

/** the findings of one code, typed */
export function findingsOf<C extends LogFinding['code']>(
  fs: readonly LogFinding[],
  code: C,
): Extract<LogFinding, { code: C }>[] {
  return fs.filter((f): f is Extract<LogFinding, { code: C }> => f.code === code);
}

/**
 * two numbers that differ, in plain notation with just enough significant digits (9 at least, up to
 * 17) to show that they differ
 */
export function distinct(a: number, b: number): [string, string] {
  for (let sig = 9; sig < 17; sig++) {
    const x = String(Number(a.toPrecision(sig)));
    const y = String(Number(b.toPrecision(sig)));
    if (x !== y) return [x, y];
  }
  return [String(a), String(b)];
}
