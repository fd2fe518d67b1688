// A batch log as the guided fill writes it of a plan read exactly at its targets: the header, the
// plan's dangers acknowledged when asked (the fill's danger screen writes one acknowledge line per
// danger before the first fill), a reading per step and the close. Shared by the tests that need a
// record of a given plan without running the fill. `opts`: each reading's temperature, K (default the
// plan's), who took it (default TT; undefined: a line without `by`, as older logs), and the header as
// written (default headerFromPlan's). Written by the demo logs' writer (scripts/log-writer.ts).
import { type LogHeader, type NewLogEvent } from '../src/io/batch-log.js';
import { headerFromPlan } from '../src/io/check.js';
import type { Plan } from '../src/core/index.js';
import type { PlanRequest } from '../src/io/load.js';
import { writeStepLog } from '../scripts/log-writer.js';

export function logAtTargets(
  file: string,
  plan: Plan,
  req: PlanRequest,
  batch: string,
  accept: { by: string; note?: string } | undefined,
  opts: {
    temperatureOf?: (step: number) => number;
    byOf?: (step: number) => string | undefined;
    header?: (h: LogHeader) => LogHeader;
    /** false: the log is left open (no close line) */
    close?: boolean;
  } = {},
): string {
  const temperatureOf = opts.temperatureOf ?? (() => plan.temperatureK);
  const byOf = opts.byOf ?? (() => 'TT');
  const header = headerFromPlan(plan, req, batch, '2026-12-02T09:00:00Z', file);
  const acks: NewLogEvent[] = accept
    ? plan.findings
        .filter((x) => x.severity === 'danger')
        .map((d) => ({
          kind: 'acknowledge',
          code: d.code,
          step: d.step ?? null,
          by: accept.by,
          time: '2026-12-02T09:05:00Z',
          ...(accept.note === undefined ? {} : { note: accept.note }),
        }))
    : [];
  return writeStepLog(
    file,
    opts.header ? opts.header(header) : header,
    plan.steps,
    (s) => ({
      reading: `${s.targetPa} Pa`,
      pressurePa: s.targetPa,
      temperature: `${temperatureOf(s.index)} K`,
      temperatureK: temperatureOf(s.index),
      time: `2026-12-02T09:1${s.index}:00Z`,
      by: byOf(s.index),
    }),
    {
      before: plan.steps.length ? { [plan.steps[0].index]: acks } : {},
      ...(opts.close === false ? {} : { close: { time: '2026-12-02T09:30:00Z' } }),
    },
  );
}
