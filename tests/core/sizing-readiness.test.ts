import { describe, expect, it } from 'vitest';
import {
  chapmanEnskogD,
  contamination,
  diffusionMixingTimeS,
  experimentsServed,
  finalPressureForExperiments,
  fullerD,
  mixingEstimate,
  R,
} from '../../src/core/index.js';
import { TORR } from '../helpers.js';

const ATM = 101325;

describe('binary diffusion (properties.md section 8)', () => {
  it('against the CRC Handbook "Diffusion in Gases" values at 293.15 K, 1 atm within 8 %: Ar-N2 0.190, CH4-N2 0.208, He-Ar 0.726 cm2/s', () => {
    const ref: [string, string, number][] = [
      ['Ar', 'N2', 0.19],
      ['CH4', 'N2', 0.208],
      ['He', 'Ar', 0.726],
    ];
    for (const [a, b, d] of ref) {
      expect(Math.abs((fullerD(a, b, 293.15, ATM)! * 1e4) / d - 1), `Fuller ${a}-${b}`).toBeLessThan(0.08);
      expect(Math.abs((chapmanEnskogD(a, b, 293.15, ATM)! * 1e4) / d - 1), `C-E ${a}-${b}`).toBeLessThan(
        0.08,
      );
    }
  });
  it('Fuller and Chapman-Enskog agree within 10 % for the light pairs; the values of properties.md at 298.15 K within 1 %', () => {
    const table: [string, string, number, number][] = [
      ['O2', 'N2', 0.206, 0.204],
      ['CH4', 'Ar', 0.212, 0.213],
      ['H2', 'N2', 0.778, 0.739],
      ['He', 'Ar', 0.729, 0.723],
      ['CO2', 'N2', 0.162, 0.155],
      ['n-C7H16', 'N2', 0.072, 0.076],
    ];
    for (const [a, b, f, c] of table) {
      const F = fullerD(a, b, 298.15, ATM)! * 1e4;
      const C = chapmanEnskogD(a, b, 298.15, ATM)! * 1e4;
      expect(Math.abs(F / f - 1), `Fuller ${a}-${b} ${F}`).toBeLessThan(0.01);
      expect(Math.abs(C / c - 1), `C-E ${a}-${b} ${C}`).toBeLessThan(0.01);
      if (!a.startsWith('n-')) expect(Math.abs(F / C - 1), `${a}-${b}`).toBeLessThan(0.1);
    }
  });
  it('pressure scaling is exactly 1/P', () => {
    expect(fullerD('O2', 'N2', 300, 3 * ATM)! * 3).toBeCloseTo(fullerD('O2', 'N2', 300, ATM)!, 18);
    expect(chapmanEnskogD('O2', 'N2', 300, 0.5 * ATM)! * 0.5).toBeCloseTo(
      chapmanEnskogD('O2', 'N2', 300, ATM)!,
      18,
    );
  });
  it('mixing time: O2-N2 at 1 atm (D 0.206 cm2/s), L = 30 cm: about 35 min to 1 % (properties.md section 8) within 2 min', () => {
    expect(Math.abs(diffusionMixingTimeS(0.3, 0.206e-4, 0.01) / 60 - 35)).toBeLessThan(2);
    // t(0.1 %) / t(1 %) = ln(1000)/ln(100) = 1.5
    expect(diffusionMixingTimeS(0.3, 0.2e-4, 0.001) / diffusionMixingTimeS(0.3, 0.2e-4, 0.01)).toBeCloseTo(
      1.5,
      12,
    );
  });
  it('the slowest pair governs: n-heptane in Ar is slower than O2 in Ar', () => {
    const m = mixingEstimate({ 'n-C7H16': 0.0025, O2: 0.0275, Ar: 0.97 }, 295.15, 1200 * TORR, 0.55, false);
    expect([m.pair!.a, m.pair!.b].sort()).toEqual(['Ar', 'n-C7H16']);
  });
});

describe('batch sizing', () => {
  const base = {
    composition: { Ar: 1 },
    tankVolumeM3: 0.01,
    temperatureK: 298.15,
    reactor: { id: 'r', label: 'r', volumeM3: 0.001, lineVolumeM3: 0.0001, fillPressurePa: 50 * TORR },
    margin: 0.1,
  };
  it('10 L at 1500 Torr, 1.1 L filled to 50 Torr, 10 % margin: (1500 - 55) x 10 / (50 x 1.1) = 262.7 (ideal-gas hand calculation); Ar at 2 bar holds 0.12 % more (Z = 0.99875): 263', () => {
    const { experiments, sizing } = experimentsServed(base, 1500 * TORR);
    expect(experiments).toBe(263);
    expect(sizing.minTankPa).toBeCloseTo(55 * TORR, 9);
    expect(sizing.perExperimentMol / ((50 * TORR * 0.0011) / (R * 298.15)) - 1).toBeLessThan(1e-3);
  });
  it('the reverse: the final pressure for N experiments serves exactly N', () => {
    for (const n of [1, 40, 262]) {
      const { pressurePa } = finalPressureForExperiments(base, n);
      expect(experimentsServed(base, pressurePa * (1 + 1e-9)).experiments).toBe(n);
      expect(experimentsServed(base, pressurePa * (1 - 1e-6)).experiments).toBe(n - 1);
    }
  });
});

describe('contamination', () => {
  it('below ambient: air ingress per day = R x 86400 x (P_atm - P)/P_atm / P, and phi drifts lean', () => {
    const R_ = (2e-5 * TORR) / 60; // 2e-5 Torr/min
    const P = 500 * TORR;
    const c = contamination({
      composition: { CH4: 0.0725, O2: 0.1948, N2: 0.7327 },
      tankPressurePa: P,
      baseVacuumPa: 2e-4 * TORR,
      leakRatePaPerS: R_,
      days: 10,
      atmosphericPa: ATM,
      air: { O2: 0.21, N2: 0.79 },
    });
    expect(c.ingressPerDay).toBeCloseTo((R_ * 86400 * (ATM - P)) / ATM / P, 15);
    expect(c.residualFraction).toBeCloseTo(4e-7, 12);
    expect(c.o2PerDay).toBeCloseTo(0.21 * c.ingressPerDay, 15);
    expect(c.phiAfter!).toBeLessThan(c.phiStart!);
    expect(c.phiDriftPerDay!).toBeLessThan(0);
  });
  it('above ambient no air comes in', () => {
    const c = contamination({
      composition: { CH4: 0.05, O2: 0.1, Ar: 0.85 },
      tankPressurePa: 2 * ATM,
      baseVacuumPa: 0,
      leakRatePaPerS: 1,
      days: 10,
      atmosphericPa: ATM,
      air: { O2: 0.21, N2: 0.79 },
    });
    expect(c.ingressPerDay).toBe(0);
    expect(c.aboveAmbient).toBe(true);
  });
});
