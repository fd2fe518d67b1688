// The logs of a two-stage fill: stage 1's header (the premix plan's steps, the stage and the
// stage-2 command), stage 2's link to its premix log, and backward compatibility of the header.
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createLog, readLog } from '../../src/io/batch-log.js';
import { stage1Header, stage2Header } from '../../src/io/stage-log.js';
import { planFrom } from '../../src/cli/plan-from.js';

const TORR = 101325 / 760;
const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const planned = planFrom(RECIPE, { premixTank: 'MT-2' });
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-stage-'));

describe('stage 1 header', () => {
  const h = stage1Header(
    planned.plan,
    planned.req,
    'b1',
    '2026-12-03T09:00:00Z',
    'mixwright fill R --premix-log L',
  );
  const premix = planned.plan.twoStage!.premix;

  it("records the premix plan's steps in the premix tank (targets identical to the plan's, 1e-9 Pa)", () => {
    expect(h.id).toBe('b1-premix');
    expect(h.tank.id).toBe('MT-2');
    expect(h.steps.map((s) => s.species)).toEqual(premix.steps.map((s) => s.species));
    h.steps.forEach((s, i) => expect(Math.abs(s.target_Pa - premix.steps[i].targetPa)).toBeLessThan(1e-9));
    // the demo's stage 1 (README two-stage table): Ar to 1636.8 Torr, then O2 to 1890.2 Torr
    expect(h.steps.map((s) => (s.target_Pa / TORR).toFixed(1))).toEqual(['1636.8', '1890.2']);
    expect(h.design.composition.O2).toBeCloseTo(premix.design.composition.O2, 12);
  });

  it('carries the stage, the batch id, the stage-2 command and the premix tank height (lab profile)', () => {
    expect(h.stage).toEqual({
      number: 1,
      of: 2,
      batch: 'b1',
      next_command: 'mixwright fill R --premix-log L',
      premix_tank: { height_m: 0.55, stirred: true },
    });
  });

  it('survives the log round trip; a header without stage (every log before) still reads', () => {
    const dir = tmp();
    const file = join(dir, 'x.jsonl');
    createLog(file, h);
    expect(readLog(file).header.stage).toEqual(h.stage);
    const old = readLog('batches/demo-ch4-phi1-ar98.jsonl');
    expect(old.header.stage).toBeUndefined();
    expect(old.readings.length).toBeGreaterThan(0);
  });

  it('stage 2 header links the premix log by a path relative to the batch log, with its sha256', () => {
    const s2 = stage2Header(
      planned.plan,
      planned.req,
      'b1',
      '2026-12-03T10:00:00Z',
      { file: '/x/batches/b1-premix.jsonl', id: 'b1-premix', sha256: 'a'.repeat(64) },
      '/x/batches/b1.jsonl',
    );
    const { premix_check, ...rest } = s2.stage!;
    expect(rest).toEqual({
      number: 2,
      of: 2,
      batch: 'b1',
      premix_log: { file: 'b1-premix.jsonl', id: 'b1-premix', sha256: 'a'.repeat(64) },
    });
    // the premix tank's check the fill asks before fill 3: the stage-2 sheet's row (README: at least
    // 621.7 Torr on head-10kT before fill 3, planned 1890.2 Torr)
    expect(premix_check).toMatchObject({ tank: 'MT-2', minimum: '621.7 Torr', fills: [3] });
    expect(premix_check!.gauge!.id).toBe('head-10kT');
  });
});
