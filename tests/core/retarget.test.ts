import { describe, expect, it } from 'vitest';
import { designMixture, planFill, pureCylinder, retarget, type Gauge } from '../../src/core/index.js';
import { TORR } from '../helpers.js';

const head = (id: string, fsTorr: number, res: number): Gauge => ({ id, label: id, reference: 'absolute', fullScalePa: fsTorr * TORR, minimumPa: 0, accuracyOfReading: 0.0012, accuracyOfFullScale: 0, resolutionPa: res * TORR, unit: 'Torr' });

// CH4/O2 phi 1 in 85 % Ar, fill order CH4, Ar, O2 (each expectation is algebra on the design, worked here)
const design = designMixture({ kind: 'phi', fuel: { CH4: 1 }, oxidizer: { O2: 1 }, diluent: { Ar: 1 }, phi: 1, basis: { kind: 'dilution', value: 0.85 } });
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
const base = { design, tolerance: plan.tolerance, sources: plan.steps.map((s) => s.source), temperatureK: 298.15, finalPressurePa: 1000 * TORR, volumeM3: 0.01 };

describe('re-targeting', () => {
  it('readings on target: the remaining targets are the plan\'s own (1e-7 relative) and nothing gives', () => {
    const r = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 }] });
    r.remaining.forEach((s, i) => expect(Math.abs(s.targetPa / plan.steps[i + 1].targetPa - 1)).toBeLessThan(1e-7));
    expect(r.gave).toEqual([]);
  });

  it('CH4 overfilled by 2 %: O2 is raised 2 % to keep phi, Ar 2 % to keep the 85 % dilution; so the whole batch, and the final pressure, grow 2 % (pressure gives)', () => {
    const r = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa * 1.02, temperatureK: 298.15 }] });
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(r.predicted.diluentFraction - 0.85)).toBeLessThan(1e-6);
    // fuel and O2 are 15 % of the batch and both grow 2 %; keeping 85 % Ar scales the rest alike
    expect(Math.abs(r.predicted.pressurePa / (1000 * TORR) - 1.02)).toBeLessThan(2e-4);
    expect(r.gave).toEqual(['pressure']);
  });

  it('CH4 underfilled by 0.2 %: within tolerance, nothing gives (the pressure is 0.2 % low)', () => {
    const r = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa * 0.998, temperatureK: 298.15 }] });
    expect(r.gave).toEqual([]);
    expect(r.message).toMatch(/keep phi, the dilution and the final pressure/);
    const big = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa * 1.1, temperatureK: 298.15 }] });
    expect(big.gave).toEqual(['pressure']);
    expect(big.message).toMatch(/final pressure becomes/);
  });

  it('Ar overfilled by 5 % of the reading after CH4: O2 still sets phi; the dilution cannot come back (0.8565 against 0.85)', () => {
    const r = retarget({ ...base, done: [{ pressurePa: plan.steps[0].targetPa, temperatureK: 298.15 }, { pressurePa: plan.steps[1].targetPa * 1.05, temperatureK: 298.15 }] });
    expect(Math.abs(r.predicted.diluentFraction - 0.8565)).toBeLessThan(5e-4);
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-6);
    expect(r.predicted.diluentFraction).toBeGreaterThan(0.85);
    expect(r.gave).toContain('dilution');
  });

  it('the tank working limit is never passed: the pressure is held at the limit and dilution gives', () => {
    const limit = 1002 * TORR;
    const r = retarget({ ...base, workingLimitPa: limit, done: [{ pressurePa: plan.steps[0].targetPa * 1.1, temperatureK: 298.15 }] });
    expect(r.predicted.pressurePa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    expect(r.remaining[r.remaining.length - 1].targetPa).toBeLessThanOrEqual(limit * (1 + 1e-9));
    expect(Math.abs(r.predicted.phi! - 1)).toBeLessThan(1e-4);
    expect(r.gave).toContain('dilution');
  });
});
