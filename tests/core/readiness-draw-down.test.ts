// `ready` over the draw-down: a tank above ambient as filled is drawn below ambient by its
// experiments, and air leaks in there (a trial found `ready` saying "the composition keeps" for a
// batch its plan draws down to 44 Torr). References: the in-leak rule of readiness.ts,
// R x 86400 s x (P_atm - P)/P_atm / P per day, evaluated by hand below (exact arithmetic, 1e-12
// relative); the draw-down pressures against an ideal-gas hand count (Ar-rich at <= 2 bar: B P / R T
// below 2e-3, from memory, so 0.5 %).
import { describe, expect, it } from 'vitest';
import {
  drawDown,
  drawDownPressures,
  experimentsServed,
  ingressPerDayAt,
  type SizingInput,
} from '../../src/core/index.js';

const TORR = 101325 / 760;
const AIR = { O2: 0.21, N2: 0.79 };
const Y = { CH4: 0.01, O2: 0.02, Ar: 0.97 };
const LEAK = (2e-5 * TORR) / 60; // 2e-5 Torr/min, in Pa/s
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('air in-leak as the tank is drawn down', () => {
  it('the rule at 44 Torr: 2e-5 x 1440 x (716/760) / 44 = 6.1665e-4 of the batch per day; none at or above ambient', () => {
    const hand = (2e-5 * 1440 * (716 / 760)) / 44;
    expect(rel(ingressPerDayAt(44 * TORR, 760 * TORR, LEAK), hand)).toBeLessThan(1e-12);
    expect(ingressPerDayAt(760 * TORR, 760 * TORR, LEAK)).toBe(0);
    expect(ingressPerDayAt(1500 * TORR, 760 * TORR, LEAK)).toBe(0);
  });

  it('below ambient from the first experiment drawn under 760 Torr; the last experiment evenly and held at the lowest', () => {
    const torrs = [1500, 1000, 700, 400, 100];
    const d = drawDown({
      composition: Y,
      pressuresPa: torrs.map((t) => t * TORR),
      residualFraction: 1e-6,
      leakRatePaPerS: LEAK,
      days: 3,
      atmosphericPa: 760 * TORR,
      air: AIR,
    });
    const r = (t: number) => (t >= 760 ? 0 : (2e-5 * 1440 * ((760 - t) / 760)) / t);
    expect(d.experiments).toBe(4);
    expect(d.belowFrom!.experiment).toBe(3);
    expect(d.belowFrom!.pressurePa / TORR).toBeCloseTo(700, 9);
    expect(d.lowestPa / TORR).toBeCloseTo(400, 9);
    expect(rel(d.ingressPerDayAtLowest, r(400))).toBeLessThan(1e-12);
    expect(rel(d.o2ShareAddedPerDayAtLowest!, (0.21 * r(400)) / 0.02)).toBeLessThan(1e-12);
    // experiments at days 0, 1, 2, 3: between them the tank holds 1000, 700 and 400 Torr for a day each
    const evenly = 1e-6 + r(1000) + r(700) + r(400);
    expect(rel(d.evenly.airFraction, evenly / (1 + evenly))).toBeLessThan(1e-12);
    const held = 1e-6 + 3 * r(400);
    expect(rel(d.heldAtLowest.airFraction, held / (1 + held))).toBeLessThan(1e-12);
    // air makes the batch leaner: phi = 2 x(CH4) / x(O2), the air's O2 added (exact stoichiometry)
    expect(rel(d.heldAtLowest.phi!, (2 * 0.01) / (0.02 + 0.21 * held))).toBeLessThan(1e-12);
    expect(d.evenly.phi!).toBeGreaterThan(d.heldAtLowest.phi!);
  });

  it('a tank that stays above ambient to its last experiment has no below-ambient point and takes in no air', () => {
    const d = drawDown({
      composition: Y,
      pressuresPa: [3000, 2500, 2000, 1500].map((t) => t * TORR),
      residualFraction: 0,
      leakRatePaPerS: LEAK,
      days: 14,
      atmosphericPa: 760 * TORR,
      air: AIR,
    });
    expect(d.belowFrom).toBeUndefined();
    expect(d.ingressPerDayAtLowest).toBe(0);
    expect(d.heldAtLowest.airFraction).toBe(0);
  });

  it('the draw-down pressures: from the final pressure, one experiment at a time, to no less than the reserve', () => {
    const input: SizingInput = {
      composition: Y,
      tankVolumeM3: 0.01,
      temperatureK: 298.15,
      reactor: { id: 'R', label: 'R', volumeM3: 0.001, lineVolumeM3: 0.0001, fillPressurePa: 50 * TORR },
      margin: 0.1,
    };
    const { experiments, sizing } = experimentsServed(input, 1500 * TORR);
    const p = drawDownPressures(input, 1500 * TORR, experiments);
    expect(p).toHaveLength(experiments + 1);
    expect(rel(p[0], 1500 * TORR)).toBeLessThan(1e-9);
    expect(p[experiments]).toBeGreaterThanOrEqual(sizing.minTankPa * (1 - 1e-12));
    // ideal gas by hand: each experiment draws 50 Torr x 1.1 L / 10 L = 5.5 Torr of the tank
    expect(rel(p[0] - p[1], 5.5 * TORR)).toBeLessThan(0.005);
  });
});
