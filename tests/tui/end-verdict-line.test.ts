// The end screen's verdict line points to the notes below once: check's verdict word points below for each
// finding it names (e.g. "ACCEPTED HAZARD (see below)"); the line gives one reference, not two.
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { appendEvent, createLog, readLog, type NewLogEvent } from '../../src/io/batch-log.js';
import { verdictWord } from '../../src/report/check-report.js';
import { verdictLine } from '../../src/tui/fill-app.js';
import { initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { entry } from './logged-entry.js';

describe('the verdict line of the end screen', () => {
  it('FAIL with an accepted hazard: one reference to the notes below, none repeated', async () => {
    // the demo recipe in the order CH4, Ar (stop 400 Torr), O2, Ar, CH4 read 40 % high (14.018 for 10.013 Torr): the review finds fill 3 flammable (the
    // scenario of fill-below-accepted.test.tsx), accepted; the rest at their re-targeted stops
    const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
    const req = buildPlanRequest({
      ...rs,
      recipe: { ...rs.recipe, order: ['CH4', 'Ar@400 Torr', 'O2', 'Ar'] },
    });
    const header = headerFromPlan(planFill(req.input), req, 'v1', '2026-12-01T00:00:00Z');
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(header));
    s = entry(s, '14.018', events);
    expect(s.phase).toBe('review');
    s = entry(s, 'accept JD', events);
    for (let k = 1; k < 4 && s.phase !== 'done'; k++) {
      if (s.phase === 'review' || s.phase === 'reminder') s = entry(s, 'accept JD', events);
      // the last fill read 3 % over its target: out of tolerance
      const t = fromPa(s.targetsPa[s.current], 'Torr') * (k === 3 ? 1.03 : 1);
      s = entry(s, t.toFixed(k === 3 ? 1 : 2), events);
    }
    // written as the fill writes it (hash-chained)
    const file = join(mkdtempSync(join(tmpdir(), 'mw-verdict-')), 'v1.jsonl');
    createLog(file, header);
    for (const e of events) appendEvent(file, e);
    expect(s.phase).toBe('done');
    const report = await checkLog(readLog(file), { trials: 0, seed: 1 });
    const word = verdictWord(report);
    expect(word).toMatch(/^FAIL - out of tolerance - ACCEPTED HAZARD \(see below\)$/);
    const line = verdictLine(report)!;
    expect(line).toBe(
      'Re-check of the log (mixwright check): FAIL - out of tolerance - ACCEPTED HAZARD (see the notes below)',
    );
    expect(line.match(/see /g)).toHaveLength(1);
  });
});
