import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  designMixture,
  planFill,
  pureCylinder,
  premix,
  R,
  type Gauge,
  type PlanInput,
} from '../../src/core/index.js';
import { fixture, TORR } from '../helpers.js';

const worked = fixture('worked-plan.json');
const mixtures = fixture('mixture-plans-coolprop.json');
const reading = { barometricPa: 101325, barometricUncertaintyPa: 50 };

const head = (id: string, fsTorr: number, resTorr: number): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: 0.0012,
  accuracyOfFullScale: 0,
  resolutionPa: resTorr * TORR,
  unit: 'Torr',
});
const GAUGES = [head('h10', 10, 1e-4), head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)];

function pureInput(
  x: Record<string, number>,
  order: string[],
  T: number,
  Pf: number,
  volumeM3 = 0.01,
): PlanInput {
  return {
    design: designMixture({ kind: 'fractions', fractions: x }),
    finalPressurePa: Pf,
    temperatureK: T,
    tank: { id: 'T', label: 'T', volumeM3 },
    sources: order.map((s) => pureCylinder({ id: s, species: s, purity: 1 })),
    order: 'given',
    gauges: GAUGES,
    reading,
    tolerance: { relative: 0.005, absolute: 0 },
  };
}

describe('fill plan against outside references', () => {
  it('worked vector of properties.md 1.2 (CoolProp 8.0): targets 50.038 / 150.106 / 1000.000 Torr within 0.01 Torr, amount 0.538290 mol within 0.01 %', () => {
    const plan = planFill(
      pureInput(
        worked.composition,
        worked.order,
        worked.temperature_K,
        worked.final_Torr * TORR,
        worked.volume_L / 1000,
      ),
    );
    plan.steps.forEach((s, i) =>
      expect(Math.abs(s.targetPa / TORR - worked.targets_Torr[i]), s.species).toBeLessThan(0.01),
    );
    expect(Math.abs(plan.final.amountMol / worked.amount_mol - 1)).toBeLessThan(1e-4);
    expect(Math.abs(plan.final.idealAmountMol / worked.ideal_amount_mol - 1)).toBeLessThan(1e-5);
    expect(Math.abs(plan.final.compressibility - worked.compressibility)).toBeLessThan(5e-5);
  });

  // measured (ppm, ours / ideal-gas plan, at the final density): ch4-o2-ar -2/-880, h2-o2-ar 32/-1111,
  // ch4-air -7/-1211, c3h8-o2-n2 31/-684, ch4-o2-co2-ar 207/-5816, c2h6-o2-he-ar -886/-1546.
  // The last case is dominated by the He-Ar cross coefficient: +18.5 cm3/mol here (combining rules with
  // effective quantum constants), while the mixture model's zero-density B_He-Ar is not one number (from
  // about -6 to +18 cm3/mol depending on composition, data/cross-virial-reference.json); the case is held
  // to a wider tolerance until a measured He-Ar B12 settles it.
  const LIMITS: Record<string, { step: number; removed: number }> = {
    'ch4-o2-ar-1000torr': { step: 1e-4, removed: 0.9 },
    'h2-o2-ar-1500torr': { step: 1e-4, removed: 0.9 },
    'ch4-air-3bar': { step: 1e-4, removed: 0.9 },
    'c3h8-o2-n2-2bar': { step: 1e-4, removed: 0.9 },
    'ch4-o2-co2-ar-5bar': { step: 3e-4, removed: 0.9 },
    'c2h6-o2-he-ar-4bar': { step: 1.2e-3, removed: 0.4 },
  };
  for (const c of mixtures.cases.filter((x: { id: string }) => x.id in LIMITS)) {
    const lim = LIMITS[c.id];
    it(`${c.id}: targets within ${lim.step} relative of the CoolProp 8.0 HEOS mixture model; the final amount removes >= ${lim.removed * 100} % of the ideal-gas error`, () => {
      const plan = planFill(pureInput(c.composition, c.order, c.temperature_K, c.final_pressure_Pa));
      plan.steps.forEach((s, i) => {
        const ref = c.readings[i].pressure_Pa;
        expect(Math.abs(s.targetPa / ref - 1), `${s.species}: ${s.targetPa} vs ${ref}`).toBeLessThan(
          lim.step,
        );
      });
      const ideal = c.final_pressure_Pa / (R * c.temperature_K);
      const errReal = Math.abs(plan.final.densityMolPerM3 / c.final_density_mol_per_m3 - 1);
      const errIdeal = Math.abs(ideal / c.final_density_mol_per_m3 - 1);
      expect(errReal).toBeLessThan((1 - lim.removed) * errIdeal);
    });
  }
});

describe('cross coefficients by combining rule: how far they could move a target', () => {
  // the estimate is ours (VIRIAL_U.cross, max(4 cm3/mol, 15 %) standard, DEVELOPERS.md); checked here is its
  // arithmetic, rho * 2 x1 x2 u for a binary, and that pairs from reference mixture models do not count
  it('He/Ar 50/50 at 10 bar, 300 K: rho_f * 2 (0.5)(0.5) * 4 cm3/mol relative, within 1e-9 of that; a note (under a third of the wide band)', () => {
    const plan = planFill(pureInput({ He: 0.5, Ar: 0.5 }, ['He', 'Ar'], 300, 10e5));
    const f = plan.findings.find((x) => x.code === 'cross-virial-estimate');
    expect(f && f.code === 'cross-virial-estimate' ? f.pairs : []).toEqual(['He-Ar']);
    if (!f || f.code !== 'cross-virial-estimate') return;
    expect(f.step).toBe(2);
    expect(Math.abs(f.relative / (plan.final.densityMolPerM3 * 2 * 0.25 * 4e-6) - 1)).toBeLessThan(1e-9);
    expect(f.severity).toBe('note');
    expect(f.shiftPa * 3).toBeLessThan(f.bandPa);
  });

  it('1 % CH4, 2 % O2 in He/Ar at 10 bar: the narrow band of the small fractions makes it a warning, with the He pairs named', () => {
    const plan = planFill(
      pureInput({ CH4: 0.01, O2: 0.02, He: 0.3, Ar: 0.67 }, ['CH4', 'He', 'Ar', 'O2'], 298.15, 10e5),
    );
    const f = plan.findings.find((x) => x.code === 'cross-virial-estimate');
    if (!f || f.code !== 'cross-virial-estimate') throw new Error('no cross-virial-estimate finding');
    expect(f.severity).toBe('warning');
    expect(f.shiftPa * 3).toBeGreaterThanOrEqual(f.bandPa);
    expect(f.pairs.every((x) => x.includes('He'))).toBe(true);
  });

  it('CH4/O2/Ar (every pair from a reference mixture model) gets no such finding at 10 bar', () => {
    const plan = planFill(pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'Ar', 'O2'], 300, 10e5));
    expect(plan.findings.some((x) => x.code === 'cross-virial-estimate')).toBe(false);
  });

  it('below 1e-4 relative there is no finding (He/Ar 50/50 at 0.1 bar)', () => {
    const plan = planFill(pureInput({ He: 0.5, Ar: 0.5 }, ['He', 'Ar'], 300, 1e4));
    expect(plan.findings.some((x) => x.code === 'cross-virial-estimate')).toBe(false);
  });
});

describe('plan invariants', () => {
  it('property: cumulative targets strictly increase and end at the final pressure; increments are positive', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 0.2, noNaN: true }),
        fc.double({ min: 0.01, max: 0.3, noNaN: true }),
        fc.double({ min: 10, max: 8000, noNaN: true }),
        fc.double({ min: 260, max: 420, noNaN: true }),
        fc.constantFrom(['CH4', 'O2', 'Ar'], ['Ar', 'O2', 'CH4'], ['O2', 'CH4', 'Ar']),
        (xf, xo, PTorr, T, order) => {
          const x = { CH4: xf, O2: xo, Ar: 1 - xf - xo };
          const plan = planFill(pureInput(x, [...order], T, PTorr * TORR));
          const p = plan.steps.map((s) => s.targetPa);
          return (
            p.every((v, i) => i === 0 || v > p[i - 1]) &&
            Math.abs(p[p.length - 1] / (PTorr * TORR) - 1) < 1e-12 &&
            plan.steps.every((s) => s.incrementPa > 0 && s.bandPa > 0)
          );
        },
      ),
      { numRuns: 200 },
    );
  });

  it('the sum of amounts is the final amount, and mass follows the molar masses', () => {
    const plan = planFill(
      pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 1000 * TORR),
    );
    const sum = plan.steps.reduce((a, s) => a + s.amountMol, 0);
    expect(sum).toBeCloseTo(plan.final.amountMol, 12);
    expect(plan.steps[2].massKg / plan.steps[2].amountMol).toBeCloseTo(0.03995, 8);
  });

  it('each reading gets the gauge with the smallest uncertainty that covers it, and low-range heads are isolated first', () => {
    const plan = planFill(
      pureInput({ CH4: 0.002, O2: 0.004, Ar: 0.994 }, ['CH4', 'O2', 'Ar'], 298.15, 1500 * TORR),
    );
    expect(plan.steps.map((s) => s.gauge?.id)).toEqual(['h10', 'h10', 'h10k']);
    expect(plan.steps[2].isolateBefore.map((g) => g.id)).toEqual(['h10', 'h1k']);
    expect(plan.steps[0].isolateBefore).toEqual([]);
  });

  it('a reading beyond every gauge is a danger finding, not a silent choice', () => {
    const plan = planFill({
      ...pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 12000 * TORR),
    });
    expect(
      plan.findings.some((f) => f.code === 'no-gauge-covers' && f.severity === 'danger' && f.step === 3),
    ).toBe(true);
  });

  it('a final pressure over the tank working limit is a danger finding', () => {
    const input = pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 3 * 1e5);
    const plan = planFill({
      ...input,
      tank: { ...input.tank, ratedPressurePa: 3.2e5, workingFraction: 0.9 },
    });
    const f = plan.findings.find((x) => x.code === 'tank-over-rating');
    expect(f?.severity).toBe('danger');
  });

  it('tolerance band: CH4 first at 0.5 % relative gives +-0.5 % of its own partial pressure (the next fill makes good the error)', () => {
    const plan = planFill(
      pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 1000 * TORR),
    );
    // an error dn in CH4 is taken from O2 by the next cumulative target: limited by CH4 (0.5 % of 0.05 N)
    expect(plan.steps[0].bandPa / TORR).toBeCloseTo(0.005 * 50.04, 2);
    // the last fill moves every fraction by dn/N: 0.5 % of the total
    expect(plan.steps[2].bandPa / TORR).toBeCloseTo(0.005 * 1000, 0);
  });
});

describe('sources', () => {
  it('impurities of a cylinder appear in the filled composition; a premix fills two species in one step', () => {
    const design = designMixture({
      kind: 'phi',
      fuel: { CH4: 1 },
      oxidizer: { O2: 0.21, N2: 0.79 },
      diluent: {},
      phi: 1,
      basis: { kind: 'dilution', value: 0 },
    });
    const plan = planFill({
      design,
      finalPressurePa: 1e5,
      temperatureK: 296,
      tank: { id: 'T', label: 'T', volumeM3: 0.01 },
      sources: [
        pureCylinder({ id: 'ch4', species: 'CH4', purity: 0.999, impurities: { C2H6: 0.0005, N2: 0.0003 } }),
        premix({ id: 'air', composition: { O2: 0.21, N2: 0.79 } }),
      ],
      order: 'given',
      gauges: GAUGES,
      reading,
      tolerance: { relative: 0.005, absolute: 0 },
    });
    expect(plan.steps).toHaveLength(2);
    expect(plan.composition.C2H6).toBeGreaterThan(4e-5);
    expect(plan.unidentifiedFraction).toBeGreaterThan(1e-5);
    expect(Math.abs(plan.composition.CH4 / design.composition.CH4 - 1)).toBeLessThan(5e-3);
    expect(plan.findings.some((f) => f.code === 'impurity-present' && f.species === 'C2H6')).toBe(true);
  });

  it('gas already in the tank is counted: a top-up fills only the difference', () => {
    const base = pureInput({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 298.15, 1000 * TORR);
    const plan = planFill({
      ...base,
      inTank: { composition: { CH4: 0.05, O2: 0.1, Ar: 0.85 }, pressurePa: 400 * TORR },
    });
    expect(plan.initial!.pressurePa).toBeCloseTo(400 * TORR, 8);
    const added = plan.steps.reduce((a, s) => a + s.amountMol, 0) + plan.initial!.amountMol;
    expect(added).toBeCloseTo(plan.final.amountMol, 12);
    expect(plan.steps[0].targetPa).toBeGreaterThan(400 * TORR);
    expect(Math.abs(plan.composition.CH4 - 0.05)).toBeLessThan(1e-9);
  });
});
