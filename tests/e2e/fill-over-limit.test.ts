import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readLog } from '../../src/io/batch-log.js';
import { hasTmux, tmuxSession } from './tmux.js';

// A reading past the tank's working limit at the manifold (tmux, 80x24, CI unset so ink draws every
// frame): Ctrl-C on its danger screen says the tank is left logged above its limit with no choice made;
// the resume brings the screen back with the same vent target; withdrawn as mistyped and the fill read
// at its target, the end screen's title leads with the withdrawn reading, as check's caution words it.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const RECIPE = resolve('recipes/ch4-o2-ar-phi1.yaml');
const flat = (s: string) => s.replace(/\s+/g, ' ');

describe.runIf(hasTmux || required)('guided fill: a reading past the working limit (tmux)', () => {
  it('Ctrl-C on the danger screen, resume, edit: the shell line, the same vent target, the end title and caution', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-over-'));
    const t = tmuxSession(`mw-over-${process.pid}`, dir);
    const log = join(dir, 'batches', 'o1.jsonl');
    try {
      t.start(`node ${BIN} fill ${RECIPE} --by JD --batch o1 --dir batches`);
      // the demo recipe (CH4, Ar 1/2, O2, Ar 2/2) read at its targets, then fill 4 read 2800 Torr: MT-1's
      // working limit is 2700.22 Torr (4 bar rating x 0.9, the demo lab profile)
      for (const [k, reading] of [
        [1, '10.01'],
        [2, '480.81'],
        [3, '500.82'],
      ] as const) {
        await t.waitFor(new RegExp(`fill ${k} of 4`));
        await t.type(reading);
        await t.keys('Enter');
        await t.waitFor(new RegExp(`fill ${k}( \\(Ar, charge 1 of 2\\))? logged`));
      }
      await t.waitFor(/fill 4 of 4/);
      await t.type('2800');
      await t.keys('Enter');
      let s = await t.waitFor(/DANGER - ABOVE THE WORKING LIMIT/);
      // the title on the first row; the choices one row each
      expect(s.split('\n')[0]).toMatch(/^mixwright fill o1 - fill 4 of 4: DANGER - ABOVE THE WORKING LIMIT/);
      for (const key of ['vent', 'accept', 'edit']) expect(s).toMatch(new RegExp(`^${key} INITIALS: `, 'm'));
      const vent = /reads at most (1\d{3}\.\d) Torr/.exec(flat(s))![1];
      expect(readLog(log).readings.map((r) => r.reading)).toEqual([
        '10.01 Torr',
        '480.81 Torr',
        '500.82 Torr',
        '2800 Torr',
      ]);
      // Ctrl-C: the shell says more than the count of readings
      await t.keys('C-c');
      s = flat(await t.waitFor(/LEFT LOGGED ABOVE/));
      expect(s).toContain(
        'the tank MT-1 is LEFT LOGGED ABOVE ITS WORKING LIMIT with no choice made: fill 4 read 2800.00 Torr ' +
          'absolute vs the limit 2700.22 Torr (logged)',
      );
      expect(s).toContain('Resume with: mixwright fill --resume batches/o1.jsonl');
      await t.kill();

      // resumed: the danger screen again, with the vent target the session gave
      t.start(`node ${BIN} fill --resume batches/o1.jsonl --by JD`);
      s = flat(await t.waitFor(/DANGER - ABOVE THE WORKING LIMIT/));
      expect(flat(s)).toContain(`reads at most ${vent} Torr`);
      await t.type('edit JD');
      await t.keys('Enter');
      s = await t.waitFor(/withdrawn by JD/);
      const target = /STOP AT (\d+\.\d) Torr/.exec(s)![1];
      await t.type(target);
      await t.keys('Enter');
      s = await t.waitFor(/Re-check of the log/, 30000);
      const rows = s.split('\n');
      // the title leads with the withdrawn reading, never "each within its band"
      expect(rows[0]).toMatch(/^mixwright fill o1 - A READING ABOVE THE WORKING LIMIT WAS LOGGED, then/);
      const f = flat(s);
      expect(f).toContain(
        'A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn (fill 4: 2800 Torr vs the ' +
          'limit 2700.22 Torr): the tank may have been above its limit; all 4 fills logged',
      );
      expect(f).not.toContain('each within its band');
      // check's caution beside the verdict
      expect(f).toContain(
        '! A READING ABOVE THE WORKING LIMIT WAS LOGGED, then corrected or withdrawn (line 5, fill 4: 2800 Torr ' +
          'absolute vs the working limit 2700.22 Torr)',
      );
    } finally {
      await t.kill();
      t.close();
    }
  });
});
