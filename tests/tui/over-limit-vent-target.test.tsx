// The over-limit screen gives the vent target once: what the gauge should read (at most, rounded down to its
// display: head-10kT shows 0.1 Torr, demo lab profile) and the target it stands for, absolute. Never two
// bare numbers for one target ("to 1499.8 Torr absolute (on head-10kT: at most 1499.7 Torr)").
import { describe, expect, it } from 'vitest';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { frame80 } from './frame80.js';
import { demoHeader, entry } from './logged-entry.js';

const TORR = 101325 / 760;

describe('the vent target on the over-limit screen', () => {
  const events: NewLogEvent[] = [];
  let s: FillState = initialState(setupFromHeader(demoHeader('v1')));
  for (const t of ['10.01', '480.81', '500.82', '2800']) s = entry(s, t, events);

  it('one instruction: the gauge reading to vent to, then the target it stands for, within 80 x 24', () => {
    expect(s.phase).toBe('over-limit');
    const f = frame80(s);
    const flat = f.replace(/\s+/g, ' ');
    const m =
      /until head-10kT reads at most (\d+\.\d) Torr \(the vent target (\d+\.\d+) Torr absolute, rounded down to what the gauge shows\)/.exec(
        flat,
      );
    expect(m, flat).not.toBeNull();
    const [atMost, target] = [Number(m![1]), Number(m![2])];
    // the target as the fill computed it (6 significant digits), and the display step below it (0.1 Torr)
    expect(target).toBeCloseTo(Number((s.overLimit!.ventToPa / TORR).toPrecision(6)), 6);
    expect(atMost).toBeLessThanOrEqual(target);
    expect(target - atMost).toBeLessThan(0.1 + 1e-9);
    expect(flat).not.toMatch(/: at most/);
    expect(flat.match(/Vent or pump back/g)).toHaveLength(1);
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  });
});
