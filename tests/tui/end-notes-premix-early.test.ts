// The end screen's verdict points to "the notes below" only where a note below says what it names: a
// stage-2 batch drawn from its premix before the least mixing time (the demo stage-2 log made again with
// a 55 h rest asked, confirmed mixed 20 h after the premix log closed: tests/io/premix-drawn-early) gets
// the note in check's own words (how long after, of how long asked, confirmed by whom); a batch with
// nothing below gets no pointer.
import { describe, expect, it } from 'vitest';
import { readLog } from '../../src/io/batch-log.js';
import { checkLog } from '../../src/io/check.js';
import { endNotes, verdictLine } from '../../src/tui/fill-app.js';
import { drawnEarlyLog } from '../stage-logs.js';

describe('the end screen of a stage-2 batch drawn early', () => {
  it('PREMIX DRAWN EARLY (see the notes below), with the note below that says it', async () => {
    const r = await checkLog(readLog(drawnEarlyLog(55 * 3600)), { trials: 0, seed: 1 });
    expect(r.caveats).toEqual([]);
    expect(verdictLine(r)).toBe(
      'Re-check of the log (mixwright check): NOT A PASS (the composition is within tolerance) - ' +
        'PREMIX DRAWN EARLY (see the notes below)',
    );
    const notes = endNotes(r);
    expect(notes).toHaveLength(1);
    // the demo's times: premix log closed 2026-11-29T14:45:00Z, confirmed mixed 2026-11-30T11:04:00Z by KL,
    // 20 h 19 min = 20.3 h after, of the 55 h asked
    expect(notes[0]).toMatch(
      /^PREMIX DRAWN EARLY: premix in MT-2 confirmed mixed by KL at 2026-11-30T11:04:00Z \(line \d+\) - DRAWN EARLY: 20\.3 h after the premix log closed \(2026-11-29T14:45:00Z\), short of the least asked, 55\.0 h of rest; the re-check assumes a uniform premix, which nothing shows here$/,
    );
  });

  it('waited long enough (15 h asked): PASS, no note and no pointer to one', async () => {
    const r = await checkLog(readLog(drawnEarlyLog(15 * 3600)), { trials: 0, seed: 1 });
    expect(endNotes(r)).toEqual([]);
    expect(verdictLine(r)).toBe('Re-check of the log (mixwright check): PASS');
  });
});
