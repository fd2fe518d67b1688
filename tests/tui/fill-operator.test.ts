import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';

// Who fills: the operator's initials are asked once a session (a new fill, and again on each resume)
// and logged on every reading the session takes, not asked per reading.
const NOW = '2026-12-01T01:00:00Z';
const read = (s: FillState, text: string) =>
  fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });
const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';

function header() {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  return headerFromPlan(planFill(req.input), req, 'op1', '2026-12-01T00:00:00Z');
}

describe('who fills: initials once a session, on every reading', () => {
  const h = header();
  const setup = setupFromHeader(h);

  it('asked first; anything but 1-6 letters is refused (nothing logged); then every reading carries them', () => {
    const s0 = initialState(setup, undefined, '', { askOperator: true });
    expect(s0.phase).toBe('operator');
    const bad = read(s0, '10.013');
    expect(bad.phase).toBe('operator');
    expect(bad.effects).toEqual([]);
    expect(bad.error).toMatch(/type your initials/);
    const s1 = read(s0, 'JD');
    expect(s1.phase).toBe('reading');
    expect(s1.effects).toEqual([]);
    const r1 = read(s1, '10.013');
    expect(r1.effects).toEqual([expect.objectContaining({ kind: 'reading', step: 1, by: 'JD' })]);
    const r2 = read(fillReducer(r1, { type: 'logged', step: 1, line: 2 }), '480.81');
    expect(r2.effects).toEqual([expect.objectContaining({ kind: 'reading', step: 2, by: 'JD' })]);
  });

  it('given (--by): not asked; a resumed log asks again and goes back to where it stopped', () => {
    const given = initialState(setup, undefined, '', { operator: 'AB', askOperator: true });
    expect(given.phase).toBe('reading');
    const first = read(given, '10.013');
    const short = read(fillReducer(first, { type: 'logged', step: 1, line: 2 }), '150');
    expect(short.phase).toBe('below');
    const log = parseLog(logText(h, [...first.effects, ...short.effects]), 'op1.jsonl');
    // an older fill's reading without initials stays readable beside it
    expect(log.readings.map((r) => r.by)).toEqual(['AB', 'AB']);
    const again = initialState(setup, log, NOW, { askOperator: true });
    expect(again.phase).toBe('operator');
    expect(again.message).toMatch(/^resumed: fill 2 \(Ar, charge 1 of 2\) logged at 150 Torr/);
    const on = read(again, 'KL');
    expect(on.phase).toBe('below');
    expect(on.message).toMatch(/KL fills/);
  });

  it('a log whose readings carry no initials (an older fill) is read as before', () => {
    const s = read(initialState(setup), '10.013');
    const ev = s.effects[0];
    expect(ev.kind === 'reading' && ev.by).toBe(undefined);
    const log = parseLog(logText(h, s.effects), 'old.jsonl');
    expect(log.readings).toHaveLength(1);
    expect(log.readings[0].by).toBeUndefined();
  });
});
