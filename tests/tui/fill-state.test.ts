import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import { parseLog, type NewLogEvent, type LogHeader } from '../../src/io/batch-log.js';
import {
  fillReducer,
  initialState,
  interruptNote,
  setupFromHeader,
  type FillState,
} from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

const PSI = 6894.757293168361; // lbf/in2 in Pa (NIST SP 811, exact from the definitions)

function header(pressure?: string, edit: (r: Record<string, unknown>) => Record<string, unknown> = (r) => r) {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({
    ...rs,
    // the three-fill order the advice gives (the sequence search would split the Ar): the reducer's cases name its steps
    recipe: edit({
      ...(rs.recipe as unknown as Record<string, unknown>),
      order: ['CH4', 'Ar', 'O2'],
    }) as unknown as typeof rs.recipe,
  });
  const input = pressure ? { ...req.input, finalPressurePa: Number(pressure) } : req.input;
  const plan = planFill(input);
  return headerFromPlan(plan, { ...req, input }, 'b1', '2026-12-01T00:00:00Z');
}
const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
const tab = (s: FillState) => fillReducer(s, { type: 'tab' });
/** type a reading and Enter, collecting the effects */
function read(s: FillState, text: string, log?: NewLogEvent[]): FillState {
  const n = enter(type(s, text));
  log?.push(...n.effects);
  return n;
}
function setTemperature(s: FillState, text: string): FillState {
  let t = tab(s);
  for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
  return tab(type(t, text));
}
const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';

describe('guided fill state machine', () => {
  it('past the range of a head below the working limit: the over-range screen names the lab gauges that cover it', () => {
    const s0 = initialState(setupFromHeader(header()));
    // fill 1 on head-1kT (up to 1000 Torr): "1890.2 kPa" = 14177.7 Torr (1 kPa = 7.50062 Torr, NIST SP 811)
    const r = read(s0, '1890.2 kPa');
    expect(r.phase).toBe('over-range');
    expect(r.done).toEqual([]);
    expect(r.overRange!.words).toMatch(
      /^DANGER if the tank holds it: 14177\.7 Torr absolute \(as typed\) is past the working limit 2700\.22 Torr of MT-1.*Then: typed "1890\.2 kPa" = 14177\.7 Torr on head-1kT, past its range \(up to 1000\.00 Torr\): head-1kT cannot show that, so it is NOT logged as a reading\..* PAST head-1kT's overpressure rating \(2000\.00 Torr\)/,
    );
    // none of the demo lab's gauges reads 14177.7 Torr (head-10kT ends at 10000)
    expect(r.overRange!.covering).toEqual([]);
    // 1200 Torr: head-10kT (absolute) first, then xdcr-100g (100 psi above ambient)
    expect(read(s0, '1200').overRange!.covering).toEqual(['head-10kT', 'xdcr-100g']);
  });
  it('a reading typed while the temperature field cannot be read ("35", no unit) is kept; the refusal names the temperature field; corrected, Enter logs it', () => {
    const s0: FillState = { ...initialState(setupFromHeader(header())), temperatureText: '35' };
    const r = enter(type(s0, '10.0128'));
    expect(r.effects).toEqual([]);
    expect(r.input).toBe('10.0128');
    expect(r.field).toBe('temperature');
    expect(r.error).toMatch(
      /^tank temperature refused \("35"\): .*Nothing is logged; the reading typed is kept/,
    );
    // the refused field, and only it, is cleared
    expect(r.temperatureText).toBe('');
    // the cursor is in the temperature field: the keys go there
    let t = r;
    for (let i = 0; i < 2; i++) t = fillReducer(t, { type: 'backspace' });
    t = type(t, '35 degC');
    expect(t.temperatureText).toBe('35 degC');
    const logged = enter(t);
    expect(logged.effects).toEqual([
      // 35 degC = 308.15 K (ISO 80000-5: T/K = t/degC + 273.15, exact)
      expect.objectContaining({
        kind: 'reading',
        reading: '10.0128 Torr',
        temperature: '35 degC',
        temperature_K: 308.15,
      }),
    ]);
  });
  it('a reading on target: one reading effect, next step, the rest re-targeted, the composition on course', () => {
    const s0 = initialState(setupFromHeader(header()));
    expect(s0.phase).toBe('reading');
    const s1 = read(s0, (s0.targetsPa[0] / TORR).toFixed(4));
    expect(s1.current).toBe(1);
    expect(s1.effects).toHaveLength(1);
    expect(s1.effects[0]).toMatchObject({ kind: 'reading', step: 1, source: 'cyl-CH4', gauge: 'head-1kT' });
    expect(s1.message).toMatch(/inside the pressure band/);
    expect(s1.judgement?.kind).toBe('predicted');
    expect(s1.judgement?.verdict).toBe('on-course');
    // the reading was typed to the gauge's 4 decimals: the rest moves by that rounding only
    expect(Math.abs(s1.targetsPa[1] / s0.targetsPa[1] - 1)).toBeLessThan(1e-4);
    expect(s1.message).toMatch(/keep phi, the dilution and the final pressure/);
  });

  it('invalid input is refused with a reason and no effect: empty, not a number, a volume, below the previous reading (causes named), past full scale, impossible temperature', () => {
    const s0 = initialState(setupFromHeader(header()));
    expect(enter(s0).error).toMatch(/type the reading first/);
    expect(enter(type(s0, 'abc')).error).toMatch(/cannot read/);
    // a typo: the field is cleared (the message quotes it), so the next entry does not run on from it;
    // the hint says that a bare number is read in the gauge's unit
    const typo = enter(type(s0, '1890..2'));
    expect(typo.error).toMatch(/cannot read "1890\.\.2" as a pressure/);
    expect(typo.error).toMatch(/Give a number in Torr \(the gauge's unit\), or a number and a unit/);
    expect(typo.input).toBe('');
    expect(read(typo, '10.0128').current).toBe(1);
    expect(enter(type(s0, '3 L')).error).toMatch(/is a volume/);
    const s1 = read(s0, '10.0128');
    const low = read(s1, '9');
    expect(low.error).toMatch(/not above the previous reading/);
    expect(low.error).toMatch(/flowed back into the line/);
    expect(low.error).toMatch(/tank cooled/);
    expect(low.effects).toEqual([]);
    expect(low.current).toBe(1);
    // past the gauge's range: no reading of it shows that, so it is not logged as a reading but as typed (the
    // over-range screen asks for the tank read on a gauge that covers it, or a slip); what was typed, what it is
    // on the gauge, its range, the likely slip; and what the gauge's own over-range would mean: head-10kT
    // reads up to 10000 Torr, past MT-1's working limit 2700.22 Torr (4 bar x 0.9)
    const over = read(s1, '20000');
    expect(over.phase).toBe('over-range');
    expect(over.done).toHaveLength(1);
    expect(over.effects).toEqual([expect.objectContaining({ kind: 'acknowledge', code: 'over-range' })]);
    expect(over.overRange!.words).toMatch(
      /^DANGER if the tank holds it: 20000\.0 Torr absolute \(as typed\) is past the working limit 2700\.22 Torr of MT-1, rated 3000 Torr: stop adding gas, close the cylinder and tank valves, keep clear of the tank and follow the lab's over-pressure procedure\. Then: typed "20000" = 20000\.0 Torr on head-10kT, past its range \(up to 10000\.0 Torr\): head-10kT cannot show that, so it is NOT logged as a reading\. It is logged as typed: MT-1 counts as NOT read until it is read on a gauge that covers it, or the value is said to be a slip\. Likely the unit or a typing slip \(the target is [\d.]+ Torr on head-10kT\)\. The lab profile gives no overpressure rating for head-10kT: .* If head-10kT itself shows over-range, MT-1 is above 10000\.0 Torr absolute, past its working limit 2700\.22 Torr: DANGER - stop adding gas, close the cylinder and tank valves, keep clear of the tank and follow the lab's over-pressure procedure\.$/,
    );
    // no gauge of the demo lab covers 20000 Torr: none is offered
    expect(over.overRange!.covering).toEqual([]);
    // 480.81 psi (the target's number in psi) = 24865.x Torr (1 psi = 51.7149 Torr, NIST SP 811)
    const far = read(s1, '480.81 psi');
    expect(far.overRange!.words).toMatch(
      /^DANGER .*Then: typed "480\.81 psi" = 24865\.\d Torr on head-10kT, past its range .* NOT logged as a reading/,
    );
    // said a slip (logged), the field is empty and the next entry is read alone
    const slip = read(over, 'slip AB');
    expect(slip.phase).toBe('reading');
    expect(slip.input).toBe('');
    expect(read(slip, '1480').error).toBeUndefined();
    // every refusal clears the field (README: a refused reading's field is cleared): past the physical
    // range, unreadable; the next entry is read alone, never appended to the refused one
    for (const bad of ['1e9 Torr', 'abc']) {
      const r = read(s1, bad);
      expect(r.error).toBeDefined();
      expect(r.input).toBe('');
      const next = read(r, '1480');
      expect(next.error).toBeUndefined();
      expect(next.pending?.event ?? next.done.at(-1)).toBeDefined();
      expect(next.input).toBe('');
    }
    expect(setTemperature(s1, '-300 degC').error).toMatch(/below absolute zero/);
    const t = setTemperature(s1, '400 degC');
    expect(t.error).toMatch(
      /^tank temperature refused \("400 degC"\): .*outside the allowed range 200-600 K/,
    );
    // the refused temperature is cleared and has the focus: what is typed next goes into it
    expect(t.temperatureText).toBe('');
    expect(t.field).toBe('temperature');
  });

  it('a refusal clears only the field refused and says which: a bad temperature keeps the reading typed, a bad reading keeps the temperature', () => {
    const s1 = read(initialState(setupFromHeader(header())), '10.0128');
    // the reading typed, then a temperature out of range, Enter from the temperature field
    let t = tab(type(s1, '1480'));
    for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
    const e = enter(type(t, '400 degC'));
    expect(e.effects).toEqual([]);
    expect(e.current).toBe(1);
    expect(e.error).toMatch(
      /^tank temperature refused \("400 degC"\): .*200-600 K.*the reading typed is kept/,
    );
    expect(e.input).toBe('1480');
    expect(e.temperatureText).toBe('');
    expect(e.field).toBe('temperature');
    // the temperature typed again, Enter: the reading kept is logged at it
    const ok = enter(type(e, '27 degC'));
    expect(ok.current).toBe(2);
    expect(ok.effects[0]).toMatchObject({ kind: 'reading', reading: '1480 Torr', temperature: '27 degC' });
    // a bad reading: the reading is cleared, the temperature stays
    const r = enter(type(setTemperature(s1, '27 degC'), '1480..2'));
    expect(r.error).toMatch(/^reading refused: cannot read "1480\.\.2" as a pressure/);
    expect(r.input).toBe('');
    expect(r.temperatureText).toBe('27 degC');
  });

  it('the last reading closes the batch: close effect, a GUM re-check summary and a final verdict on composition', () => {
    let s = initialState(setupFromHeader(header()));
    for (let k = 0; k < 3; k++) s = read(s, (s.targetsPa[k] / TORR).toFixed(4));
    expect(s.phase).toBe('done');
    expect(s.effects.map((e) => e.kind)).toEqual(['reading', 'close']);
    // design CH4 = 0.02/3 (phi 1 in 98 % Ar: CH4 + 2 O2 = 2 %), readings to the gauge's resolution
    expect(s.summary!.composition.CH4.value).toBeCloseTo(0.0066667, 5);
    expect(s.judgement?.kind).toBe('final');
    expect(s.judgement?.verdict).not.toBe('fail');
  });

  it('a last reading typed 1.1 K warmer at the old target: the verdict is on composition (FAIL), the same as check of that log; re-targeted for the typed temperature it passes', async () => {
    const h = header();
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(h));
    s = read(s, (s.targetsPa[0] / TORR).toFixed(4), events);
    s = read(s, (s.targetsPa[1] / TORR).toFixed(1), events);
    const oldTarget = s.targetsPa[2];
    // the temperature is typed with the reading (Tab, type, Enter without leaving the field)
    let t = tab(s);
    for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
    t = type(t, '26.1 degC');
    t = fillReducer(t, { type: 'tab' });
    // leaving the field re-targets: O2 at the same amount reads higher at 299.25 K (ideal gas: x T ratio)
    expect(t.targetsPa[2] / oldTarget).toBeGreaterThan(1.003);
    expect(t.targetsPa[2] / oldTarget).toBeLessThan(1.0045);
    expect(t.message).toMatch(/targets re-computed for 26.1 degC/);
    // the old target typed anyway: pressure inside its band, composition far off
    const bad = read(
      { ...t, targetsPa: s.targetsPa, targetTemperatureK: t.targetTemperatureK },
      (oldTarget / TORR).toFixed(1),
      events,
    );
    expect(bad.phase).toBe('done');
    expect(bad.judgement?.verdict).toBe('fail');
    const o2 = bad.judgement!.deviations.find((d) => d.species === 'O2')!;
    expect(o2.within).toBe(false);
    // the same inverse model and temperatures as `check`: the composition agrees to 1e-9 relative
    const rep = await checkLog(parseLog(logText(h, events), 'x.jsonl'), { trials: 0, seed: 1 });
    expect(rep.verdict.verdict).toBe('fail');
    for (const d of bad.judgement!.deviations)
      expect(Math.abs(d.actual / rep.result.composition[d.species].value - 1)).toBeLessThan(1e-9);
    // at the re-targeted pressure the composition is the design's
    const good = read(t, (t.targetsPa[2] / TORR).toFixed(1));
    expect(good.judgement?.verdict).not.toBe('fail');
  });

  it('a danger finding blocks the fill until "accept INITIALS" is typed; then today\'s barometer is asked (a gauge-referenced sensor is in the plan)', () => {
    const s0 = initialState(setupFromHeader(header(String(3.8e5))));
    expect(s0.phase).toBe('acknowledge');
    expect(s0.setup.dangers.length).toBeGreaterThan(0);
    const no = enter(type(s0, '1500'));
    expect(no.phase).toBe('acknowledge');
    expect(no.error).toMatch(/type "accept" and your initials/);
    const yes = enter(type(s0, 'accept AB'));
    expect(yes.phase).toBe('barometer');
    expect(yes.effects.every((e) => e.kind === 'acknowledge' && e.by === 'AB')).toBe(true);
  });

  it('resume: the readings in the log set the step, the acknowledgements are remembered', () => {
    const h = header();
    let s = initialState(setupFromHeader(h));
    const events: NewLogEvent[] = [];
    s = read(s, (s.targetsPa[0] / TORR).toFixed(4), events);
    const log = parseLog(logText(h, events), 'x.jsonl');
    const r = initialState(setupFromHeader(log.header), log);
    expect(r.current).toBe(1);
    expect(r.message).toMatch(/resumed: 1 of 3/);
    expect(r.done[0].pressurePa).toBeCloseTo(s.done[0].pressurePa, 9);
  });
});

describe('the working limit is a hard stop (demo MT-1: rating 4 bar x 0.9 = 2700.2 Torr)', () => {
  const h = header();
  const limitTorr = (4e5 * 0.9) / TORR;
  it('the header carries the working limit, not only the rating', () => {
    expect(h.tank.working_limit_Pa! / TORR).toBeCloseTo(limitTorr, 9);
    expect(setupFromHeader(h).workingLimitPa! / TORR).toBeCloseTo(limitTorr, 9);
  });

  /** 10.01 then 2800 Torr, the over-limit reading logged on line 3 (line 1 the header, line 2 fill 1) */
  const overLimit = () => {
    const s1 = read(initialState(setupFromHeader(h)), '10.01');
    const d = read(s1, '2800');
    return { s1, d, logged: fillReducer(d, { type: 'logged', step: 2, line: 3 }) };
  };
  it('10.01 then 2800 Torr: the reading is logged at once, then a danger screen; it says how far to vent and to what reading, below the limit', () => {
    const { d: d0, logged: d } = overLimit();
    expect(d0.phase).toBe('over-limit');
    // a reading is a fact about the tank: logged before the operator chooses (Ctrl-C there keeps it)
    expect(d0.effects.map((e) => e.kind)).toEqual(['reading']);
    expect(d0.effects[0]).toMatchObject({
      step: 2,
      pressure_Pa: 2800 * TORR,
      note: expect.stringMatching(/above the working limit/),
    });
    expect(d.pending!.done.line).toBe(3);
    // venting keeps the composition: the CH4 overshoot-free CH4/Ar ratio, O2 restores phi: the screen says whether that is within the tolerance
    expect(typeof d.overLimit!.within).toBe('boolean');
    expect(d.overLimit!.within).toBe(d.overLimit!.outside.length === 0);
    expect(d.overLimit!.limitPa / TORR).toBeCloseTo(limitTorr, 6);
    expect(d.overLimit!.ventToPa / TORR).toBeLessThan(limitTorr);
    // venting keeps the CH4/Ar ratio; O2 then restores phi: from about the planned Ar reading (1480 Torr at the CH4 read)
    expect(d.overLimit!.ventToPa / TORR).toBeGreaterThan(1400);
    expect(d.overLimit!.ventToPa / TORR).toBeLessThan(1500);
    // anything else than vent, accept INITIALS or edit INITIALS is refused; Esc does not drop the logged reading
    expect(enter(type(d, 'ok')).error).toMatch(/type "vent"/i);
    expect(enter(type(d, 'edit')).error).toMatch(/"edit" and your initials/);
    const esc = fillReducer(d, { type: 'escape' });
    expect(esc.phase).toBe('over-limit');
    expect(esc.error).toMatch(/logged/);
  });

  it('edit INITIALS (mistyped): a withdrawal with initials and reason, the field cleared; check still reports the over-limit line as withdrawn', async () => {
    const { s1, logged: d } = overLimit();
    const e = enter(type(d, 'edit JD'));
    expect(e.phase).toBe('reading');
    expect(e.current).toBe(1);
    // the mistyped value is not given back: one Enter must not log it a second time
    expect(e.input).toBe('');
    const again = enter(e);
    expect(again.effects).toEqual([]);
    expect(again.phase).toBe('reading');
    expect(again.error).toMatch(/type the reading first/);
    expect(e.effects).toEqual([
      expect.objectContaining({
        kind: 'withdraw',
        step: 2,
        withdraws_line: 3,
        by: 'JD',
        reason: expect.stringMatching(/mistyped/),
      }),
    ]);
    const ok = read({ ...e, input: '' }, '1480');
    expect(ok.effects.map((x) => x.kind)).toEqual(['reading']);
    const log = parseLog(
      logText(h, [...s1.effects, ...overLimit().d.effects, ...e.effects, ...ok.effects]),
      'x.jsonl',
    );
    expect(log.readings.map((r) => r.pressure_Pa / TORR)).toEqual([10.01, 1480]);
    const report = await checkLog(log, { trials: 0, seed: 1 });
    const f = report.findings.find((x) => x.code === 'above-working-limit');
    expect(f).toBeDefined();
    expect(f!.severity).toBe('warning');
    // the verdict's caveats (check, the label, the fill's end screen) carry it: the reading against the
    // limit (MT-1's 2700.22 Torr: 4 bar rating x 0.9, the demo lab profile) and what to do if it was real
    const c = report.caveats.find((x) => /ABOVE THE WORKING LIMIT WAS LOGGED/.test(x));
    expect(c, report.caveats.join('\n')).toMatch(
      /line 3, fill 2: 2800 Torr absolute vs the working limit 2700\.22 Torr\): if the tank really reached it, treat it as a danger/,
    );
  });

  it('resumed after Ctrl-C on the danger screen: the logged reading brings the danger screen back', () => {
    const { s1, d } = overLimit();
    const log = parseLog(logText(h, [...s1.effects, ...d.effects]), 'x.jsonl');
    const r = initialState(setupFromHeader(h), log, NOW);
    expect(r.phase).toBe('over-limit');
    expect(r.pending!.done.line).toBe(3);
    expect(r.done).toHaveLength(1);
    // Ctrl-C here says more than the count of readings: the tank left above its limit, no choice made
    expect(interruptNote(r)).toMatch(
      /LEFT LOGGED ABOVE ITS WORKING LIMIT with no choice made: fill 2 read 2800\.00 Torr absolute vs the limit 2700\.22 Torr \(logged\)/,
    );
    expect(interruptNote(s1)).toBeUndefined();
    expect(enter(type(r, 'edit JD')).effects[0]).toMatchObject({ kind: 'withdraw', withdraws_line: 3 });
  });

  it('resumed after a new over-limit reading of a fill whose earlier over-limit reading was accepted: the acceptance is of its own log line (as check matches it), so the danger screen comes back', async () => {
    const { s1, d } = overLimit();
    // line 3: 2800 Torr; line 4: accepted; line 5: withdrawn (mistyped); line 6: 2850 Torr, no choice logged
    const events: NewLogEvent[] = [
      ...s1.effects,
      ...d.effects,
      { kind: 'acknowledge', code: 'above-working-limit', step: 2, by: 'JD', time: NOW, note: 'accepted' },
      { kind: 'withdraw', step: 2, withdraws_line: 3, by: 'JD', time: NOW, reason: 'mistyped' },
      {
        ...(d.effects[0] as Extract<NewLogEvent, { kind: 'reading' }>),
        reading: '2850 Torr',
        pressure_Pa: 2850 * TORR,
      },
    ];
    const log = parseLog(logText(h, events), 'x.jsonl');
    expect(log.readings.map((r) => [r.line, r.pressure_Pa / TORR])).toEqual([
      [2, expect.closeTo(10.01, 9)],
      [6, expect.closeTo(2850, 9)],
    ]);
    // check: the acknowledgement accepts line 3 (withdrawn), not line 6: the reading on line 6 stands as a danger
    const report = await checkLog(log, { trials: 0, seed: 1 });
    const f = report.findings.find((x) => x.code === 'above-working-limit' && x.line === 6);
    expect(f).toMatchObject({ severity: 'danger' });
    expect(f).not.toHaveProperty('accepted');
    // the fill, resumed, asks again about the reading on line 6
    const r = initialState(setupFromHeader(h), log, NOW);
    expect(r.phase).toBe('over-limit');
    expect(r.pending!.done.line).toBe(6);
    expect(r.pending!.done.pressurePa / TORR).toBeCloseTo(2850, 9);
    // the acknowledgement of that very line (a later line) is the choice: then it is not asked again
    const acked = parseLog(
      logText(h, [
        ...events,
        { kind: 'acknowledge', code: 'above-working-limit', step: 2, by: 'JD', time: NOW },
      ]),
      'x.jsonl',
    );
    expect(initialState(setupFromHeader(h), acked, NOW).phase).not.toBe('over-limit');
  });

  it('accept INITIALS: the acknowledgement and the reading are logged; no fill is proposed past the limit, the batch stops', () => {
    const { logged: d } = overLimit();
    const a = enter(type(d, 'accept JD'));
    expect(a.effects.map((e) => e.kind)).toEqual(['acknowledge', 'close']);
    expect(a.effects[0]).toMatchObject({ code: 'above-working-limit', step: 2, by: 'JD' });
    expect(a.phase).toBe('ended');
    expect(a.message).toMatch(/at or above its working limit/);
    const log = parseLog(logText(h, [...overLimit().d.effects, ...a.effects]), 'x.jsonl');
    expect(log.readings.map((r) => r.step)).toEqual([2]);
  });

  it('vent INITIALS (not the last fill): the vent is logged, the tank read after venting (a reading not below the one before venting is refused, one still past the limit is logged and asked again); the batch stops with the instruction to finish as a top-up', () => {
    const { logged: d } = overLimit();
    // the vent is logged: initials are asked
    expect(enter(type(d, 'vent')).error).toMatch(/"vent" and your initials/);
    const v = enter(type(d, 'vent JD'));
    expect(v.effects).toEqual([
      expect.objectContaining({ kind: 'vent', step: 2, by: 'JD', target_Pa: d.overLimit!.ventToPa }),
    ]);
    // the note gives the target to vent to, never as what happened (the tank is not yet read after venting)
    const note = (v.effects[0] as { note?: string }).note!;
    expect(note).toMatch(/chosen to vent; target to vent to: at most 14\d\d\.\d+ Torr absolute/);
    expect(note).not.toMatch(/vented back to/);
    expect(v.phase).toBe('vented');
    expect(v.message).toMatch(
      /Vent or pump the tank back to at most 14\d\d\.\d Torr on head-10kT \(14\d\d\.\d+ Torr absolute\), let it settle/,
    );
    // a slip: above the reading before venting (2800 Torr) - refused, nothing logged
    const typo = read(v, '2900 JD');
    expect(typo.phase).toBe('vented');
    expect(typo.effects).toEqual([]);
    expect(typo.error).toMatch(/not below the reading before venting, 2800\.00 Torr absolute/);
    // still past the working limit: logged (a fact), the screen stays
    const still = read(typo, '2750 JD');
    expect(still.phase).toBe('vented');
    expect(still.effects).toEqual([
      expect.objectContaining({ kind: 'vent-reading', pressure_Pa: 2750 * TORR }),
    ]);
    expect(still.message).toMatch(/still ABOVE the working limit/);
    const done = read(still, '1490.5 JD');
    expect(done.effects.map((e) => e.kind)).toEqual(['vent-reading', 'close']);
    expect(done.phase).toBe('ended');
    expect(done.message).toMatch(/1490\.50 Torr absolute\) after venting, logged by JD/);
    // how to finish as a top-up: the recipe lines, the command, and each fill (gas, reading, gauge)
    expect(done.message).toMatch(
      /in a copy of this batch's recipe add `in_tank: \{ composition: \{ CH4: 0\.00\d+, .*Ar: 0\.99\d+ \}, pressure: 1490\.50 Torr \}` \(the fills left: \[O2\]\), check it with `mixwright plan` and fill it with `mixwright fill`/,
    );
    expect(done.message).toMatch(
      /Its fills should come to \(re-targeted here from the tank as read after venting\): fill 3 O2 from cyl-O2 to 1501\.12 Torr on head-10kT/,
    );
    expect(done.message).toMatch(/If `plan` refuses the copy .* the design cannot be reached from this tank/);
    const close = done.effects[1] as { note?: string };
    expect(close.note).toMatch(/in_tank: .*the fills left: \[O2\]/);
  });

  it('an Ar reading just under the limit: the O2 target stays at or under the limit and the screen says what gives', () => {
    const s1 = read(initialState(setupFromHeader(h)), '10.01');
    const s2 = read(s1, '2695');
    // a stop screen: the operator chooses explicitly (go, undo or stop), each logged
    expect(s2.phase).toBe('capped');
    expect(s2.targetsPa[2] / TORR).toBeLessThanOrEqual(limitTorr * (1 + 1e-9));
    expect(s2.message).toMatch(/working limit/);
    expect(s2.judgement?.verdict).toBe('off-course');
    expect(s2.capped).toMatchObject({
      after: 'after fill 2',
      step: 3,
      outside: expect.arrayContaining(['CH4', 'O2']),
    });
    // one capped final pressure, said the same way in the re-target's words, the cost and the choice
    const final = s2.capped!.finalText;
    expect(final).toMatch(/^2\d{3}\.\d Torr$/);
    expect(s2.capped!.cost).toContain(
      `The working limit costs: the tank ends at the capped final pressure ${final} (absolute); x(CH4)`,
    );
    expect(s2.message).toContain(
      `the final pressure is held at ${final} (design 1500 Torr), at least the last fill's band`,
    );
    expect(s2.message).not.toMatch(/held at 2\d{3}\.\d{2}/);
    // no way on without a logged choice: Enter, Esc, a bare word, initials missing
    for (const t of [enter(s2), fillReducer(s2, { type: 'escape' }), read(s2, 'go'), read(s2, 'ok AB')]) {
      expect(t.phase).toBe('capped');
      expect(t.effects).toEqual([]);
      expect(t.error).toMatch(/go INITIALS/);
    }
    const go = read(s2, 'go JD');
    expect(go.phase).toBe('reading');
    expect(go.current).toBe(2);
    expect(go.effects).toEqual([
      expect.objectContaining({
        kind: 'acknowledge',
        code: 'limit-cap',
        step: 3,
        by: 'JD',
        cap: expect.objectContaining({ outcome: 'continued', outside: expect.arrayContaining(['CH4']) }),
      }),
    ]);
    const stop = read(s2, 'stop JD');
    expect(stop.phase).toBe('ended');
    expect(stop.effects.map((e) => e.kind)).toEqual(['acknowledge', 'close']);
    expect(stop.effects[0]).toMatchObject({ cap: { outcome: 'stopped' } });
    // undo: the reading of fill 2 is withdrawn (its line known) and fill 2 is read again
    const undo = read(read(fillReducer(s2, { type: 'logged', step: 2, line: 3 }), 'undo JD'), '');
    expect(undo.effects).toEqual([expect.objectContaining({ kind: 'withdraw', step: 2, withdraws_line: 3 })]);
    expect(undo.current).toBe(1);
    expect(undo.capped).toBeUndefined();
  });

  it('a cap reached after a correction, an undo or a temperature change gets the same stop screen as after a reading', () => {
    // fill 1 on target; fix 1: the CH4 was 20.02 Torr (100 % high): the diluent it needs passes the limit
    const s1 = fillReducer(read(initialState(setupFromHeader(h)), '10.01'), {
      type: 'logged',
      step: 1,
      line: 2,
    });
    const c = read(read(read(s1, 'fix 1 JD'), '20.02'), 'misread the head');
    expect(c.effects.map((e) => e.kind)).toEqual(['correction']);
    expect(c.phase).toBe('capped');
    expect(c.capped).toMatchObject({ after: 'after the correction of fill 1', step: 2 });
    expect(c.capped!.cost).toContain(`the capped final pressure ${c.capped!.finalText} (absolute)`);
    // fills 1 and 2 read (Ar to 2660 Torr: the O2 still fits), then fill 1 corrected to 20.02 Torr: the
    // final pressure gives (the Ar is in), no cap; undo of fill 2 leaves the CH4 alone: capped - the screen
    const s2 = fillReducer(read(s1, '2660'), { type: 'logged', step: 2, line: 3 });
    const c2 = fillReducer(read(read(read(s2, 'fix 1 JD'), '20.02'), 'misread'), {
      type: 'logged',
      step: 1,
      line: 4,
    });
    expect(c2.phase).toBe('reading');
    const u = read(read(c2, 'undo JD'), 'valve left open');
    expect(u.effects.map((e) => e.kind)).toEqual(['withdraw']);
    expect(u.phase).toBe('capped');
    expect(u.capped).toMatchObject({ after: 'after the undo of fill 2', step: 2 });
    expect(u.message).toMatch(/is withdrawn by JD \(reason: valve left open\)/);
    // a warmer tank: the gas read at 2660 Torr at 25 degC is about 2687 Torr at 28 degC; its O2 then passes the cap
    const w1 = read(read(initialState(setupFromHeader(h)), '10.01'), '2660');
    expect(w1.phase).toBe('reading');
    let t = tab(w1);
    for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
    const w = tab(type(t, '28 degC'));
    expect(w.phase).toBe('capped');
    expect(w.capped).toMatchObject({ after: 'at 28.0 degC', step: 3 });
    // go: logged as for a reading
    const go = read(w, 'go JD');
    expect(go.effects[0]).toMatchObject({ kind: 'acknowledge', code: 'limit-cap', step: 3 });
    expect((go.effects[0] as { note: string }).note).toContain(
      `at 28.0 degC the remaining fills are held below the working limit`,
    );
  });

  it('resumed after a capped re-target with no choice logged: the stop screen comes back; with the choice logged it does not', async () => {
    const s1 = read(initialState(setupFromHeader(h)), '10.01');
    const s2 = read(s1, '2695');
    const log = parseLog(logText(h, [...s1.effects, ...s2.effects]), 'x.jsonl');
    expect(initialState(setupFromHeader(h), log, NOW).phase).toBe('capped');
    const go = read(s2, 'go JD');
    const log2 = parseLog(logText(h, [...s1.effects, ...s2.effects, ...go.effects]), 'x.jsonl');
    expect(log2.acknowledgements[0].cap).toMatchObject({ outcome: 'continued' });
    expect(initialState(setupFromHeader(h), log2, NOW).phase).toBe('reading');
    // check lists the choice with who made it and the cost
    const report = await checkLog(log2, { trials: 0, seed: 1 });
    expect(report.warnings.join('\n')).toMatch(
      /before fill 3 the re-target was held below the working limit .*: JD at .* went on to the capped targets/,
    );
  });
});

describe('plausibility and the barometer (MT-2 at 3 bar: Ar and O2 on the 100 psi gauge-referenced transducer)', () => {
  const h = header(undefined, (r) => ({ ...r, tank: 'MT-2', pressure: '3 bar' }));
  const start = () => {
    const s = initialState(setupFromHeader(h));
    expect(s.phase).toBe('barometer');
    return s;
  };
  it("today's barometric pressure is asked first, refused without a unit or outside 70-110 kPa, and used for the gauge targets and logged with each gauge reading", () => {
    const s = start();
    expect(enter(type(s, '752.3')).error).toMatch(/unit/);
    expect(enter(type(s, '752.3 Torr')).error).toMatch(/add your initials/);
    expect(enter(type(s, '75 Torr AB')).error).toMatch(/70-110 kPa/);
    const b = enter(type(s, '745 Torr AB'));
    expect(b.phase).toBe('reading');
    expect(b.barometerPa / TORR).toBeCloseTo(745, 9);
    expect(b.effects).toEqual([
      expect.objectContaining({ kind: 'barometer', reading: '745 Torr', by: 'AB' }),
    ]);
    expect(b.effects[0]).toMatchObject({ pressure_Pa: 745 * TORR });
    const s1 = read(b, (b.targetsPa[0] / TORR).toFixed(2));
    const shownPsi = (s1.targetsPa[1] - 745 * TORR) / PSI;
    const s2 = read(s1, shownPsi.toFixed(2));
    const ev = s2.effects[0] as { barometer_Pa?: number; pressure_Pa: number };
    expect(ev.barometer_Pa! / TORR).toBeCloseTo(745, 9);
    expect(ev.pressure_Pa).toBeCloseTo(Number(shownPsi.toFixed(2)) * PSI + 745 * TORR, 6);
  });

  it('an absolute value typed on the gauge-referenced sensor asks first and names the cause; n goes back, y logs it', () => {
    const b = enter(type(start(), '760 Torr AB'));
    const s1 = read(b, (b.targetsPa[0] / TORR).toFixed(2));
    const absPsi = s1.targetsPa[1] / PSI;
    const c = read(s1, absPsi.toFixed(2));
    expect(c.phase).toBe('confirm');
    expect(c.effects).toEqual([]);
    expect(c.pending!.reason).toMatch(/about one barometric pressure/);
    expect(c.pending!.reason).toMatch(/absolute pressure typed for a gauge-referenced sensor/);
    const n = type(c, 'n');
    expect(n.phase).toBe('reading');
    expect(n.effects).toEqual([]);
    // the wrong value is cleared from the field
    expect(n.input).toBe('');
    const y = type(c, 'y');
    expect(y.effects.map((e) => e.kind)).toEqual(['reading']);
  });
});

describe('the accepted danger is shown again at the fill that creates it', () => {
  it('CH4 then O2 (detonable state at fill 2): after accept, fill 1 as usual, then a reminder screen before fill 2', () => {
    const h = header(undefined, (r) => ({ ...r, order: ['CH4', 'O2', 'Ar'] }));
    const setup = setupFromHeader(h);
    expect(setup.dangers.some((d) => d.code === 'detonable-state' && d.step === 2)).toBe(true);
    const a = enter(type(initialState(setup), 'accept AB'));
    expect(a.phase).toBe('reading');
    const s1 = read(a, (a.targetsPa[0] / TORR).toFixed(4));
    expect(s1.phase).toBe('reminder');
    expect(s1.current).toBe(1);
    const r = enter(s1);
    expect(r.phase).toBe('reading');
    expect(r.effects).toEqual([]);
  });
});

describe('undo and correction, written through the batch log (lines, chain, check)', async () => {
  const { mkdtempSync } = await import('node:fs');
  const { join } = await import('node:path');
  const { tmpdir } = await import('node:os');
  const { createLog, appendEvent, readLog } = await import('../../src/io/batch-log.js');
  /** a fill on a real log: every effect appended (chained, fsync'd), its line fed back as the component does */
  function onLog(h: LogHeader) {
    const file = join(mkdtempSync(join(tmpdir(), 'mw-fs-')), 'b.jsonl');
    createLog(file, h);
    let s = initialState(setupFromHeader(h));
    const step = (a: Parameters<typeof fillReducer>[1]) => {
      s = fillReducer(s, a);
      for (const e of s.effects) {
        const w = appendEvent(file, e);
        if (e.kind === 'reading' || e.kind === 'correction')
          s = fillReducer(s, { type: 'logged', step: e.step, line: w.line });
      }
      return s;
    };
    const typeEnter = (t: string) => {
      // what a refused entry left in the field is cleared first, as an operator would
      while (s.input.length) step({ type: 'backspace' });
      for (const c of t) step({ type: 'char', text: c });
      return step({ type: 'enter', now: NOW });
    };
    return { file, typeEnter, step, get: () => s };
  }

  it('undo AB withdraws the last reading: the log keeps it and the withdrawal; the step is read again; check uses the new reading', async () => {
    const f = onLog(header());
    f.typeEnter('10.01');
    f.typeEnter('1408');
    expect(f.get().current).toBe(2);
    // 1408 Torr is below the Ar band (about 1480 Torr): the fill is incomplete, its screen stays
    expect(f.get().phase).toBe('below');
    expect(f.typeEnter('undo').error).toMatch(/undo AB/);
    // undo asks a short reason first: nothing is logged yet, Esc cancels (back to that screen)
    const ask = f.typeEnter('undo AB');
    expect(ask.phase).toBe('undo-reason');
    expect(ask.effects).toEqual([]);
    const esc = f.step({ type: 'escape' });
    expect(esc.phase).toBe('below');
    expect(esc.current).toBe(2);
    expect(esc.message).toMatch(/undo cancelled; nothing logged/);
    f.typeEnter('undo AB');
    const u = f.typeEnter('misread the  head');
    expect(u.current).toBe(1);
    expect(u.message).toMatch(/withdrawn by AB \(reason: misread the head\)/);
    const t2 = u.targetsPa[1] / TORR;
    f.typeEnter(t2.toFixed(1));
    f.typeEnter((f.get().targetsPa[2] / TORR).toFixed(1));
    expect(f.get().phase).toBe('done');
    const log = readLog(f.file);
    expect(log.amendments.map((a) => a.kind)).toEqual(['withdraw']);
    expect(log.amendments[0].reason).toBe('misread the head');
    expect(log.allReadings.map((r) => r.reading)).toEqual([
      '10.01 Torr',
      '1408 Torr',
      `${t2.toFixed(1)} Torr`,
      expect.any(String),
    ]);
    expect(log.issues.filter((i) => i.code === 'line-edited')).toEqual([]);
    const rep = await checkLog(log, { trials: 0, seed: 1 });
    expect(rep.readings[1].pressurePa / TORR).toBeCloseTo(Number(t2.toFixed(1)), 9);
  });

  it('fix 2 AB corrects an earlier reading with a reason: a correction line naming the line it replaces; the targets follow the corrected value; Esc cancels', async () => {
    const f = onLog(header());
    f.typeEnter('10.01');
    f.typeEnter('1480.0');
    expect(f.typeEnter('fix 5 AB').error).toMatch(/fill 5 has no reading/);
    const c = f.typeEnter('fix 2 AB');
    expect(c.phase).toBe('correct');
    expect(f.step({ type: 'escape' }).phase).toBe('reading');
    f.typeEnter('fix 2 AB');
    expect(f.typeEnter('9').error).toMatch(/does not lie between/);
    const r = f.typeEnter('1481.0');
    expect(r.correcting?.pending).toBeDefined();
    expect(f.typeEnter('').error).toMatch(/type why/);
    const before = r.targetsPa[2];
    const done = f.typeEnter('mistyped: 1481.0 not 1480.0');
    expect(done.phase).toBe('reading');
    expect(done.current).toBe(2);
    expect(done.message).toMatch(/fill 2 corrected by AB: 1480.0 Torr -> 1481.0 Torr/);
    // one Torr more Ar: O2 (which keeps phi) stays near its amount, so its target rises by about that Torr
    expect((done.targetsPa[2] - before) / TORR).toBeGreaterThan(0.9);
    expect((done.targetsPa[2] - before) / TORR).toBeLessThan(1.1);
    const log = readLog(f.file);
    expect(log.amendments).toHaveLength(1);
    expect(log.amendments[0]).toMatchObject({
      kind: 'correction',
      step: 2,
      by: 'AB',
      reason: 'mistyped: 1481.0 not 1480.0',
    });
    expect(log.amendments[0].old!.reading).toBe('1480.0 Torr');
    expect(log.readings[1].pressure_Pa / TORR).toBeCloseTo(1481, 9);
  });

  it('top-up: the starting pressure and temperature are read and logged first; the targets re-compute from them; check uses the logged start', async () => {
    // 120 Torr of a CH4/O2/Ar mixture already in MT-1 (the demo design's own composition)
    const comp = { CH4: 0.02 / 3, O2: 0.04 / 3, Ar: 0.98 };
    const h = header(undefined, (r) => ({ ...r, in_tank: { composition: comp, pressure: '120 Torr' } }));
    expect(h.in_tank?.pressure_Pa).toBeCloseTo(120 * TORR, 6);
    const f = onLog(h);
    const s0 = f.get();
    expect(s0.phase).toBe('start');
    expect(f.typeEnter('118.5').error).toMatch(/your initials/);
    const s1 = f.typeEnter('118.5 AB');
    expect(s1.phase).toBe('reading');
    expect(s1.message).toMatch(
      /starting pressure 118.5 Torr logged by AB \(the plan assumed 120.000 Torr absolute\)/,
    );
    // 1.5 Torr less gas of the design composition to start from: the first target falls by about that
    expect((s0.targetsPa[0] - s1.targetsPa[0]) / TORR).toBeGreaterThan(1.3);
    expect((s0.targetsPa[0] - s1.targetsPa[0]) / TORR).toBeLessThan(1.7);
    const log = readLog(f.file);
    expect(log.start).toMatchObject({ kind: 'start-pressure', reading: '118.5 Torr', by: 'AB' });
    expect(log.start!.pressure_Pa / TORR).toBeCloseTo(118.5, 9);
    // resumed: the start is not asked again
    const r = initialState(setupFromHeader(log.header), log);
    expect(r.phase).toBe('reading');
    expect(r.start?.read).toBe(true);
    expect(r.targetsPa[0]).toBeCloseTo(s1.targetsPa[0], 3);
  });
});

describe('the last fill below its band: the batch stays open for more gas', () => {
  const h = header();
  /** fills 1 and 2 on target, logged on lines 2 and 3; the last fill typed `lowBy` bands below its target */
  function lastLow(events: NewLogEvent[]) {
    let s = initialState(setupFromHeader(h));
    s = fillReducer(read(s, (s.targetsPa[0] / TORR).toFixed(4), events), {
      type: 'logged',
      step: 1,
      line: 2,
    });
    s = fillReducer(read(s, (s.targetsPa[1] / TORR).toFixed(2), events), {
      type: 'logged',
      step: 2,
      line: 3,
    });
    const t = s.targetsPa[2] / TORR;
    const band = s.setup.steps[2].bandPa / TORR;
    return { s, t, band };
  }
  it('a low last reading is logged, not closed; a lower "more gas" value is refused; the new reading is a correction ("more gas added") and closes; check uses it', async () => {
    const events: NewLogEvent[] = [];
    const { s, t, band } = lastLow(events);
    const low = read(s, (t - 3 * band).toFixed(2), events);
    expect(low.phase).toBe('below');
    expect(low.effects.map((e) => e.kind)).toEqual(['reading']);
    expect(low.message).toMatch(/BELOW the target/);
    expect(low.message).not.toMatch(/e[+-]\d/);
    const b = fillReducer(low, { type: 'logged', step: 3, line: 4 });
    expect(enter(type(b, (t - 2 * band).toFixed(2))).error).toMatch(/initials/);
    const lower = enter(type(b, `${(t - 4 * band).toFixed(2)} AB`));
    expect(lower.error).toMatch(/not above the logged reading of fill 3/);
    expect(lower.effects).toEqual([]);
    // still below: a correction, the batch stays open
    const still = read(b, `${(t - 2 * band).toFixed(2)} AB`, events);
    expect(still.phase).toBe('below');
    expect(still.effects).toEqual([
      expect.objectContaining({
        kind: 'correction',
        step: 3,
        by: 'AB',
        replaces_line: 4,
        reason: expect.stringMatching(/more gas added/),
      }),
    ]);
    const b2 = fillReducer(still, { type: 'logged', step: 3, line: 5 });
    const ok = read(b2, `${t.toFixed(2)} AB`, events);
    expect(ok.phase).toBe('done');
    expect(ok.effects.map((e) => e.kind)).toEqual(['correction', 'close']);
    expect(ok.effects[0]).toMatchObject({ replaces_line: 5 });
    const log = parseLog(logText(h, events), 'x.jsonl');
    expect(log.closed).toBe(true);
    expect(log.readings[2].pressure_Pa / TORR).toBeCloseTo(Number(t.toFixed(2)), 9);
    const rep = await checkLog(log, { trials: 0, seed: 1 });
    expect(rep.verdict.verdict).not.toBe('fail');
  });

  it('undo AB withdraws the low reading and reads the last fill again; close AB closes the batch below the target (check: FAIL); a resumed open log comes back to the choice', async () => {
    const events: NewLogEvent[] = [];
    const { s, t, band } = lastLow(events);
    const b = fillReducer(read(s, (t - 3 * band).toFixed(2), events), { type: 'logged', step: 3, line: 4 });
    const u = enter(enter(type(b, 'undo AB')));
    expect(u.phase).toBe('reading');
    expect(u.current).toBe(2);
    // Enter alone: the withdrawal carries no reason, and the screen says so
    expect(u.effects).toEqual([{ kind: 'withdraw', step: 3, withdraws_line: 4, by: 'AB', time: NOW }]);
    expect(u.message).toMatch(/withdrawn by AB \(no reason given\)/);
    const resumed = initialState(setupFromHeader(h), parseLog(logText(h, events), 'x.jsonl'), NOW);
    expect(resumed.phase).toBe('below');
    expect(resumed.effects).toEqual([]);
    const c = enter(type(b, 'close AB'));
    expect(c.phase).toBe('done');
    expect(c.effects).toEqual([
      expect.objectContaining({ kind: 'close', note: expect.stringMatching(/below its target band/) }),
    ]);
    const rep = await checkLog(parseLog(logText(h, [...events, ...c.effects]), 'x.jsonl'), {
      trials: 0,
      seed: 1,
    });
    expect(rep.verdict.verdict).toBe('fail');
  });

  it('more gas past the working limit on the below-target screen: the same hard stop as any reading past it - logged at once, then vent, accept or edit; resumed, the danger screen comes back', () => {
    const events: NewLogEvent[] = [];
    const { s, t, band } = lastLow(events);
    const b = fillReducer(read(s, (t - 3 * band).toFixed(2), events), { type: 'logged', step: 3, line: 4 });
    const limitTorr = h.tank.working_limit_Pa! / TORR;
    const gauge = s.setup.steps[2].gauge!;
    // a reading past the limit that the last fill's gauge can still show (else the range refusal comes first)
    const pastTorr = Math.min(limitTorr + 50, gauge.fullScalePa / TORR - 1);
    expect(pastTorr).toBeGreaterThan(limitTorr);
    const over = read(b, `${pastTorr.toFixed(2)} AB`, events);
    expect(over.phase).toBe('over-limit');
    expect(over.effects).toEqual([
      expect.objectContaining({ kind: 'correction', step: 3, by: 'AB', replaces_line: 4 }),
    ]);
    expect(over.overLimit!.ventToPa).toBeLessThan(h.tank.working_limit_Pa!);
    expect(over.effects.some((e) => e.kind === 'close')).toBe(false);
    const logged = fillReducer(over, { type: 'logged', step: 3, line: 5 });
    // Esc does not leave the screen; accept logs the acknowledgement and closes
    expect(fillReducer(logged, { type: 'escape' }).phase).toBe('over-limit');
    const acc = enter(type(logged, 'accept AB'));
    expect(acc.phase).toBe('done');
    expect(acc.effects.map((e) => e.kind)).toEqual(['acknowledge', 'close']);
    expect(acc.effects[0]).toMatchObject({ code: 'above-working-limit', step: 3, by: 'AB' });
    // edit: the correction is withdrawn with a trace, and fill 3 is read again
    const ed = enter(type(logged, 'edit AB'));
    expect(ed.phase).toBe('reading');
    expect(ed.current).toBe(2);
    expect(ed.effects).toEqual([expect.objectContaining({ kind: 'withdraw', step: 3, withdraws_line: 5 })]);
    const withdrawn = parseLog(logText(h, [...events, ...ed.effects]), 'x.jsonl');
    expect(withdrawn.readings.map((r) => r.step)).toEqual([1, 2]);
    // stopped (Ctrl-C) on the danger screen: the logged correction brings it back
    const resumed = initialState(setupFromHeader(h), parseLog(logText(h, events), 'x.jsonl'), NOW);
    expect(resumed.phase).toBe('over-limit');
    expect(resumed.pending!.done.step).toBe(3);
  });

  it('fix N INITIALS on the below-target screen corrects an earlier fill; the last target follows it, and the screen comes back; Esc returns to it too', () => {
    const events: NewLogEvent[] = [];
    const { s, t, band } = lastLow(events);
    const b = fillReducer(read(s, (t - 3 * band).toFixed(2), events), { type: 'logged', step: 3, line: 4 });
    const fix = enter(type(b, 'fix 1 AB'));
    expect(fix.error).toBeUndefined();
    expect(fix.phase).toBe('correct');
    expect(fillReducer(fix, { type: 'escape' }).phase).toBe('below');
    const fill1 = events[0] as { pressure_Pa: number };
    const right = enter(type(fix, ((fill1.pressure_Pa / TORR) * 1.001).toFixed(4)));
    expect(right.correcting?.pending).toBeDefined();
    const done = enter(type(right, 'misread the head'));
    expect(done.effects).toEqual([
      expect.objectContaining({ kind: 'correction', step: 1, by: 'AB', replaces_line: 2 }),
    ]);
    expect(done.phase).toBe('below');
    expect(done.message).toMatch(/fill 1 corrected by AB/);
    // more CH4 in the tank: the last fill's target moves with the corrected reading
    expect(done.targetsPa[2]).not.toBe(b.targetsPa[2]);
    const log = parseLog(logText(h, [...events, ...done.effects]), 'x.jsonl');
    expect(log.closed).toBe(false);
    expect(log.readings[0].pressure_Pa / TORR).toBeCloseTo((fill1.pressure_Pa / TORR) * 1.001, 3);
  });

  it('smaller: n on the "check this reading" prompt clears the field; a low reading is refused with both values in the typed unit and says what was typed', () => {
    const s0 = initialState(setupFromHeader(header()));
    const s1 = read(s0, '10.0128');
    const low = read(s1, '1 kPa');
    expect(low.error).toMatch(
      /typed "1 kPa": 1\.00000 kPa absolute is not above the previous reading, 1\.33\d+ kPa absolute/,
    );
  });
});

describe('the re-target message names only what the design has', () => {
  it('with phi: "keep phi, the dilution and the final pressure"; a design without phi (no fuel-oxidizer pair) is not told about phi', () => {
    const h = header();
    const setup = setupFromHeader(h);
    const s0 = initialState(setup);
    const withPhi = read(s0, (s0.targetsPa[0] / TORR).toFixed(4));
    expect(withPhi.message).toMatch(/keep phi, the dilution and the final pressure within tolerance/);
    const noPhi = initialState({ ...setup, design: { ...setup.design, phi: undefined } });
    const m = read(noPhi, (noPhi.targetsPa[0] / TORR).toFixed(4)).message!;
    expect(m).toMatch(/keep the dilution and the final pressure within tolerance/);
    expect(m).not.toMatch(/phi/);
  });
  it('a deviation of about a thousand Torr prints in plain notation (no "1.17e+3")', () => {
    const s0 = initialState(setupFromHeader(header()));
    const s1 = read(s0, (s0.targetsPa[0] / TORR).toFixed(4));
    const dev = 2650 - s1.targetsPa[1] / TORR;
    const s2 = read(s1, '2650');
    expect(s2.message).toContain(`fill 2 logged: +${dev.toFixed(0)} Torr from the target`);
    expect(s2.message).not.toMatch(/\de[+-]\d/);
  });
});
