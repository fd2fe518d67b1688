// A batch log written of a plan's steps, as the guided fill writes one: the header, then for each
// step the events logged before it (a premix check) and its reading on the plan's gauge, then the
// close. One writer for the demo logs (make-demo-log.ts, make-demo-premix-logs.ts) and the tests
// that need the record of a plan without running the fill (tests/log-at-targets.ts and others).
import { existsSync, unlinkSync } from 'node:fs';
import type { PlanStep } from '../src/core/index.js';
import { appendEvent, createLog, type LogHeader, type NewLogEvent } from '../src/io/batch-log.js';

/** what a step's reading line says: the gauge's text and the absolute pressure, the temperature, who, when */
export interface StepReading {
  readonly reading: string;
  readonly pressurePa: number;
  readonly temperature: string;
  readonly temperatureK: number;
  readonly time: string;
  /** who read it (the guided fill writes the session's operator); undefined: none, as older logs */
  readonly by?: string;
  readonly note?: string;
}

/** an invented reading in Torr and degC, as a demo operator typed it */
export function torrReading(torr: number, degC: number, time: string, note?: string): StepReading {
  return {
    reading: `${torr} Torr`,
    pressurePa: torr * (101325 / 760),
    temperature: `${degC} degC`,
    temperatureK: degC + 273.15,
    time,
    note,
  };
}

/**
 * Writes `file` anew (an older one removed): the header, each step's `before` events and reading
 * (`readingOf`), and, when given, the close line. Returns the file.
 */
export function writeStepLog(
  file: string,
  header: LogHeader,
  steps: readonly PlanStep[],
  readingOf: (step: PlanStep, i: number) => StepReading,
  opts: {
    readonly close?: { readonly time: string; readonly note?: string };
    readonly before?: Readonly<Record<number, readonly NewLogEvent[]>>;
  } = {},
): string {
  if (existsSync(file)) unlinkSync(file);
  createLog(file, header);
  steps.forEach((s, i) => {
    for (const e of opts.before?.[s.index] ?? []) appendEvent(file, e);
    const r = readingOf(s, i);
    appendEvent(file, {
      kind: 'reading',
      step: s.index,
      source: s.source.id,
      gauge: s.gauge!.id,
      reading: r.reading,
      pressure_Pa: r.pressurePa,
      temperature: r.temperature,
      temperature_K: r.temperatureK,
      time: r.time,
      by: r.by,
      note: r.note,
      // which charge of a split source (the header's step says the same): as the guided fill writes it
      charge: s.charge.of > 1 ? s.charge : undefined,
    });
  });
  if (opts.close) appendEvent(file, { kind: 'close', ...opts.close });
  return file;
}
