// The reminder before a fill that creates a plan danger comes from the review of the current targets:
// after a capped re-target (go on the capped screen) the fill that no longer reaches the plan's danger
// says so, with no DANGER AT THIS FILL screen; where the targets still reach it, the reminder stands with
// the danger as the review of the current targets finds it.
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { frame80, read } from './frame80.js';

const NOW = '2026-12-01T01:00:00Z';

/** CH4/O2 phi 1 in 80 % Ar, 1500 Torr in MT-1, filled Ar, CH4, O2: the finished batch is a plan danger */
function header() {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const recipe = {
    ...rs.recipe,
    mixture: { ...rs.recipe.mixture, dilution: 0.8 },
    order: ['Ar', 'CH4', 'O2'],
  };
  const req = buildPlanRequest({ ...rs, recipe } as typeof rs);
  return headerFromPlan(planFill(req.input), req, 'd1', '2026-12-01T00:00:00Z');
}

const flat = (f: string) => f.replace(/\s+/g, ' ');
const target = (s: FillState) => fromPa(s.targetsPa[s.current], 'Torr').toFixed(1);

describe('the reminder of a plan danger after a capped re-target', () => {
  const h = header();
  const dangers = (h.findings ?? []).filter((f) => f.severity === 'danger').map((f) => `${f.code}@${f.step}`);
  // the plan's dangers at fill 3 (the finished batch: detonable, and its closed-vessel peak above the limit)
  it('the plan has its dangers at fill 3', () => {
    expect(dangers).toEqual(expect.arrayContaining(['detonable-state@3', 'closed-vessel-pressure@3']));
  });
  const s0 = initialState(setupFromHeader(h));
  const acked = fillReducer(fillReducer(s0, { type: 'char', text: 'accept JD' }), {
    type: 'enter',
    now: NOW,
  });
  expect(acked.phase).toBe('reading');

  it('Ar read at 2600 Torr for 1200.4, go on the capped screen: fill 3 opens on its reading screen, the plan danger said avoided', () => {
    const capped = read(acked, '2600', 2);
    expect(capped.phase).toBe('capped');
    const go = read(capped, 'go JD');
    expect(go.phase).toBe('reading');
    const s2 = read(go, target(go), 3);
    // the capped fills end at 96.3 % Ar (CH4 1.2 %, O2 2.5 %): the review of the current targets finds
    // neither danger at fill 3, which it finds on the plan's targets
    expect(s2.current).toBe(2);
    expect(s2.phase).toBe('reading');
    const f = flat(frame80(s2));
    expect(f).not.toContain('DANGER AT THIS FILL');
    expect(f).toContain(
      "the plan's DANGER detonable-state, closed-vessel-pressure (this fill; accepted at the start): not reached by the re-targeted fills",
    );
    expect(f).not.toMatch(/^DANGER detonable-state/m);
    // the plan's warning of the finished batch (flammable-mixture) is not reached either: said so, not as a warning
    expect(f).toContain(
      "the plan's warning flammable-mixture (this fill): not reached by the re-targeted fills",
    );
    expect(f).not.toContain('warning flammable-mixture (this fill, the plan)');
  });

  it('the fills read at their targets: the reminder stands, the dangers as the review of the current targets finds them', () => {
    const s1 = read(acked, target(acked), 2);
    const s2 = read(s1, target(s1), 3);
    expect(s2.phase).toBe('reminder');
    const f = flat(frame80(s2));
    expect(f).toContain('fill 3 of 3: DANGER AT THIS FILL');
    expect(f).toContain('- detonable-state (as the review of the current targets finds it):');
    expect(f).toContain('- closed-vessel-pressure (as the review of the current targets finds it):');
    // past the reminder, the fill's screen keeps the plan's warning of the finished batch
    const screen = flat(frame80(fillReducer(s2, { type: 'enter', now: NOW })));
    expect(screen).toContain('warning flammable-mixture (this fill, the plan)');
  });

  it('a reminder taller than the terminal (80 x 18): each danger by its name and what to do, ? the whole text', async () => {
    const s1 = read(acked, target(acked), 2);
    const s2 = read(s1, target(s1), 3);
    expect(s2.phase).toBe('reminder');
    const ui = render(<FillApp initial={s2} write={() => {}} logFile="d1.jsonl" />);
    Object.defineProperty(ui.stdout, 'columns', { get: () => 80 });
    Object.defineProperty(ui.stdout, 'rows', { get: () => 18 });
    ui.rerender(<FillApp initial={s2} write={() => {}} logFile="d1.jsonl" />);
    const f = ui.lastFrame()!;
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(18);
    expect(rows[0]).toBe('mixwright fill d1 - fill 3 of 3: DANGER AT THIS FILL');
    const t = flat(f);
    expect(t).toContain(
      '- detonable-state: lower the pressure of this state, dilute it more, or change the fill order',
    );
    expect(t).toContain(
      '- closed-vessel-pressure: lower the pressure of this state or change the fill order',
    );
    expect(t).toContain('?: the whole text');
    ui.stdin.write('?');
    for (let k = 0; k < 300 && !ui.lastFrame()!.includes('THE WHOLE TEXT'); k++)
      await new Promise((r) => setTimeout(r, 10));
    expect(ui.lastFrame()).toContain('THE WHOLE TEXT');
    ui.stdin.write('b');
    for (let k = 0; k < 300 && !ui.lastFrame()!.includes('DANGER AT THIS FILL'); k++)
      await new Promise((r) => setTimeout(r, 10));
    expect(ui.lastFrame()).toContain('DANGER AT THIS FILL');
    ui.unmount();
  });
});
