// Premix logs for the two-stage tests: the demo's stage 1 (ch4-o2-ar-phi1, premix in MT-2), read
// at the given absolute pressures at 25 degC and closed (or not).
import { join } from 'node:path';
import { appendEvent, createLog, type LogHeader } from '../src/io/batch-log.js';
import { stage1Header } from '../src/io/stage-log.js';
import { planFrom } from '../src/cli/plan-from.js';

export const TWO_STAGE_RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
export const twoStagePlanned = planFrom(TWO_STAGE_RECIPE, { premixTank: 'MT-2' });
/** stage 1's planned targets, Pa absolute */
export const premixTargets = twoStagePlanned.plan.twoStage!.premix.steps.map((s) => s.targetPa);

export function writePremixLog(
  dir: string,
  readings: readonly number[],
  opts: { close?: boolean; batch?: string } = {},
): { file: string; header: LogHeader } {
  const batch = opts.batch ?? 'b1';
  const file = join(dir, `${batch}-premix.jsonl`);
  const p = twoStagePlanned;
  const header = stage1Header(p.plan, p.req, batch, '2026-12-03T09:00:00Z', 'mixwright fill X');
  createLog(file, header);
  header.steps.forEach((s, i) =>
    appendEvent(file, {
      kind: 'reading',
      step: s.step,
      source: s.source,
      gauge: s.gauge!,
      reading: `${(readings[i] / (101325 / 760)).toFixed(1)} Torr`,
      pressure_Pa: readings[i],
      temperature: '25.0 degC',
      temperature_K: 298.15,
      time: `2026-12-03T09:1${i}:00Z`,
      by: 'QX',
    }),
  );
  if (opts.close ?? true) appendEvent(file, { kind: 'close', time: '2026-12-03T09:30:00Z' });
  return { file, header };
}
