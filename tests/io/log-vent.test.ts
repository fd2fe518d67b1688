// A vent after a reading past the working limit: the log's vent and vent-reading lines, read by `check`
// and `label`. Venting lets out gas of the tank's own composition, so the re-checked composition is the
// readings' and only the final pressure and amount are the vented reading's; a vent not read after is
// said plainly; an older log whose close note records a vent says so too; a fill reading after a vent,
// a reading after venting without a vent and an event kind this version does not know are refused.
import { mkdtempSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { describe, expect, it } from 'vitest';
import { planFill, ProblemError, describeProblem, R } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import {
  appendEvent,
  createLog,
  parseLog,
  readLog,
  type LogHeader,
  type LogReading,
  type NewLogEvent,
} from '../../src/io/batch-log.js';
import { labelModel } from '../../src/report/label-model.js';
import { buildCertificateModel } from '../../src/report/label-certificate.js';
import { certificateToText } from '../../src/report/label-render.js';
import { checkToJson, checkToText } from '../../src/report/check-report.js';
import { fillReducer, initialState, setupFromHeader } from '../../src/tui/fill-state.js';
import { TORR } from '../helpers.js';

/** the demo recipe filled CH4, Ar, O2 (MT-1: 4 bar x 0.9 = 2700.2 Torr working limit) */
function header(): LogHeader {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest({
    ...rs,
    recipe: {
      ...(rs.recipe as unknown as Record<string, unknown>),
      order: ['CH4', 'Ar', 'O2'],
    } as unknown as typeof rs.recipe,
  });
  return headerFromPlan(planFill(req.input), req, 'vent-1', '2026-12-01T00:00:00Z');
}
const T = 298.15;
const reading = (step: number, source: string, gauge: string, torr: number): LogReading => ({
  kind: 'reading',
  step,
  source,
  gauge,
  reading: `${torr} Torr`,
  pressure_Pa: torr * TORR,
  temperature: '25 degC',
  temperature_K: T,
  time: `2026-12-01T01:0${step}:00Z`,
});
const VENT: NewLogEvent = {
  kind: 'vent',
  step: 3,
  target_Pa: 1500 * TORR,
  by: 'JD',
  time: '2026-12-01T01:05:00Z',
};
const AFTER: NewLogEvent = {
  kind: 'vent-reading',
  step: 3,
  gauge: 'head-10kT',
  reading: '1498.2 Torr',
  pressure_Pa: 1498.2 * TORR,
  temperature: '25 degC',
  temperature_K: T,
  by: 'JD',
  time: '2026-12-01T01:09:00Z',
};

function logOf(events: readonly NewLogEvent[]) {
  const h = header();
  const file = join(mkdtempSync(join(tmpdir(), 'mw-vent-')), 'b.jsonl');
  createLog(file, h);
  const fills = [
    reading(1, h.steps[0].source, h.steps[0].gauge!, 10.01),
    reading(2, h.steps[1].source, h.steps[1].gauge!, 1480),
    reading(3, h.steps[2].source, h.steps[2].gauge!, 2800),
  ];
  for (const e of [...fills, ...events]) appendEvent(file, e);
  return { file, h, log: readLog(file) };
}

describe('check and label of a log with a vent after the last reading', () => {
  it("read after venting: the composition is the readings' (identical), the final pressure and amount are the vented reading's", async () => {
    const plain = await checkLog(logOf([]).log, { trials: 0, seed: 1 });
    const { log, h } = logOf([VENT, AFTER, { kind: 'close', time: 't' }]);
    expect(log.vents).toHaveLength(1);
    const r = await checkLog(log, { trials: 0, seed: 1 });
    // venting keeps the composition: the same fractions, to the last bit (the same readings)
    for (const [k, st] of Object.entries(plain.result.composition))
      expect(r.result.composition[k].value).toBe(st.value);
    expect(r.verdict.verdict).toBe(plain.verdict.verdict);
    expect(r.vent!.after!.pressurePa).toBe(1498.2 * TORR);
    expect(r.vent!.before.pressurePa).toBe(2800 * TORR);
    // amount = V rho(P, T): against the ideal gas n = PV/RT (exact definition) within 0.5 %, the size of
    // 1 - Z for this Ar/O2-rich gas near 2 to 4 bar at 25 degC (B of Ar about -16 cm3/mol at 298 K, from memory)
    const ideal = (p: number) => (p * h.tank.volume_m3) / (R * T);
    expect(r.vent!.after!.amountMol! / ideal(1498.2 * TORR)).toBeCloseTo(1, 2);
    expect(Math.abs(r.vent!.after!.amountMol! / ideal(1498.2 * TORR) - 1)).toBeLessThan(5e-3);
    expect(Math.abs(r.vent!.before.amountMol! / ideal(2800 * TORR) - 1)).toBeLessThan(5e-3);
    // the reading past the limit still stands as a danger (the tank went past it); no unread vent is claimed
    expect(r.findings.some((f) => f.code === 'above-working-limit' && f.severity === 'danger')).toBe(true);
    expect(r.findings.some((f) => f.code === 'vent-not-read')).toBe(false);
    const text = checkToText(r);
    expect(text).toMatch(/Vented {6}after fill 3 by JD/);
    expect(text).toMatch(
      /after venting: 1498\.2 Torr on head-10kT = 1498\.200 Torr at 25\.00 degC, read by JD .*: the tank's final pressure; it holds 0\.8\d+ mol/,
    );
    const json = checkToJson(r, 'x') as { vent: { after: { pressure_Pa: number; amount_mol: number } } };
    expect(json.vent.after.pressure_Pa).toBe(1498.2 * TORR);
    const m = labelModel(r, log);
    expect(m.finalPressure).toMatch(/^1498\.2\d* Torr absolute after venting$/);
  });

  it('a reading after venting still above the working limit, read again after venting more: said as that, never as corrected or withdrawn', async () => {
    // MT-1's working limit 2700.2 Torr (4 bar x 0.9, the demo tank): 2710 Torr after venting is still above it
    const still: NewLogEvent = {
      ...AFTER,
      reading: '2710 Torr',
      pressure_Pa: 2710 * TORR,
      time: '2026-12-01T01:07:00Z',
    };
    const { log } = logOf([VENT, still, AFTER, { kind: 'close', time: 't' }]);
    const r = await checkLog(log, { trials: 0, seed: 1 });
    const f = r.findings.find((x) => x.code === 'above-working-limit' && x.pressurePa === 2710 * TORR);
    expect(f).toBeDefined();
    const text = checkToText(r);
    const line = text.split('\n').find((l) => l.includes('2710 Torr (absolute)'))!;
    // said once: the reading after venting is still above the working limit, then what was done
    expect(line).toMatch(
      /the tank reading after venting 2710 Torr \(absolute\) is still above the tank's working limit of 2700\.\d+ Torr: the tank was vented again and read again after it$/,
    );
    expect(line.match(/working limit/g)).toHaveLength(1);
    expect(line).not.toMatch(/corrected or withdrawn/);
    // the fill reading past the limit (2800, in force) still says what it is: a danger, inspect
    // (the limit said once, then what to do)
    const fill = text.split('\n').find((l) => l.includes('2800 Torr (absolute)'))!;
    expect(fill).toMatch(
      /the tank reading 2800 Torr \(absolute\) is above the tank's working limit of 2700\.\d+ Torr: have the tank and its fittings inspected under local practice before the batch is used/,
    );
    expect(fill.match(/working limit/g)).toHaveLength(1);
  });

  it('the certificate lists the vent and the readings after venting as logged, and the vent and an accept among the acknowledgements', async () => {
    const meta = { version: 't', paper: 'a4' as const, generated: '2026-12-01T02:00:00Z' };
    const still: NewLogEvent = {
      ...AFTER,
      reading: '2710 Torr',
      pressure_Pa: 2710 * TORR,
      time: '2026-12-01T01:07:00Z',
    };
    const vented = logOf([VENT, still, AFTER, { kind: 'close', time: 't' }]).log;
    const text = certificateToText(
      buildCertificateModel(await checkLog(vented, { trials: 0, seed: 1 }), vented, meta),
    );
    const readings = text.slice(text.indexOf('READINGS AS LOGGED'), text.indexOf('CORRECTIONS'));
    // the rows (by last), each note under the table by its number and fill (the certificate's 80 columns)
    expect(readings).toMatch(/^ {2}3 +vent .*JD$/m);
    expect(readings).toMatch(/^ {2}3 +after venting +head-10kT +2710 +2710\.0 .*JD$/m);
    expect(readings).toMatch(/^ {2}3 +after venting +head-10kT +1498\.2 +1498\.2 .*JD$/m);
    const notes = readings.replace(/\s+/g, ' ');
    expect(notes).toContain('#3 vent: vented (line 5); target to vent to: at most 1500 Torr absolute');
    expect(notes).toContain('#3 after venting: still above the working limit; vented again');
    expect(notes).toContain("#3 after venting: the tank's final pressure");
    // the paragraphs wrap at 80 columns: read whole
    const acks = text.slice(text.indexOf('ACKNOWLEDGEMENTS'), text.indexOf('FINDINGS')).replace(/\s+/g, ' ');
    expect(acks).not.toMatch(/none logged/);
    expect(acks).toMatch(
      /above-working-limit \(fill 3\): vent chosen by JD at 2026-12-01T01:05:00Z \(line 5\); read after venting 2 times/,
    );
    // accept INITIALS at the manifold: the acknowledgement line is listed
    const accepted = logOf([
      {
        kind: 'acknowledge',
        code: 'above-working-limit',
        step: 3,
        by: 'JD',
        time: '2026-12-01T01:06:00Z',
        note: 'accepted',
      },
      { kind: 'close', time: 't' },
    ]).log;
    const t2 = certificateToText(
      buildCertificateModel(await checkLog(accepted, { trials: 0, seed: 1 }), accepted, meta),
    );
    const acks2 = t2.slice(t2.indexOf('ACKNOWLEDGEMENTS'), t2.indexOf('FINDINGS')).replace(/\s+/g, ' ');
    expect(acks2).toMatch(
      /above-working-limit \(fill 3\): accepted by JD at 2026-12-01T01:06:00Z - accepted/,
    );
  });

  it('a vent with no reading after it: said plainly (finding and caveat), the label gives no final pressure', async () => {
    const { log } = logOf([VENT]);
    const r = await checkLog(log, { trials: 0, seed: 1 });
    expect(r.vent!.after).toBeUndefined();
    const f = r.findings.find((x) => x.code === 'vent-not-read');
    expect(f?.severity).toBe('warning');
    expect(f?.message).toMatch(/final pressure and amount are NOT known/);
    expect(r.caveats.join(' ')).toMatch(/pressure after venting was NOT read/);
    expect(checkToText(r)).toMatch(/after venting: NOT READ/);
    expect(labelModel(r, log).finalPressure).toMatch(
      /^PRESSURE NOT READ after venting \(2800\.0\d* Torr absolute before venting\)$/,
    );
  });

  it('an older log (no vent line) whose close note says the operator vented: the same plain statement', async () => {
    const note =
      'fill 3 read 2800.00 Torr absolute, above the working limit; the operator chose to vent back to at most ' +
      '1500.00 Torr absolute. The pressure after venting was not read or logged in this fill';
    const { log } = logOf([{ kind: 'close', time: 't', note }]);
    const r = await checkLog(log, { trials: 0, seed: 1 });
    expect(r.vent).toMatchObject({ step: 3, line: null });
    expect(r.findings.find((x) => x.code === 'vent-not-read')?.message).toMatch(
      /close note says the tank was vented after fill 3/,
    );
    // an older log without any vent keeps its meaning: no vent
    expect(
      (await checkLog(logOf([{ kind: 'close', time: 't' }]).log, { trials: 0, seed: 1 })).vent,
    ).toBeUndefined();
  });

  it('refused: a fill reading after a vent, a reading after venting with no vent, an event kind this version does not know', () => {
    const h = header();
    const text = (events: readonly object[]) =>
      [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';
    const r1 = reading(1, h.steps[0].source, h.steps[0].gauge!, 10.01);
    const refusal = (t: string) => {
      try {
        parseLog(t, 'x.jsonl');
      } catch (e) {
        if (e instanceof ProblemError) return describeProblem(e.problem);
        throw e;
      }
      return 'read';
    };
    expect(
      refusal(text([r1, { ...VENT, step: 1 }, reading(2, h.steps[1].source, h.steps[1].gauge!, 1480)])),
    ).toMatch(/a reading of fill 2 follows the vent on line 3/);
    expect(refusal(text([r1, { ...AFTER, step: 1 }]))).toMatch(/with no "vent" line before it/);
    expect(refusal(text([r1, { kind: 'purge', time: 't' }]))).toMatch(
      /unknown event kind "purge": this version of mixwright does not know it, so the log is not checked/,
    );
  });

  it('resumed with the vent logged and no reading after it: the fill asks for the reading after venting', () => {
    const { log, h } = logOf([VENT]);
    const s = initialState(setupFromHeader(h), log, '2026-12-01T02:00:00Z');
    expect(s.phase).toBe('vented');
    expect(s.message).toMatch(
      /the vent after fill 3 is logged \(line 5, by JD\); the pressure after venting is not logged yet/,
    );
    const done = fillReducer(
      [...'1498.2 JD'].reduce((x, c) => fillReducer(x, { type: 'char', text: c }), s),
      { type: 'enter', now: '2026-12-01T02:01:00Z' },
    );
    expect(done.phase).toBe('done');
    expect(done.effects.map((e) => e.kind)).toEqual(['vent-reading', 'close']);
  });
});

describe('check lists undone readings with their reason', () => {
  it('a withdrawal with a reason and one without: both listed with who, what and why (or that none was given)', async () => {
    const h = header();
    const file = join(mkdtempSync(join(tmpdir(), 'mw-undo-')), 'b.jsonl');
    createLog(file, h);
    const r1 = reading(1, h.steps[0].source, h.steps[0].gauge!, 10.01);
    appendEvent(file, r1);
    appendEvent(file, {
      kind: 'withdraw',
      step: 1,
      withdraws_line: 2,
      by: 'AB',
      time: 't1',
      reason: 'misread the head',
    });
    appendEvent(file, { ...r1, reading: '10.02 Torr', pressure_Pa: 10.02 * TORR });
    appendEvent(file, { kind: 'withdraw', step: 1, withdraws_line: 4, by: 'CD', time: 't2' });
    appendEvent(file, r1);
    const text = checkToText(await checkLog(readLog(file), { trials: 0, seed: 1 }));
    expect(text).toMatch(
      /line 3 {2}fill 1 {2}withdrawn by AB at t1: 10\.01 Torr at 25 degC \(line 2\); reason: misread the head/,
    );
    expect(text).toMatch(
      /line 5 {2}fill 1 {2}withdrawn by CD at t2: 10\.02 Torr at 25 degC \(line 4\); no reason given/,
    );
  });
});
