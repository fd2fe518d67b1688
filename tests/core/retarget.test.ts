import { describe, expect, it } from 'vitest';
import {
  designMixture,
  planFill,
  pureCylinder,
  retarget,
  ventBack,
  type Gauge,
} from '../../src/core/index.js';
import { ProblemError } from '../../src/core/index.js';
import { TORR } from '../helpers.js';

const head = (id: string, fsTorr: number, res: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: 0.0012,
  accuracyOfFullScale: 0,
  resolutionPa: res * TORR,
  unit: 'Torr',
});

// CH4/O2 phi 1 in 85 % Ar, fill order CH4, Ar, O2 (each expectation is algebra on the design, worked here)
const design = designMixture({
  kind: 'phi',
  fuel: { CH4: 1 },
  oxidizer: { O2: 1 },
  diluent: { Ar: 1 },
  phi: 1,
  basis: { kind: 'dilution', value: 0.85 },
});
const sources = ['CH4', 'Ar', 'O2'].map((s) => pureCylinder({ id: s, species: s, purity: 1 }));
const plan = planFill({
  design,
  finalPressurePa: 1000 * TORR,
  temperatureK: 298.15,
  tank: { id: 'T', label: 'T', volumeM3: 0.01 },
  sources,
  order: 'given',
  gauges: [head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)],
  reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
  tolerance: { relative: 0.005, absolute: 0 },
});
const base = {
  design,
  tolerance: plan.tolerance,
  sources: plan.steps.map((s) => s.source),
  temperatureK: 298.15,
  finalPressurePa: 1000 * TORR,
  volumeM3: 0.01,
};

describe('re-targeting', () => {
  it("readings on target: the remaining targets are the plan's own (1e-7 relative) and nothing gives", () => {
    const r = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 }] });
    r.remaining.forEach((s, i) =>
      expect(Math.abs(s.targetPa / plan.steps[i + 1].targetPa - 1)).toBeLessThan(1e-7),
    );
    expect(r.gave).toEqual([]);
  });

  it('CH4 overfilled by 2 %: O2 is raised 2 % to keep phi, Ar 2 % to keep the 85 % dilution; so the whole batch, and the final pressure, grow 2 % (pressure gives)', () => {
    const r = retarget({
      ...base,
      done: [{ pressurePa: plan.steps[0].targetPa * 1.02, temperatureK: 298.15 }],
    });
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.predicted.diluentFraction - 0.85)).toBeLessThan(1e-6);
    // fuel and O2 are 15 % of the batch and both grow 2 %; keeping 85 % Ar scales the rest alike
    expect(Math.abs(r.predicted.pressurePa / (1000 * TORR) - 1.02)).toBeLessThan(2e-4);
    expect(r.gave).toEqual(['pressure']);
  });

  it('CH4 underfilled by 0.2 %: within tolerance, nothing gives (the pressure is 0.2 % low)', () => {
    const r = retarget({
      ...base,
      done: [{ pressurePa: plan.steps[0].targetPa * 0.998, temperatureK: 298.15 }],
    });
    expect(r.gave).toEqual([]);
    expect(r.message).toMatch(/keep phi, the dilution and the final pressure/);
    const big = retarget({
      ...base,
      done: [{ pressurePa: plan.steps[0].targetPa * 1.1, temperatureK: 298.15 }],
    });
    expect(big.gave).toEqual(['pressure']);
    expect(big.message).toMatch(/final pressure becomes/);
  });

  it('Ar overfilled by 5 % of the reading after CH4: O2 still sets phi; the dilution cannot come back (0.8565 against 0.85)', () => {
    const r = retarget({
      ...base,
      done: [
        { pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 },
        { pressurePa: plan.steps[1].targetPa * 1.05, temperatureK: 298.15 },
      ],
    });
    expect(Math.abs(r.predicted.diluentFraction - 0.8565)).toBeLessThan(5e-4);
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
    expect(r.predicted.diluentFraction).toBeGreaterThan(0.85);
    expect(r.gave).toContain('dilution');
  });

  it('the tank working limit is never passed: the pressure is held at the limit and dilution gives', () => {
    const limit = 1002 * TORR;
    const r = retarget({
      ...base,
      workingLimitPa: limit,
      done: [{ pressurePa: plan.steps[0].targetPa * 1.1, temperatureK: 298.15 }],
    });
    expect(r.predicted.pressurePa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    expect(r.remaining[r.remaining.length - 1].targetPa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-4);
    expect(r.gave).toContain('dilution');
  });
});

describe('re-targeting at the working limit', () => {
  const limit = 1002 * TORR;
  it("held by the limit, the final target sits the last fill's band below it: the band's upper edge never passes the limit", () => {
    const done = [{ pressurePa: plan.steps[0].targetPa * 1.1, temperatureK: 298.15 }];
    const band = 7.5 * TORR;
    const formatPressure = (pa: number) => `${Number((pa / TORR).toPrecision(5))} Torr`;
    const r = retarget({ ...base, workingLimitPa: limit, finalBandPa: band, done, formatPressure });
    const last = r.remaining[r.remaining.length - 1].targetPa;
    expect(r.limitBinds).toBe(true);
    // the final target is the limit less the band (within the aim's 1e-6 relative step), so target + band <= limit
    expect(last + band).toBeLessThanOrEqual(limit);
    expect((limit - band - last) / limit).toBeLessThan(1e-5);
    // one final pressure: the last target (not the limit less the band beside it), and how far below the limit it stays
    expect(r.message).toContain(
      `held at ${formatPressure(last)} (design ${formatPressure(base.finalPressurePa)}), at least the last fill's band 7.5 Torr below the tank's working limit 1002 Torr`,
    );
    // without the band the target is at the limit itself (the case the band guards against)
    const bare = retarget({ ...base, workingLimitPa: limit, done });
    expect(bare.remaining[bare.remaining.length - 1].targetPa + band).toBeGreaterThan(limit);
  });
  it('an overshoot past the limit: no further fill is proposed, the message says so', () => {
    const r = retarget({
      ...base,
      workingLimitPa: limit,
      done: [
        { pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 },
        { pressurePa: 1010 * TORR, temperatureK: 298.15 },
      ],
    });
    expect(r.limitBinds).toBe(true);
    expect(r.nowPa / TORR).toBeCloseTo(1010, 6); // same reading, same temperature: the EOS round trip
    expect(r.remaining.every((x) => x.amountMol === 0)).toBe(true);
    expect(r.message).toMatch(/at or above its working limit/);
  });

  it('no remaining target ever passes the limit, over a sweep of Ar overshoots (the limit 1e-9 relative)', () => {
    for (const f of [1.0, 1.003, 1.01, 1.05, 1.2]) {
      const r = retarget({
        ...base,
        workingLimitPa: limit,
        done: [
          { pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 },
          { pressurePa: Math.min(plan.steps[1].targetPa * f, limit * 0.999), temperatureK: 298.15 },
        ],
      });
      for (const x of r.remaining) expect(x.targetPa).toBeLessThanOrEqual(limit * (1 + 1e-9));
      expect(r.predicted.pressurePa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    }
  });

  it('vent back after an Ar reading past the limit: venting keeps the composition, so O2 can still restore phi; the vent target is below the limit and ends near the design pressure', () => {
    const done = [
      { pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 },
      { pressurePa: 1010 * TORR, temperatureK: 298.15 },
    ];
    const v = ventBack({ ...base, workingLimitPa: limit, done });
    expect(v.targetPa).toBeLessThan(limit);
    expect(v.ventFactor).toBeGreaterThan(0);
    expect(v.ventFactor).toBeLessThan(1);
    // phi is kept by the O2 fill from the vented tank (algebra: venting scales CH4 and Ar alike)
    expect(Math.abs(v.after.predicted.phi! - 1)).toBeLessThan(1e-4);
    expect(v.after.predicted.pressurePa).toBeLessThanOrEqual(limit);
    // from a tank vented a little further the re-target gives no more: the answer is the largest such vent
    const more = retarget({ ...base, workingLimitPa: limit, done, ventFactor: v.ventFactor * 0.99 });
    expect(more.gave.every((g) => v.after.gave.includes(g) || g === 'pressure')).toBe(true);
  });
  it('a working limit below the design pressure: no vent lets the remaining fills go on, and ventBack raises not-converged instead of proposing a vent to an empty tank', () => {
    // a fuel blend (no phi, no diluent): the last fill is held only by the total amount, so from
    // any vented tank it ends at the design's 1000 Torr, above a 900 Torr limit (algebra on the design)
    const blend = designMixture({ kind: 'fractions', fractions: { CH4: 0.5, C2H6: 0.5 } });
    const low = 900 * TORR;
    const input = {
      design: blend,
      tolerance: { relative: 0.005, absolute: 0 },
      sources: ['CH4', 'C2H6'].map((x) => pureCylinder({ id: x, species: x, purity: 1 })),
      temperatureK: 298.15,
      finalPressurePa: 1000 * TORR,
      volumeM3: 0.01,
      done: [{ pressurePa: 910 * TORR, temperatureK: 298.15 }],
    };
    let caught: unknown;
    try {
      ventBack({ ...input, workingLimitPa: low });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ProblemError);
    const p = (caught as ProblemError).problem;
    expect(p.code).toBe('not-converged');
    if (p.code !== 'not-converged') return;
    expect(p.computation).toMatch(/vent-back/);
    expect(p.iterations).toBe(120);
    // what was left: without the limit the last fill would end at the design's 1000 Torr, 100 Torr above
    // it (algebra on the design; 0.5 % for the virial non-ideality of the blend)
    expect(Math.abs(p.residual / (100 * TORR) - 1)).toBeLessThan(0.05);
    expect(p.tolerance).toBe(0);
  });

  it('the re-target itself never ends above the working limit: every search for amounts ends within it or raises', () => {
    // a limit just above the tank pressure now: the O2 fill is scaled back to fit (60 halvings)
    const done = [
      { pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 },
      { pressurePa: plan.steps[1].targetPa, temperatureK: 298.15 },
    ];
    const tight = plan.steps[1].targetPa * 1.0001;
    const r = retarget({ ...base, workingLimitPa: tight, done });
    expect(r.limitBinds).toBe(true);
    expect(r.predicted.pressurePa).toBeLessThanOrEqual(tight);
    expect(r.gave).toContain('pressure');
  });
});
