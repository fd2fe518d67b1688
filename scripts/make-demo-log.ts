// Writes the demo batch log batches/demo-ch4-phi1-ar98.jsonl: the plan of the demo recipe in its
// advised order (CH4, Ar, O2: without the sequence search, as the log was made) and a set of invented
// readings as an operator might have logged them (demo data only).
// Run: npx tsx scripts/make-demo-log.ts
// The committed log was written by an earlier version of the planner and of its header (no settling_K,
// safety, barometer source or charges): `check` of an older log is tested on it, so it is kept as it
// is. Running this writes the present plan's log in its place (other header and hash chain, targets in
// the last digits): do so only to replace the demo log, and update what is pinned to it.
import { planFill } from '../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../src/io/load.js';
import { headerFromPlan } from '../src/io/check.js';
import { torrReading, writeStepLog } from './log-writer.js';

const file = 'batches/demo-ch4-phi1-ar98.jsonl';
const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
const plan = planFill({ ...req.input, thermometer: undefined });
// invented readings, close to the targets (10.0128 / 1480.025 / 1500.000 Torr)
const readings = [
  torrReading(10.0131, 24.9, '2026-11-30T09:20:00Z', 'line purged twice with CH4 before the fill'),
  torrReading(1480.0, 25.0, '2026-11-30T09:41:00Z'),
  torrReading(1500.0, 25.0, '2026-11-30T09:55:00Z'),
];
writeStepLog(
  file,
  headerFromPlan(plan, req, 'demo-ch4-phi1-ar98', '2026-11-30T09:12:00Z'),
  plan.steps,
  (_, i) => readings[i],
  { close: { time: '2026-11-30T10:02:00Z', note: 'stirrer on 30 min' } },
);
console.log(`wrote ${file}`);
