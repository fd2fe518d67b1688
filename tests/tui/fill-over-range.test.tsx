// A value typed past the range of the gauge its fill is read on: the gauge cannot show it, but the tank
// may hold it, so it is logged as typed at once (Ctrl-C keeps it), and the fill asks for the tank read on a
// gauge of the lab profile whose range covers it (that reading logged on that gauge, then judged as any
// reading), or for the operator to say it was a typing slip. The demo natural-gas blend in air at 900 Torr
// in MT-1 (all three fills read on head-1kT, up to 1000 Torr; overpressure 2000 Torr, the demo lab's).
// Units: 1 Torr = 101325/760 Pa, 1 psi = 6894.757 Pa (NIST SP 811, exact from the definitions); checked to
// the printed digits.
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { checkLog, headerFromPlan } from '../../src/io/check.js';
import { parseLog, type LogHeader, type NewLogEvent } from '../../src/io/batch-log.js';
import { checkOutcomes } from '../../src/report/check-outcome.js';
import { buildCertificateModel } from '../../src/report/label-certificate.js';
import { fillReducer, initialState, setupFromHeader, type FillState } from '../../src/tui/fill-state.js';
import { frame80 } from './frame80.js';

const NOW = '2026-12-01T01:00:00Z';
const TORR = 101325 / 760;
/** type, Enter; the events it logs are kept in `log`, a reading's line acknowledged as the shell does */
function read(s: FillState, text: string, log: NewLogEvent[] = []): FillState {
  let n = fillReducer(fillReducer(s, { type: 'char', text }), { type: 'enter', now: NOW });
  for (const e of n.effects) {
    log.push(e);
    if (e.kind === 'reading') n = fillReducer(n, { type: 'logged', step: e.step, line: log.length + 1 });
  }
  return n;
}
const logText = (h: LogHeader, events: readonly NewLogEvent[]) =>
  [h, ...events].map((e) => JSON.stringify(e)).join('\n') + '\n';

function header() {
  const rs = readRecipe('recipes/ng-blend-air.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, tank: 'MT-1', pressure: '900 Torr' } });
  return headerFromPlan(planFill(req.input), req, 'or1', '2026-12-01T00:00:00Z');
}

describe('a value typed past the gauge range: logged as typed, then read on a gauge that covers it or a slip', () => {
  const h = header();
  const events: NewLogEvent[] = [];
  let s = initialState(setupFromHeader(h), undefined, NOW, { operator: 'TT' });
  s = read(s, 'accept TT', events);
  const t = h.steps.map((x) => (x.target_Pa / TORR).toFixed(2));
  s = read(s, t[0], events);
  s = read(s, t[1], events);
  // fill 3 makes the plan's detonable state: its reminder first (Enter)
  if (s.phase === 'reminder') s = read(s, '', events);
  const before = [...events];
  const typed = read(s, '1200', events);

  it('1200 Torr for the air on head-1kT: no reading logged, the value logged as typed, the over-range screen names the gauges that cover it', () => {
    expect(h.steps[2].gauge).toBe('head-1kT');
    expect(typed.phase).toBe('over-range');
    expect(typed.done).toHaveLength(2);
    expect(typed.effects).toEqual([
      expect.objectContaining({
        kind: 'acknowledge',
        code: 'over-range',
        step: 3,
        by: 'TT',
        over_range: expect.objectContaining({ outcome: 'typed', typed: '1200', gauge: 'head-1kT' }),
      }),
    ]);
    const o = typed.overRange!;
    expect(o.absolutePa / TORR).toBeCloseTo(1200, 9);
    // head-10kT (absolute, up to 10000 Torr) and xdcr-100g (100 psi above ambient) cover it; head-10T does not
    expect(o.covering).toEqual(['head-10kT', 'xdcr-100g']);
    expect(o.words).toMatch(/past its range \(up to 1000\.00 Torr\)/);
    expect(o.words).toMatch(/within head-1kT's overpressure rating \(2000\.00 Torr\)/);
    const f = frame80(typed);
    expect(f).toMatch(/PAST THE RANGE OF head-1kT/);
    expect(f.replace(/\n/g, ' ')).toMatch(/read MT-1 on a gauge that covers it \(head-10kT, xdcr-100g\)/);
    expect(f.replace(/\n/g, ' ')).toMatch(/e\.g\. head-10kT 1200\.0 AB/);
    expect(f.split('\n').length).toBeLessThanOrEqual(24);
    for (const r of f.split('\n')) expect(r.length).toBeLessThanOrEqual(80);
  });

  it('Esc and an entry that is neither way do not leave the screen; a gauge that cannot show the value is refused', () => {
    for (const x of [
      fillReducer(typed, { type: 'escape' }),
      read(typed, '1200'),
      read(typed, 'head-1kT 999 TT'),
      read(typed, 'head-10T 20 TT'),
      read(typed, 'nogauge 9 TT'),
    ]) {
      expect(x.phase).toBe('over-range');
      expect(x.effects).toEqual([]);
      expect(x.error).toBeTruthy();
    }
    expect(read(typed, 'head-10T 20 TT').error).toMatch(/outside head-10T's range/);
  });

  it('Ctrl-C there: the log keeps the value typed; check finds the tank NOT re-read (a danger, no pass); resuming brings the screen back', async () => {
    const log = parseLog(logText(h, [...before, ...typed.effects]), 'or1.jsonl');
    const rep = await checkLog(log, { trials: 0, seed: 1 });
    const f = rep.findings.find((x) => x.code === 'over-range-typed');
    expect(f?.severity).toBe('danger');
    expect(f?.message).toMatch(
      /"1200" \(1200 Torr\) was typed for head-1kT, past its range of 1000 Torr, and the tank was NOT read on a gauge that covers it/,
    );
    expect(checkOutcomes(rep)).toContain('danger');
    expect(rep.caveats.join('\n')).toMatch(
      /DANGER: a value was typed past a gauge's range and the tank was NOT read on a gauge that covers it/,
    );
    expect(rep.warnings.join('\n')).not.toMatch(/over-range/);
    const again = initialState(setupFromHeader(h), log, NOW, { operator: 'TT' });
    expect(again.phase).toBe('over-range');
    expect(again.overRange?.covering).toEqual(['head-10kT', 'xdcr-100g']);
    expect(again.overRange?.words).toMatch(/^RESUMED: /);
  });

  it('read on head-10kT: logged as fill 3 on head-10kT (the resolution first), judged as any reading; check takes the gauge from it', async () => {
    const log = [...before, ...typed.effects];
    const r = read(typed, 'head-10kT 1200.0 TT', log);
    expect(r.error).toBeUndefined();
    // what it wrote (the reading's log line acknowledged, as the shell does)
    const written = log.slice(before.length + 1);
    expect(written.map((e) => e.kind)).toEqual(['acknowledge', 'reading', 'close']);
    expect(written[0]).toMatchObject({
      over_range: { outcome: 're-read', read_on: 'head-10kT' },
      by: 'TT',
    });
    expect(written[1]).toMatchObject({ step: 3, gauge: 'head-10kT', reading: '1200.0 Torr', by: 'TT' });
    // the last fill, 300 Torr above its target: the batch is closed above its band, as for any reading
    expect(r.phase).toBe('done');
    const rep = await checkLog(parseLog(logText(h, log), 'or1.jsonl'), { trials: 0, seed: 1 });
    expect(rep.readings[2].gauge.id).toBe('head-10kT');
    expect(rep.findings.find((x) => x.code === 'over-range-typed')).toMatchObject({
      severity: 'note',
      outcome: 're-read',
      readOn: 'head-10kT',
    });
    // the reading is no above-gauge-range finding: head-10kT covers it
    expect(rep.findings.some((x) => x.code === 'above-gauge-range')).toBe(false);
    expect(checkOutcomes(rep)).not.toContain('pass');
    const cert = buildCertificateModel(rep, parseLog(logText(h, log), 'or1.jsonl'), {
      version: 'test',
      paper: 'a4',
      generated: 'now',
    });
    const acks = cert.acknowledgements.join('\n');
    expect(acks).toMatch(/^over-range \(fill 3\): logged as typed by TT/m);
    expect(acks).toMatch(/^over-range \(fill 3\): re-read by TT/m);
  });

  it('read on xdcr-100g (gauge-referenced, psi): absolute with the barometer in force, said when it was not read today', () => {
    const log = [...before, ...typed.effects];
    // 1200 Torr absolute with the plan's barometer: (1200 - B) Torr above ambient, in psi (51.71493 Torr/psi)
    const psi = ((typed.overRange!.absolutePa - typed.barometerPa) / 6894.757293168361).toFixed(2);
    const r = read(typed, `xdcr-100g ${psi} TT`, log);
    expect(r.error).toBeUndefined();
    const reading = log.find((e) => e.kind === 'reading' && e.step === 3);
    expect(reading).toMatchObject({ gauge: 'xdcr-100g', reading: `${psi} psi` });
    // within half the 0.01 psi display step the value was rounded to (0.2586 Torr)
    const abs = reading!.kind === 'reading' ? reading!.pressure_Pa / TORR : NaN;
    expect(Math.abs(abs - 1200)).toBeLessThanOrEqual(0.2586);
    expect(reading!.kind === 'reading' && reading!.note).toMatch(
      /made absolute with the plan's barometer [\d.]+ Torr \(not read today\)/,
    );
  });

  it('slip TT: logged, back to the reading of fill 3; check lists it as a note', async () => {
    const log = [...before, ...typed.effects];
    const r = read(typed, 'slip TT', log);
    expect(r.phase).toBe('reading');
    expect(r.current).toBe(2);
    expect(r.effects).toEqual([
      expect.objectContaining({
        code: 'over-range',
        by: 'TT',
        over_range: expect.objectContaining({ outcome: 'slip' }),
      }),
    ]);
    const done = read(r, t[2], log);
    expect(done.phase).toBe('done');
    const rep = await checkLog(parseLog(logText(h, log), 'or1.jsonl'), { trials: 0, seed: 1 });
    expect(rep.findings.find((x) => x.code === 'over-range-typed')).toMatchObject({
      severity: 'note',
      outcome: 'slip',
    });
  });
});

describe("past a head's overpressure rating: said by name (the demo lab's head-10T: range 10 Torr, overpressure 20 Torr)", () => {
  // the demo blend at 200 Torr in MT-2: the ethane, fill 1, is read on head-10T
  const rs = readRecipe('recipes/ng-blend-air.yaml');
  const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, pressure: '200 Torr' } });
  const h = headerFromPlan(planFill(req.input), req, 'or2', '2026-12-01T00:00:00Z');
  let s = initialState(setupFromHeader(h), undefined, NOW, { operator: 'TT' });
  if (s.phase === 'acknowledge') s = read(s, 'accept TT');

  it('25 Torr is past the rating (the head may be damaged); 10.5 Torr is past the range, within the rating', () => {
    expect(s.setup.steps[0]).toMatchObject({ species: 'C2H6' });
    expect(s.setup.steps[0].gauge?.id).toBe('head-10T');
    const past = read(s, '25');
    expect(past.phase).toBe('over-range');
    expect(past.overRange!.words).toMatch(
      /It is PAST head-10T's overpressure rating \(20\.0000 Torr\): if the tank holds it, the head may be damaged - close its valve now/,
    );
    expect(past.effects[0]).toMatchObject({ over_range: { overpressure_Pa: 20 * TORR } });
    // head-1kT (0.01 Torr display step) covers it before head-10kT
    expect(past.overRange!.covering[0]).toBe('head-1kT');
    const within = read(s, '10.5');
    expect(within.overRange!.words).toMatch(/within head-10T's overpressure rating \(20\.0000 Torr\)/);
  });
});
