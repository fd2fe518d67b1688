// Writes the demo batch log batches/demo-ch4-phi1-ar98.jsonl: the plan of the demo recipe and
// a set of invented readings as an operator might have logged them (demo data only).
// Run: npx tsx scripts/make-demo-log.ts
import { existsSync, unlinkSync } from 'node:fs';
import { planFill } from '../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../src/io/load.js';
import { appendEvent, createLog } from '../src/io/batch-log.js';
import { headerFromPlan } from '../src/io/check.js';

const file = 'batches/demo-ch4-phi1-ar98.jsonl';
const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
const plan = planFill(req.input);
if (existsSync(file)) unlinkSync(file);
createLog(file, headerFromPlan(plan, req, 'demo-ch4-phi1-ar98', '2026-11-30T09:12:00Z'));
const TORR = 101325 / 760;
// invented readings, close to the targets (10.0128 / 1480.025 / 1500.000 Torr)
const readings = [
  { torr: 10.0131, degC: 24.9, time: '2026-11-30T09:20:00Z' },
  { torr: 1480.0, degC: 25.0, time: '2026-11-30T09:41:00Z' },
  { torr: 1500.0, degC: 25.0, time: '2026-11-30T09:55:00Z' },
];
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
    note: i === 0 ? 'line purged twice with CH4 before the fill' : undefined,
  });
});
appendEvent(file, { kind: 'close', time: '2026-11-30T10:02:00Z', note: 'stirrer on 30 min' });
console.log(`wrote ${file}`);
