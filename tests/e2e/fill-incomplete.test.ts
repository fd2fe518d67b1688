import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { readLog } from '../../src/io/batch-log.js';
import { hasTmux, tmuxSession } from './tmux.js';

// A fresh-eyes trial of the guided fill in a real terminal (tmux, 80x24, CI unset so ink draws every
// frame). Every screen checked here keeps its first row (the title) in view: nothing scrolled off.
// Flammability reference: LFL of CH4 4.4 % (IEC 60079-20-1), LOC 10.7 % (ASTM E2079), checked by hand in
// tests/core/remainder-review.test.ts. MT-1: rated 4 bar, working limit 0.9 x 4 bar = 2700.22 Torr;
// 1 kPa = 7.500617 Torr (NIST SP 811, exact from the definitions).
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
const RECIPE = resolve('recipes/ch4-o2-ar-phi1.yaml');
const TORR = 101325 / 760;
const flat = (s: string) => s.replace(/\s+/g, ' ');
const withStatus = (cmd: string) => `sh -c '${cmd.replace(/'/g, `'"'"'`)}; echo EXIT=$?; sleep 60'`;
/** the screen fits: 24 rows at most, its title on the first row */
function fits(screen: string) {
  const rows = screen.replace(/\n+$/, '').split('\n');
  expect(rows.length).toBeLessThanOrEqual(24);
  expect(rows[0]).toMatch(/^mixwright fill /);
  for (const r of rows) expect(r.length).toBeLessThanOrEqual(80);
}

/** a new fill (by JD): CH4 at its target, then the Ar charge (target 480.81 Torr) read as `ar`: the next screen */
async function throughAr(
  t: ReturnType<typeof tmuxSession>,
  batch: string,
  ar: string,
  next: RegExp,
): Promise<string> {
  t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch ${batch} --dir batches`));
  await t.waitFor(/fill 1 of 4/);
  await t.type('10.013');
  await t.keys('Enter');
  await t.waitFor(/STOP AT 480\.81 Torr/);
  await t.type(ar);
  await t.keys('Enter');
  return t.waitFor(next);
}
const arChargeShort = (t: ReturnType<typeof tmuxSession>, batch: string) =>
  throughAr(t, batch, '150', /BELOW ITS BAND/);

describe.runIf(hasTmux || required)('guided fill, fresh-eyes trial (tmux)', () => {
  it('an Ar charge read short (150 for 480.81 Torr): continue it first; next JD (logged) shows the review with continuing as the safer way; the further reading is logged as such', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-incomplete-'));
    const t = tmuxSession(`mw-incomplete-${process.pid}`, dir);
    try {
      const below = await arChargeShort(t, 'inc');
      fits(below);
      const b = flat(below);
      expect(b).toMatch(/fill 2 of 4 \(Ar, charge 1 of 2\): BELOW ITS BAND/);
      expect(b).toMatch(/the fill is incomplete/);
      // every way on, with what its review found
      expect(b).toMatch(
        /- continue: fill on from cyl-Ar to 480\.81 Torr, .*: passes no hazard the plan did not have/,
      );
      expect(b).toMatch(/- next AB \(go on from 150 Torr\): passes .*DANGER detonable-state \(fill 3\)/);
      expect(b).toMatch(/- stop AB \(.*\): no flammable, detonable or danger state in the tank now/);
      // going on from the short reading: the review names the hazard and offers continuing, never "no safer stop"
      await t.type('next JD');
      await t.keys('Enter');
      const rv = await t.waitFor(/SAFETY REVIEW[\s\S]*>/);
      fits(rv);
      const r = flat(rv);
      expect(r).toMatch(/DANGER detonable-state \(fill 3\) at 170\.02 Torr/);
      expect(r).toMatch(
        /Safer: continue fill 2 \(Ar, charge 1 of 2\) to its target 480\.81 Torr absolute \(it stopped at 150\.00 Torr\)/,
      );
      expect(r).not.toMatch(/no safer stop/);
      await t.type('480.81 JD');
      await t.keys('Enter');
      const next = await t.waitFor(/fill 3 of 4/);
      fits(next);
      expect(flat(next)).toMatch(/more gas added, 480\.81 Torr logged by JD/);
      const log = readLog(join(dir, 'batches', 'inc.jsonl'));
      expect(log.readings.map((x) => x.pressure_Pa / TORR)).toEqual([
        expect.closeTo(10.013, 9),
        expect.closeTo(480.81, 9),
      ]);
      expect(log.amendments).toEqual([
        expect.objectContaining({
          kind: 'correction',
          step: 2,
          by: 'JD',
          reason: expect.stringMatching(/more gas added/),
        }),
      ]);
      // the choice to go on from 150 Torr is logged; nothing was accepted: no review outcome is logged
      expect(log.acknowledgements).toEqual([
        expect.objectContaining({ code: 'went-on-below-band', step: 2, by: 'JD' }),
      ]);
      await t.keys('C-c');
      expect(Number(/EXIT=(\d+)/.exec(await t.waitFor(/EXIT=\d+/))![1])).toBe(130);
    } finally {
      t.close();
    }
  }, 90000);

  it('the Ar cylinder cannot give more: stop JD closes the batch at the short reading, INCOMPLETE, exit 4', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-stop-'));
    const t = tmuxSession(`mw-stop-${process.pid}`, dir);
    try {
      await arChargeShort(t, 'st');
      await t.type('stop JD');
      await t.keys('Enter');
      const end = await t.waitFor(/Re-check of the log[\s\S]*q or Enter: quit/);
      fits(end);
      const e = flat(end);
      expect(e).toMatch(/STOPPED after fill 2 of 4/);
      expect(e).toMatch(/fills 3, 4 not made, so it is INCOMPLETE \(not a pass\)/);
      expect(e).toMatch(/the review finds no flammable, detonable or danger state in the tank now/);
      expect(e).toMatch(/INCOMPLETE - not a pass/);
      await t.keys('q');
      expect(Number(/EXIT=(\d+)/.exec(await t.waitFor(/EXIT=\d+/))![1])).toBe(4);
      const log = readLog(join(dir, 'batches', 'st.jsonl'));
      expect(log.closed).toBe(true);
      expect(log.readings.map((r) => r.by)).toEqual(['JD', 'JD']);
    } finally {
      t.close();
    }
  }, 90000);

  it('O2 step on head-1kT: "501.5 kPa" says the danger first; at fill 4, 2800 then edit JD leaves the field empty and Enter logs nothing', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-pastrange-'));
    const t = tmuxSession(`mw-pastrange-${process.pid}`, dir);
    try {
      await throughAr(t, 'pr', '480.81', /fill 3 of 4/);
      await t.type('501.5 kPa');
      await t.keys('Enter');
      const pr = await t.waitFor(/PAST THE RANGE OF head-1kT[\s\S]*>/);
      fits(pr);
      const p = flat(pr);
      expect(p).toMatch(
        /DANGER if the tank holds it: 3761\.56 Torr absolute \(as typed\) is past the working limit 2700\.22 Torr of MT-1, rated 3000 Torr: stop adding gas, close the cylinder and tank valves/,
      );
      expect(p.indexOf('DANGER')).toBeLessThan(p.indexOf('past its range'));
      // logged as typed, never as a reading: a slip said with initials goes back to the reading
      await t.type('slip JD');
      await t.keys('Enter');
      await t.waitFor(/a typing slip, said by JD/);
      await t.type('500.82');
      await t.keys('Enter');
      await t.waitFor(/fill 4 of 4/);
      await t.type('2800');
      await t.keys('Enter');
      await t.waitFor(/ABOVE THE WORKING\s+LIMIT[\s\S]*>/);
      await t.type('edit JD');
      await t.keys('Enter');
      const back = await t.waitFor(/withdrawn by JD/);
      fits(back);
      expect(back).toMatch(/> actual reading \[Torr\]:\s*$/m);
      await t.keys('Enter');
      expect(flat(await t.waitFor(/! type the reading first|! .*reading/))).toMatch(/fill 4 of 4/);
      const log = readLog(join(dir, 'batches', 'pr.jsonl'));
      // the over-limit reading once, withdrawn once: Enter after edit logged nothing
      expect(log.allReadings.filter((x) => x.step === 4)).toHaveLength(1);
      expect(log.amendments.map((a) => a.kind)).toEqual(['withdraw']);
      await t.keys('C-c');
      await t.waitFor(/EXIT=\d+/);
    } finally {
      t.close();
    }
  }, 90000);

  it("order CH4, O2, Ar: fill 3 shows the plan's compression-heating and oxygen-compression warnings (throttle the fill), and fill 2 its danger, each screen 80x24", async () => {
    const dir = mkdtempSync(join(tmpdir(), 'mw-warn-'));
    const t = tmuxSession(`mw-warn-${process.pid}`, dir);
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --order CH4,O2,Ar --batch w --dir batches`));
      await t.waitFor(/accept INITIALS/);
      await t.type('accept JD');
      await t.keys('Enter');
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.013');
      await t.keys('Enter');
      await t.waitFor(/DANGER AT THIS FILL/);
      await t.keys('Enter');
      const f2 = await t.waitFor(/fill 2 of 3\s*\n/);
      fits(f2);
      expect(flat(f2)).toMatch(
        /DANGER detonable-state \(this fill; accepted at the start\): add the bath gas/,
      );
      expect(flat(f2)).toMatch(/warning flammable-state \(this fill, the plan\)/);
      await t.type('30.04');
      await t.keys('Enter');
      const f3 = await t.waitFor(/fill 3 of 3/);
      fits(f3);
      const w = flat(f3);
      expect(w).toMatch(
        /warning compression-heating \(this fill, the plan\): Throttle the fill \(open the valve slowly\)/,
      );
      expect(w).toMatch(/warning oxygen-compression \(this fill, the plan\): .*throttle this fill/);
      await t.keys('C-c');
      await t.waitFor(/EXIT=\d+/);
    } finally {
      t.close();
    }
  }, 90000);
});
