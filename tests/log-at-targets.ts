// A batch log as the guided fill writes it of a plan read exactly at its targets: the header, the
// plan's dangers acknowledged when asked (the fill's danger screen writes one acknowledge line per
// danger before the first fill), a reading per step and the close. Shared by the tests that need a
// record of a given plan without running the fill. `opts`: each reading's temperature, K (default the
// plan's), who took it (default TT; undefined: a line without `by`, as older logs), and the header as
// written (default headerFromPlan's).
import { appendEvent, createLog, type LogHeader } from '../src/io/batch-log.js';
import { headerFromPlan } from '../src/io/check.js';
import type { Plan } from '../src/core/index.js';
import type { PlanRequest } from '../src/io/load.js';

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
  } = {},
): string {
  const temperatureOf = opts.temperatureOf ?? (() => plan.temperatureK);
  const byOf = opts.byOf ?? (() => 'TT');
  const header = headerFromPlan(plan, req, batch, '2026-12-02T09:00:00Z', file);
  createLog(file, opts.header ? opts.header(header) : header);
  if (accept)
    for (const d of plan.findings.filter((x) => x.severity === 'danger'))
      appendEvent(file, {
        kind: 'acknowledge',
        code: d.code,
        step: d.step ?? null,
        by: accept.by,
        time: '2026-12-02T09:05:00Z',
        ...(accept.note === undefined ? {} : { note: accept.note }),
      });
  for (const s of plan.steps)
    appendEvent(file, {
      kind: 'reading',
      step: s.index,
      source: s.source.id,
      gauge: s.gauge!.id,
      reading: `${s.targetPa} Pa`,
      pressure_Pa: s.targetPa,
      temperature: `${temperatureOf(s.index)} K`,
      temperature_K: temperatureOf(s.index),
      time: `2026-12-02T09:1${s.index}:00Z`,
      by: byOf(s.index),
    });
  appendEvent(file, { kind: 'close', time: '2026-12-02T09:30:00Z' });
  return file;
}
