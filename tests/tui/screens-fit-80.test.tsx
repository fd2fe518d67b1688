// The guided fill's screens at 80 x 24, as a lab member's terminal draws them (ink-testing-library's
// stdout says 100 columns: set to 80 here): no row wider than 80, the frame within 24 rows, the title
// on one row, and no wrapped row starting with a space. The screens a trial found near or past the
// edge: a fill read below its band (with its reviewed ways on, and a refused entry), the review of the
// remaining fills, the danger screen of a reading past the working limit, the last fill below its
// target, and a fill screen with the plan's danger, a warning and a message of three rows or more.
import { describe, expect, it } from 'vitest';
import { planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { headerFromPlan } from '../../src/io/check.js';
import { gasCaution } from '../../src/report/gas-caution.js';
import { dropLeadingSpace } from '../../src/tui/para.js';
import {
  fillEnding,
  fillReducer,
  initialState,
  setupFromHeader,
  type FillState,
} from '../../src/tui/fill-state.js';
import { fromPa } from '../../src/report/units.js';
import { splitHeader } from '../split-plan.js';
import { frame80, read } from './frame80.js';

const NOW = '2026-12-01T01:00:00Z';

/** the frame fits 80 x 24; its first row is the whole title (what the screen is, after the batch) */
function fits(s: FillState, title: RegExp): string {
  const f = frame80(s);
  const rows = f.split('\n');
  expect(rows.length, f).toBeLessThanOrEqual(24);
  for (const r of rows) expect(r.length, r).toBeLessThanOrEqual(80);
  expect(rows[0], f).toMatch(title);
  // a continuation row of wrapped text never starts with a space (indented rows start with two or more)
  for (const r of rows) expect(r, f).not.toMatch(/^ [^ ]/);
  return f;
}

function header(order?: string[], id = 'b1') {
  const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
  const req = buildPlanRequest(order ? { ...rs, recipe: { ...rs.recipe, order } } : rs);
  return headerFromPlan(planFill(req.input), req, id, '2026-12-01T00:00:00Z');
}

describe('the fill screens fit 80 x 24', () => {
  // the demo recipe's recommended order: CH4, Ar 1/2 (stop 480.81 Torr), O2, Ar 2/2
  const s0 = initialState(setupFromHeader(header()));
  const s1 = read(s0, '10.013', 2);
  const below = read(s1, '150', 3);
  const s3 = read(read(s1, '480.81', 3), '500.82', 4);

  it('a fill read below its band: the ways on with what each review found, also with a refused entry', () => {
    expect(below.phase).toBe('below');
    const f = fits(below, /^mixwright fill b1 - fill 2 of 4 \(Ar, charge 1 of 2\): BELOW ITS BAND$/);
    expect(f).toContain('The ways on, each reviewed');
    const refused = read(below, 'next');
    expect(refused.error).toBeDefined();
    fits(refused, /BELOW ITS BAND$/);
    const wrong = read(below, 'hello');
    expect(wrong.error).toBeDefined();
    fits(wrong, /BELOW ITS BAND$/);
  });

  it('the review of the remaining fills (after next JD), also with a refused entry', () => {
    const rv = read(below, 'next JD', 4);
    expect(rv.phase).toBe('review');
    fits(rv, /^mixwright fill b1 - SAFETY REVIEW of the remaining fills$/);
    const refused = read(rv, 'hello');
    expect(refused.error).toBeDefined();
    fits(refused, /SAFETY REVIEW/);
  });

  it('the review with a safer stop (Ar stop 400 Torr, CH4 read 40 % high: README), also with a refused entry', () => {
    const rv = read(initialState(setupFromHeader(splitHeader())), '14.0179', 2);
    expect(rv.phase).toBe('review');
    expect(rv.review!.alternative).toBeDefined();
    fits(rv, /^mixwright fill split-1 - SAFETY REVIEW of the remaining fills$/);
    fits(read(rv, 'hello'), /SAFETY REVIEW/);
  });

  it('a reading past the working limit (2800 Torr at fill 4), also with a refused entry', () => {
    const over = read(s3, '2800', 5);
    expect(over.phase).toBe('over-limit');
    fits(over, /^mixwright fill b1 - fill 4 of 4: DANGER - ABOVE THE WORKING LIMIT$/);
    const refused = read(over, 'hello');
    expect(refused.error).toBeDefined();
    fits(refused, /ABOVE THE WORKING LIMIT$/);
    expect(frame80(over).replace(/\n/g, ' ')).toMatch(
      /accept INITIALS: keep the tank as it is, ABOVE its working limit/,
    );
    // accepted: the end says the tank is still above the limit (the logged pressure vs the limit) and what to do
    const kept = read(over, 'accept CD');
    expect(kept.phase).toBe('done');
    expect(kept.aboveLimitText).toMatch(
      /^the tank MT-1 is STILL ABOVE its working limit: 2800\.00 Torr absolute logged vs the limit 2700\.22 Torr\. Close the cylinder and tank valves and bring it below the limit by your lab's procedure/,
    );
    // the title says how the batch ended (the reading vs the last target), never "all 4 fills logged"
    const end = fits(kept, /^mixwright fill b1 - fill 4 of 4 KEPT ABOVE THE WORKING LIMIT: 2800 Torr/);
    expect(end.replace(/\n/g, ' ')).toMatch(
      /KEPT ABOVE THE WORKING LIMIT: 2800 Torr \(target 1500\.1 Torr\)/,
    );
    expect(end).not.toMatch(/all 4 fills logged/);
    expect(end.replace(/\n/g, ' ')).toContain('STILL ABOVE its working limit');
  });

  it('every fill read inside its band: only then does the end say all fills logged', () => {
    const s3Target = fromPa(s3.targetsPa[3], 'Torr').toFixed(1);
    const done = read(s3, s3Target, 5);
    expect(done.phase).toBe('done');
    const e = fillEnding(done)!;
    expect(e).toMatchObject({ kind: 'within', step: 4, reached: `${s3Target} Torr`, short: [] });
    const title = e.over.length
      ? 'all 4 fills logged, the last within its band'
      : 'all 4 fills logged, each within its band';
    fits(done, new RegExp(`^mixwright fill b1 - ${title}$`));
    // read 50 Torr above the target (its band is a few Torr wide): said, with the target
    const high = read(s3, (Number(s3Target) + 50).toFixed(1), 5);
    expect(high.phase).toBe('done');
    expect(fillEnding(high)!.kind).toBe('above');
    fits(high, /^mixwright fill b1 - fill 4 of 4 ABOVE ITS BAND: \d+\.\d Torr \(target \d+\.\d Torr\)$/);
  });

  it('the last fill vented back and read after venting: the end says closed after venting, with the reading', () => {
    // the shell reports the over-limit reading's log line (line 5) before the choice
    const over = fillReducer(read(s3, '2800'), { type: 'logged', step: 4, line: 5 });
    const vented = read(over, 'vent JD');
    expect(vented.phase).toBe('vented');
    const closed = read(vented, '1490.0 JD');
    expect(closed.phase).toBe('done');
    expect(fillEnding(closed)).toMatchObject({ kind: 'vented', reached: '1490.0 Torr' });
    const f = fits(closed, /^mixwright fill b1 - CLOSED AFTER VENTING: fill 4 of 4 read 1490\.0 Torr/);
    expect(f).not.toMatch(/fills logged/);
  });

  it('a band finer than the display step (3000 Torr asked, capped; fill 2 on the 0.01 psi gauge): said so, never a zero-width band', () => {
    const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
    const req = buildPlanRequest(rs);
    // 3000 Torr: above MT-1's working limit, so the re-target is capped (go JD) and fill 2 reads 36.74 psi
    const input = { ...req.input, finalPressurePa: (3000 * 101325) / 760 };
    const h3 = headerFromPlan(planFill(input), req, 'b1', '2026-12-01T00:00:00Z');
    let t = initialState(setupFromHeader(h3));
    for (const x of ['accept JD', '760.0 Torr JD', '20.02', 'go JD']) t = read(t, x, t.done.length + 2);
    t = fillReducer(t, { type: 'enter', now: NOW });
    expect(t.phase).toBe('reading');
    expect(t.current).toBe(1);
    const f = fits(t, /^mixwright fill b1 /);
    const flat = f.replace(/[│\s]+/g, ' ');
    expect(flat).toMatch(
      /band \+-0\.0039 psi: finer than the display step 0\.01 psi; only 36\.74 psi reads inside it at 25\.0 degC/,
    );
    expect(f).not.toMatch(/(\d+\.\d+) - \1\b/);
    // the crowded screen (the plan's danger, a three-row message) shows the composition on one row
    expect(flat).toContain('Values (not U): OFF COURSE - CH4 +11 %, O2 +11 % rel: OUT (tol 0.50 %)');
  });

  it('the last fill below its target, with the composition as filled', () => {
    const last = read(s3, '1400', 5);
    expect(last.phase).toBe('below');
    fits(last, /^mixwright fill b1 - fill 4 of 4 \(Ar, charge 2 of 2\): BELOW THE TARGET$/);
  });

  it('a fill screen with a message of five rows (CH4 read 40 % high: near the flammable region ahead)', () => {
    const high = read(s0, '14.0179', 2);
    expect(high.phase).toBe('reading');
    expect(high.message).toMatch(/near the flammable region/);
    fits(high, /^mixwright fill b1 /);
  });

  it("order CH4, O2, Ar: fill 2 with the plan's danger, a warning and a three-row message", () => {
    let t = initialState(setupFromHeader(header(['CH4', 'O2', 'Ar'])));
    t = read(t, 'accept JD', 2);
    // CH4 read 0.1 Torr high: the re-target's message takes three rows
    t = read(t, '10.11', 3);
    t = fillReducer(t, { type: 'enter', now: NOW });
    expect(t.phase).toBe('reading');
    expect(t.current).toBe(1);
    const f = fits(t, /^mixwright fill b1 /);
    expect(f).toMatch(/DANGER detonable-state/);
    expect(f).toMatch(/warning flammable-state/);
    expect(f.split('\n').filter((r) => /^fill 1 logged|^[a-z(].*/.test(r)).length).toBeGreaterThan(0);
    // with a refused entry the error stands in for the message and the composition
    fits(read(t, 'hello'), /^mixwright fill b1 /);
  });

  it('order CH4, O2, Ar, the last fill (Ar) read at 100 Torr: the close offer says the tank NOW holds a detonable mixture', () => {
    let t = initialState(setupFromHeader(header(['CH4', 'O2', 'Ar'])));
    t = read(t, 'accept JD', 2);
    t = read(t, '10.01', 3);
    t = fillReducer(t, { type: 'enter', now: NOW });
    t = read(t, '30.04', 4);
    // 10 Torr CH4, 20 Torr O2, 70 Torr Ar: 10 % fuel, 20 % O2 as read, no N2 (by hand): detonable by the
    // planner's conservative rule (less than 50 % N2-equivalent inert)
    const last = read(t, '100', 5);
    expect(last.phase).toBe('below');
    expect(last.belowWays!.tankNow).toContain('DANGER detonable-state (fill 3)');
    const f = fits(last, /^mixwright fill b1 - fill 3 of 3: BELOW THE TARGET$/);
    expect(f.replace(/\n/g, ' ')).toMatch(/close AB .*the tank NOW holds DANGER detonable-state \(fill 3\)/);
    fits(read(last, 'hello'), /BELOW THE TARGET$/);
    const closed = read(last, 'close JD');
    expect(closed.phase).toBe('done');
    // closed below the last target: the title says so, with the reading and the target (the below screen's
    // STOP AT), never "all 3 fills logged"
    const stop = /STOP AT ([\d.]+ Torr)/.exec(frame80(last))![1];
    const end = fits(closed, /^mixwright fill b1 - CLOSED BELOW THE LAST TARGET: fill 3 of 3 at 100 Torr/);
    expect(end.replace(/\n/g, ' ')).toContain(
      `CLOSED BELOW THE LAST TARGET: fill 3 of 3 at 100 Torr (target ${stop})`,
    );
    expect(end).not.toMatch(/fills logged/);
    expect(fillEnding(closed)).toMatchObject({ kind: 'below', step: 3, reached: '100 Torr', short: [] });
    expect(closed.tankNowText).toMatch(
      /^the tank NOW holds a detonable, flammable mixture: keep its valves closed, do not use or vent it except under your lab's procedure, defer to local rules/,
    );
    expect(closed.message).toContain(closed.tankNowText);
    expect(closed.effects).toEqual([
      expect.objectContaining({ kind: 'close', note: expect.stringContaining('the tank NOW holds') }),
    ]);
  });

  it('order CH4, O2, Ar: each offer says what its review found (capped go and stop; next with a lower final pressure)', () => {
    let t = initialState(setupFromHeader(header(['CH4', 'O2', 'Ar'])));
    t = read(t, 'accept JD', 2);
    t = read(t, '10.01', 3);
    t = fillReducer(t, { type: 'enter', now: NOW });
    // O2 read 560 Torr (target 30.03): the working limit holds the final pressure
    const capped = read(t, '560', 4);
    expect(capped.phase).toBe('capped');
    expect(capped.capped!.ways).toBeDefined();
    const raw = fits(capped, /^mixwright fill b1$/);
    const f = raw.replace(/\n/g, ' ');
    expect(f).toMatch(
      /go INITIALS: fill to the capped targets \(the tank ends at 2692\.7 Torr, OFF THE DESIGN\): the review finds/,
    );
    expect(f).toMatch(
      /stop INITIALS: stop the batch here \(incomplete\): no flammable, detonable or danger state in the tank now/,
    );
    // each choice on its own row, its key first
    for (const key of ['go', 'stop', 'undo']) expect(raw).toMatch(new RegExp(`^${key} INITIALS: `, 'm'));
    fits(read(capped, 'hello'), /^mixwright fill b1$/);
    // O2 read 15 Torr: going on from it keeps phi and the dilution, so the batch ends lower (by the re-target: the
    // fuel and O2 in the tank, 15 Torr, over the design's 2 % of them: 751 Torr, by hand about 15 / 0.02 = 750)
    const low = read(t, '15', 4);
    expect(low.phase).toBe('below');
    const g = fits(low, /BELOW ITS BAND$/).replace(/\n/g, ' ');
    expect(g).toMatch(
      /- next AB \(go on from 15 Torr; the batch ends at 751\.4 Torr instead of 1500\.0 Torr\): passes/,
    );
  });

  it('each reading screen of a flammable or oxidizing gas carries its one-row caution; an inert gas none', () => {
    // the demo's recommended order: CH4 (fuel), Ar 1/2 (inert), O2 (oxidizer), Ar 2/2
    const ch4 = fits(s0, /^mixwright fill b1 /);
    expect(ch4).toContain('! Flammable gas: no ignition sources, no leaks; lab procedure, local rules');
    const ar = fits(s1, /^mixwright fill b1 /);
    expect(ar).not.toMatch(/^! /m);
    const o2 = read(s1, '480.81', 3);
    expect(o2.phase).toBe('reading');
    expect(fits(o2, /^mixwright fill b1 /)).toContain(
      '! Oxidizer: oxygen-service parts only, open slowly; lab procedure, local rules',
    );
    // a premix that carries both (common practice: CH4 a fuel, O2 an oxidizer by their oxygen demand)
    const both = gasCaution({ CH4: 0.33, O2: 0.67 })!;
    expect(both).toMatch(/^! Fuel \+ oxidizer: no ignition sources, open slowly/);
    for (const c of [both, gasCaution({ CH4: 1 })!, gasCaution({ O2: 1 })!])
      expect(c.length).toBeLessThan(80);
    expect(gasCaution({ Ar: 1 })).toBeUndefined();
  });

  it("the key hints name the session's operator (a resume by another operator: theirs)", () => {
    const qx = initialState(setupFromHeader(header()), undefined, NOW, { operator: 'QX' });
    expect(qx.phase).toBe('reading');
    const f = fits(qx, /^mixwright fill b1 /);
    expect(f).toContain('undo QX: undo last fix N QX: correct');
    expect(f).not.toContain('undo AB');
  });

  it('a batch id too long for the title row: what the screen is goes whole on the row under it', () => {
    const id = 'ng-surrogate-air-phi08-20261203T1627';
    const b = read(read(initialState(setupFromHeader(header(undefined, id))), '10.013', 2), '150', 3);
    const rows = frame80(b).split('\n');
    expect(rows[0]).toBe(`mixwright fill ${id}`);
    expect(rows[1]).toBe('fill 2 of 4 (Ar, charge 1 of 2): BELOW ITS BAND');
    expect(rows.length).toBeLessThanOrEqual(24);
  });
});

describe('wrapped text', () => {
  it('a continuation line loses the space the wrap broke at, after any colour codes; the first line keeps its own', () => {
    expect(dropLeadingSpace(' a', 1)).toBe('a');
    expect(dropLeadingSpace('\u001b[1m a', 2)).toBe('\u001b[1ma');
    expect(dropLeadingSpace(' a', 0)).toBe(' a');
    expect(dropLeadingSpace('  two', 1)).toBe(' two');
  });
});
