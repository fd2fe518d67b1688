// The guided fill driven as the shell drives it, for the tests that read the log it writes: each entry
// through the reducer, each event kept in order, each reading acknowledged with its log line.
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { fillReducer, type FillState } from '../../src/tui/fill-state.js';

const NOW = '2026-12-01T01:00:00Z';

/** the demo recipe's batch header (CH4, Ar 1/2, O2, Ar 2/2; 1500 Torr in MT-1) */
export function demoHeader(id: string): LogHeader {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(rs);
  return headerFromPlan(planFill(req.input), req, id, '2026-12-01T00:00:00Z');
}

/** type, Enter; the events kept in `events`, a reading acknowledged with its line (the header is line 1) */
export function entry(s: FillState, text: string, events: NewLogEvent[]): FillState {
  let r = fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });
  for (const e of r.effects) {
    events.push(e);
    if (e.kind === 'reading') r = fillReducer(r, { type: 'logged', step: e.step, line: events.length + 1 });
  }
  return { ...r, effects: [] };
}

/** the log those events make */
export const logOf = (header: LogHeader, events: readonly NewLogEvent[], file: string) =>
  parseLog([header, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n', file);
