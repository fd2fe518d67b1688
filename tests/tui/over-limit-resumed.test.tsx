// A fill resumed on a reading above the tank's working limit whose choice the log does not hold: the
// danger screen comes back and says, on its own rows, that no choice was logged for it before the stop
// (the resume message alone gives way to the operator's initials).
import { describe, expect, it } from 'vitest';
import { type NewLogEvent } from '../../src/io/batch-log.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { demoHeader, entry, logOf } from './logged-entry.js';
import { frame80, read } from './frame80.js';

const flat = (f: string) => f.replace(/\s+/g, ' ');

describe('resumed on a reading above the working limit with no choice logged', () => {
  const header = demoHeader('w1');
  const events: NewLogEvent[] = [];
  let s = initialState(setupFromHeader(header));
  for (const t of ['10.01', '480.81', '500.82', '2800']) s = entry(s, t, events);

  it('the session that logged it: the screen does not say "resumed"', () => {
    expect(s.phase).toBe('over-limit');
    const f = flat(frame80(s));
    expect(f).toContain('The reading is logged (line 5); what you choose is logged beside it.');
    expect(f).not.toMatch(/RESUMED/);
  });

  it('resumed (initials asked first): the danger screen says no choice was logged before the stop, 80x24', () => {
    const log = logOf(header, events, 'w1.jsonl');
    const r = initialState(setupFromHeader(header), log, '2026-12-01T02:00:00Z', { askOperator: true });
    expect(r.phase).toBe('operator');
    const on = read(r, 'JD');
    expect(on.phase).toBe('over-limit');
    const f = frame80(on);
    expect(flat(f)).toContain(
      'The reading is logged (line 5); RESUMED: no choice for it was logged before the fill stopped. What ' +
        'you choose now is logged beside it.',
    );
    const rows = f.split('\n');
    expect(rows.length, f).toBeLessThanOrEqual(24);
    for (const row of rows) expect(row.length, row).toBeLessThanOrEqual(80);
  });
});
