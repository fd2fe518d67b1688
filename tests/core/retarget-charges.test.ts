// Re-targeting a split plan (retarget.ts with `charges`): a charge that is not its source's last keeps
// its stop reading, the rest of the source's gas goes in its last charge. The plans are the demo recipe
// ch4-o2-ar-phi1 (CH4/O2 phi 1 in 98 % Ar, 1500 Torr in MT-1) with the order CH4, Ar@STOP, O2, Ar.
import { describe, expect, it } from 'vitest';
import { nnls, retarget, type RetargetInput } from '../../src/core/index.js';
import { splitPlan } from '../split-plan.js';
import { TORR } from '../helpers.js';

const T = 298.15;

/** the re-target input of the split plan with the stop at stopTorr, and the plan */
function splitCase(stopTorr: number) {
  const { plan, req } = splitPlan(stopTorr);
  const input: Omit<RetargetInput, 'done'> = {
    design: req.input.design,
    tolerance: plan.tolerance,
    sources: plan.steps.map((s) => s.source),
    charges: plan.steps.map((s) => ({
      ...s.charge,
      stopPa: s.charge.number < s.charge.of ? s.targetPa : undefined,
    })),
    temperatureK: T,
    finalPressurePa: 1500 * TORR,
    volumeM3: req.input.tank.volumeM3,
  };
  return { plan, input };
}
const reading = (pressurePa: number) => ({ pressurePa, temperatureK: T });
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('the cause: nnls judged every gradient against one threshold set by the heaviest row', () => {
  it('a diagonal system weighted 1e8 : 1: the light column is solved by both gradient tests (algebra: x = b_i / A_ii, 1e-12 relative)', () => {
    const A = [
      [1e8, 0],
      [0, 1],
    ];
    const b = [1e8, 1e-3];
    // the columns are brought to unit length first, so the one threshold 1e-12 x max|b| = 1e-4 of the
    // default test no longer carries the heavy column's 1e8 (it was 1e4, above the light gradient 1e-3)
    for (const x of [nnls(A, b).x, nnls(A, b, undefined, { gradientTest: 'per-column' }).x]) {
      expect(rel(x[0], 1)).toBeLessThan(1e-12);
      expect(rel(x[1], 1e-3)).toBeLessThan(1e-12);
    }
  });

  it('held at a 1200 Torr stop after an exact CH4 reading, the second Ar charge gets its gas (was none: 1219.99 Torr final)', () => {
    // without charges: the stop given as a reading, the remaining fills O2 and Ar are distinct sources
    const { plan, input } = splitCase(1200);
    const r = retarget({
      ...input,
      charges: undefined,
      done: [reading(plan.steps[0].targetPa), reading(plan.steps[1].targetPa)],
    });
    // the plan's own targets (the planner's real-gas amounts) within the re-target's total-row weighting, 1e-4
    expect(rel(r.remaining[0].targetPa, plan.steps[2].targetPa)).toBeLessThan(1e-4);
    expect(rel(r.remaining[1].targetPa, 1500 * TORR)).toBeLessThan(1e-4);
    expect(r.gave).toEqual([]);
  });
});

describe('a split plan re-targeted in the core: the stop of the first Ar charge is kept', () => {
  for (const stop of [400, 1200]) {
    for (const f of [1, 1.01]) {
      it(`stop ${stop} Torr, CH4 read ${f === 1 ? 'exactly' : '1 % high'}`, () => {
        const { plan, input } = splitCase(stop);
        const ch4 = reading(plan.steps[0].targetPa * f);
        const r = retarget({ ...input, done: [ch4] });
        expect(r.remaining.map((x) => x.step)).toEqual([2, 3, 4]);
        expect(r.stops).toEqual([expect.objectContaining({ step: 2, kept: true })]);
        // the stop is kept exactly (the bisection on the real-gas pressure: 1e-12 relative)
        expect(rel(r.remaining[0].targetPa, stop * TORR)).toBeLessThan(1e-12);
        // identity: the fills after the stop are the unsplit re-target from the stop taken as a reading (1e-9)
        const held = retarget({
          ...input,
          charges: undefined,
          done: [ch4, reading(stop * TORR)],
        });
        r.remaining.slice(1).forEach((x, i) => {
          expect(rel(x.targetPa, held.remaining[i].targetPa)).toBeLessThan(1e-9);
          expect(rel(x.amountMol, held.remaining[i].amountMol)).toBeLessThan(1e-7);
        });
        expect(rel(r.predicted.pressurePa, held.predicted.pressurePa)).toBeLessThan(1e-9);
        // amount balance: the two Ar charges together are the Ar of the unsplit order CH4, Ar, O2 re-targeted
        // after the same reading (the same final state: 1e-6 relative)
        const unsplit = retarget({
          ...input,
          sources: [input.sources[0], input.sources[1], input.sources[2]],
          charges: undefined,
          done: [ch4],
        });
        expect(
          rel(r.remaining[0].amountMol + r.remaining[2].amountMol, unsplit.remaining[0].amountMol),
        ).toBeLessThan(1e-6);
        expect(rel(r.remaining[1].amountMol, unsplit.remaining[1].amountMol)).toBeLessThan(1e-6);
        // phi and the dilution kept (the re-target's priorities; 1e-6 and the design tolerance 0.5 %)
        expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
        expect(rel(r.predicted.diluentFraction, 0.98)).toBeLessThan(0.005);
        // hand calculation (ideal-gas scaling): every fill grows with the CH4, so the final pressure is
        // 1500 x f Torr; 0.1 Torr for the re-target's total-row weighting and the non-ideality
        expect(Math.abs(r.predicted.pressurePa / TORR - 1500 * f)).toBeLessThan(0.1);
        if (f === 1) {
          expect(r.gave).toEqual([]);
          // the final composition within the design tolerance (0.5 % relative of each design fraction)
          for (const [k, x] of Object.entries(input.design.composition))
            if (x > 0) expect(rel(r.predicted.composition[k], x)).toBeLessThan(0.005);
        } else {
          expect(r.gave).toEqual(['pressure']);
          expect(r.message).toMatch(
            /^the final pressure becomes 20198\d Pa \(design 199980 Pa\) to keep phi and the dilution$/,
          );
        }
      });
    }
  }

  it('the first Ar charge read 10 Torr above its 400 Torr stop: O2 keeps phi, the second charge takes 10 Torr less, the design is met', () => {
    const { plan, input } = splitCase(400);
    const exact = retarget({ ...input, done: [reading(plan.steps[0].targetPa)] });
    const r = retarget({ ...input, done: [reading(plan.steps[0].targetPa), reading(410 * TORR)] });
    expect(r.stops).toEqual([]);
    expect(r.remaining.map((x) => x.step)).toEqual([3, 4]);
    // O2 is set by phi on the CH4 alone: the same amount as from the exact stop (1e-6)
    expect(rel(r.remaining[0].amountMol, exact.remaining[1].amountMol)).toBeLessThan(1e-6);
    // amount balance: the same final state, so the Ar of charge 1 (read) + charge 2 (re-targeted) is the
    // exact case's (1e-4: the 10 Torr of Ar read at 410 Torr instead of 400 Torr is taken from charge 2)
    const ar1 = exact.remaining[0].amountMol;
    const extra = exact.remaining[2].amountMol - r.remaining[1].amountMol;
    // ideal gas: 10 Torr of Ar in the tank, n = p V / R T (R = 8.314462618 J/(mol K), CODATA 2018); 0.2 % non-ideality
    const tenTorrMol = (10 * TORR * input.volumeM3) / (8.314462618 * T);
    expect(rel(extra, tenTorrMol)).toBeLessThan(0.002);
    expect(ar1).toBeGreaterThan(0);
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
    expect(rel(r.predicted.pressurePa, exact.predicted.pressurePa)).toBeLessThan(1e-6);
    for (const [k, x] of Object.entries(input.design.composition))
      if (x > 0) expect(rel(r.predicted.composition[k], x)).toBeLessThan(0.005);
    expect(r.gave).toEqual([]);
  });

  it('a stop the tank is already past (CH4 mistyped as 405 Torr) is not kept and not moved silently: the message gives the numbers and what it means', () => {
    const { input } = splitCase(400);
    const r = retarget({ ...input, done: [reading(405 * TORR)] });
    expect(r.stops).toEqual([expect.objectContaining({ step: 2, kept: 'passed' })]);
    expect(rel(r.stops[0].beforePa, 405 * TORR)).toBeLessThan(1e-9);
    // that charge adds no gas; the Ar goes in the last charge (fill 4)
    expect(r.remaining[0].amountMol).toBe(0);
    expect(r.remaining[0].incrementPa).toBe(0);
    expect(r.remaining[2].amountMol).toBeGreaterThan(0);
    expect(r.message).toMatch(
      /^the stop of fill 2 \(charge 1 of 2 of cyl-Ar\) cannot be kept: the tank is at 53996 Pa before it, past its stop 53329 Pa; that charge adds no gas/,
    );
    expect(r.message).toMatch(/the last is fill 4\)\. The stop is part of the plan's safety design/);
  });

  it('a stop at or above the working limit is not kept, and said so; no target passes the limit', () => {
    const { plan, input } = splitCase(400);
    const limit = 390 * TORR;
    const r = retarget({ ...input, workingLimitPa: limit, done: [reading(plan.steps[0].targetPa)] });
    expect(r.stops[0].kept).toBe('limit');
    expect(r.message).toMatch(/its stop 53329 Pa is at or above the tank's working limit 51996 Pa/);
    for (const x of r.remaining) expect(x.targetPa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    expect(r.limitBinds).toBe(true);
  });

  it('a source in two remaining fills without its charges is refused (its stop is needed)', () => {
    const { input } = splitCase(400);
    expect(() => retarget({ ...input, charges: undefined, done: [] })).toThrow(
      /fill 2 \(cyl-Ar\) is not its source's last charge: its charge and stop reading are needed/,
    );
  });
});
