// The two-stage screens as pure logic: the wizard's premix field (evaluated after a pause in
// typing, never on every key; a result for values no longer on screen is dropped), its two-stage
// preview, and the end screen's block of a stage-1 fill (re-checked premix, mixing, stage-2 command).
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { FIELDS, DEFAULTS, wizardInit, wizardReducer, type Evaluate } from '../../src/tui/wizard-state.js';
import {
  buildFromValues,
  makeEvaluator,
  PENDING_LINES,
  recipeFromValues,
} from '../../src/tui/wizard-eval.js';
import { stageEndLines } from '../../src/tui/stage-state.js';
import { previewRows } from '../../src/tui/stage-preview.js';
import { appendEvent, createLog, readLog, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { stage1Header } from '../../src/io/stage-log.js';
import { planFrom } from '../../src/cli/plan-from.js';

const TORR = 101325 / 760;
const V = { ...DEFAULTS, tank: 'MT-1', dilution: '0.98' };

describe('wizard: the premix field', () => {
  it('typing in it never runs the two-stage plan: each key leaves the evaluation pending', () => {
    const calls: boolean[] = [];
    const evaluate: Evaluate = (v, full) => {
      calls.push(Boolean(full));
      return v.premix
        ? { pending: true, preview: { lines: ['wait'], danger: false } }
        : { preview: { lines: ['one'], danger: false } };
    };
    let s = wizardInit(evaluate, V);
    s = { ...s, focus: FIELDS.indexOf('premix') };
    for (const ch of 'MT-2') s = wizardReducer(s, { type: 'char', text: ch }, evaluate);
    expect(s.values.premix).toBe('MT-2');
    expect(s.evaluation.pending).toBe(true);
    expect(calls.every((full) => !full)).toBe(true);
    // the screen's evaluation after the pause, for the values on screen: taken
    const done = { preview: { lines: ['stage 1: ...'], danger: false } };
    const t = wizardReducer(s, { type: 'evaluated', values: s.values, evaluation: done }, evaluate);
    expect(t.evaluation).toBe(done);
    // for values typed over meanwhile: dropped (the next pause brings its own)
    const stale = wizardReducer(
      s,
      { type: 'evaluated', values: { ...s.values, premix: 'MT-' }, evaluation: done },
      evaluate,
    );
    expect(stale.evaluation.pending).toBe(true);
  });

  it('refuses a premix tank that is not in the lab profile, or is the batch tank, on the premix field', () => {
    const evaluate = makeEvaluator();
    expect(evaluate({ ...V, premix: 'MT-9' }).error).toMatchObject({ field: 'premix' });
    expect(evaluate({ ...V, premix: 'MT-9' }).error?.message).toContain(
      '"MT-9" is not a tank of the lab profile (MT-1, MT-2)',
    );
    expect(evaluate({ ...V, premix: 'MT-1' }).error?.message).toContain(
      'another tank than the batch (both are MT-1)',
    );
    expect(evaluate({ ...V, premix: 'MT-2' })).toEqual({
      pending: true,
      preview: { lines: PENDING_LINES, danger: false },
    });
  });

  it('the full evaluation shows both stages: the fills of each as the plan has them, U of each and the premix tank', () => {
    const v = { ...V, premix: 'MT-2' };
    expect(recipeFromValues(v).premix).toEqual({ tank: 'MT-2' });
    const lines = makeEvaluator()(v, true).preview!.lines;
    const plan = buildFromValues(v).plan;
    const two = plan.twoStage!;
    const s1 = lines.findIndex((l) => l.startsWith('stage 1: 13.4 % O2 in Ar in MT-2'));
    const s2 = lines.findIndex((l) => l.startsWith('stage 2: the batch in MT-1'));
    expect(s1).toBe(0);
    expect(s2).toBe(1 + two.premix.steps.length + 1);
    // each stage's readings on their gauges, as the plan gives them (the plan's own numbers, 0.05 Torr)
    two.premix.steps.forEach((st, i) => {
      const n = Number(/([\d.]+) Torr$/.exec(lines[s1 + 1 + i])![1]);
      expect(Math.abs(n - st.gauge!.readingPa / TORR)).toBeLessThan(0.05);
    });
    plan.steps.forEach((st, i) => {
      const n = Number(/([\d.]+) Torr$/.exec(lines[s2 + 1 + i])![1]);
      expect(Math.abs(n - st.gauge!.readingPa / TORR)).toBeLessThan(0.05);
    });
    expect(lines[s2 - 1]).toMatch(/^ {2}U x\(O2\) 0\.26 % \(tol 0\.5 %\)$/);
    expect(lines[s2 + plan.steps.length + 1]).toMatch(/^ {2}U x\(O2\) 0\.36 % \(tol 0\.5 %\)$/);
    expect(lines.find((l) => l.startsWith('MT-2 '))).toMatch(/^MT-2 1890->1841 Torr, need 572\.\d$/);
    // the preview box shows each line in rows of its width, nothing cut (stage-preview.ts previewRows): a
    // finding line too long for it (both stages carry band-edges-past-tolerance here) takes two rows
    const rows = lines.flatMap((l) => previewRows(l, 34));
    expect(rows.filter((r) => r.length > 34)).toEqual([]);
    expect(rows.join('\n')).toContain('band-edges-past-tolerance');
  });
});

describe('wizard: a premix log in the premix field (stage 2)', () => {
  it('plans the batch from the log as plan --premix-log does: the premix a source, its log named first', async () => {
    const { premixTargets, writePremixLog } = await import('../stage-logs.js');
    const { file } = writePremixLog(mkdtempSync(join(tmpdir(), 'mw-wiz-log-')), premixTargets);
    const v = { ...V, premix: file };
    expect(recipeFromValues(v).premix).toEqual({ log: file });
    const evaluate = makeEvaluator();
    expect(evaluate(v).pending).toBe(true);
    const lines = evaluate(v, true).preview!.lines;
    expect(lines[0]).toBe(`from premix log ${file} (re-checked)`);
    const plan = buildFromValues(v).plan;
    expect(plan.premixLog?.path).toBe(file);
    expect(lines.some((l) => /^3 Ar\+O2 +head-1kT 520\.\d\d Torr$/.test(l))).toBe(true);
    expect(lines.some((l) => l.startsWith('preview in the advised order'))).toBe(false);
  });

  it('an unfinished premix log is refused on the premix field, with the premix-log wording', async () => {
    const { premixTargets, writePremixLog } = await import('../stage-logs.js');
    const { file } = writePremixLog(mkdtempSync(join(tmpdir(), 'mw-wiz-log-')), premixTargets, {
      close: false,
    });
    const e = makeEvaluator()({ ...V, premix: file }, true).error;
    expect(e?.field).toBe('premix');
    expect(e?.message).toMatch(/not (finished|closed)/);
  });
});

describe('end screen of a stage-1 fill', () => {
  const planned = planFrom('recipes/ch4-o2-ar-phi1.yaml', { premixTank: 'MT-2' });
  const steps = planned.plan.twoStage!.premix.steps;

  /** the stage-1 log read at `readings` (closed once every step is read, as the fill closes it) */
  async function premixReport(readings: readonly number[], before2: NewLogEvent[] = []) {
    const file = join(mkdtempSync(join(tmpdir(), 'mw-stage-end-')), 'b1-premix.jsonl');
    createLog(
      file,
      stage1Header(
        planned.plan,
        planned.req,
        'b1',
        '2026-12-03T09:00:00Z',
        'mixwright fill R --premix-log L',
      ),
    );
    steps.slice(0, readings.length).forEach((s, i) => {
      if (i === 1) for (const e of before2) appendEvent(file, e);
      appendEvent(file, {
        kind: 'reading',
        step: s.index,
        source: s.source.id,
        gauge: s.gauge!.id,
        reading: `${readings[i] / TORR} Torr`,
        pressure_Pa: readings[i],
        temperature: '25.0 degC',
        temperature_K: 298.15,
        time: `2026-12-03T09:1${i}:00Z`,
      });
    });
    if (readings.length === steps.length) appendEvent(file, { kind: 'close', time: '2026-12-03T09:30:00Z' });
    const log = readLog(file);
    return { header: log.header, report: await checkLog(log, { trials: 0, seed: 1 }) };
  }

  it("at the targets: the premix's re-check +- U (check's model), the mixing time, and the stage-2 command", async () => {
    const { header, report } = await premixReport(steps.map((s) => s.targetPa));
    const lines = stageEndLines(header, report, true);
    expect(lines[0]).toBe('Stage 1 of 2 - the premix for batch b1');
    // x(O2) = the plan's 0.134228 (README two-stage table) +- 2u of check's GUM (0.26 % of the value)
    const o2 = report.result.composition.O2;
    expect(o2.value).toBeCloseTo(0.134228, 6);
    expect(lines).toContain(`  x(O2) 13.423 % +- 0.035 %  (U 0.26 % of the value)`);
    expect(
      lines.some((l) => /^Mixing: by diffusion alone over 55\.0 cm, .+ to 1 %, .+ to 0\.1 %/.test(l)),
    ).toBe(true);
    expect(lines.slice(-2)).toEqual([
      'Next, stage 2 (the batch from this premix), once it is mixed:',
      '  mixwright fill R --premix-log L',
    ]);
  });

  it('not closed, or its re-check not a pass: no stage-2 command, but why stage 2 will refuse it', async () => {
    const { header, report } = await premixReport([steps[0].targetPa, steps[1].targetPa + 2 * TORR]);
    expect(report.verdict.verdict).not.toBe('pass');
    const lines = stageEndLines(header, report, true);
    expect(lines.join('\n')).not.toContain('mixwright fill R');
    expect(lines[lines.length - 1]).toMatch(/^Stage 2 will refuse this premix log/);
    const ok = await premixReport(steps.map((s) => s.targetPa));
    expect(stageEndLines(ok.header, ok.report, false).join('\n')).toContain('Stage 2 will refuse');
  });

  it("at the targets and closed, but through a hazard accepted at the manifold: check's outcome is no pass, stage 2 will refuse it", async () => {
    const accepted: NewLogEvent = {
      kind: 'acknowledge',
      code: 'remainder-review',
      step: 2,
      by: 'KL',
      time: '2026-12-03T09:12:00Z',
      review: {
        trigger: 'reading',
        outcome: 'accepted',
        hazards: [{ code: 'oxygen-compression', step: 2, severity: 'warning' }],
      },
    };
    const { header, report } = await premixReport(
      steps.map((s) => s.targetPa),
      [accepted],
    );
    // the composition alone is within tolerance; the record is not a pass (check exit 6)
    expect(report.verdict.verdict).toBe('pass');
    const text = stageEndLines(header, report, true).join('\n');
    expect(text).toContain(
      'Stage 2 will refuse this premix log: its re-check is not a pass (accepted-hazard',
    );
    expect(text).not.toContain('mixwright fill R');
  });

  it('an incomplete premix (one reading, past the working limit): no U share that was not computed, no mixing advice, what to do', async () => {
    const { header, report } = await premixReport([4800 * TORR]);
    const lines = stageEndLines(header, report, true);
    const text = lines.join('\n');
    expect(text).toMatch(/x\(Ar\) 100\.000 % \(U not computed\)/);
    expect(text).not.toMatch(/not computed\)\s*\(U/);
    expect(text).not.toMatch(/^Mixing:/m);
    expect(text).toMatch(
      /Do not mix it for stage 2: vent or evacuate the premix tank and fill a new premix batch/,
    );
  });

  it('a single-tank log adds nothing', () => {
    expect(stageEndLines(readLog('batches/demo-ch4-phi1-ar98.jsonl').header, undefined, true)).toEqual([]);
  });
});

describe('wizard actions of a two-stage design', () => {
  it('start guided fill: with a premix tank, only once the recipe is saved; then the stage-1 log with its stage-2 command', async () => {
    const { wizardAct } = await import('../../src/tui/run.js');
    const dir = mkdtempSync(join(tmpdir(), 'mw-wiz-act-'));
    const ctx = {
      version: 't',
      recipesDir: join(dir, 'recipes'),
      batchesDir: join(dir, 'batches'),
      sheetsDir: dir,
    };
    const s = wizardInit(() => ({}), { ...V, id: 'w2', premix: 'MT-2' });
    const refused = wizardAct(s, 'start guided fill', ctx);
    expect(refused).toMatchObject({ kind: 'message' });
    expect((refused as { text: string }).text).toContain('a two-stage fill needs the recipe saved first');
    expect(wizardAct(s, 'save recipe', ctx)).toMatchObject({ kind: 'message', savedRecipe: true });
    const started = wizardAct(s, 'start guided fill', ctx) as {
      header: { stage?: unknown };
      logFile: string;
    };
    expect(started.logFile).toMatch(/batches\/w2-\d{8}T\d{4}-premix\.jsonl$/);
    expect(started.header.stage).toMatchObject({ number: 1, of: 2 });
    expect((started.header.stage as { next_command: string }).next_command).toMatch(
      new RegExp(
        `^mixwright fill ${join(dir, 'recipes', 'w2.yaml')} --premix-log .+-premix\\.jsonl --batch w2-`,
      ),
    );
    // the fill sheet holds both stages
    expect(wizardAct(s, 'write fill sheet', ctx)).toMatchObject({ kind: 'message' });
    const { readFileSync } = await import('node:fs');
    const html = readFileSync(join(dir, 'fill-w2.html'), 'utf8');
    expect(html).toContain('Stage 1 of 2: premix in');
  });

  it('start guided fill from a premix log: the batch log (stage 2) beside it, linked to it', async () => {
    const { wizardAct } = await import('../../src/tui/run.js');
    const { premixTargets, writePremixLog } = await import('../stage-logs.js');
    const logDir = mkdtempSync(join(tmpdir(), 'mw-wiz-act2-'));
    const { file } = writePremixLog(logDir, premixTargets);
    const s = wizardInit(() => ({}), { ...V, premix: file });
    const started = wizardAct(s, 'start guided fill', { version: 't' }) as {
      header: { stage?: unknown };
      logFile: string;
    };
    expect(started.logFile).toBe(join(logDir, 'b1.jsonl'));
    expect(started.header.stage).toMatchObject({
      number: 2,
      batch: 'b1',
      premix_log: { file: 'b1-premix.jsonl' },
    });
  });
});
