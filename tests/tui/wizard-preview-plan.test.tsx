// The wizard's preview shows the plan the wizard writes and starts: the fills and the predicted U of
// the same planning call as `mixwright plan` (the sequence search), never those of the advised order.
// A trial found the preview showing 3 fills (CH4, Ar, O2) and U 2.9 % while the sheet and the guided
// fill used 4 (CH4, Ar 1/2, O2, Ar 2/2) with U 0.98 %. Outside reference: the plan of the saved recipe
// as `mixwright plan` makes it (planFrom), and the log header the guided fill starts from; numbers
// compared to half a unit of the preview's last digit.
import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { render } from 'ink-testing-library';
import { DEFAULTS, wizardInit, wizardReducer } from '../../src/tui/wizard-state.js';
import { makeEvaluator, PREVIEW_WIDTH, SEARCHING_LINES } from '../../src/tui/wizard-eval.js';
import { fitLines, WizardApp } from '../../src/tui/wizard-app.js';
import { wizardAct } from '../../src/tui/run.js';
import { readLog } from '../../src/io/batch-log.js';
import { planFrom } from '../../src/cli/plan-from.js';
import type { PredictedPlan } from '../../src/core/index.js';
import { untilWithin } from './until.js';

const TORR = 101325 / 760;
const V = { ...DEFAULTS, id: 'wiz1', tank: 'MT-1', dilution: '0.98', temperature: '25 degC' };
const STEP = /^(\d+) (\S+(?: \d+\/\d+)?)\s+(\S+) ([\d.]+) Torr$/;

const until = untilWithin(10000);

describe('the wizard preview is the plan it writes and starts', () => {
  const evaluate = makeEvaluator();

  it('on each key: no fills and no U (those of the advised order are not the plan), the search said', () => {
    const e = evaluate(V);
    expect(e.pending).toBe(true);
    const lines = e.preview!.lines;
    expect(lines.filter((l) => STEP.test(l))).toEqual([]);
    expect(lines.join('\n')).not.toMatch(/\bU\b/);
    expect(lines.slice(-SEARCHING_LINES.length)).toEqual(SEARCHING_LINES);
    // said in full: no line wider than the box
    for (const l of lines) expect(l.length, l).toBeLessThanOrEqual(PREVIEW_WIDTH);
  });

  it('after the pause: the fills of the started fill and the U of `plan` for the saved recipe', () => {
    const lines = evaluate(V, true).preview!.lines;
    const steps = lines.filter((l) => STEP.test(l)).map((l) => STEP.exec(l)!);
    const dir = mkdtempSync(join(tmpdir(), 'mw-wizprev-'));
    const ctx = { version: 'test', recipesDir: dir, batchesDir: join(dir, 'b'), sheetsDir: dir };
    const s = wizardInit(evaluate, V);
    expect(wizardAct(s, 'save recipe', ctx)).toMatchObject({ text: `saved ${join(dir, 'wiz1.yaml')}` });
    const hand = wizardAct(s, 'start guided fill', ctx) as { logFile: string };
    const header = readLog(hand.logFile).header;
    // the trial's design: 4 fills, Ar split around O2
    expect(header.steps.map((st) => st.species)).toEqual(['CH4', 'Ar', 'O2', 'Ar']);
    expect(steps.map((m) => m[2])).toEqual(['CH4', 'Ar 1/2', 'O2', 'Ar 2/2']);
    header.steps.forEach((st, i) => {
      const m = steps[i];
      expect(Number(m[1])).toBe(st.step);
      expect(m[3]).toBe(st.gauge);
      const half = 0.5 * 10 ** -(m[4].split('.')[1]?.length ?? 0);
      expect(Math.abs(Number(m[4]) - st.target_Pa / TORR)).toBeLessThanOrEqual(half + 1e-9);
    });
    // the predicted U of the worst fraction, as `mixwright plan` predicts it for the saved recipe
    const planned = planFrom(join(dir, 'wiz1.yaml'), {}).plan as PredictedPlan;
    const rows = planned.predicted!.rows.filter((r) => r.kind === 'fraction');
    const w = rows.reduce((a, b) => (b.expandedU / b.tolerance > a.expandedU / a.tolerance ? b : a));
    const u = lines.find((l) => l.startsWith('U x('))!;
    expect(u).toContain(`x(${w.name})`);
    const shown = Number(/\) ([\d.]+) %/.exec(u)![1]);
    expect(Math.abs(shown - (100 * w.expandedU) / w.design)).toBeLessThanOrEqual(0.005 + 1e-9);
    expect(shown).toBeLessThan(1.5); // not the advised order's 2.9 %
    for (const l of lines.filter((x) => !x.startsWith('warning') && !x.startsWith('DANGER')))
      expect(l.length, l).toBeLessThanOrEqual(PREVIEW_WIDTH);
  });

  it('on screen: the searched fills replace the waiting lines after a pause; an edit waits again', async () => {
    const ui = render(
      <WizardApp
        initial={{ ...wizardInit(evaluate, V), focus: 5 }}
        evaluate={evaluate}
        act={() => ({ kind: 'message', text: 'ok' })}
      />,
    );
    expect(ui.lastFrame()).toContain('fills: searching the order ...');
    expect(ui.lastFrame()).not.toMatch(/\d O2\s+head-/);
    await until(() => /4 Ar 2\/2\s+head-10kT 1500\.0 Torr/.test(ui.lastFrame() ?? ''), 'the searched plan');
    expect(ui.lastFrame()).toMatch(/U x\(O2\) 0\.98 %/);
    expect(ui.lastFrame()).not.toContain('searching');
    ui.stdin.write('\x7f'); // dilution 0.9: planned again after a pause
    await until(() => (ui.lastFrame() ?? '').includes('searching the order'), 'the waiting lines');
    expect(ui.lastFrame()).not.toMatch(/Ar 2\/2/);
    ui.unmount();
  });

  it('lines past the box are counted on its last row, not cut silently', () => {
    expect(fitLines(['a', 'b'], 3)).toEqual(['a', 'b']);
    expect(fitLines(['a', 'b', 'c', 'd'], 3)).toEqual(['a', 'b', '+2 more lines: mixwright plan']);
    // the reducer keeps an edit pending until the screen's evaluation comes back
    const s = wizardReducer({ ...wizardInit(evaluate, V), focus: 5 }, { type: 'char', text: '1' }, evaluate);
    expect(s.evaluation.pending).toBe(true);
  });
});
