// Writes the demo logs of a two-stage preparation (demo data only, our invented lab):
//   batches/demo-premix-o2-ar-mt2.jsonl  stage 1: the O2-in-Ar premix in MT-2 that the two-stage plan of
//                                        recipes/ch4-o2-ar-phi1.yaml chooses, filled and closed
//   batches/demo-ch4-phi1-from-premix.jsonl  stage 2: the batch in MT-1 planned from that premix log
//                                        (`plan --premix-log`), its header naming the premix log
// with invented readings as an operator might have logged them, close to the targets.
// Run: npx tsx scripts/make-demo-premix-logs.ts
import { existsSync, unlinkSync } from 'node:fs';
import { planTwoStage, type Plan } from '../src/core/index.js';
import { buildPlanRequest, readRecipe, type PlanRequest } from '../src/io/load.js';
import { appendEvent, createLog } from '../src/io/batch-log.js';
import { headerFromPlan } from '../src/io/check.js';
import { twoStageInputOf } from '../src/io/two-stage-request.js';
import { mergeOptions } from '../src/cli/design-options.js';
import { planFrom } from '../src/cli/plan-from.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const TORR = 101325 / 760;

/** one reading per step, read on the plan's gauge: the invented value in Torr, degC, time, note */
function fill(
  file: string,
  plan: Plan,
  req: PlanRequest,
  id: string,
  created: string,
  readings: readonly { torr: number; degC: number; time: string; note?: string }[],
  close: { time: string; note: string },
): void {
  if (existsSync(file)) unlinkSync(file);
  createLog(file, { ...headerFromPlan(plan, req, id, created, file) });
  plan.steps.forEach((s, i) => {
    const r = readings[i];
    appendEvent(file, {
      kind: 'reading',
      step: s.index,
      source: s.source.id,
      gauge: s.gauge!.id,
      reading: `${r.torr} Torr`,
      pressure_Pa: r.torr * TORR,
      temperature: `${r.degC} degC`,
      temperature_K: r.degC + 273.15,
      time: r.time,
      note: r.note,
      charge: s.charge.of > 1 ? s.charge : undefined,
    });
  });
  appendEvent(file, { kind: 'close', ...close });
  console.log(`wrote ${file}`);
}

// stage 1: the premix of the two-stage plan (targets 1636.765 / 1890.155 Torr on head-10kT)
for (const f of [BATCH, PREMIX]) if (existsSync(f)) unlinkSync(f);
const rs = mergeOptions(readRecipe(RECIPE), { premixTank: 'MT-2' });
const req = buildPlanRequest(rs);
const two = planTwoStage(twoStageInputOf(req, rs)!);
const premixReq: PlanRequest = {
  ...req,
  recipe: { ...req.recipe, id: 'premix-o2-ar-mt2', title: 'stage 1 of ch4-phi1-ar98: O2 in Ar in MT-2' },
};
fill(
  PREMIX,
  two.premix,
  premixReq,
  'demo-premix-o2-ar-mt2',
  '2026-11-29T14:05:00Z',
  [
    { torr: 1636.8, degC: 25.0, time: '2026-11-29T14:21:00Z', note: 'MT-2 evacuated to 0.02 Torr first' },
    { torr: 1890.2, degC: 25.0, time: '2026-11-29T14:38:00Z' },
  ],
  { time: '2026-11-29T14:45:00Z', note: 'left overnight to mix' },
);

// stage 2: the batch from the premix log (targets 10.013 / 371.19 / 520.27 / 1500.0 Torr)
const batch = planFrom(RECIPE, { premixLog: PREMIX });
fill(
  BATCH,
  batch.plan,
  batch.req,
  'demo-ch4-phi1-from-premix',
  '2026-11-30T10:30:00Z',
  [
    {
      torr: 10.0129,
      degC: 25.0,
      time: '2026-11-30T10:41:00Z',
      note: 'line purged twice with CH4 before the fill',
    },
    { torr: 371.2, degC: 25.0, time: '2026-11-30T10:58:00Z' },
    { torr: 520.27, degC: 25.0, time: '2026-11-30T11:12:00Z', note: 'premix valve of MT-2 opened slowly' },
    { torr: 1500.0, degC: 25.1, time: '2026-11-30T11:30:00Z' },
  ],
  { time: '2026-11-30T11:36:00Z', note: 'stirrer on 30 min' },
);
