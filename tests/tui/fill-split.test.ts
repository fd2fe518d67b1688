import { describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProblemError, describeProblem } from '../../src/core/index.js';
import { checkLog } from '../../src/io/check.js';
import {
  appendEvent,
  createLog,
  parseLog,
  readLog,
  type LogHeader,
  type NewLogEvent,
} from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { splitHeader } from '../split-plan.js';
import { TORR } from '../helpers.js';

const NOW = '2026-12-01T01:00:00Z';
const type = (s: FillState, text: string) => fillReducer(s, { type: 'char', text });
const enter = (s: FillState) => fillReducer(s, { type: 'enter', now: NOW });
function read(s: FillState, text: string, log?: NewLogEvent[]): FillState {
  const n = enter(type(s, text));
  log?.push(...n.effects);
  return n;
}
const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';
/** a target as typed on the gauge: 4 decimals (head-1kT and head-10kT show 0.01 Torr and finer) */
const at = (s: FillState, k: number) => (s.targetsPa[k] / TORR).toFixed(4);

describe('guided fill of a split plan: CH4, Ar to 400 Torr (charge 1 of 2), O2, Ar (charge 2 of 2)', () => {
  it('each charge is its own step; every reading is logged with its step and charge; the batch closes on the second charge', async () => {
    const h = splitHeader();
    const setup = setupFromHeader(h);
    expect(setup.steps.map((s) => [s.index, s.species, s.charge.number, s.charge.of])).toEqual([
      [1, 'CH4', 1, 1],
      [2, 'Ar', 1, 2],
      [3, 'O2', 1, 1],
      [4, 'Ar', 2, 2],
    ]);
    const events: NewLogEvent[] = [];
    let s = initialState(setup);
    for (let k = 0; k < 4; k++) s = read(s, at(s, k), events);
    expect(s.phase).toBe('done');
    const readings = events.filter((e) => e.kind === 'reading');
    expect(readings.map((e) => [e.step, e.source, e.charge])).toEqual([
      [1, 'cyl-CH4', { number: 1, of: 1 }],
      [2, 'cyl-Ar', { number: 1, of: 2 }],
      [3, 'cyl-O2', { number: 1, of: 1 }],
      [4, 'cyl-Ar', { number: 2, of: 2 }],
    ]);
    // the log reads back, and `check` of it passes the design (readings at the targets)
    const log = parseLog(logText(h, events), 'split.jsonl');
    expect(log.readings.map((r) => r.step)).toEqual([1, 2, 3, 4]);
    const rep = await checkLog(log, { trials: 0, seed: 1 });
    expect(rep.verdict.deviations.every((d) => d.within)).toBe(true);
  });

  it('the first charge keeps its stop reading when an earlier fill is off target; the fills after it are re-targeted', () => {
    const s0 = initialState(setupFromHeader(splitHeader()));
    // CH4 read 1 % high: phi needs more O2, the dilution more Ar; the Ar stop stays at 400 Torr
    const s1 = read(s0, ((s0.targetsPa[0] / TORR) * 1.01).toFixed(4));
    expect(s1.current).toBe(1);
    expect(s1.targetsPa[1] / TORR).toBeCloseTo(400, 9);
    expect(s1.targetsPa[2]).toBeGreaterThan(s0.targetsPa[2]);
    expect(s1.judgement?.verdict).toBe('on-course');
    expect(s1.message).toMatch(/^fill 1 logged: /);
    // read the first charge a little high: the O2 and second Ar targets follow the reading
    const s2 = read(s1, '401.0000');
    expect(s2.message).toMatch(/^fill 2 \(Ar, charge 1 of 2\) logged: \+1\.00 Torr from the target/);
    expect(s2.targetsPa[2]).toBeGreaterThan(s1.targetsPa[2]);
    // the remaining fills keep phi and the dilution; the final pressure gives (the re-target's order of
    // priority): 1 % more CH4 at the design fractions is 1 % more gas, about 1515 Torr
    expect(s2.judgement?.verdict).toBe('on-course');
    expect(s2.targetsPa[3] / TORR).toBeGreaterThan(1510);
    expect(s2.targetsPa[3] / TORR).toBeLessThan(1520);
    expect(s2.message).toMatch(
      /the final pressure becomes 151\d(\.\d+)? Torr \(design 1500 Torr\) to keep phi and the dilution/,
    );
  });

  it('stop at 1200 Torr: an exact CH4 reading keeps the stop and gives the second Ar charge the rest (it got none before)', () => {
    const s0 = initialState(setupFromHeader(splitHeader(1200)));
    const s1 = read(s0, at(s0, 0));
    // the stop is kept; the second charge ends at the design's 1500 Torr (the plan's own target, 0.1 Torr:
    // the re-target's total-row weighting), not at the O2 target 1219.99 Torr
    expect(s1.targetsPa[1] / TORR).toBeCloseTo(1200, 9);
    expect(Math.abs(s1.targetsPa[3] / TORR - 1500)).toBeLessThan(0.1);
    expect(s1.targetsPa[3] - s1.targetsPa[2]).toBeGreaterThan(270 * TORR);
    expect(s1.message).toMatch(/keep phi, the dilution and the final pressure within tolerance/);
    // the readings at the targets close the batch, and its judgement (the re-check's model) passes the design
    let s = s1;
    for (let k = 1; k < 4; k++) s = read(s, at(s, k));
    expect(s.phase).toBe('done');
    expect(['pass', 'pass-uncertain']).toContain(s.judgement?.verdict);
  });

  it('a stop the tank is already past is not kept: the fill says so with the numbers, and the Ar goes in its last charge', () => {
    const s0 = initialState(setupFromHeader(splitHeader()));
    // CH4 mistyped as 405 Torr (a gross overfill): taken as read, the next fill is the first Ar charge
    const s0b = read(s0, '405.0000');
    // so much CH4 that the working limit holds the final pressure: first the stop screen of the cap
    expect(s0b.phase).toBe('capped');
    expect(s0b.message).toMatch(
      /the stop of fill 2 \(charge 1 of 2 of cyl-Ar\) cannot be kept: the tank is at 405(\.\d+)? Torr before it, past its stop 400 Torr/,
    );
    const s1 = { ...read(s0b, 'go AB'), message: s0b.message };
    // then the remaining sequence is reviewed: O2 onto 405 Torr of CH4 is flammable and detonable
    // (undiluted fuel/O2, which the plan never had), so the fill stops on the review screen
    expect(s1.phase).toBe('review');
    expect(s1.review?.hazards.map((z) => z.key)).toEqual(
      expect.arrayContaining(['flammable-state@3', 'detonable-state@3']),
    );
    expect(s1.current).toBe(1);
    expect(s1.message).toMatch(
      /the stop of fill 2 \(charge 1 of 2 of cyl-Ar\) cannot be kept: the tank is at 405(\.\d+)? Torr before it, past its stop 400 Torr/,
    );
    expect(s1.message).toMatch(/have the remaining sequence reviewed before going on/);
    expect(s1.targetsPa[1] / TORR).toBeCloseTo(405, 6);
    expect(s1.targetsPa[3]).toBeGreaterThan(s1.targetsPa[2]);
  });

  it("a reading near the second charge's target typed for the first is asked about, and logged only as the first charge's", () => {
    // stop at 1100 Torr: both Ar charges read on head-10kT, so a reading at the final pressure can be typed
    const s0 = initialState(setupFromHeader(splitHeader(1100)));
    const s1 = read(s0, at(s0, 0));
    const c = read(s1, '1499.9');
    expect(c.phase).toBe('confirm');
    expect(c.effects).toEqual([]);
    expect(c.pending?.reason).toMatch(
      /nearer the target of fill 4 \(Ar, charge 2 of 2\), 1500\.\d+ Torr, than the stop of this one, 1100\.\d+ Torr: this is charge 1 of 2 of Ar/,
    );
    // n: nothing logged, the first charge is read again
    const back = fillReducer(c, { type: 'char', text: 'n' });
    expect(back.phase).toBe('reading');
    expect(back.current).toBe(1);
    // y: logged as charge 1 of 2 (what the tank reads after the first charge), never as the second
    const yes = fillReducer(c, { type: 'char', text: 'y' });
    expect(yes.effects.filter((e) => e.kind === 'reading')).toEqual([
      expect.objectContaining({ step: 2, charge: { number: 1, of: 2 } }),
    ]);
    expect(yes.current).toBe(2);
  });

  it('resumed after a stop on the second charge: lands on it, names it, keeps the logged charges', () => {
    const h = splitHeader();
    const events: NewLogEvent[] = [];
    let s = initialState(setupFromHeader(h));
    for (let k = 0; k < 3; k++) s = read(s, at(s, k), events);
    const target4 = s.targetsPa[3];
    const r = initialState(setupFromHeader(h), parseLog(logText(h, events), 'x.jsonl'), NOW);
    expect(r.phase).toBe('reading');
    expect(r.current).toBe(3);
    expect(r.message).toBe(
      'resumed: 3 of 4 readings were in the log; next: fill 4 (Ar, charge 2 of 2) from cyl-Ar',
    );
    expect(Math.abs(r.targetsPa[3] - target4)).toBeLessThan(1e-6 * target4);
    const done = read(r, at(r, 3));
    expect(done.phase).toBe('done');
    expect(done.effects[0]).toMatchObject({ kind: 'reading', step: 4, charge: { number: 2, of: 2 } });
  });

  it("the log refuses a reading that names another charge than its step's, and loads an older log without charges", () => {
    const h = splitHeader();
    const f = join(mkdtempSync(join(tmpdir(), 'mw-charge-')), 'b.jsonl');
    createLog(f, h);
    // createLog writes every step's charge
    expect(readLog(f).header.steps.map((x) => x.charge)).toEqual([
      { number: 1, of: 1 },
      { number: 1, of: 2 },
      { number: 1, of: 1 },
      { number: 2, of: 2 },
    ]);
    const reading = {
      kind: 'reading' as const,
      step: 2,
      source: 'cyl-Ar',
      gauge: h.steps[1].gauge!,
      reading: '400.00 Torr',
      pressure_Pa: 400 * TORR,
      temperature: '25.0 degC',
      temperature_K: 298.15,
      time: NOW,
    };
    appendEvent(f, { ...reading, step: 1, source: 'cyl-CH4', reading: '10 Torr', pressure_Pa: 10 * TORR });
    let err: unknown;
    try {
      appendEvent(f, { ...reading, charge: { number: 2, of: 2 } });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ProblemError);
    const p = (err as ProblemError).problem;
    expect(p).toMatchObject({ code: 'schema', log: { kind: 'charge-mismatch', step: 2 } });
    expect(describeProblem(p)).toMatch(
      /step 2 names charge 2 of 2 of cyl-Ar, but step 2 of the plan is charge 1 of 2 of cyl-Ar/,
    );
    // nothing was written; the right charge is taken
    expect(readLog(f).readings).toHaveLength(1);
    appendEvent(f, { ...reading, charge: { number: 1, of: 2 } });
    expect(readLog(f).readings.map((r) => r.charge?.number)).toEqual([undefined, 1]);
    // a log made before split charges: no charge in the header or the readings; it loads, the charges counted
    const old = { ...h, steps: h.steps.map(({ charge: _c, ...x }) => x) };
    const oldLog = parseLog(logText(old as LogHeader, [reading]), 'old.jsonl');
    expect(oldLog.readings.map((r) => r.step)).toEqual([2]);
    expect(setupFromHeader(oldLog.header).steps.map((x) => x.charge.number)).toEqual([1, 1, 1, 2]);
  });
});
