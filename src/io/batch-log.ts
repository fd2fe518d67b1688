/**
 * The batch log: JSON Lines, one event per line, append-only, fsync after every
 * line. Format "mixwright-batch/1":
 *   {"kind":"batch", ...}        header: design, tank, gauges, sources, planned steps
 *   {"kind":"reading", ...}      one per fill: step, source, gauge, reading with unit, temperature, time
 *   {"kind":"correction", ...}   replaces the reading of a step (the original stays in the file)
 *   {"kind":"acknowledge", ...}  an operator's acknowledgement of a finding
 *   {"kind":"close", ...}        the batch is finished
 * A log is never overwritten; a torn last line (a crash mid-write) is reported and
 * ignored, every complete line kept.
 */
import { closeSync, existsSync, fsyncSync, linkSync, openSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { readTextFile } from './read-text.js';
import { z } from 'zod';
import { fail } from '../core/index.js';
import type { Gauge, GasSource } from '../core/index.js';

export const LOG_FORMAT = 'mixwright-batch/1';
const LOG_VERSION = 1;

const fractions = z.record(z.string(), z.number().min(0).max(1));

const gaugeSchema = z.object({
  id: z.string(),
  label: z.string(),
  reference: z.enum(['absolute', 'gauge']),
  full_scale_Pa: z.number().positive(),
  minimum_Pa: z.number(),
  accuracy_of_reading: z.number().min(0),
  accuracy_of_full_scale: z.number().min(0),
  resolution_Pa: z.number().min(0),
  unit: z.string(),
});

const sourceSchema = z.object({
  id: z.string(),
  label: z.string(),
  kind: z.enum(['cylinder', 'premix', 'vapour', 'in-tank']),
  composition: fractions,
  unidentified: z.number().min(0).max(1),
  main_species: z.string(),
});

export const headerSchema = z.object({
  kind: z.literal('batch'),
  format: z.string(),
  id: z.string().min(1),
  created: z.string(),
  lab: z.string(),
  tank: z.object({ id: z.string(), volume_m3: z.number().positive(), rated_pressure_Pa: z.number().positive().nullable(), working_limit_Pa: z.number().positive().nullable().optional().describe('rating x working fraction; logs without it use the rating') }),
  design: z.object({ composition: fractions, phi: z.number().nullable(), diluent: z.array(z.string()), diluent_fraction: z.number() }),
  tolerance: z.object({ relative: z.number().min(0), absolute: z.number().min(0) }),
  temperature_K: z.number().positive(),
  final_pressure_Pa: z.number().positive(),
  barometer: z.object({ pressure_Pa: z.number().positive(), u_Pa: z.number().min(0) }),
  thermometer: z.object({ u_K: z.number().min(0), resolution_K: z.number().min(0) }),
  gauges: z.array(gaugeSchema),
  sources: z.array(sourceSchema),
  steps: z.array(z.object({ step: z.number().int().positive(), source: z.string(), species: z.string(), target_Pa: z.number(), band_Pa: z.number(), gauge: z.string().nullable() })),
  recipe: z.unknown().optional(),
  findings: z.array(z.object({ severity: z.enum(['danger', 'warning', 'note']), code: z.string(), step: z.number().nullable(), message: z.string() })).optional(),
});

const readingSchema = z.object({
  kind: z.enum(['reading', 'correction']),
  step: z.number().int().positive(),
  source: z.string(),
  gauge: z.string(),
  reading: z.string().describe('as shown on the gauge, with its unit, e.g. "50.04 Torr"'),
  pressure_Pa: z.number().positive().describe('absolute tank pressure'),
  barometer_Pa: z.number().positive().optional(),
  temperature: z.string(),
  temperature_K: z.number().positive(),
  time: z.string(),
  note: z.string().optional(),
  reason: z.string().optional(),
});

const ackSchema = z.object({ kind: z.literal('acknowledge'), code: z.string(), step: z.number().int().nullable(), by: z.string(), time: z.string(), note: z.string().optional() });
const closeSchema = z.object({ kind: z.literal('close'), time: z.string(), note: z.string().optional() });

export type LogHeader = z.infer<typeof headerSchema>;
export type LogReading = z.infer<typeof readingSchema>;
export type LogAck = z.infer<typeof ackSchema>;
export type LogEvent = LogHeader | LogReading | LogAck | z.infer<typeof closeSchema>;

export function gaugeToLog(g: Gauge): LogHeader['gauges'][number] {
  return {
    id: g.id,
    label: g.label,
    reference: g.reference,
    full_scale_Pa: g.fullScalePa,
    minimum_Pa: g.minimumPa,
    accuracy_of_reading: g.accuracyOfReading,
    accuracy_of_full_scale: g.accuracyOfFullScale,
    resolution_Pa: g.resolutionPa,
    unit: g.unit,
  };
}

export function gaugeFromLog(g: LogHeader['gauges'][number]): Gauge {
  return {
    id: g.id,
    label: g.label,
    reference: g.reference,
    fullScalePa: g.full_scale_Pa,
    minimumPa: g.minimum_Pa,
    accuracyOfReading: g.accuracy_of_reading,
    accuracyOfFullScale: g.accuracy_of_full_scale,
    resolutionPa: g.resolution_Pa,
    unit: g.unit,
  };
}

export function sourceToLog(s: GasSource): LogHeader['sources'][number] {
  return { id: s.id, label: s.label, kind: s.kind, composition: { ...s.composition }, unidentified: s.unidentified, main_species: s.mainSpecies };
}

export function sourceFromLog(s: LogHeader['sources'][number]): GasSource {
  return { id: s.id, label: s.label, kind: s.kind, composition: s.composition, unidentified: s.unidentified, mainSpecies: s.main_species };
}

function appendLine(fd: number, event: LogEvent): void {
  const line = JSON.stringify(event) + '\n';
  writeSync(fd, line);
  fsyncSync(fd);
}

/**
 * Start a new log; refuses to touch an existing file. The header is written to a
 * temporary file, fsync'd, then hard-linked into place (link fails if the name exists,
 * so there is no window in which a half-written header or an overwrite can happen).
 */
export function createLog(path: string, header: LogHeader): void {
  if (existsSync(path)) fail({ code: 'file-unreadable', reason: 'a batch log of that name exists already; it is never overwritten - choose another batch id' }, { file: path });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  const fd = openSync(tmp, 'wx');
  try {
    appendLine(fd, header);
  } finally {
    closeSync(fd);
  }
  try {
    linkSync(tmp, path);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') fail({ code: 'file-unreadable', reason: 'a batch log of that name exists already; it is never overwritten - choose another batch id' }, { file: path });
    throw e;
  } finally {
    unlinkSync(tmp);
  }
}

/** append one event and fsync it before returning */
export function appendEvent(path: string, event: LogEvent): void {
  const fd = openSync(path, 'a');
  try {
    appendLine(fd, event);
  } finally {
    closeSync(fd);
  }
}

export interface ParsedLog {
  readonly file: string;
  readonly header: LogHeader;
  /** the reading in force for each step (corrections applied), in step order, with its line number */
  readonly readings: readonly (LogReading & { line: number })[];
  readonly acknowledgements: readonly LogAck[];
  readonly closed: boolean;
  /** e.g. a torn last line */
  readonly warnings: readonly string[];
}

export function parseLog(text: string, file: string): ParsedLog {
  const lines = text.split('\n');
  const warnings: string[] = [];
  const endsClean = text.endsWith('\n');
  let header: LogHeader | undefined;
  const byStep = new Map<number, LogReading & { line: number }>();
  const acks: LogAck[] = [];
  let closed = false;
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i];
    const lineNo = i + 1;
    if (raw.trim() === '') continue;
    const last = i === lines.length - 1 && !endsClean;
    let obj: unknown;
    try {
      obj = JSON.parse(raw);
    } catch {
      if (last) {
        warnings.push(`line ${lineNo} is incomplete (the write was cut off, e.g. by a crash) and was ignored; every line before it is used`);
        break;
      }
      return fail({ code: 'schema', reason: 'not a JSON object; a batch log has one JSON event per line' }, { file, line: lineNo });
    }
    const kind = (obj as { kind?: unknown })?.kind;
    if (lineNo === 1 || !header) {
      if (kind !== 'batch') fail({ code: 'schema', reason: 'the first line of a batch log must be its "batch" header' }, { file, line: lineNo });
      const fmt = String((obj as { format?: unknown }).format ?? '');
      const m = /^mixwright-batch\/(\d+)$/.exec(fmt);
      if (!m) fail({ code: 'schema', reason: `unknown log format "${fmt}"; this version reads ${LOG_FORMAT}` }, { file, line: lineNo, field: 'format' });
      if (Number(m[1]) > LOG_VERSION) fail({ code: 'schema', reason: `the log is format ${fmt}, newer than this version of mixwright reads (${LOG_FORMAT}); update mixwright` }, { file, line: lineNo, field: 'format' });
      const h = headerSchema.safeParse(obj);
      if (!h.success) fail({ code: 'schema', reason: `bad batch header: ${h.error.issues[0].path.join('.')}: ${h.error.issues[0].message}` }, { file, line: lineNo });
      header = h.data;
      continue;
    }
    if (kind === 'reading' || kind === 'correction') {
      const r = readingSchema.safeParse(obj);
      if (!r.success) fail({ code: 'schema', reason: `bad ${kind}: ${r.error.issues[0].path.join('.')}: ${r.error.issues[0].message}` }, { file, line: lineNo });
      if (kind === 'reading' && byStep.has(r.data.step)) {
        fail({ code: 'schema', reason: `step ${r.data.step} has a second reading; a changed reading is logged as a "correction"` }, { file, line: lineNo });
      }
      byStep.set(r.data.step, { ...r.data, line: lineNo });
    } else if (kind === 'acknowledge') {
      const a = ackSchema.safeParse(obj);
      if (!a.success) fail({ code: 'schema', reason: `bad acknowledgement: ${a.error.issues[0].message}` }, { file, line: lineNo });
      acks.push(a.data);
    } else if (kind === 'close') {
      closed = true;
    } else {
      fail({ code: 'schema', reason: `unknown event kind "${String(kind)}"` }, { file, line: lineNo });
    }
  }
  if (!header) return fail({ code: 'schema', reason: 'the log is empty' }, { file });
  const readings = [...byStep.values()].sort((a, b) => a.step - b.step);
  return { file, header, readings, acknowledgements: acks, closed, warnings };
}

export function readLog(file: string): ParsedLog {
  const text = readTextFile(file);
  return parseLog(text, file);
}
