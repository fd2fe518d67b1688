// The wizard shows its finding codes whole and checks an action the same whatever its timing. A trial
// found codes cut at the preview box's 32 columns ("predicted-u-over-tolera...") and Enter on [start
// guided fill] during the pause before the plan arrived handing over without the "danger findings
// stand" message that Enter after the pause gives. The design: the wizard's defaults at 2900 Torr in MT-1
// (over its working limit, under its rating: tank-over-rating, a danger, as `mixwright plan` finds it).
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { DEFAULTS, FIELDS, ACTIONS, wizardInit, wizardReducer } from '../../src/tui/wizard-state.js';
import { makeEvaluator } from '../../src/tui/wizard-eval.js';
import { WizardApp } from '../../src/tui/wizard-app.js';
import { previewRows } from '../../src/tui/stage-preview.js';
import { planFrom } from '../../src/cli/plan-from.js';
import { untilWithin } from './until.js';

const until = untilWithin(15000);
const V = { ...DEFAULTS, id: 'wz-danger', tank: 'MT-1', pressure: '2900 Torr' };
const DANGER_MESSAGE = 'danger findings stand: the guided fill will ask you to acknowledge them';
/** focus on [start guided fill] */
const FILL = FIELDS.length + ACTIONS.indexOf('start guided fill');

describe('[start guided fill] on a design with a danger', () => {
  const evaluate = makeEvaluator();

  it('before the pause (only the quick check made) as after it: the danger message, and the fill requested', () => {
    // the premise: the plan has a danger; the quick check on each key does not know it yet
    const plan = planFrom(undefined, {
      fuel: 'CH4',
      oxidizer: 'O2',
      phi: '1',
      diluent: 'Ar',
      dilution: '0.95',
      tank: 'MT-1',
      pressure: '2900 Torr',
      temperature: '22 degC',
    }).plan;
    expect(plan.findings.filter((f) => f.severity === 'danger').map((f) => f.code)).toContain(
      'tank-over-rating',
    );
    const waiting = { ...wizardInit(evaluate, V), focus: FILL };
    expect(waiting.evaluation.pending).toBe(true);
    expect(waiting.evaluation.preview?.danger).toBe(false);
    const after = { ...waiting, evaluation: evaluate(V, true) };
    expect(after.evaluation.preview?.danger).toBe(true);
    for (const s of [waiting, after]) {
      const r = wizardReducer(s, { type: 'enter' }, evaluate);
      expect(r.request).toBe('start guided fill');
      expect(r.message).toBe(DANGER_MESSAGE);
      // the plan now on screen is the full one (its fills), not the quick check's
      expect(r.evaluation.pending).toBeFalsy();
      expect(r.evaluation.preview?.lines.some((l) => /^1 CH4 /.test(l))).toBe(true);
    }
  });

  it('the hand-over draws the message before the wizard leaves', async () => {
    let handed = 0;
    const app = (
      <WizardApp
        initial={{ ...wizardInit(evaluate, V), focus: FILL }}
        evaluate={evaluate}
        act={() => {
          handed++;
          return { kind: 'handOver' };
        }}
      />
    );
    const ui = render(app);
    await until(() => !!ui.lastFrame()?.includes('preview'), 'the wizard');
    ui.stdin.write('\r');
    await until(() => handed === 1, 'the hand-over');
    await until(() => !!ui.lastFrame()?.includes(DANGER_MESSAGE), 'the danger message');
    ui.unmount();
  });
});

describe('the preview shows finding codes whole', () => {
  const evaluate = makeEvaluator();

  it('a finding line too long for the box: severity and fill, then the code whole; other lines at their spaces', () => {
    expect(previewRows('warning predicted-u-over-tolerance (fill 3)', 32)).toEqual([
      'warning (fill 3)',
      '  predicted-u-over-tolerance',
    ]);
    expect(previewRows('DANGER stage 1 tank-over-rating (fill 2)', 32)).toEqual([
      'DANGER stage 1 (fill 2)',
      '  tank-over-rating',
    ]);
    expect(previewRows('warning band-edges-past-tolerance', 32)).toEqual([
      'warning',
      '  band-edges-past-tolerance',
    ]);
    expect(previewRows('DANGER tank-over-rating (fill 2)', 32)).toEqual(['DANGER tank-over-rating (fill 2)']);
    expect(previewRows('stage 1: 13.4 % O2 in Ar in the tank MT-2', 32)).toEqual([
      'stage 1: 13.4 % O2 in Ar in the',
      '  tank MT-2',
    ]);
  });

  for (const columns of [80, 100])
    it(`${columns} columns: every finding code of the plan whole on screen, within ${columns} x 24`, async () => {
      const app = (
        <WizardApp
          initial={wizardInit(evaluate, V)}
          evaluate={evaluate}
          act={() => ({ kind: 'message', text: 'ok' })}
        />
      );
      const ui = render(app);
      Object.defineProperty(ui.stdout, 'columns', { get: () => columns });
      ui.rerender(app);
      await until(() => /tank-over-rating/.test(ui.lastFrame() ?? ''), 'the planned findings');
      const f = ui.lastFrame()!;
      const rows = f.split('\n');
      expect(rows.length, f).toBeLessThanOrEqual(24);
      for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(columns);
      expect(f).not.toContain('…');
      // the codes the preview lists (dangers, then warnings: four at most), each whole in a row
      const codes = ['supply-pressure-low', 'tank-over-rating', 'predicted-u-over-tolerance'];
      for (const c of codes) expect(f, c).toContain(c);
      // at 80 the box is 32 columns inside: the warning's code on a row of its own; at 100 on one row
      expect(f).toContain(
        columns === 80 ? 'warning (fill 3)' : 'warning predicted-u-over-tolerance (fill 3)',
      );
      ui.unmount();
    });
});
