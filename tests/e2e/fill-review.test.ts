import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readLog } from '../../src/io/batch-log.js';
import { hasTmux, tmuxSession } from './tmux.js';

// The review of the re-targeted remainder in a real terminal (tmux, 80x24, CI unset so ink draws every
// frame): a deviating reading stops the fill on the review screen, and the safer stop is taken with
// initials and logged. Flammability reference: LFL of CH4 4.4 % (IEC 60079-20-1), LOC 10.7 % (ASTM
// E2079), checked by hand in tests/core/remainder-review.test.ts.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const RECIPE = `${resolve('recipes/ch4-o2-ar-phi1.yaml')} --order "CH4,Ar@400 Torr,O2,Ar"`;
const TORR = 101325 / 760;
const flat = (s: string) => s.replace(/\s+/g, ' ');
const withStatus = (cmd: string) => `sh -c '${cmd.replace(/'/g, `'"'"'`)}; echo EXIT=$?; sleep 60'`;

describe.runIf(hasTmux || required)('guided fill: the review of the re-targeted remainder (tmux)', () => {
  it('CH4 read 40 % high: the review screen names the flammable state after O2 and the safer Ar stop; safer JD takes it, logged', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-review-'));
    const t = tmuxSession(`mw-review-${process.pid}`, dir);
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch rv --dir batches`));
      await t.waitFor(/fill 1 of 4/);
      await t.type('14.0179');
      await t.keys('Enter');
      const s = flat(await t.waitFor(/Ctrl-C leaves/));
      expect(s).toMatch(/SAFETY REVIEW of the remaining fills/);
      expect(s).toMatch(/pass what the plan did not have:/);
      expect(s).toMatch(/WARNING flammable-state \(fill 3\) at 428\.02 Torr: fuel 5\.51 %, O2 11\.0 %/);
      expect(s).toMatch(/DANGER closed-vessel-pressure \(fill 3\)/);
      expect(s).toMatch(
        /Safer: stop fill 2 \(Ar, charge 1 of 2\) at 451\.31 Torr absolute instead of 400\.00 Torr/,
      );
      // Enter alone does not pass it
      await t.keys('Enter');
      expect(flat(await t.waitFor(/! type one of/))).toMatch(/accept INITIALS/);
      await t.type('safer JD');
      await t.keys('Enter');
      const next = flat(await t.waitFor(/fill 2 of 4/));
      expect(next).toMatch(/STOP AT 451\.31 Torr/);
      const log = readLog(join(dir, 'batches', 'rv.jsonl'));
      expect(log.readings.map((r) => r.pressure_Pa / TORR)).toEqual([expect.closeTo(14.0179, 9)]);
      expect(log.acknowledgements).toEqual([
        expect.objectContaining({
          code: 'remainder-review',
          by: 'JD',
          review: expect.objectContaining({ trigger: 'reading', outcome: 'safer-stop' }),
        }),
      ]);
      expect(log.acknowledgements[0].review!.stop!.to_Pa / TORR).toBeCloseTo(451.31, 6);
      await t.keys('C-c');
      expect(Number(/EXIT=(\d+)/.exec(await t.waitFor(/EXIT=\d+/))![1])).toBe(130);
    } finally {
      t.close();
    }
  }, 60000);
});
