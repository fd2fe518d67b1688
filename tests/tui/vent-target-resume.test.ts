// The vent target of a last fill read past the working limit is "the final pressure the re-target set":
// the same number in the session and after a resume (the re-target of the readings before that reading,
// not the plan's target nor one that counts the over-limit reading).
import { describe, expect, it } from 'vitest';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';
import { demoHeader, entry, logOf } from './logged-entry.js';

const NOW = '2026-12-01T01:00:00Z';
const header = demoHeader('v2');

describe('the vent target of the last fill read past the working limit', () => {
  it('is the same in the session and after a resume (CH4 read 10.01 Torr for 10.0128: the last target 1499.9 Torr)', () => {
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(header));
    for (const t of ['10.01', '480.81', '500.82']) s = entry(s, t, events);
    // the re-target of the first three readings moves the last target off the plan's 1500 Torr
    const lastTarget = s.targetsPa[3];
    expect(Math.abs(lastTarget - header.steps[3].target_Pa)).toBeGreaterThan(0.05 * TORR);
    const over = entry(s, '2800', events);
    expect(over.phase).toBe('over-limit');
    expect(over.overLimit!.ventToPa).toBeCloseTo(lastTarget, 6);
    // Ctrl-C on the danger screen: the reading is logged, no choice; resumed from the log
    const log = logOf(header, events, 'v2.jsonl');
    const r = initialState(setupFromHeader(header), log, NOW);
    expect(r.phase).toBe('over-limit');
    // the same vent target, to 1e-6 Pa (one computation from the same readings)
    expect(r.overLimit!.ventToPa).toBeCloseTo(over.overLimit!.ventToPa, 6);
    expect(r.targetsPa[3]).toBeCloseTo(lastTarget, 6);
  });
});
