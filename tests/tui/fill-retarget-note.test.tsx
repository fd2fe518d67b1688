// The reading screen says "(re-targeted; planned X)" only when the target it shows differs from the
// planned one at the gauge's display step: a re-target that moves the target by less than that step
// is not a change the operator can see, and "planned 10.01" beside "STOP AT 10.01" reads as a slip.
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

async function frameOf(s: FillState): Promise<string> {
  const ui = render(<FillApp initial={s} write={() => {}} logFile="b1.jsonl" />);
  const t0 = Date.now();
  while (!ui.lastFrame()?.includes('STOP AT') && Date.now() - t0 < 5000)
    await new Promise((r) => setTimeout(r, 10));
  const f = ui.lastFrame()!.replace(/\s+/g, ' ');
  ui.unmount();
  return f;
}

describe('the re-target note on the reading screen', () => {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const h = headerFromPlan(planFill(req.input), req, 'b1', 't');
  const s0 = initialState(setupFromHeader(h));
  const plan0 = h.steps[0].target_Pa; // 10.01279 Torr on head-1kT (0.01 Torr display step)

  it('a target moved by less than the display step: STOP AT 10.01, no "(re-targeted; planned 10.01)"', async () => {
    const moved = { ...s0, targetsPa: [plan0 + 0.001 * TORR, ...s0.targetsPa.slice(1)] };
    expect(moved.targetsPa[0]).not.toBe(plan0);
    const f = await frameOf(moved);
    expect(f).toContain('STOP AT 10.01 Torr');
    expect(f).not.toContain('re-targeted');
  });

  it('a target moved by a display step or more: the note with the planned value', async () => {
    const moved = { ...s0, targetsPa: [plan0 + 0.02 * TORR, ...s0.targetsPa.slice(1)] };
    const f = await frameOf(moved);
    expect(f).toContain('STOP AT 10.03 Torr');
    expect(f).toContain('(re-targeted; planned 10.01)');
  });
});
