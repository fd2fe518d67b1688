import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { planFill, ProblemError } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { WizardApp } from '../../src/tui/wizard-app.js';
import { DEFAULTS, wizardInit, wizardReducer } from '../../src/tui/wizard-state.js';
import { makeEvaluator } from '../../src/tui/wizard-eval.js';
import type { NewLogEvent } from '../../src/io/batch-log.js';
import { splitHeader } from '../split-plan.js';
import { untilWithin } from './until.js';

const tick = () => new Promise((r) => setTimeout(r, 30));
/** wait until the screen (or the log) shows what the test expects: input is handled asynchronously, and slower under load */
const until = untilWithin(5000);

/** the demo recipe in the three-fill order the advice gives (the sequence search would split the Ar) */
function threeFills(rs: ReturnType<typeof readRecipe>): ReturnType<typeof readRecipe> {
  return { ...rs, recipe: { ...rs.recipe, order: ['CH4', 'Ar', 'O2'] } };
}

/** the guided fill of the demo recipe, its log events handed to write */
function startDemoFill(write: (e: NewLogEvent) => void) {
  const req = buildPlanRequest(threeFills(readRecipe('recipes/ch4-o2-ar-phi1.yaml')));
  const h = headerFromPlan(planFill(req.input), req, 'b1', 't');
  return render(<FillApp initial={initialState(setupFromHeader(h))} write={write} logFile="b1.jsonl" />);
}

/**
 * the end screen's text: its first page (the verdict) and the tank label, on it or on its own page
 * (l), in parts (n) when taller than the screen; every page fits 24 rows
 */
async function endText(ui: ReturnType<typeof render>): Promise<string> {
  await until(() => !!ui.lastFrame()?.includes('Re-check of the log'), 'the re-check', 15000);
  let text = ui.lastFrame()!;
  expect(text.split('\n').length).toBeLessThanOrEqual(24);
  if (text.includes('Tank label')) return text;
  ui.stdin.write('l');
  await until(() => !!ui.lastFrame()?.includes('Tank label'), 'the label page');
  for (let k = 2; ; k++) {
    const page = ui.lastFrame()!;
    expect(page.split('\n').length).toBeLessThanOrEqual(24);
    text += `\n${page}`;
    if (!page.includes('n: next part') || new RegExp(`part (\\d+) of \\1`).test(page)) return text;
    ui.stdin.write('n');
    await until(() => !!ui.lastFrame()?.includes(`part ${k} of`), `part ${k}`);
  }
}

describe('fill screen (ink)', () => {
  it('shows the target large with its band and gauge; a typed reading is written before the next step shows', async () => {
    const written: NewLogEvent[] = [];
    const ui = startDemoFill((e) => written.push(e));
    await until(() => !!ui.lastFrame()?.includes('STOP AT 10.01 Torr'), 'the first target');
    expect(ui.lastFrame()).toContain('head-1kT');
    expect(ui.lastFrame()).toContain('close off head-10T');
    // the band rounded inward at the gauge's 0.01 Torr: 10.01276 - 0.05 = 9.96276 shows as 9.97, not 9.96
    expect(ui.lastFrame()).toContain('band 9.97 - 10.06 Torr');
    ui.stdin.write('10.0128');
    await until(() => !!ui.lastFrame()?.includes('10.0128'), 'the typed reading');
    ui.stdin.write('\r');
    await until(() => written.length > 0 && !!ui.lastFrame()?.includes('fill 2 of 3'), 'the next step');
    expect(written).toHaveLength(1);
    expect(ui.lastFrame()).toContain('fill 2 of 3');
    expect(ui.lastFrame()).toMatch(/fill 1 logged/);
    // the course check speaks of values only: whether the batch is shown within is the re-check's
    const flat = ui.lastFrame()!.replace(/\s+/g, ' ');
    expect(flat).toContain('Composition (values, not U): the remaining fills bring each within tolerance');
    expect(flat).not.toMatch(/\bok\b(?! )|\) ok\b/);
    ui.unmount();
  });
  it('keys that arrive one by one faster than the screen redraws are all taken: the logged reading is the one typed', async () => {
    const written: NewLogEvent[] = [];
    const ui = startDemoFill((e) => written.push(e));
    await until(() => !!ui.lastFrame()?.includes('STOP AT 10.01 Torr'), 'the first target');
    for (const ch of '10.0128') ui.stdin.write(ch);
    ui.stdin.write('\r');
    await until(() => written.length > 0, 'the logged reading');
    const e = written[0] as { kind: string; reading: string; pressure_Pa: number };
    expect(e.kind).toBe('reading');
    expect(e.reading).toBe('10.0128 Torr');
    expect(e.pressure_Pa).toBeCloseTo((10.0128 * 101325) / 760, 9); // Torr = 101325/760 Pa exactly
    ui.unmount();
  });

  it('if the log cannot be written, the reading is not taken', async () => {
    const ui = startDemoFill(() => {
      throw new Error('disk full');
    });
    await until(() => !!ui.lastFrame()?.includes('fill 1 of 3'), 'the first step');
    ui.stdin.write('10.0128\r');
    await until(() => !!ui.lastFrame()?.includes('NOT recorded'), 'the refusal');
    expect(ui.lastFrame()).toContain('fill 1 of 3');
    ui.unmount();
  });

  it("a log writer's typed problem is shown in words (the cause and that the event was NOT logged), not as its code", async () => {
    const ui = startDemoFill(() => {
      throw new ProblemError(
        {
          code: 'write-failed',
          cause: { kind: 'short-write', written: 40, expected: 300 },
          outcome: 'the event was NOT logged',
        },
        { file: 'b.jsonl' },
      );
    });
    await until(() => !!ui.lastFrame()?.includes('fill 1 of 3'), 'the first step');
    ui.stdin.write('10.0128\r');
    await until(() => !!ui.lastFrame()?.includes('NOT recorded'), 'the refusal');
    const frame = (ui.lastFrame() ?? '').replace(/\s+/g, ' ');
    expect(frame).toMatch(/only 40 of 300 bytes reached the disk/);
    expect(frame).toMatch(/the event was NOT logged/);
    expect(frame).not.toMatch(/: write-failed;/);
    ui.unmount();
  });
});

describe('fill screens: danger, end, Ctrl-C (ink)', () => {
  it('a danger accepted at the review of the remaining fills is shown on the fill that creates it, each time its screen is on', async () => {
    // the split demo (CH4, Ar to 400 Torr, O2, Ar): CH4 read 40 % high makes igniting the tank after
    // O2 (fill 3) pass the working limit (closed-vessel-pressure, checked in tests/tui/fill-review.test.ts)
    const ui = render(
      <FillApp initial={initialState(setupFromHeader(splitHeader()))} write={() => {}} logFile="s.jsonl" />,
    );
    const flat = () => (ui.lastFrame() ?? '').replace(/\s+/g, ' ');
    await until(() => flat().includes('fill 1 of 4'), 'the first fill');
    ui.stdin.write('14.0179\r');
    await until(() => flat().includes('accept INITIALS'), 'the review');
    ui.stdin.write('accept TT\r');
    await until(() => flat().includes('fill 2 of 4') && !flat().includes('accept INITIALS'), 'fill 2');
    // fill 2 (Ar) does not create it: not shown there
    expect(flat()).not.toContain('closed-vessel-pressure (this fill');
    ui.stdin.write('400.00\r');
    await until(() => flat().includes('DANGER AT THIS FILL'), 'the reminder of fill 3');
    expect(flat()).toMatch(
      /accepted at the review of the remaining fills \(logged\): - closed-vessel-pressure: ignited at/,
    );
    ui.stdin.write('\r');
    const shown =
      /DANGER closed-vessel-pressure \(this fill; accepted at the review of the remaining fills, logged\): ignited at [\d.]+ Torr it reaches [\d.]+ Torr \(working limit [\d.]+ Torr\)/;
    await until(() => flat().includes('STOP AT') && shown.test(flat()), 'the danger on the O2 screen');
    // still there after a refused entry
    ui.stdin.write('abc\r');
    await until(() => flat().includes('! '), 'the refusal');
    expect(flat()).toMatch(shown);
    ui.unmount();
  });

  const TORR = 101325 / 760;
  it('a reading past the working limit is written at once, then the danger screen with the vent-back reading; the choice is written beside it', async () => {
    const written: NewLogEvent[] = [];
    const ui = startDemoFill((e) => written.push(e));
    await until(() => !!ui.lastFrame()?.includes('STOP AT 10.01 Torr'), 'the first target');
    ui.stdin.write('10.01\r');
    await until(() => !!ui.lastFrame()?.includes('fill 2 of 3'), 'fill 2');
    ui.stdin.write('2800\r');
    await until(() => !!ui.lastFrame()?.includes('ABOVE THE WORKING LIMIT'), 'the danger screen');
    const f = ui.lastFrame()!.replace(/\s+/g, ' ');
    expect(f).toMatch(
      /2800\.0 Torr absolute, 99\.8 Torr above the working limit of MT-1 \(2700\.2 Torr absolute\)/,
    );
    expect(f).toMatch(/Close the cylinder valve and the tank valve now/);
    expect(f).toMatch(
      /Vent or pump back by 13\d\d\.\d Torr, until head-10kT reads at most 14\d\d\.\d Torr \(the vent target 14\d\d\.\d+ Torr absolute/,
    );
    expect(f).toMatch(/The reading is logged/);
    expect(f).toMatch(/After venting .*the composition is (NOT )?within the tolerance/);
    expect(written.map((e) => e.kind)).toEqual(['reading', 'reading']);
    ui.stdin.write('accept JD\r');
    await until(() => !!ui.lastFrame()?.includes('STOPPED after fill 2 of 3'), 'the stop');
    expect(written.map((e) => e.kind)).toEqual(['reading', 'reading', 'acknowledge', 'close']);
    ui.unmount();
  });

  it("the end screen shows check's verdict and the label from the as-filled composition, marked FAIL when it failed", async () => {
    const { mkdtempSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const { createLog, appendEvent, readLog } = await import('../../src/io/batch-log.js');
    const { checkLog } = await import('../../src/io/check.js');
    const req = buildPlanRequest(threeFills(readRecipe('recipes/ch4-o2-ar-phi1.yaml')));
    const h = headerFromPlan(planFill(req.input), req, 'b1', 't');
    const file = join(mkdtempSync(join(tmpdir(), 'mw-end-')), 'b1.jsonl');
    createLog(file, h);
    const recheck = async () => {
      const log = readLog(file);
      return { report: await checkLog(log, { trials: 0, seed: 1 }), log };
    };
    const ui = render(
      <FillApp
        initial={initialState(setupFromHeader(h))}
        write={(e) => appendEvent(file, e)}
        logFile={file}
        recheck={recheck}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('STOP AT 10.01 Torr'), 'the first target');
    // Ar 1 % over (still well inside the limit): the dilution is off and cannot come back
    ui.stdin.write('10.01\r');
    await until(() => !!ui.lastFrame()?.includes('fill 2 of 3'), 'fill 2');
    ui.stdin.write('1495\r');
    await until(() => !!ui.lastFrame()?.includes('fill 3 of 3'), 'fill 3');
    expect(ui.lastFrame()).toMatch(/OFF COURSE/);
    const t3 = /STOP AT ([\d.]+) Torr/.exec(ui.lastFrame()!)![1];
    ui.stdin.write(`${t3}\r`);
    const f = await endText(ui);
    expect(f).toMatch(/Re-check of the log \(mixwright check\): FAIL/);
    expect(f).toMatch(/\*\*\* FAIL/);
    expect(f).toMatch(/DO NOT USE AS THE DESIGN MIXTURE/);
    // the label's CH4 is the as-filled value from the readings, not the design's 0.6667 %
    const rep = (await recheck()).report;
    const ch4 = rep.result.composition.CH4.value * 100;
    expect(Math.abs(ch4 / ((0.02 / 3) * 100) - 1)).toBeGreaterThan(0.005);
    expect(f).toContain(`CH4      ${ch4.toFixed(4).slice(0, 5)}`);
    expect(f).not.toContain('0.6667 %');
    void TORR;
    ui.unmount();
  });

  it("an accepted reading past the working limit: the end screen shows check's DANGER caveat beside the verdict and in the label box, and hands the report to the shell", async () => {
    const { mkdtempSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const { createLog, appendEvent, readLog } = await import('../../src/io/batch-log.js');
    const { checkLog } = await import('../../src/io/check.js');
    const req = buildPlanRequest(threeFills(readRecipe('recipes/ch4-o2-ar-phi1.yaml')));
    const h = headerFromPlan(planFill(req.input), req, 'b1', 't');
    const file = join(mkdtempSync(join(tmpdir(), 'mw-danger-')), 'b1.jsonl');
    createLog(file, h);
    const recheck = async () => {
      const log = readLog(file);
      return { report: await checkLog(log, { trials: 0, seed: 1 }), log };
    };
    let caveats: readonly string[] | undefined;
    const ui = render(
      <FillApp
        initial={initialState(setupFromHeader(h))}
        write={(e) => appendEvent(file, e)}
        logFile={file}
        recheck={recheck}
        onReport={(r) => (caveats = r.caveats)}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('STOP AT 10.01 Torr'), 'the first target');
    ui.stdin.write('10.01\r');
    await until(() => !!ui.lastFrame()?.includes('fill 2 of 3'), 'fill 2');
    ui.stdin.write('2800\r');
    await until(() => !!ui.lastFrame()?.includes('ABOVE THE WORKING LIMIT'), 'the danger screen');
    // logged before the choice: the file holds it now
    expect(readLog(file).readings.map((r) => r.step)).toEqual([1, 2]);
    ui.stdin.write('accept JD\r');
    const f = (await endText(ui)).replace(/\s+/g, ' ');
    await until(() => caveats !== undefined, 'the report handed to the shell');
    expect(caveats!.some((c) => /^DANGER:/.test(c))).toBe(true);
    expect(f).toMatch(/ \(see the notes below\)/);
    // beside the verdict, and once inside the label box (its lines carry the caveat; the box adds none)
    expect(f.match(/DANGER: a logged reading went past the tank's working limit/g)?.length).toBe(2);
    expect(f.match(/! DANGER: a logged reading went past the tank's working limit/g)?.length).toBe(2);
    expect(f).toMatch(/do not label or use this tank as fit/);
    ui.unmount();
  });

  it('Ctrl-C stops the fill and reports it to the shell (which exits 130)', async () => {
    let stopped = 0;
    const req = buildPlanRequest(threeFills(readRecipe('recipes/ch4-o2-ar-phi1.yaml')));
    const h = headerFromPlan(planFill(req.input), req, 'b1', 't');
    const ui = render(
      <FillApp
        initial={initialState(setupFromHeader(h))}
        write={() => undefined}
        logFile="b1.jsonl"
        onInterrupt={() => stopped++}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('fill 1 of 3'), 'the first step');
    ui.stdin.write('\x03');
    await until(() => stopped === 1, 'the interrupt');
    ui.unmount();
  });
});

describe('wizard (reducer and screen)', () => {
  const evaluate = makeEvaluator();
  it('reducer: typing edits the focused field and re-evaluates; an invalid phi is marked with its reason; Tab completes a species', () => {
    let s = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' });
    expect(s.evaluation.preview).toBeDefined();
    s = wizardReducer(s, { type: 'down' }, evaluate); // oxidizer
    s = wizardReducer(s, { type: 'down' }, evaluate); // phi
    s = wizardReducer(s, { type: 'backspace' }, evaluate);
    s = wizardReducer(s, { type: 'char', text: '-1' }, evaluate);
    expect(s.evaluation.error?.field).toBe('phi');
    expect(s.evaluation.error?.message).toMatch(/greater than zero/);
    s = wizardReducer(s, { type: 'up' }, evaluate);
    s = wizardReducer(s, { type: 'up' }, evaluate); // fuel
    for (let i = 0; i < 3; i++) s = wizardReducer(s, { type: 'backspace' }, evaluate);
    s = wizardReducer(s, { type: 'char', text: 'C2H' }, evaluate);
    s = wizardReducer(s, { type: 'complete' }, evaluate);
    expect(s.values.fuel).toMatch(/^C2H/);
    expect(s.values.fuel.length).toBeGreaterThan(3);
  });
  it('reducer: an action on an invalid design is refused; on a valid one it is requested', () => {
    let s = wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' });
    for (let i = 0; i < 9; i++) s = wizardReducer(s, { type: 'down' }, evaluate); // from fuel to "save recipe"
    expect(wizardReducer(s, { type: 'enter' }, evaluate).request).toBe('save recipe');
    const bad = { ...s, evaluation: { error: { message: 'x' } } };
    const r = wizardReducer(bad, { type: 'enter' }, evaluate);
    expect(r.request).toBeUndefined();
    expect(r.message).toMatch(/fix the design first/);
  });
  it('screen: fields, the live preview and the reason next to a bad field', async () => {
    const ui = render(
      <WizardApp
        initial={wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' })}
        evaluate={evaluate}
        act={() => ({ kind: 'message', text: 'ok' })}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the preview');
    // the fills: the plan's (the sequence search), after a short pause
    await until(() => /1 CH4\s+head-1kT/.test(ui.lastFrame() ?? ''), 'the planned fills');
    ui.stdin.write('\x1b[B'); // down: oxidizer
    await tick();
    ui.stdin.write('\x7f\x7fN2');
    await until(() => /oxidizer\s+N2\s+!/.test(ui.lastFrame() ?? ''), 'the refused oxidizer');
    expect(ui.lastFrame()).toContain('the oxidizer carries no oxygen');
    ui.unmount();
  });
  it('screen: keys sent one by one without waiting for a redraw all land in the field', async () => {
    const ui = render(
      <WizardApp
        initial={wizardInit(evaluate, { ...DEFAULTS, tank: 'MT-1' })}
        evaluate={evaluate}
        act={() => ({ kind: 'message', text: 'ok' })}
      />,
    );
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the preview');
    for (const k of ['\x1b[B', '\x7f', '\x7f', 'N', '2']) ui.stdin.write(k);
    await until(() => /oxidizer\s+N2\s+!/.test(ui.lastFrame() ?? ''), 'the refused oxidizer');
    ui.unmount();
  });
});

describe('wizard actions', () => {
  it('save recipe writes a recipe that plans to the same design; write fill sheet writes HTML; an existing file is not overwritten without a yes', async () => {
    const { mkdtempSync, readFileSync, existsSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const { wizardAct } = await import('../../src/tui/run.js');
    const { readRecipe, buildPlanRequest } = await import('../../src/io/load.js');
    const dir = mkdtempSync(join(tmpdir(), 'mw-wiz-'));
    const evaluate = makeEvaluator();
    const s = wizardInit(evaluate, { ...DEFAULTS, id: 'wz1', tank: 'MT-1', dilution: '0.98' });
    const ctx = { version: 'test', recipesDir: dir, batchesDir: join(dir, 'b'), sheetsDir: dir };
    expect(wizardAct(s, 'save recipe', ctx)).toMatchObject({ text: `saved ${join(dir, 'wz1.yaml')}` });
    const req = buildPlanRequest(readRecipe(join(dir, 'wz1.yaml')));
    expect(req.input.design.composition.Ar).toBeCloseTo(0.98, 12);
    expect(wizardAct({ ...s, values: { ...s.values, dilution: '0.97' } }, 'save recipe', ctx)).toMatchObject({
      kind: 'confirm',
    });
    expect(wizardAct(s, 'write fill sheet', ctx)).toMatchObject({
      text: expect.stringMatching(/saved .*fill-wz1\.html/),
    });
    expect(readFileSync(join(dir, 'fill-wz1.html'), 'utf8')).toContain('<svg');
    const hand = wizardAct(s, 'start guided fill', ctx);
    expect(typeof hand).toBe('object');
    expect(existsSync((hand as { logFile: string }).logFile)).toBe(true);
  });
});
