import { describe, expect, it } from 'vitest';
import { appendFileSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createLog, readLog } from '../../src/io/batch-log.js';
import { splitHeader } from '../split-plan.js';
import { checkFile } from '../../src/io/check.js';
import { hasTmux, tmuxSession } from './tmux.js';

// The guided fill at the manifold in a real terminal (tmux, 80x24, CI unset so ink draws every
// frame): the mistakes an operator makes, and what the screen and the log must do about them.
const required = process.env.MIXWRIGHT_REQUIRE_BROWSER === '1';
const BIN = resolve('dist/mixwright.mjs');
// the fill mechanics are tested on the three-fill order the advice gives (the sequence search would split the Ar)
const RECIPE = `${resolve('recipes/ch4-o2-ar-phi1.yaml')} --order CH4,Ar,O2`;
const TORR = 101325 / 760;
const target = (s: string) => Number(/STOP AT ([\d.]+) (?:Torr|psi)/.exec(s)![1]);
const flat = (s: string) => s.replace(/\s+/g, ' ');

function session(tag: string) {
  const dir = mkdtempSync(join(tmpdir(), `mw-${tag}-`));
  return { dir, t: tmuxSession(`mw-${tag}-${process.pid}`, dir) };
}
/** run through sh so that the exit status is printed on the pane when the program ends */
const withStatus = (cmd: string) => `sh -c '${cmd}; echo EXIT=$?; sleep 60'`;
async function exitStatus(t: ReturnType<typeof tmuxSession>, ms = 15000): Promise<number> {
  return Number(/EXIT=(\d+)/.exec(await t.waitFor(/EXIT=\d+/, ms))![1]);
}

/**
 * the end screen: its first page (check's verdict, the commands to run next) and the tank label, which
 * is on it when it fits 80 x 24, else on its own page (l), in parts (n) when taller than the terminal;
 * the title stays on every page (nothing scrolled off)
 */
async function endPages(
  t: ReturnType<typeof tmuxSession>,
  ms = 30000,
): Promise<{ first: string; label: string }> {
  const first = await t.waitFor(/Re-check of the log \(mixwright check\)/, ms);
  expect(first).toMatch(/^mixwright fill /m);
  if (/Tank label/.test(first)) return { first: flat(first), label: flat(first) };
  expect(first).toContain('l: the tank label');
  await t.keys('l');
  let page = await t.waitFor(/Tank label/);
  let label = flat(page);
  for (let k = 2; /n: next part/.test(page) && !new RegExp(`part (\\d+) of \\1`).test(page); k++) {
    await t.keys('n');
    page = await t.waitFor(new RegExp(`part ${k} of`));
    expect(page).toMatch(/^mixwright fill /m);
    label += ` ${flat(page)}`;
  }
  return { first: flat(first), label };
}

describe.runIf(hasTmux || required)('guided fill at the manifold (tmux)', () => {
  it('overshoot past the working limit: a danger screen with the vent-back reading; accept with initials is logged; the fill stops; check names the limit', async () => {
    const { dir, t } = session('over');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch over --dir batches`));
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.01');
      await t.keys('Enter');
      await t.waitFor(/fill 2 of 3/);
      await t.type('2800');
      await t.keys('Enter');
      const s = flat(await t.waitFor(/ABOVE THE WORKING LIMIT/));
      expect(s).toMatch(/2800\.0 Torr absolute, 99\.8 Torr above the working limit of MT-1/);
      expect(s).toMatch(
        /Vent or pump back by 13\d\d\.\d Torr, until head-10kT reads at most 14\d\d\.\d Torr \(the vent target 14\d\d\.\d+ Torr absolute/,
      );
      const log = join(dir, 'batches', 'over.jsonl');
      // the reading is a fact about the tank: in the log before the operator chooses
      expect(readLog(log).readings).toHaveLength(2);
      expect(s).toMatch(/The reading is logged/);
      await t.type('accept JD');
      await t.keys('Enter');
      await t.waitFor(/STOPPED after fill 2 of 3/);
      const end = flat(await t.waitFor(/do not label or use/, 30000));
      expect(end).toMatch(/DANGER:/);
      await t.keys('q');
      // stopped before the last fill: the re-check fails (4), as `check` of the log exits
      expect(await exitStatus(t)).toBe(4);
      const l = readLog(log);
      expect(l.acknowledgements.map((a) => [a.code, a.by])).toEqual([['above-working-limit', 'JD']]);
      expect(l.readings.map((r) => r.pressure_Pa / TORR)).toEqual(
        [10.01, 2800].map((x) => expect.closeTo(x, 9)),
      );
      expect(l.closed).toBe(true);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      expect(rep.verdict.verdict).toBe('fail');
      expect(rep.findings.some((f) => f.severity === 'danger')).toBe(true);
    } finally {
      t.close();
    }
  }, 60000);

  it("a temperature change before the last fill re-computes the target; filled to it, the end screen shows check's verdict and the as-filled label", async () => {
    const { dir, t } = session('temp');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch temp --dir batches`));
      let s = await t.waitFor(/fill 1 of 3/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = await t.waitFor(/fill 2 of 3/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = await t.waitFor(/fill 3 of 3/);
      const before = target(s);
      await t.keys('Tab');
      for (let i = 0; i < 10; i++) await t.keys('BSpace');
      await t.type('26.1 degC');
      await t.keys('Tab');
      s = await t.waitFor(/targets re-computed for 26\.1 degC/);
      const after = target(s);
      // the same amount of O2 at 1.1 K more: about 1500 x 1.1/298 = 5.5 Torr higher (ideal-gas estimate)
      expect(after - before).toBeGreaterThan(5);
      expect(after - before).toBeLessThan(6);
      await t.type(String(after));
      await t.keys('Enter');
      s = (await endPages(t)).first;
      // the demo at its targets is shown within only on the values: check's words, never a bare pass
      expect(s).toMatch(/Re-check of the log \(mixwright check\): NOT SHOWN WITHIN TOLERANCE - not a pass/);
      await t.keys('q');
      // not a pass: exit 7 as check (README "Exit codes")
      expect(await exitStatus(t)).toBe(7);
      const rep = await checkFile(join(dir, 'batches', 'temp.jsonl'), { trials: 0, seed: 1 });
      expect(rep.verdict.verdict).not.toBe('fail');
      expect(rep.readings[2].temperatureK).toBeCloseTo(299.25, 9);
    } finally {
      t.close();
    }
  }, 60000);

  it('a last fill read below its band keeps the batch open: more gas, the new reading with initials corrects it, then the batch closes (exit 7: not shown within tolerance)', async () => {
    const { dir, t } = session('low');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch low --dir batches`));
      let s = await t.waitFor(/fill 1 of 3/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = await t.waitFor(/fill 2 of 3/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = await t.waitFor(/fill 3 of 3/);
      const t3 = target(s);
      await t.type((t3 - 5).toFixed(1));
      await t.keys('Enter');
      s = flat(await t.waitFor(/BELOW THE TARGET/));
      expect(s).toMatch(/the batch is not closed/);
      const log = join(dir, 'batches', 'low.jsonl');
      expect(readLog(log).closed).toBe(false);
      await t.type(`${t3} AB`);
      await t.keys('Enter');
      s = (await endPages(t)).first;
      // the demo at its targets is shown within only on the values: check's words, never a bare pass
      expect(s).toMatch(/Re-check of the log \(mixwright check\): NOT SHOWN WITHIN TOLERANCE - not a pass/);
      await t.keys('q');
      // not a pass: exit 7 as check (README "Exit codes")
      expect(await exitStatus(t)).toBe(7);
      const l = readLog(log);
      expect(l.closed).toBe(true);
      expect(l.amendments.map((a) => [a.kind, a.by, a.reason])).toEqual([
        ['correction', 'AB', expect.stringMatching(/more gas added/)],
      ]);
      expect(l.readings[2].pressure_Pa / TORR).toBeCloseTo(t3, 6);
    } finally {
      t.close();
    }
  }, 60000);

  it('a mistyped reading corrected before the next fill: the original stays, the correction is logged with initials and reason', async () => {
    const { dir, t } = session('fix');
    try {
      t.start(`node ${BIN} fill ${RECIPE} --by JD --batch fix --dir batches`);
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.01');
      await t.keys('Enter');
      await t.waitFor(/fill 2 of 3/);
      await t.type('1408');
      await t.keys('Enter');
      // below the Ar band (about 1480 Torr): the fill is incomplete and its screen stays, fix works there
      await t.waitFor(/BELOW ITS BAND/);
      await t.type('fix 2 AB');
      await t.keys('Enter');
      await t.waitFor(/correct the reading of fill 2/);
      await t.type('1480.0');
      await t.keys('Enter');
      await t.waitFor(/reason:/);
      await t.type('mistyped 1408 for 1480.0');
      await t.keys('Enter');
      const s = flat(await t.waitFor(/fill 2 corrected by AB/));
      expect(s).toMatch(/1408 Torr -> 1480\.0 Torr/);
      await t.kill();
      const l = readLog(join(dir, 'batches', 'fix.jsonl'));
      expect(l.amendments).toEqual([
        expect.objectContaining({
          kind: 'correction',
          step: 2,
          by: 'AB',
          reason: 'mistyped 1408 for 1480.0',
        }),
      ]);
      expect(l.allReadings.map((r) => r.reading)).toEqual(['10.01 Torr', '1408 Torr', '1480.0 Torr']);
      expect(l.readings[1].pressure_Pa / TORR).toBeCloseTo(1480, 9);
    } finally {
      t.close();
    }
  }, 60000);

  it('a gauge-referenced reading typed as absolute: the barometer is asked first; the reading is questioned with its likely cause and not logged until confirmed', async () => {
    const { dir, t } = session('gref');
    try {
      t.start(`node ${BIN} fill ${RECIPE} --by JD --tank MT-2 --pressure "3 bar" --batch gref --dir batches`);
      await t.waitFor(/barometric pressure today/);
      await t.type('755.0 Torr AB');
      await t.keys('Enter');
      let s = await t.waitFor(/fill 1 of 3/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = await t.waitFor(/fill 2 of 3/);
      const gaugePsi = target(s);
      // the absolute value in psi: gauge + 755 Torr
      const absPsi = (gaugePsi * 6894.757293168361 + 755 * TORR) / 6894.757293168361;
      await t.type(absPsi.toFixed(2));
      await t.keys('Enter');
      s = flat(await t.waitFor(/CHECK THIS READING/));
      expect(s).toMatch(/about one barometric pressure/);
      expect(s).toMatch(/absolute pressure typed for a gauge-referenced sensor/);
      const log = join(dir, 'batches', 'gref.jsonl');
      expect(readLog(log).readings).toHaveLength(1);
      await t.keys('n');
      await t.waitFor(/fill 2 of 3/);
      for (let i = 0; i < 8; i++) await t.keys('BSpace');
      await t.type(String(gaugePsi));
      await t.keys('Enter');
      await t.waitFor(/fill 3 of 3/);
      await t.kill();
      const l = readLog(log);
      expect(l.barometer).toMatchObject({ reading: '755.0 Torr', by: 'AB' });
      expect(l.readings[1].barometer_Pa! / TORR).toBeCloseTo(755, 9);
      expect(l.readings[1].pressure_Pa).toBeCloseTo(gaugePsi * 6894.757293168361 + 755 * TORR, 3);
    } finally {
      t.close();
    }
  }, 60000);

  it('Ctrl-C ends the fill with exit 130 and says how many readings are logged and how to resume', async () => {
    const { dir, t } = session('ctrlc');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch cc --dir batches`));
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.01');
      await t.keys('Enter');
      await t.waitFor(/fill 2 of 3/);
      await t.keys('C-c');
      expect(await exitStatus(t)).toBe(130);
      // the message is wrapped at 80 columns (its continuation rows indented): join the screen's
      // lines, and the indent with them
      const s = t.screen().replace(/\n/g, '').replace(/ {2,}/g, ' ');
      expect(s).toMatch(
        /fill stopped by Ctrl-C: 1 of 3 readings are logged in batches\/cc\.jsonl\. Resume with: mixwright fill --resume batches\/cc\.jsonl/,
      );
      expect(readdirSync(join(dir, 'batches')).filter((f) => f.endsWith('.lock'))).toEqual([]);
    } finally {
      t.close();
    }
  }, 60000);

  it('a second fill on the same log is refused and names the holder; a torn tail is moved aside before the resumed fill appends, and check reads the log', async () => {
    const a = session('lockA');
    const b = tmuxSession(`mw-lockB-${process.pid}`, a.dir);
    try {
      a.t.start(`node ${BIN} fill ${RECIPE} --by JD --batch lk --dir batches`);
      await a.t.waitFor(/fill 1 of 3/);
      await a.t.type('10.01');
      await a.t.keys('Enter');
      await a.t.waitFor(/fill 2 of 3/);
      b.start(withStatus(`node ${BIN} fill --by JD --resume batches/lk.jsonl`));
      expect(await exitStatus(b)).toBe(2);
      expect(flat(b.screen())).toMatch(/another guided fill holds this batch log: process \d+/);
      await a.t.kill();
      // a power cut mid-write: half a line at the end
      const log = join(a.dir, 'batches', 'lk.jsonl');
      appendFileSync(log, '{"kind":"reading","step":2,"source":"cyl-Ar","gau');
      a.t.start(`node ${BIN} fill --by JD --resume batches/lk.jsonl`);
      const s = flat(await a.t.waitFor(/fill 2 of 3/));
      expect(s).toMatch(/moved to batches\/lk\.jsonl\.torn-/);
      await a.t.type(String(target(s)));
      await a.t.keys('Enter');
      await a.t.waitFor(/fill 3 of 3/);
      await a.t.kill();
      expect(readdirSync(join(a.dir, 'batches')).some((f) => f.startsWith('lk.jsonl.torn-'))).toBe(true);
      expect(readFileSync(log, 'utf8').endsWith('\n')).toBe(true);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      expect(rep.readings.map((r) => r.step)).toEqual([1, 2]);
    } finally {
      a.t.close();
      b.close();
    }
  }, 60000);
  it('a split plan (CH4, Ar to 400 Torr, O2, Ar): each charge named on screen and logged with its charge; killed on the second charge, resumed on it, filled to the end', async () => {
    const { dir, t } = session('split');
    try {
      const log = join(dir, 'split.jsonl');
      // the header as `fill` writes it (the split order given to the planner), then the fill itself
      createLog(log, splitHeader());
      t.start(withStatus(`node ${BIN} fill --by JD --resume ${log}`));
      let s = await t.waitFor(/fill 1 of 4/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = flat(await t.waitFor(/fill 2 of 4/));
      expect(s).toMatch(/Fill Ar, charge 1 of 2 from cyl-Ar/);
      expect(s).toMatch(
        /Open cyl-Ar for charge 1 of 2 of Ar only: stop at 400\.\d+ Torr, then close the cylinder valve; charge 2 of 2 follows at fill 4\./,
      );
      expect(target(s)).toBeCloseTo(400, 1);
      const first = target(s);
      await t.type(String(first));
      await t.keys('Enter');
      s = flat(await t.waitFor(/fill 3 of 4/));
      expect(s).toMatch(/fill 2 \(Ar, charge 1 of 2\) logged/);
      expect(s).toMatch(/Fill O2 from cyl-O2/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = flat(await t.waitFor(/fill 4 of 4/));
      expect(s).toMatch(/Fill Ar, charge 2 of 2 from cyl-Ar/);
      expect(s).toMatch(
        /Open cyl-Ar again for charge 2 of 2 of Ar: fill on to 1[45]\d\d\.\d+ Torr; charge 1 of 2 was fill 2 \(logged 400(\.\d+)? Torr\)/,
      );
      // killed on the second charge, before its reading: three readings are logged, each with its charge
      await t.kill();
      const mid = readLog(log);
      expect(mid.closed).toBe(false);
      expect(mid.readings.map((r) => [r.step, r.source, r.charge?.number, r.charge?.of])).toEqual([
        [1, 'cyl-CH4', 1, 1],
        [2, 'cyl-Ar', 1, 2],
        [3, 'cyl-O2', 1, 1],
      ]);
      expect(mid.readings[1].pressure_Pa / TORR).toBeCloseTo(first, 9);
      t.start(withStatus(`node ${BIN} fill --by JD --resume ${log}`));
      s = flat(await t.waitFor(/fill 4 of 4/));
      expect(s).toMatch(
        /resumed: 3 of 4 readings were in the log; next: fill 4 \(Ar, charge 2 of 2\) from cyl-Ar/,
      );
      expect(s).toMatch(/Fill Ar, charge 2 of 2 from cyl-Ar/);
      await t.type(String(target(s)));
      await t.keys('Enter');
      s = (await endPages(t)).first;
      // the demo at its targets is shown within only on the values: check's words, never a bare pass
      expect(s).toMatch(/Re-check of the log \(mixwright check\): NOT SHOWN WITHIN TOLERANCE - not a pass/);
      await t.keys('q');
      // not a pass: exit 7 as check (README "Exit codes")
      expect(await exitStatus(t)).toBe(7);
      const l = readLog(log);
      expect(l.closed).toBe(true);
      expect(l.readings.map((r) => [r.step, r.source, r.charge])).toEqual([
        [1, 'cyl-CH4', { number: 1, of: 1 }],
        [2, 'cyl-Ar', { number: 1, of: 2 }],
        [3, 'cyl-O2', { number: 1, of: 1 }],
        [4, 'cyl-Ar', { number: 2, of: 2 }],
      ]);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      expect(rep.verdict.deviations.every((d) => d.within)).toBe(true);
    } finally {
      t.close();
    }
  }, 90000);

  it('past the working limit on the last fill: vent with initials (logged), a reading after venting above the one before is refused, the settled reading closes the batch; check and the label give the vented pressure', async () => {
    const { dir, t } = session('vent');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch vent --dir batches`));
      for (const r of ['10.01', '1480', '2800']) {
        await t.waitFor(/fill \d of 3/);
        await t.type(r);
        await t.keys('Enter');
      }
      let s = flat(await t.waitFor(/ABOVE THE WORKING LIMIT/));
      expect(s).toMatch(/vent INITIALS: you vent back \(logged; then read the tank after venting/);
      await t.type('vent');
      await t.keys('Enter');
      s = flat(await t.waitFor(/"vent" and your initials/));
      for (let i = 0; i < 4; i++) await t.keys('BSpace');
      await t.type('vent JD');
      await t.keys('Enter');
      s = flat(await t.waitFor(/VENTING \(logged\)/));
      expect(s).toMatch(/VENT TO AT MOST 1499\.9 Torr on head-10kT/);
      const log = join(dir, 'batches', 'vent.jsonl');
      expect(readLog(log).vents).toMatchObject([{ step: 3, by: 'JD', readings: [] }]);
      // a slip: above the reading before venting - refused, not logged
      await t.type('2900 JD');
      await t.keys('Enter');
      s = flat(await t.waitFor(/not below the reading before venting/));
      expect(s).toMatch(/The reading is not logged/);
      await t.type('1498.2 JD');
      await t.keys('Enter');
      // the title says how the batch ended: closed after venting, the reading against the last target
      s = flat(await t.waitFor(/CLOSED AFTER VENTING/, 30000));
      expect(s).toMatch(/CLOSED AFTER VENTING: fill 3 of 3 read 1498\.2 Torr \(target 1500\.0 Torr\)/);
      expect(s).not.toMatch(/fills logged/);
      expect(s).toMatch(/the tank read 1498\.2 Torr \(1498\.20 Torr absolute\) after venting, logged by JD/);
      // the label (on the end screen, or its own page): the final pressure is the one read after venting
      s = (await endPages(t, 60000)).label;
      expect(s).toMatch(/1498\.2 Torr absolute after venting at 25\.0 degC/);
      await t.keys('q');
      // 2800 Torr of O2 is far off the design: the re-check fails (4 before the danger's 3)
      expect(await exitStatus(t)).toBe(4);
      const l = readLog(log);
      expect(l.vents[0].readings.map((r) => r.pressure_Pa / TORR)).toEqual([expect.closeTo(1498.2, 9)]);
      expect(l.closed).toBe(true);
      const rep = await checkFile(log, { trials: 0, seed: 1 });
      expect(rep.vent?.after?.pressurePa).toBeCloseTo(1498.2 * TORR, 6);
    } finally {
      t.close();
    }
  }, 90000);

  it('a re-target held by the working limit stops on its own screen with the cost; the choice is typed with initials and logged (stop)', async () => {
    const { dir, t } = session('cap');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch cap --dir batches`));
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.01');
      await t.keys('Enter');
      await t.waitFor(/fill 2 of 3/);
      await t.type('2695');
      await t.keys('Enter');
      let s = flat(await t.waitFor(/THE WORKING LIMIT HOLDS THE FINAL/));
      // one capped final pressure (the last target on head-10kT's 0.1 Torr), the same in every line
      expect(s).toMatch(
        /The working limit costs: the tank ends at the capped final pressure 2700\.1 Torr \(absolute\); x\(CH4\) 0\.370 %/,
      );
      expect(s).toMatch(/Capped targets: fill 3 O2: 2700\.1 Torr on head-10kT \(the capped final pressure\)/);
      expect(s).not.toContain('2700.12');
      expect(s).toMatch(/go INITIALS: fill to the capped targets/);
      // a bare word is refused; nothing is logged
      await t.type('go');
      await t.keys('Enter');
      s = flat(await t.waitFor(/type one of: go INITIALS/));
      for (let i = 0; i < 2; i++) await t.keys('BSpace');
      await t.type('stop JD');
      await t.keys('Enter');
      await t.waitFor(/STOPPED after fill 2 of 3/);
      await t.keys('q');
      expect(await exitStatus(t, 30000)).toBe(4);
      const l = readLog(join(dir, 'batches', 'cap.jsonl'));
      expect(l.acknowledgements).toMatchObject([
        { code: 'limit-cap', step: 3, by: 'JD', cap: { outcome: 'stopped', outside: ['CH4', 'O2', 'Ar'] } },
      ]);
      expect(l.closed).toBe(true);
    } finally {
      t.close();
    }
  }, 90000);

  it('undo asks a short reason (Enter alone skips it); the withdrawal is logged with it and check lists it', async () => {
    const { dir, t } = session('undo');
    try {
      t.start(withStatus(`node ${BIN} fill ${RECIPE} --by JD --batch undo --dir batches`));
      await t.waitFor(/fill 1 of 3/);
      await t.type('10.01');
      await t.keys('Enter');
      await t.waitFor(/fill 2 of 3/);
      await t.type('undo JD');
      await t.keys('Enter');
      let s = flat(await t.waitFor(/undo the reading of fill 1/));
      expect(s).toMatch(/Enter alone logs it without a reason\. Esc: do not undo/);
      await t.type('typed 10.01 for 10.10');
      await t.keys('Enter');
      s = flat(await t.waitFor(/withdrawn by JD/));
      expect(s).toMatch(/withdrawn by JD \(reason: typed 10\.01 for 10\.10\)/);
      await t.keys('C-c');
      await exitStatus(t);
      const rep = await checkFile(join(dir, 'batches', 'undo.jsonl'), { trials: 0, seed: 1 }).catch(
        (e: Error) => e,
      );
      // no reading in force: check refuses the log; the record itself holds the withdrawal and its reason
      expect(rep).toBeInstanceOf(Error);
      const l = readLog(join(dir, 'batches', 'undo.jsonl'));
      expect(l.amendments).toMatchObject([
        { kind: 'withdraw', step: 1, by: 'JD', reason: 'typed 10.01 for 10.10' },
      ]);
    } finally {
      t.close();
    }
  }, 60000);
});
