// The fill screens of a two-stage preparation (ink): stage 1 names the premix tank it fills and that
// it is stage 1 of 2, on every screen; a single-tank fill's title is unchanged.
import { describe, expect, it } from 'vitest';
import { render } from 'ink-testing-library';
import { FillApp } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { fillTitle } from '../../src/tui/stage-state.js';
import { stage1Header } from '../../src/io/stage-log.js';
import { planFrom } from '../../src/cli/plan-from.js';
import { readLog } from '../../src/io/batch-log.js';
import { untilWithin } from './until.js';

const until = untilWithin(5000);
const flat = (s: string | undefined) => (s ?? '').replace(/\s+/g, ' ');

describe('stage-1 fill screens name the premix tank', () => {
  const planned = planFrom('recipes/ch4-o2-ar-phi1.yaml', { premixTank: 'MT-2' });
  const h = stage1Header(planned.plan, planned.req, 'b1', '2026-12-03T09:00:00Z', 'mixwright fill R');

  it('the reading screen: stage 1 of 2, premix tank MT-2, and where the gas goes', async () => {
    const ui = render(
      <FillApp initial={initialState(setupFromHeader(h))} write={() => {}} logFile="p.jsonl" />,
    );
    await until(() => flat(ui.lastFrame()).includes('STOP AT'), 'the first target');
    const s = flat(ui.lastFrame());
    expect(s).toContain('mixwright fill b1-premix (stage 1 of 2: premix tank MT-2)');
    expect(s).toMatch(/Fill Ar from cyl-Ar \(.*\) into premix tank MT-2 \(the premix for batch b1\)/);
    // the unit check of a doubtful reading says it too (163.68 kPa = 1227.7 Torr, 0.75 x the target)
    ui.stdin.write('163.68 kPa');
    ui.stdin.write('\r');
    await until(() => flat(ui.lastFrame()).includes('CHECK THE UNIT'), 'the question');
    expect(flat(ui.lastFrame())).toContain('(stage 1 of 2: premix tank MT-2)');
    ui.unmount();
  });

  it('the title of a stage log, and of a single-tank log (unchanged)', () => {
    expect(fillTitle(h)).toBe('mixwright fill b1-premix (stage 1 of 2: premix tank MT-2)');
    expect(
      fillTitle({
        ...h,
        id: 'b1',
        stage: { number: 2, of: 2, batch: 'b1' },
        tank: { ...h.tank, id: 'MT-1' },
      }),
    ).toBe('mixwright fill b1 (stage 2 of 2: batch tank MT-1)');
    expect(fillTitle(readLog('batches/demo-ch4-phi1-ar98.jsonl').header)).toMatch(/^mixwright fill [^(]+$/);
  });
});
