// Writes the demo logs of a two-stage preparation (demo data only, our invented lab), with the
// headers the guided fill writes (src/io/stage-log.ts, as `fill` calls it):
//   batches/demo-premix-o2-ar-mt2.jsonl  stage 1: the O2-in-Ar premix in MT-2 that the two-stage plan of
//                                        recipes/ch4-o2-ar-phi1.yaml chooses (`fill RECIPE --premix-tank
//                                        MT-2 --batch demo-ch4-phi1-from-premix`), filled and closed; its
//                                        header `stage` 1 of 2 with the stage-2 command
//   batches/demo-ch4-phi1-from-premix.jsonl  stage 2: the batch in MT-1 planned from that premix log
//                                        (`fill RECIPE --premix-log PREMIX`), its header naming the premix
//                                        log (`premix_logs`: the hash of its last entry; `stage`: the
//                                        sha256 of its bytes)
// with invented readings as an operator might have logged them, close to the targets. The one
// difference from `fill`: the premix log's name and id are the demo's (`fill` would call it
// demo-ch4-phi1-from-premix-premix.jsonl).
// Run: npx tsx scripts/make-demo-premix-logs.ts
import { existsSync, unlinkSync } from 'node:fs';
import type { Plan } from '../src/core/index.js';
import type { LogHeader, NewLogEvent } from '../src/io/batch-log.js';
import { fileSha256, stage1Header, stage2Header } from '../src/io/stage-log.js';
import { planFrom } from '../src/cli/plan-from.js';
import { stage2Command } from '../src/cli/stage-fill.js';
import { torrReading, writeStepLog } from './log-writer.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const PREMIX = 'batches/demo-premix-o2-ar-mt2.jsonl';
const BATCH = 'batches/demo-ch4-phi1-from-premix.jsonl';
const BATCH_ID = 'demo-ch4-phi1-from-premix';
const TORR = 101325 / 760;

/** one reading per step, read on the plan's gauge: the invented value in Torr, degC, time, note */
function fill(
  file: string,
  plan: Plan,
  header: LogHeader,
  readings: readonly { torr: number; degC: number; time: string; note?: string }[],
  close: { time: string; note: string },
  before: Readonly<Record<number, readonly NewLogEvent[]>> = {},
): void {
  writeStepLog(
    file,
    header,
    plan.steps,
    (_, i) => {
      const r = readings[i];
      return torrReading(r.torr, r.degC, r.time, r.note);
    },
    { close, before },
  );
  console.log(`wrote ${file}`);
}

// stage 1: the premix of the two-stage plan (targets 1636.765 / 1890.155 Torr on head-10kT), its
// header as `fill RECIPE --premix-tank MT-2 --batch BATCH_ID --dir batches` writes it
for (const f of [BATCH, PREMIX]) if (existsSync(f)) unlinkSync(f);
const two = planFrom(RECIPE, { premixTank: 'MT-2' });
const next = stage2Command(RECIPE, {}, PREMIX, BATCH_ID, 'batches');
const premixHeader: LogHeader = {
  ...stage1Header(two.plan, two.req, BATCH_ID, '2026-11-29T14:05:00Z', next),
  id: 'demo-premix-o2-ar-mt2',
};
const PREMIX_CLOSED = '2026-11-29T14:45:00Z';
fill(
  PREMIX,
  two.plan.twoStage!.premix,
  premixHeader,
  [
    { torr: 1636.8, degC: 25.0, time: '2026-11-29T14:21:00Z', note: 'MT-2 evacuated to 0.02 Torr first' },
    { torr: 1890.2, degC: 25.0, time: '2026-11-29T14:38:00Z' },
  ],
  { time: PREMIX_CLOSED, note: 'left overnight to mix' },
);

// stage 2: the batch from the premix log (targets 10.013 / 371.19 / 520.27 / 1500.0 Torr), its
// header as `fill RECIPE --premix-log PREMIX --batch BATCH_ID --dir batches` writes it
const batch = planFrom(RECIPE, { premixLog: PREMIX });
const premixUsed = { file: PREMIX, id: premixHeader.id, sha256: fileSha256(PREMIX)! };
const batchHeader = stage2Header(
  batch.plan,
  batch.req,
  BATCH_ID,
  '2026-11-30T10:30:00Z',
  premixUsed,
  BATCH,
  PREMIX_CLOSED,
);
const check = batchHeader.stage!.premix_check!;
fill(
  BATCH,
  batch.plan,
  batchHeader,
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
  // before the first fill from the premix, as the guided fill asks: mixed, then the premix tank read
  {
    [check.fills[0]]: [
      {
        kind: 'premix-mixed',
        tank: check.tank,
        by: 'KL',
        time: '2026-11-30T11:04:00Z',
        note: `the premix in ${check.tank} was left overnight to mix (20 h); confirmed by KL`,
      },
      {
        kind: 'premix-reading',
        tank: check.tank,
        gauge: check.gauge!.id,
        reading: '1890.1 Torr',
        pressure_Pa: 1890.1 * TORR,
        minimum_Pa: check.minimum_Pa,
        enough: 1890.1 * TORR >= check.minimum_Pa,
        by: 'KL',
        time: '2026-11-30T11:06:00Z',
      },
    ],
  },
);
