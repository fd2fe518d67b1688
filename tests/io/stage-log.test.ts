// The logs of a two-stage fill: stage 1's header (the premix plan's steps, the stage and the
// stage-2 command), backward compatibility of the header, and the gate stage 2 puts on a premix
// log (closed, no danger, a re-check that passes, the same bytes).
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, readLog, type LogHeader } from '../../src/io/batch-log.js';
import { fileSha256, premixLogGate, stage1Header, stage2Header } from '../../src/io/stage-log.js';
import { planFrom } from '../../src/cli/plan-from.js';
import { ProblemError } from '../../src/core/index.js';

const TORR = 101325 / 760;
const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';
const planned = planFrom(RECIPE, { premixTank: 'MT-2' });
const tmp = () => mkdtempSync(join(tmpdir(), 'mw-stage-'));

/** a premix log filled at the given readings (Pa) and closed, at the plan's temperature */
function premixLog(
  dir: string,
  readings: readonly number[],
  close = true,
): { file: string; header: LogHeader } {
  const file = join(dir, 'b1-premix.jsonl');
  const header = stage1Header(planned.plan, planned.req, 'b1', '2026-12-03T09:00:00Z', 'mixwright fill X');
  createLog(file, header);
  header.steps.forEach((s, i) =>
    appendEvent(file, {
      kind: 'reading',
      step: s.step,
      source: s.source,
      gauge: s.gauge!,
      reading: `${(readings[i] / TORR).toFixed(1)} Torr`,
      pressure_Pa: readings[i],
      temperature: '25.0 degC',
      temperature_K: 298.15,
      time: `2026-12-03T09:1${i}:00Z`,
      by: 'QX',
    }),
  );
  if (close) appendEvent(file, { kind: 'close', time: '2026-12-03T09:30:00Z' });
  return { file, header };
}

async function refusal(p: Promise<unknown>): Promise<ProblemError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof ProblemError) return e;
    throw e;
  }
  throw new Error('not refused');
}

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
    expect(s2.stage).toEqual({
      number: 2,
      of: 2,
      batch: 'b1',
      premix_log: { file: 'b1-premix.jsonl', id: 'b1-premix', sha256: 'a'.repeat(64) },
    });
  });
});

describe('the premix log gate of stage 2', () => {
  const targets = planned.plan.twoStage!.premix.steps.map((s) => s.targetPa);

  it('a closed premix log read at its targets passes; its re-check is the one check gives', async () => {
    const { file } = premixLog(tmp(), targets);
    const g = await premixLogGate(file, { batch: 'b1' });
    expect(g.report.verdict.verdict).toBe('pass');
    expect(g.sha256).toBe(fileSha256(file));
    // x(O2) of the premix: the plan's design 13.4228 % (README two-stage table), re-checked within 1e-6
    expect(g.report.result.composition.O2.value).toBeCloseTo(0.134228, 6);
  });

  it('refuses an unfinished premix log (premix-open), naming the resume command', async () => {
    const { file } = premixLog(tmp(), targets, false);
    const e = await refusal(premixLogGate(file));
    expect(e.problem).toMatchObject({
      code: 'stage-fill',
      cause: { kind: 'premix-open', logged: 2, steps: 2 },
    });
  });

  it('refuses a premix whose re-check is not shown within tolerance (O2 read 1 Torr high: premix-unproven)', async () => {
    const { file } = premixLog(tmp(), [targets[0], targets[1] + TORR]);
    const e = await refusal(premixLogGate(file));
    expect(e.problem).toMatchObject({ code: 'stage-fill', cause: { kind: 'premix-unproven' } });
  });

  it('refuses a premix log whose reading passed the tank working limit (premix-danger)', async () => {
    const limit = planned.plan.twoStage!.premix.tank.ratedPressurePa! * 0.9;
    const { file } = premixLog(tmp(), [targets[0], limit * 1.01]);
    const e = await refusal(premixLogGate(file));
    expect(e.problem).toMatchObject({ code: 'stage-fill', cause: { kind: 'premix-danger' } });
  });

  it('refuses a premix log that changed since the batch started from it (premix-changed), and one of another batch', async () => {
    const { file } = premixLog(tmp(), targets);
    const before = fileSha256(file)!;
    writeFileSync(file, readFileSync(file, 'utf8').replace('"QX"', '"QY"'));
    const e = await refusal(premixLogGate(file, { sha256: before }));
    expect(e.problem).toMatchObject({
      code: 'stage-fill',
      cause: { kind: 'premix-changed', expected: before },
    });
    const { file: f2 } = premixLog(tmp(), targets);
    const o = await refusal(premixLogGate(f2, { batch: 'b2' }));
    expect(o.problem).toMatchObject({
      code: 'stage-fill',
      cause: { kind: 'premix-other-batch', batch: 'b1' },
    });
  });
});
