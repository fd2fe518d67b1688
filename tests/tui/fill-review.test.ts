/**
 * The guided fill's safety review of its re-targeted remainder (src/tui/fill-review.ts), one case per
 * trigger: a reading, an undo, a correction, a resume of the log, a change of temperature. The plan is
 * the split demo (CH4, Ar to 400 Torr, O2, Ar; tests/split-plan.ts). Flammability reference: the
 * project's data (LFL of CH4 4.4 %, IEC 60079-20-1; LOC 10.7 %, ASTM E2079; Ar as 0.55 N2, ISO 10156),
 * checked by hand in tests/core/remainder-review.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { checkLog } from '../../src/io/check.js';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { splitHeader } from '../split-plan.js';
import { TORR } from '../helpers.js';
import { checkOutcomes } from '../../src/report/check-outcome.js';
import { buildCertificateModel } from '../../src/report/label-certificate.js';

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
const at = (s: FillState, k: number) => (s.targetsPa[k] / TORR).toFixed(4);
/** the CH4 fill read 40 % high: 14.0179 Torr instead of 10.0128 */
const CH4_HIGH = '14.0179';
const keys = (s: FillState) => s.review?.hazards.map((z) => z.key) ?? [];
const planHas = (h: LogHeader, key: string) =>
  (h.findings ?? []).some((f) => `${f.code}@${f.step ?? 0}` === key);

function setTemperature(s: FillState, text: string): FillState {
  let t = fillReducer(s, { type: 'tab' });
  for (let i = 0; i < 12; i++) t = fillReducer(t, { type: 'backspace' });
  return fillReducer(type(t, text), { type: 'tab' });
}

describe('guided fill: the re-targeted remainder is reviewed after every change, and a new hazard stops the fill', () => {
  const h = splitHeader();

  it('reading: CH4 40 % high makes the state after O2 flammable (not in the plan); no silent way on; the safer stop is taken and logged', async () => {
    const events: NewLogEvent[] = [];
    const s0 = initialState(setupFromHeader(h));
    expect(s0.phase).toBe('reading');
    const s1 = read(s0, CH4_HIGH, events);
    expect(s1.phase).toBe('review');
    expect(s1.review?.trigger).toBe('reading');
    // fill 4 (Ar) keeps that flammable tank flammable to a higher pressure: its own closed-vessel hazard
    expect(keys(s1)).toEqual(['flammable-state@3', 'closed-vessel-pressure@3', 'closed-vessel-fill-path@4']);
    expect(planHas(h, 'flammable-state@3')).toBe(false);
    expect(s1.review?.hazards[1].severity).toBe('danger');
    expect(s1.review?.hazards[0].text).toMatch(/flammable after this fill .* at 428\.0\d+ Torr/);
    // the reading itself is logged before the review screen
    expect(s1.effects.map((e) => e.kind)).toEqual(['reading']);
    // the safer stop: Ar charge 1 to 451.31 Torr (on head-1kT's 0.01 Torr grid), not 400
    const alt = s1.review!.alternative!;
    expect(alt.step).toBe(2);
    expect(alt.fromPa / TORR).toBeCloseTo(400, 9);
    expect(alt.toPa / TORR).toBeCloseTo(451.31, 6);
    // no way past it without a logged choice: Enter, Esc, a bare word, initials missing
    for (const t of [enter(s1), fillReducer(s1, { type: 'escape' }), read(s1, 'go'), read(s1, 'accept')]) {
      expect(t.phase).toBe('review');
      expect(t.effects).toEqual([]);
      expect(t.error).toMatch(/accept INITIALS/);
    }
    const s2 = read(s1, 'safer AB', events);
    expect(s2.phase).toBe('reading');
    expect(s2.current).toBe(1);
    expect(s2.effects).toEqual([
      expect.objectContaining({
        kind: 'acknowledge',
        code: 'remainder-review',
        step: 2,
        by: 'AB',
        review: expect.objectContaining({
          trigger: 'reading',
          outcome: 'safer-stop',
          stop: { step: 2, from_Pa: alt.fromPa, to_Pa: alt.toPa },
        }),
      }),
    ]);
    expect(s2.targetsPa[1]).toBeCloseTo(alt.toPa, 6);
    // on at the targets: no further review stops it, and the log re-checks
    let s = s2;
    for (let k = 1; k < 4; k++) s = read(s, at(s, k), events);
    expect(s.phase).toBe('done');
    const log = parseLog(logText(h, events), 'review.jsonl');
    expect(log.acknowledgements[0].review?.outcome).toBe('safer-stop');
    const rep = await checkLog(log, { trials: 0, seed: 1 });

    expect(rep.warnings.join('\n')).toMatch(
      /took the safer stop of fill 2, 451\.31 Torr instead of 400\.00 Torr/,
    );
  });

  it('reading: accept INITIALS goes on through the hazard, logged with the hazards; the same hazard does not stop the fill again', () => {
    const s1 = read(initialState(setupFromHeader(h)), CH4_HIGH);
    const s2 = read(s1, 'accept cd');
    expect(s2.phase).toBe('reading');
    expect(s2.effects).toEqual([
      expect.objectContaining({
        code: 'remainder-review',
        by: 'cd',
        review: expect.objectContaining({
          outcome: 'accepted',
          hazards: [
            { code: 'flammable-state', step: 3, severity: 'warning' },
            { code: 'closed-vessel-pressure', step: 3, severity: 'danger' },
            { code: 'closed-vessel-fill-path', step: 4, severity: 'danger' },
          ],
        }),
      }),
    ]);
    expect(s2.targetsPa[1] / TORR).toBeCloseTo(400, 9);
    expect(s2.acceptedHazards?.map((z) => z.key)).toEqual([
      'flammable-state@3',
      'closed-vessel-pressure@3',
      'closed-vessel-fill-path@4',
    ]);
    // fill 3 (O2) creates the accepted danger: it opens on the reminder, as a plan danger's fill does
    const s3 = read(s2, at(s2, 1));
    expect(s3.phase).toBe('reminder');
    expect(s3.current).toBe(2);
    const s4 = enter(s3);
    expect(s4.phase).toBe('reading');
    expect(s4.reminded).toContain(3);
    // the hazards stay known to the state with the numbers of the latest review (after the Ar reading)
    expect(s4.acceptedHazards?.find((z) => z.code === 'closed-vessel-pressure')?.numbers).toMatch(
      /ignited at [\d.]+ Torr it reaches [\d.]+ Torr \(working limit [\d.]+ Torr\)/,
    );
  });

  it('undo: withdrawing the reading that caused the hazard clears the review; withdrawing another keeps it (trigger undo)', () => {
    const s1 = read(initialState(setupFromHeader(h)), CH4_HIGH);
    // the logged line is known once written (the shell reports it)
    const l1 = fillReducer(s1, { type: 'logged', step: 1, line: 2 });
    const u = read(read(l1, 'undo AB'), '');
    expect(u.phase).toBe('reading');
    expect(u.review).toBeUndefined();
    expect(u.current).toBe(0);
    expect(u.effects).toEqual([expect.objectContaining({ kind: 'withdraw', withdraws_line: 2, by: 'AB' })]);
    // CH4 high, accepted; Ar to its stop; then the Ar reading is undone: the remainder (Ar to 400,
    // O2 onto it) is reviewed again and the hazard, accepted, does not stop it; not accepted, it would
    // (fill 3 opens on the reminder of the accepted danger: Enter passes it)
    const a = enter(read(read(l1, 'accept AB'), at(l1, 1)));
    const a2 = read(read(fillReducer(a, { type: 'logged', step: 2, line: 4 }), 'undo AB'), '');
    expect(a2.phase).toBe('reading');
    expect(a2.current).toBe(1);
    const b = read(fillReducer(read(l1, 'safer AB'), { type: 'logged', step: 2, line: 4 }), '452.0000');
    expect(b.phase).toBe('reading');
    const b2 = read(read(fillReducer(b, { type: 'logged', step: 2, line: 5 }), 'undo AB'), '');
    // the safer stop stays the charge's stop after the undo: nothing new, no review
    expect(b2.phase).toBe('reading');
    expect(b2.targetsPa[1] / TORR).toBeCloseTo(451.31, 6);
  });

  it('correction: fix 1 to a reading 40 % high stops the fill on the review (trigger correction); an undo from there reviews again (trigger undo)', () => {
    let s = initialState(setupFromHeader(h));
    s = fillReducer(read(s, at(s, 0)), { type: 'logged', step: 1, line: 2 });
    s = fillReducer(read(s, at(s, 1)), { type: 'logged', step: 2, line: 3 });
    expect(s.phase).toBe('reading');
    let c = read(s, 'fix 1 AB');
    expect(c.phase).toBe('correct');
    c = read(c, CH4_HIGH);
    c = read(c, 'mistyped: the head read 14.0179');
    expect(c.phase).toBe('review');
    expect(c.review?.trigger).toBe('correction');
    expect(keys(c)).toEqual(['flammable-state@3', 'closed-vessel-pressure@3', 'closed-vessel-fill-path@4']);
    // Esc from a correction begun on the review screen comes back to it
    const f = read(c, 'fix 2 AB');
    expect(f.phase).toBe('correct');
    expect(fillReducer(f, { type: 'escape' }).phase).toBe('review');
    // undo the Ar reading: CH4 stays high and the Ar stop is ahead again
    const u = read(read(c, 'undo AB'), '');
    expect(u.effects).toEqual([expect.objectContaining({ kind: 'withdraw', step: 2 })]);
    expect(u.phase).toBe('review');
    expect(u.review?.trigger).toBe('undo');
    expect(u.review?.alternative?.toPa).toBeCloseTo(451.31 * TORR, 3);
  });

  it('resume: a log stopped on the review screen comes back to it; an accepted or a safer-stop choice in the log is kept', () => {
    const events: NewLogEvent[] = [];
    const s1 = read(initialState(setupFromHeader(h)), CH4_HIGH, events);
    const r = initialState(setupFromHeader(h), parseLog(logText(h, events), 'x.jsonl'), NOW);
    expect(r.phase).toBe('review');
    expect(r.review?.trigger).toBe('resume');
    expect(keys(r)).toEqual(keys(s1));
    const accepted = [...events, ...read(s1, 'accept AB').effects];
    const ra = initialState(setupFromHeader(h), parseLog(logText(h, accepted), 'x.jsonl'), NOW);
    expect(ra.phase).toBe('reading');
    expect(ra.targetsPa[1] / TORR).toBeCloseTo(400, 9);
    const safer = [...events, ...read(s1, 'safer AB').effects];
    const rs = initialState(setupFromHeader(h), parseLog(logText(h, safer), 'x.jsonl'), NOW);
    expect(rs.phase).toBe('reading');
    expect(rs.targetsPa[1] / TORR).toBeCloseTo(451.31, 6);
  });

  it('temperature: the tank at 40 degC holds less Ar at the same stop, and the O2 inlet becomes flammable (trigger temperature)', () => {
    // CH4 20 % high: at 25 degC the remainder is reviewed clean
    const s1 = read(initialState(setupFromHeader(h)), '12.0154');
    expect(s1.phase).toBe('reading');
    const t = setTemperature(s1, '40 degC');
    expect(t.targetTemperatureK).toBeCloseTo(313.15, 9);
    expect(t.phase).toBe('review');
    expect(t.review?.trigger).toBe('temperature');
    expect(keys(t)).toEqual(['flammable-at-inlet@3']);
    expect(planHas(h, 'flammable-at-inlet@3')).toBe(false);
    expect(t.review?.alternative?.step).toBe(2);
    expect(t.review!.alternative!.toPa).toBeGreaterThan(400 * TORR);
  });

  it('stop INITIALS: the fill stops at the review, logged; the batch is closed, incomplete (never a pass), the tank as it stands said', async () => {
    const events: NewLogEvent[] = [];
    const s1 = read(initialState(setupFromHeader(h)), CH4_HIGH, events);
    expect(s1.phase).toBe('review');
    // a bare stop is refused, nothing logged (the ways stand on the screen, stop among them)
    const bare = read(s1, 'stop');
    expect(bare.phase).toBe('review');
    expect(bare.effects).toEqual([]);
    expect(bare.error).toMatch(/^type one of the ways above, e\.g\. accept INITIALS/);
    const st = read(s1, 'stop TT', events);
    expect(st.phase).toBe('ended');
    expect(st.effects).toEqual([
      expect.objectContaining({
        kind: 'acknowledge',
        code: 'remainder-review',
        by: 'TT',
        review: expect.objectContaining({ trigger: 'reading', outcome: 'stopped' }),
      }),
      expect.objectContaining({
        kind: 'close',
        note: expect.stringMatching(/^stopped by TT at the safety review: fills 2, 3, 4 not made; /),
      }),
    ]);
    // CH4 alone in the tank: nothing flammable now (the hazards were ahead, at the O2)
    expect(st.message).toMatch(
      /INCOMPLETE \(not a pass\); the review finds no flammable, detonable or danger state in the tank now/,
    );
    const log = parseLog(logText(h, events), 'stopped.jsonl');
    // closed: `fill --resume` refuses it (log-closed), so the review screen does not come back
    expect(log.closed).toBeTruthy();
    const rep = await checkLog(log, { trials: 0, seed: 1 });
    expect(checkOutcomes(rep)[0]).toBe('incomplete');
    expect(rep.warnings.join('\n')).toMatch(/TT at .*: stopped the batch there \(closed, not finished\)/);
    // no accepted hazard: stopping is not going on through it; the certificate never calls it accepted
    expect(rep.record?.acceptedHazards).toEqual([]);
    const cert = buildCertificateModel(rep, log, { version: 'test', paper: 'a4', generated: 'now' });
    expect(cert.acknowledgements.join('\n')).toMatch(
      /^remainder-review \(fill 2\): batch stopped by TT at /m,
    );
    expect(cert.acknowledgements.join('\n')).not.toMatch(/remainder-review \(fill 2\): accepted/);
  });
});

describe('a remainder held by the working limit (MT-1: 4 bar x 0.9 = 2700.22 Torr; CH4 read 100 % high)', () => {
  const h = splitHeader();
  it("the last target's band ends within the limit; the cost and the choices are said; a reading past the limit is never 'inside the band'", () => {
    let s = initialState(setupFromHeader(h));
    const limit = s.setup.workingLimitPa!;
    const band = s.setup.steps[3].bandPa;
    s = read(s, '20.02');
    // the limit holds the final pressure: the final target + its band stays within the limit
    expect(s.targetsPa[3] + band).toBeLessThanOrEqual(limit);
    // one final pressure (the last capped target on head-10kT, 0.1 Torr): not the limit less the band beside it
    expect(s.message).toMatch(
      /held at 2692\.\d Torr \(design 1500 Torr\), at least the last fill's band 7\.49053 Torr below the tank's working limit 2700\.22 Torr/,
    );
    expect(s.message).toContain(`held at ${s.capped!.finalText} (design 1500 Torr), at least`);
    expect(s.message).not.toContain('2692.73');
    // what it costs: each mole fraction off the design, outside the tolerance or not, on a stop screen
    expect(s.phase).toBe('capped');
    expect(s.capped!.cost).toMatch(
      /x\(CH4\) 0\.742 % \(design 0\.667 %: \+0\.0752 points, OUTSIDE the tolerance/,
    );
    expect(s.capped!.cost).toMatch(/x\(Ar\) 97\.8 % \(design 98\.0 %: -0\.226 points, inside the tolerance/);
    s = read(s, 'go AB');
    expect(s.phase).toBe('review');
    s = read(s, 'safer AB');
    s = read(s, '921.53');
    s = read(s, '961.51');
    expect(s.current).toBe(3);
    expect(s.targetsPa[3] + band).toBeLessThanOrEqual(limit);
    // 2705 Torr: past the limit (the old band 2692.7 - 2707.7 Torr took it in)
    s = read(s, '2705');
    expect(s.phase).toBe('over-limit');
    s = read(s, 'accept AB');
    expect(s.phase).toBe('done');
    expect(s.message).not.toMatch(/inside the pressure band/);
    expect(s.message).toMatch(/ABOVE the working limit 2700\.22 Torr of MT-1 by 4\.78 Torr/);
  });
});

describe('past the working limit on the last fill: the vent target is explained, and the tank is read after venting', () => {
  const h = splitHeader();
  it('CH4 40 % high, the safer stop, then 2750 Torr on the last fill and vent', () => {
    let s = initialState(setupFromHeader(h));
    for (const t of ['14.02', 'safer AB', '480.81', '508.83']) s = read(s, t);
    const target = s.targetsPa[3];
    s = read(s, '2750');
    expect(s.phase).toBe('over-limit');
    const o = s.overLimit!;
    expect(o.last).toBe(true);
    // the vent target is the last fill's re-targeted target (2097.95 Torr), not the design 1500 Torr
    expect(o.ventToPa).toBe(target);
    expect(o.ventToPa / TORR).toBeCloseTo(2097.95, 2);
    expect(o.why).toMatch(/the target of this last fill \(the final pressure the re-target set\)/);
    // no remaining fills are promised anything
    expect(o.after).not.toMatch(/remaining fills/);
    expect(o.after).toMatch(/no fill remains/);
    // the vent is logged with initials, then the tank is read after venting; that reading closes the batch
    // the shell reports the over-limit reading's log line (header, CH4, review, Ar, O2: line 6)
    s = read(fillReducer(s, { type: 'logged', step: 4, line: 6 }), 'vent AB');
    expect(s.phase).toBe('vented');
    expect(s.effects).toEqual([
      expect.objectContaining({ kind: 'vent', step: 4, target_Pa: target, by: 'AB' }),
    ]);
    s = read(s, '2096.40 AB');
    expect(s.phase).toBe('done');
    expect(s.effects.map((e) => e.kind)).toEqual(['vent-reading', 'close']);
    expect(s.effects[0]).toMatchObject({ step: 4, pressure_Pa: 2096.4 * TORR, by: 'AB' });
    expect(s.message).toMatch(
      /the tank read 2096\.40 Torr .* after venting, logged by AB: -1\.55 Torr from the vent target 2097\.95 Torr/,
    );
    const close = s.effects.find((e) => e.kind === 'close') as { note?: string };
    expect(close.note).toMatch(/closed after venting/);
  });
});
