/**
 * The review of a guided fill's re-targeted remainder (core/remainder-review.ts) and its safer stop.
 * Plan: the demo recipe ch4-o2-ar-phi1 as CH4, Ar to 400 Torr, O2, Ar (tests/split-plan.ts).
 * Flammability reference, the project's data: LFL of CH4 in air 4.4 % (IEC 60079-20-1), LOC of CH4
 * 10.7 % (ASTM E2079), Ar counted as 0.55 N2 (ISO 10156); the envelope's lean corner "LFL in air" is
 * (fuel LFL, O2 0.21 x (1 - LFL)) on the N2-equivalent diagram.
 */
import { describe, expect, it } from 'vitest';
import {
  retarget,
  reviewBelowBand,
  reviewRemainder,
  type Finding,
  type RetargetInput,
} from '../../src/core/index.js';
import { splitPlan } from '../split-plan.js';
import { TORR } from '../helpers.js';

const { plan, req } = splitPlan();
const planned = plan.findings;
const safety = {
  workingLimitPa: 2700.222 * TORR,
  tankId: 'MT-1',
  coldestK: 291.15,
  condensationFraction: 0.5,
};
const grid = { resolutionPa: 0.01 * TORR, offsetPa: 0 };

function input(readingsTorr: readonly number[], stopTorr = 400): RetargetInput {
  return {
    design: plan.design,
    tolerance: plan.tolerance,
    sources: plan.steps.map((s) => s.source),
    done: readingsTorr.map((p) => ({ pressurePa: p * TORR, temperatureK: 298.15 })),
    temperatureK: 298.15,
    finalPressurePa: plan.final.pressurePa,
    volumeM3: req.input.tank.volumeM3,
    workingLimitPa: safety.workingLimitPa,
    charges: plan.steps.map((s, k) => ({
      number: s.charge.number,
      of: s.charge.of,
      stopPa: k === 1 ? stopTorr * TORR : undefined,
    })),
  };
}
const review = (i: RetargetInput, search = true) =>
  reviewRemainder({ retarget: i, safety, planned, readingGrid: () => grid, searchAlternative: search });
const codes = (fs: readonly Finding[]) => fs.map((f) => `${f.code}@${f.step ?? 0}`);

describe('review of the re-targeted remainder', () => {
  it('a fill read at the targets passes nothing the plan did not have, after every reading', () => {
    const targets = plan.steps.map((s) => s.targetPa / TORR);
    for (let m = 0; m < targets.length; m++) {
      const rv = review(input(targets.slice(0, m)));
      expect(rv.hazards).toEqual([]);
      expect(rv.evaluations).toBe(0);
    }
  });

  it('CH4 read 40 % high (14.0179 Torr): the state after O2 at 428.02 Torr is flammable, inside the published limits by hand', () => {
    const rv = review(input([14.0179]), false);
    // fill 4 (Ar) starts in that flammable tank and keeps it flammable to a higher pressure: the closed-vessel
    // pressure at the top of the stretch is its own hazard, above the state's (fill-path-closed-vessel.test.ts)
    expect(codes(rv.hazards)).toEqual([
      'flammable-state@3',
      'closed-vessel-pressure@3',
      'closed-vessel-fill-path@4',
    ]);
    const top = rv.hazards[2];
    if (top.code !== 'closed-vessel-fill-path')
      throw new Error(`expected closed-vessel-fill-path, got ${top.code}`);
    const state = rv.hazards[1];
    if (state.code !== 'closed-vessel-pressure')
      throw new Error(`expected closed-vessel-pressure, got ${state.code}`);
    expect(top.peakPa).toBeGreaterThan(state.peakPa);
    expect(top.flammableToPa).toBeGreaterThan(428.02 * TORR);
    const f = rv.hazards[0];
    if (f.code !== 'flammable-state') throw new Error(`expected flammable-state, got ${f.code}`);
    expect(f.pressurePa / TORR).toBeCloseTo(428.02, 1);
    // by hand (ideal partial pressures): CH4 14.0179, O2 2 x 14.0179 = 28.0358 (phi 1), Ar 428.02 - 42.05 = 385.97
    // Torr; N2-equivalent sum 14.0179 + 28.0358 + 0.55 x 385.97 = 254.34: fuel 5.51 %, O2 11.02 %, on the
    // stoichiometric line above the nose (LOC 10.7 %) and above the LFL 4.4 %: inside the envelope
    expect(f.fuelFraction).toBeCloseTo(14.0179 / 254.34, 3);
    expect(f.oxygenFraction).toBeCloseTo(28.0358 / 254.34, 3);
    expect(f.oxygenFraction).toBeGreaterThan(0.107);
    expect(f.fuelFraction).toBeGreaterThan(0.044);
    expect(rv.noAlternative).toBe('not-searched');
  });

  it('the safer stop of the first Ar charge is where the O2 jet no longer crosses the lean corner of the envelope: 451.49 Torr by hand (ideal gas), within 0.3 Torr', () => {
    const rv = review(input([14.0179]));
    const alt = rv.alternative!;
    expect(alt.fill).toBe(1);
    expect(alt.sourceId).toBe(plan.steps[1].source.id);
    // by hand: the inlet line from the tank's point (f0, 0) to pure O2 (0, 1) passes the corner
    // (LFL, 0.21 (1 - LFL)) when f0 = LFL / (1 - 0.21 (1 - LFL)) = 0.044 / 0.79924 = 5.5052 %; the CH4 mole
    // fraction with Ar as 0.55 N2 is x = 0.55 f0 / (1 - 0.45 f0) = 3.1048 %, so the stop is 14.0179 / x =
    // 451.49 Torr. The real gas (Ar's B < 0 puts slightly more Ar in at the stop) and the 0.01 Torr
    // grid move it by under 0.3 Torr.
    const f0 = 0.044 / (1 - 0.21 * (1 - 0.044));
    const x = (0.55 * f0) / (1 - 0.45 * f0);
    expect(14.0179 / x).toBeCloseTo(451.49, 2);
    expect(Math.abs(alt.toPa / TORR - 14.0179 / x)).toBeLessThan(0.3);
    // on the gauge's 0.01 Torr grid, and the lowest clean one: a step below it the inlet is flammable
    expect(Math.abs((alt.toPa / TORR) * 100 - Math.round((alt.toPa / TORR) * 100))).toBeLessThan(1e-6);
    expect(codes(review(input([14.0179], alt.toPa / TORR - 0.01), false).hazards)).toEqual([
      'flammable-at-inlet@3',
    ]);
    expect(review(input([14.0179], alt.toPa / TORR), false).hazards).toEqual([]);
    expect(alt.marginKept).toBe(true);
    expect(alt.findings.some((z) => /^flammable|detonable/.test(z.code))).toBe(false);
    // the re-target with the safer stop still keeps phi and the dilution
    expect(alt.result.gave).not.toContain('phi');
    expect(alt.result.stops[0].kept).toBe(true);
    expect(alt.result.remaining[0].targetPa).toBeCloseTo(alt.toPa, 6);
  });

  it('a hazard no stop ahead can change is said so: the Ar charge read at 200 Torr (its stop is behind)', () => {
    const rv = review(input([10.0128, 200]));
    expect(codes(rv.hazards)).toContain('flammable-state@3');
    expect(rv.alternative).toBeUndefined();
    expect(rv.noAlternative).toBe('no-diluent-stop');
  });

  it('the remainder review uses the re-target it is given (the same targets as retarget alone)', () => {
    const i = input([14.0179]);
    const r = retarget(i);
    const rv = reviewRemainder({ retarget: i, result: r, safety, planned, searchAlternative: false });
    expect(rv.result).toBe(r);
    expect(rv.result.remaining.map((x) => x.targetPa)).toEqual(retarget(i).remaining.map((x) => x.targetPa));
  });
});

describe('an incomplete diluent charge: continuing it is the safer way', () => {
  // the Ar charge 1 of 2 (stop 400 Torr) read at 150 Torr after CH4 at the target: O2 onto 150 Torr
  // puts about 10.01 Torr CH4 with 20.03 Torr O2 in 170 Torr: 5.9 % fuel, 11.8 % O2 as read (ideal
  // partial pressures, by hand), past the LFL 4.4 % and the LOC 10.7 % before Ar counts as 0.55 N2:
  // flammable, where the plan was not
  const ch4 = plan.steps[0].targetPa / TORR;
  const band = plan.steps[1].bandPa;
  it('without the band of the fill read, no continuation: no charge ahead holds a diluent stop (the trial finding)', () => {
    const rv = review(input([ch4, 150]));
    expect(codes(rv.hazards)).toContain('flammable-state@3');
    expect(rv.continuation).toBeUndefined();
    expect(rv.noAlternative).toBe('no-diluent-stop');
  });
  /** the Ar charge read at 150 Torr, reviewed with its band (and what else is given) */
  const short = (more: Partial<Parameters<typeof reviewRemainder>[0]> = {}) =>
    reviewRemainder({
      retarget: input([ch4, 150]),
      safety,
      planned,
      readingGrid: () => grid,
      lastBandPa: band,
      ...more,
    });
  it('with it: continuing the Ar charge to its stop (400 Torr, the plan) is clean and offered, no stop searched', () => {
    const rv = short();
    expect(codes(rv.hazards)).toContain('flammable-state@3');
    const c = rv.continuation!;
    expect(c).toBeDefined();
    expect(c.fill).toBe(1);
    expect(c.sourceId).toBe(plan.steps[1].source.id);
    // the stop held (the re-target keeps it exactly), from the reading as the virial model gives it (0.01 Torr)
    expect(c.toPa / TORR).toBeCloseTo(400, 9);
    expect(c.fromPa / TORR).toBeCloseTo(150, 2);
    expect(c.clean).toBe(true);
    expect(c.hazards).toEqual([]);
    expect(rv.noAlternative).toBeUndefined();
    expect(rv.alternative).toBeUndefined();
    expect(rv.evaluations).toBe(1);
  });
  it('a continuation to a target no reading can show inside its band does not end the search', () => {
    // the caller says the target is not readable inside its band (a gauge display step coarser than it):
    // the continuation is still computed (clean), and the search for a stop runs and gives its reason
    const rv = short({
      readableTarget: (fill, pa) => {
        expect(fill).toBe(1);
        expect(pa / TORR).toBeCloseTo(400, 9);
        return false;
      },
    });
    expect(rv.continuation?.clean).toBe(true);
    expect(rv.noAlternative).toBe('no-diluent-stop');
  });
  it('a charge read inside its band is complete: no continuation (the review is as before)', () => {
    const rv = reviewRemainder({
      retarget: input([14.0179, 400]),
      safety,
      planned,
      readingGrid: () => grid,
      lastBandPa: band,
    });
    expect(rv.continuation).toBeUndefined();
  });

  it('each way on from it reviewed: going on passes the flammable state at fill 3, continuing passes nothing new, the tank now (CH4 in Ar, no oxidizer) holds no hazard', () => {
    const ways = reviewBelowBand({ retarget: input([ch4, 150]), safety, planned, lastBandPa: band });
    expect(codes(ways.goingOn)).toContain('flammable-state@3');
    expect(ways.continuing!.clean).toBe(true);
    expect(ways.continuing!.toPa / TORR).toBeCloseTo(400, 9);
    // 10.01 Torr CH4 in 150 Torr with no O2: no oxidizer, not flammable (common practice: a fuel needs an oxidizer)
    expect(ways.tankNow).toEqual([]);
  });
  it('the tank now after O2 read short onto a short Ar charge: flammable in the tank is said for stopping there', () => {
    // CH4 10.01, Ar at 150 (its stop 400 left short), O2 at 165 Torr: 15 Torr O2, 10 Torr CH4 in 165 Torr:
    // 6.1 % fuel, 9.1 % O2 as read (ideal partial pressures, by hand), past the LFL 4.4 %; with Ar as 0.55
    // N2 the N2-equivalent O2 fraction rises above the LOC 10.7 % (ISO 10156 equivalence, by hand: about
    // 15 / (10 + 15 + 0.55 x 140) = 14.7 %): flammable in the tank now
    const ways = reviewBelowBand({
      retarget: input([ch4, 150, 165]),
      safety,
      planned,
      lastBandPa: plan.steps[2].bandPa,
    });
    expect(codes(ways.tankNow)).toContain('flammable-state@3');
  });
  it('every fill made, the last read below its target: the tank as it stands is reviewed (closing leaves it so)', () => {
    // as above, then the last Ar fill read at 170 Torr (target about 1500): 10 Torr CH4, 15 Torr O2 and 145
    // Torr Ar; N2-equivalent sum 10 + 15 + 0.55 x 145 = 104.75 (ISO 10156, by hand): fuel 9.5 %, O2 14.3 %,
    // past the LFL 4.4 % and the LOC 10.7 %: flammable, and it is the finished batch
    const ways = reviewBelowBand({
      retarget: input([ch4, 150, 165, 170]),
      safety,
      planned,
      lastBandPa: plan.steps[3].bandPa,
    });
    // no fill ahead: what the plan did not have is the tank itself
    expect(codes(ways.goingOn).every((c) => c.endsWith('@4'))).toBe(true);
    expect(codes(ways.tankNow).filter((c) => /^flammable-(state|mixture)@4$/.test(c)).length).toBeGreaterThan(
      0,
    );
    // continuing the last fill to its target is reviewed too
    expect(ways.continuing!.toPa).toBeGreaterThan(170 * TORR);
    // the same readings with no band given: the tank is still reviewed (no fill ahead is no empty review)
    const rv = reviewRemainder({
      retarget: input([ch4, 150, 165, 170]),
      safety,
      planned,
      searchAlternative: false,
    });
    expect(codes(rv.findings).some((c) => c.endsWith('@4'))).toBe(true);
  });
});
