// A premix tank's falling pressure as it delivers, and the two-stage delivery check on both sides of its limit.
import { describe, expect, it } from 'vitest';
import {
  planTwoStage,
  premixDelivery,
  premixDeliveryCheck,
  premixStartForEndPa,
  PREMIX_DELIVERY_MARGIN,
  type TwoStagePlan,
} from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { fixture, TORR } from '../helpers.js';

interface Case {
  composition: Record<string, number>;
  volume_m3: number;
  temperature_K: number;
  start_Pa: number;
  delivered_mol: number;
  start_amount_mol: number;
  end_Pa: number;
}
const ref = fixture<{ source: string; cases: Case[] }>('premix-delivery-coolprop.json');

describe('premixDelivery: settled end pressure against CoolProp 8.0.0 (HEOS Ar-O2 mixture)', () => {
  it.each(ref.cases)('$composition.O2 O2 in Ar, $start_Pa Pa, $delivered_mol mol drawn', (c) => {
    const d = premixDelivery({
      composition: c.composition,
      volumeM3: c.volume_m3,
      temperatureK: c.temperature_K,
      startPa: c.start_Pa,
      deliveredMol: c.delivered_mol,
    });
    // the virial model against the reference EOS up to 6 bar: 0.02 % on amount and pressure
    expect(Math.abs(d.startAmountMol / c.start_amount_mol - 1)).toBeLessThan(2e-4);
    expect(Math.abs(d.endPa / c.end_Pa - 1)).toBeLessThan(2e-4);
    // a fast delivery leaves the gas colder, so lower, than settled (ideal-gas adiabat: identity of sign)
    expect(d.endFastK).toBeLessThan(c.temperature_K);
    expect(d.endFastPa).toBeLessThan(d.endPa);
  });

  it('the doc example: 30.2 L of 1.342 % O2 in Ar at 4500 Torr, 0.8 mol drawn, settles at 4010.9 Torr', () => {
    const c = ref.cases[0];
    const d = premixDelivery({
      composition: c.composition,
      volumeM3: c.volume_m3,
      temperatureK: c.temperature_K,
      startPa: c.start_Pa,
      deliveredMol: c.delivered_mol,
    });
    // CoolProp 8.0.0: 7.336 mol, 534741 Pa = 4010.8 Torr; the comment's rounding, 0.1 %
    expect(d.startAmountMol).toBeCloseTo(7.336, 2);
    expect(Math.abs(d.endPa / TORR / 4010.8 - 1)).toBeLessThan(1e-3);
  });

  it('a tank asked for more than it holds runs empty (identity)', () => {
    const d = premixDelivery({
      composition: { Ar: 1 },
      volumeM3: 0.01,
      temperatureK: 298.15,
      startPa: 1e5,
      deliveredMol: 1,
    });
    expect(d.endPa).toBe(0);
    expect(d.endAmountMol).toBe(0);
  });
});

describe('premixStartForEndPa: the start pressure a delivery needs, against CoolProp 8.0.0 (HEOS Ar-O2 mixture)', () => {
  it.each(ref.cases)(
    '$composition.O2 O2 in Ar: the start of $delivered_mol mol drawn to its settled end',
    (c) => {
      const start = premixStartForEndPa({
        composition: c.composition,
        volumeM3: c.volume_m3,
        temperatureK: c.temperature_K,
        endPa: c.end_Pa,
        deliveredMol: c.delivered_mol,
      });
      // the reference EOS's start of the same delivery, the virial model's 0.02 % (as premixDelivery above)
      expect(Math.abs(start / c.start_Pa - 1)).toBeLessThan(2e-4);
      // and premixDelivery from that start ends where asked (round trip of our own model, 1e-9 relative)
      const back = premixDelivery({
        composition: c.composition,
        volumeM3: c.volume_m3,
        temperatureK: c.temperature_K,
        startPa: start,
        deliveredMol: c.delivered_mol,
      });
      expect(Math.abs(back.endPa / c.end_Pa - 1)).toBeLessThan(1e-9);
    },
  );
});

describe('the delivery check on both sides of its limit (demo batch ch4-o2-ar-phi1 with a premix in MT-2)', () => {
  const req = buildPlanRequest(readRecipe('recipes/ch4-o2-ar-phi1.yaml'));
  const mt2 = req.lab.tanks.find((t) => t.id === 'MT-2')!;
  const thermometer = { uK: 0.3, resolutionK: 0.1, settlingK: 0.05 };
  const two: TwoStagePlan = planTwoStage({
    batch: req.input,
    premixTank: mt2,
    thermometer,
    premixSpecies: ['O2'],
    premixPressurePa: 3000 * TORR,
  });
  const { delivery } = two;
  /** the start pressure whose settled end is exactly the required pressure, by bisection on premixDelivery */
  const limit = (() => {
    let lo = delivery.requiredPa;
    let hi = 10 * delivery.requiredPa;
    for (let i = 0; i < 80; i++) {
      const mid = (lo + hi) / 2;
      const end = premixDelivery({
        composition: two.source.composition,
        volumeM3: mt2.volumeM3,
        temperatureK: req.input.temperatureK,
        startPa: mid,
        deliveredMol: delivery.deliveredMol,
      }).endPa;
      if (end < delivery.requiredPa) lo = mid;
      else hi = mid;
    }
    return hi;
  })();

  it('premixStartForEndPa at the required end is the bisection limit of premixDelivery (identity, 1e-9 relative)', () => {
    const start = premixStartForEndPa({
      composition: two.source.composition,
      volumeM3: mt2.volumeM3,
      temperatureK: req.input.temperatureK,
      endPa: delivery.requiredPa,
      deliveredMol: delivery.deliveredMol,
    });
    expect(Math.abs(start / limit - 1)).toBeLessThan(1e-9);
  });

  it('the required end pressure is the target of the last premix charge plus the margin (identity)', () => {
    const last = two.batch.steps.filter((s) => s.source.id === two.source.id).at(-1)!;
    expect(delivery.targetPa).toBe(last.targetPa);
    expect(delivery.requiredPa).toBeCloseTo(last.targetPa * (1 + PREMIX_DELIVERY_MARGIN), 6);
  });

  it('0.1 % above the limit: no premix-runs-low; 0.1 % below: a danger with the numbers', () => {
    const above = premixDeliveryCheck(two.batch, two.source, mt2, limit * 1.001);
    expect(above.findings.filter((f) => f.code === 'premix-runs-low')).toEqual([]);
    const below = premixDeliveryCheck(two.batch, two.source, mt2, limit * 0.999);
    const f = below.findings.find((x) => x.code === 'premix-runs-low');
    expect(f?.severity).toBe('danger');
    if (f?.code !== 'premix-runs-low') throw new Error('no finding');
    expect(f.tank).toBe('MT-2');
    expect(f.endPa).toBeLessThan(f.requiredPa);
    expect(f.startPa).toBeCloseTo(limit * 0.999, 3);
    expect(f.deliveredMol).toBeCloseTo(delivery.deliveredMol, 12);
  });

  it('a premix pressure too low for every choice: the plan carries premix-runs-low (danger, exit 3 in the shell)', () => {
    const low = planTwoStage({
      batch: req.input,
      premixTank: mt2,
      thermometer,
      premixSpecies: ['O2'],
      premixPressurePa: 120 * TORR,
    });
    const f = low.batch.findings.find((x) => x.code === 'premix-runs-low');
    expect(f?.severity).toBe('danger');
  });
});
