// Premix logs for the two-stage tests: the demo's stage 1 (ch4-o2-ar-phi1, premix in MT-2), read
// at the given absolute pressures at 25 degC and closed (or not).
import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, type LogHeader, type NewLogEvent } from '../src/io/batch-log.js';
import { fileSha256, stage1Header, stage2Header } from '../src/io/stage-log.js';
import { planFrom } from '../src/cli/plan-from.js';
import { buildSheetModel } from '../src/report/sheet-model.js';
import { stageSheets } from '../src/report/two-stage-sheet.js';

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

/**
 * Stage 2 of the demo, batch b1 in a new temporary folder (`prefix`): the premix log read at its
 * targets and closed, the batch planned from it, its log header (`headerAt(closed)`: with the premix
 * log's close time, from which the mixing time counts) and the stage-2 sheet the plan prints.
 */
export function stage2Batch(prefix: string) {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  const { file } = writePremixLog(dir, premixTargets, {});
  const planned = planFrom(TWO_STAGE_RECIPE, { premixLog: file });
  const headerAt = (closed?: string): LogHeader =>
    stage2Header(
      planned.plan,
      planned.req,
      'b1',
      '2026-12-03T09:40:00Z',
      { file, id: 'b1-premix', sha256: fileSha256(file)! },
      join(dir, 'b1.jsonl'),
      closed,
    );
  const meta = {
    recipe: planned.req.recipe,
    labName: planned.req.lab.name,
    orderRecommended: true,
    unit: 'Torr' as const,
    version: 't',
    paper: 'a4' as const,
    lab: {
      gauges: planned.req.input.gauges,
      reading: planned.req.input.reading,
      tanks: planned.req.lab.tanks,
    },
  };
  const stage2Sheet = () => stageSheets(planned.plan, meta, buildSheetModel).at(-1)!;
  return { dir, file, planned, header: headerAt(), headerAt, stage2Sheet };
}

const DEMO_STAGE2 = 'batches/demo-ch4-phi1-from-premix.jsonl';
const DEMO_PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';

/**
 * the demo stage-2 log (its premix log beside it) made again with a premix tank that asks `restS` of rest
 * (unstirred): it was confirmed mixed 20 h after the premix log closed, so a rest over 20 h makes it drawn
 * early by the guided fill's own rule (premixMixingElapsed)
 */
export function drawnEarlyLog(restS: number): string {
  const dir = mkdtempSync(join(tmpdir(), 'mw-early-'));
  copyFileSync(DEMO_PREMIX, join(dir, 'demo-premix-o2-ar-mt2.jsonl'));
  const [head, ...events] = readFileSync(DEMO_STAGE2, 'utf8')
    .trim()
    .split('\n')
    .map((l) => JSON.parse(l) as Record<string, unknown>);
  const h = head as unknown as LogHeader;
  const pc = h.stage!.premix_check!;
  const header = {
    ...h,
    stage: { ...h.stage!, premix_check: { ...pc, mixing: { stirred: false, rest_s: restS } } },
  };
  const file = join(dir, 'b.jsonl');
  createLog(file, header as LogHeader);
  for (const e of events) {
    const { chain: _, ...rest } = e;
    appendEvent(file, rest as unknown as NewLogEvent);
  }
  return file;
}
