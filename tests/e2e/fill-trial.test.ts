import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readLog } from '../../src/io/batch-log.js';
import { hasTmux, tmuxSession } from './tmux.js';

// What a lab member meets at the manifold (tmux, 80x24, CI unset so ink draws every frame): a
// reading typed in the wrong unit, the stop screen of a re-target capped by the working limit, and
// screens that fit the terminal.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const RECIPE = resolve('recipes/ch4-o2-ar-phi1.yaml');
const flat = (s: string) => s.replace(/\s+/g, ' ');

function session(tag: string) {
  const dir = mkdtempSync(join(tmpdir(), `mw-${tag}-`));
  return { dir, t: tmuxSession(`mw-${tag}-${process.pid}`, dir) };
}

describe.runIf(hasTmux || required)('guided fill: what a trial at the manifold found (tmux)', () => {
  it('the target number typed in kPa is asked about before it is logged; n re-types, log AB logs it as typed with the initials', async () => {
    const { dir, t } = session('unit');
    try {
      t.start(`node ${BIN} fill ${RECIPE} --by JD --batch u1 --dir batches`);
      let s = await t.waitFor(/fill 1 of 4/);
      expect(s).toContain('STOP AT 10.01 Torr');
      await t.type('10.02 kPa');
      await t.keys('Enter');
      s = flat(await t.waitFor(/CHECK THE UNIT/));
      // what was typed, what it is in the target's unit, the target, and the two ways on
      expect(s).toContain('typed "10.02 kPa" = 75.16 Torr on head-1kT; the target is 10.01 Torr');
      expect(s).toContain('7.51 x the target');
      expect(s).toMatch(/log INITIALS: it is right, log 10\.02 kPa as typed/);
      const log = join(dir, 'batches', 'u1.jsonl');
      expect(readLog(log).readings).toHaveLength(0);
      await t.type('n');
      await t.keys('Enter');
      s = flat(await t.waitFor(/10\.02 kPa is not logged/));
      expect(s).toContain('fill 1 of 4');
      expect(readLog(log).readings).toHaveLength(0);
      await t.type('10.02 kPa');
      await t.keys('Enter');
      await t.waitFor(/CHECK THE UNIT/);
      await t.type('log AB');
      await t.keys('Enter');
      await t.waitFor(/fill 1 logged/);
      const r = readLog(log).readings;
      expect(r).toHaveLength(1);
      expect(r[0]).toMatchObject({ reading: '10.02 kPa', pressure_Pa: 10020, by: 'AB' });
      expect(r[0].note).toMatch(/unit checked at the manifold.*confirmed by AB/);
      // 75.16 Torr of CH4 (7.5 x): the working limit of MT-1 caps the re-target. The stop screen
      // gives one capped final pressure (the last capped target, on head-10kT's 0.1 Torr), the same
      // in the re-target's words, the cost, the targets and the choice - not the limit less the band beside it
      s = flat(await t.waitFor(/go INITIALS/));
      const finals = new Set([...s.matchAll(/(2\d{3}\.\d+) Torr/g)].map((m) => m[1]));
      finals.delete('2700.22'); // the working limit itself
      expect([...finals]).toEqual(['2692.6']);
      expect(s).toContain('the final pressure is held at 2692.6 Torr (design 1500 Torr), at least the last');
      expect(s).toContain('the tank ends at the capped final pressure 2692.6 Torr (absolute)');
      expect(s).toContain('fill 4 Ar: 2692.6 Torr on head-10kT (the capped final pressure)');
      expect(s).toContain('go INITIALS: fill to the capped targets (the tank ends at 2692.6 Torr');
    } finally {
      await t.kill();
      t.close();
    }
  });
});
