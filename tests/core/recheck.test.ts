import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import {
  designMixture,
  evaluateUncertainty,
  inverseSetup,
  invertReadings,
  numericalTolerance,
  planFill,
  pureCylinder,
  R,
  xoshiro128ss,
  type Gauge,
} from '../../src/core/index.js';
import { fixture, TORR } from '../helpers.js';

const mixtures = fixture('mixture-plans-coolprop.json');
const head = (id: string, fsTorr: number, resTorr: number, acc = 0.0012): Gauge => ({
  id,
  label: id,
  reference: 'absolute',
  fullScalePa: fsTorr * TORR,
  minimumPa: 0,
  accuracyOfReading: acc,
  accuracyOfFullScale: 0,
  resolutionPa: resTorr * TORR,
  unit: 'Torr',
});
const GAUGES = [head('h10', 10, 1e-4), head('h1k', 1000, 0.01), head('h10k', 10000, 0.1)];

function planOf(x: Record<string, number>, order: string[], PTorr: number, purity = 1) {
  return planFill({
    design: designMixture({ kind: 'fractions', fractions: x }),
    finalPressurePa: PTorr * TORR,
    temperatureK: 298.15,
    tank: { id: 'T', label: 'T', volumeM3: 0.01 },
    sources: order.map((s) =>
      pureCylinder({
        id: s,
        species: s,
        purity,
        impurities: purity < 1 && s !== 'N2' ? { N2: (1 - purity) / 2 } : undefined,
      }),
    ),
    order: 'given',
    gauges: GAUGES,
    reading: { barometricPa: 101325, barometricUncertaintyPa: 40 },
    tolerance: { relative: 0.005, absolute: 0 },
  });
}

function invertPlan(plan: ReturnType<typeof planOf>) {
  const readings = plan.steps.map((s) => ({
    source: s.source,
    pressurePa: s.targetPa,
    temperatureK: plan.temperatureK,
  }));
  const setup = inverseSetup(readings);
  return {
    setup,
    res: invertReadings(
      setup,
      undefined,
      readings.map((r) => r.pressurePa),
    ),
  };
}

describe('inverse model', () => {
  it('round trip: the plan of properties.md 1.2 fed back as readings returns CH4 0.05, O2 0.10, Ar 0.85 to 1e-9', () => {
    const { setup, res } = invertPlan(planOf({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'O2', 'Ar'], 1000));
    const x = Object.fromEntries(setup.species.map((k, i) => [k, res.x[i]]));
    expect(Math.abs(x.CH4 - 0.05)).toBeLessThan(1e-9);
    expect(Math.abs(x.O2 - 0.1)).toBeLessThan(1e-9);
    expect(Math.abs(x.Ar - 0.85)).toBeLessThan(1e-9);
  });

  it('property: plan then re-check of a perfect log returns the planned composition (impurities included) for any design', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.002, max: 0.2, noNaN: true }),
        fc.double({ min: 0.01, max: 0.3, noNaN: true }),
        fc.double({ min: 20, max: 6000, noNaN: true }),
        fc.constantFrom(1, 0.999),
        (xf, xo, P, purity) => {
          const plan = planOf({ CH4: xf, O2: xo, N2: 1 - xf - xo }, ['CH4', 'N2', 'O2'], P, purity);
          const { setup, res } = invertPlan(plan);
          return (
            setup.species.every((k, i) => Math.abs(res.x[i] - (plan.composition[k] ?? 0)) < 1e-9) &&
            Math.abs(res.unidentified - plan.unidentifiedFraction) < 1e-9
          );
        },
      ),
      { numRuns: 60 },
    );
  });

  const readingsOf = (c: { order: string[]; readings: { pressure_Pa: number; temperature_K: number }[] }) =>
    c.readings.map((r, i) => ({
      source: pureCylinder({ id: c.order[i], species: c.order[i], purity: 1 }),
      pressurePa: r.pressure_Pa,
      temperatureK: r.temperature_K,
    }));
  const recovered = (c: { order: string[]; readings: { pressure_Pa: number; temperature_K: number }[] }) => {
    const rd = readingsOf(c);
    const setup = inverseSetup(rd);
    const res = invertReadings(
      setup,
      undefined,
      rd.map((r) => r.pressurePa),
    );
    return Object.fromEntries(setup.species.map((k, i) => [k, res.x[i]]));
  };
  const idealOf = (c: { order: string[]; readings: { pressure_Pa: number; temperature_K: number }[] }) => {
    let prev = 0;
    const n: Record<string, number> = {};
    let tot = 0;
    c.readings.forEach((r, i) => {
      const v = r.pressure_Pa / (R * r.temperature_K);
      n[c.order[i]] = v - prev;
      tot += v - prev;
      prev = v;
    });
    return Object.fromEntries(Object.entries(n).map(([k, v]) => [k, v / tot]));
  };

  // readings computed with the CoolProp 8.0 HEOS mixture model (scripts/reference/gen_mixture_plans.py)
  for (const id of [
    'ch4-o2-ar-1000torr',
    'h2-o2-ar-1500torr',
    'ch4-air-3bar',
    'c3h8-o2-n2-2bar',
    'ch4-o2-ar-drift',
  ]) {
    it(`${id}: fractions recovered from CoolProp readings within 2e-4 relative (Ar/N2-diluted, per-reading temperatures)`, () => {
      const c = mixtures.cases.find((x: { id: string }) => x.id === id);
      const x = recovered(c);
      for (const [k, truth] of Object.entries(c.composition as Record<string, number>))
        expect(Math.abs(x[k] / truth - 1), k).toBeLessThan(2e-4);
    });
  }

  it('c2h6-o2-he-ar-4bar: He-diluted case within 1e-3 (measured 955 ppm on He: the He-Ar cross coefficient, which the mixture model does not give as one number)', () => {
    const c = mixtures.cases.find((x: { id: string }) => x.id === 'c2h6-o2-he-ar-4bar');
    const x = recovered(c);
    for (const [k, truth] of Object.entries(c.composition as Record<string, number>))
      expect(Math.abs(x[k] / truth - 1), k).toBeLessThan(1e-3);
  });

  // measured RMS relative error of the fractions, ours / ideal gas: n-heptane 3 bar 50 / 1423 ppm,
  // C3H8-O2-Ar 5 bar 258 / 1426 ppm, CO2-rich 6 bar 276 / 4506 ppm
  for (const id of ['nc7h16-o2-n2-3bar', 'c3h8-o2-ar-5bar', 'co2-ch4-o2-ar-6bar', 'ch4-o2-co2-ar-5bar']) {
    it(`${id}: heavy fuel or CO2 at several bar - at least 70 % of the ideal-gas error removed (RMS over fractions), every fraction within 1e-3`, () => {
      const c = mixtures.cases.find((x: { id: string }) => x.id === id);
      const x = recovered(c);
      const xi = idealOf(c);
      let ours = 0;
      let ideal = 0;
      const comp = c.composition as Record<string, number>;
      for (const [k, truth] of Object.entries(comp)) {
        ours += (x[k] / truth - 1) ** 2;
        ideal += (xi[k] / truth - 1) ** 2;
        expect(Math.abs(x[k] / truth - 1), k).toBeLessThan(1e-3);
      }
      expect(Math.sqrt(ours)).toBeLessThan(0.3 * Math.sqrt(ideal));
    });
  }
});

describe('temperature derivative of the B matrix (for temperature terms of the budget)', () => {
  // reference: the CoolProp 8.0.0 table itself (src/core/data/virial-reference.json, cross-virial-reference.json),
  // secant slope between its first two and last two nodes; 10 % covers the curvature over one 10 K step
  const pure = JSON.parse(readFileSync('src/core/data/virial-reference.json', 'utf8'));
  it('near the table edges (230.2 and 479.8 K) dB/dT follows the table, not a mix of table and correlation', () => {
    const T: number[] = pure.temperatures_K;
    const b = pure.species.CH4.B as number[];
    const n = T.length;
    for (const [t, slope] of [
      [230.2, (b[1] - b[0]) / (T[1] - T[0])],
      [479.8, (b[n - 1] - b[n - 2]) / (T[n - 1] - T[n - 2])],
    ]) {
      const setup = inverseSetup([
        { source: pureCylinder({ id: 'c', species: 'CH4', purity: 1 }), pressurePa: 1e4, temperatureK: t },
      ]);
      const d = setup.dBdT[0][0] * 1e6;
      expect(Math.abs(d / slope - 1), `${t} K: ${d} vs ${slope} cm3/mol/K`).toBeLessThan(0.1);
    }
  });
});

describe('uncertainty (GUM and Monte Carlo)', () => {
  const settings = {
    barometricPa: 101325,
    barometricUncertaintyPa: 40,
    thermometerUncertaintyK: 0,
    thermometerResolutionK: 0,
    trials: 0,
    seed: 7,
  };

  it('two gases with independent reading errors: u(x1) matches the closed form of properties.md 1.3, u^2 = [u^2(P1) + x1^2 u^2(P2)] / P2^2, within 1 %', () => {
    // resolution only (no span), two different gauges so nothing is shared; Ar/He at low pressure (B terms negligible)
    const g1: Gauge = { ...head('a', 100, 0.02, 0), id: 'a' };
    const g2: Gauge = { ...head('b', 1000, 0.2, 0), id: 'b' };
    const P1 = 20 * TORR;
    const P2 = 400 * TORR;
    const r = evaluateUncertainty(
      [
        {
          step: 1,
          source: pureCylinder({ id: 'Ar', species: 'Ar', purity: 1 }),
          pressurePa: P1,
          temperatureK: 298.15,
          gauge: g1,
        },
        {
          step: 2,
          source: pureCylinder({ id: 'He', species: 'He', purity: 1 }),
          pressurePa: P2,
          temperatureK: 298.15,
          gauge: g2,
        },
      ],
      settings,
    );
    const u1 = (0.02 * TORR) / Math.sqrt(12);
    const u2 = (0.2 * TORR) / Math.sqrt(12);
    const x1 = P1 / P2;
    const closed = Math.sqrt(u1 ** 2 + x1 ** 2 * u2 ** 2) / P2;
    expect(Math.abs(r.composition.Ar.u / closed - 1)).toBeLessThan(0.01);
    expect(r.composition.Ar.value).toBeCloseTo(x1, 3);
  });

  it('a span error common to all readings of one gauge cancels in the fractions (properties.md 1.3)', () => {
    const g: Gauge = { ...head('one', 1000, 0, 0.0025) };
    const plan = planOf({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'Ar', 'O2'], 900);
    const r = evaluateUncertainty(
      plan.steps.map((s) => ({
        step: s.index,
        source: s.source,
        pressurePa: s.targetPa,
        temperatureK: 298.15,
        gauge: g,
      })),
      settings,
    );
    // only the tiny real-gas curvature remains: u(x_CH4) below 1e-3 of the value
    expect(r.composition.CH4.u / 0.05).toBeLessThan(1e-3);
  });

  it('Monte Carlo (2e5 trials, seeded) reproduces the GUM standard uncertainty within 2 % for the demo batch, and the same seed gives the same result', () => {
    const plan = planOf({ CH4: 0.05, O2: 0.1, Ar: 0.85 }, ['CH4', 'Ar', 'O2'], 1000);
    const readings = plan.steps.map((s) => ({
      step: s.index,
      source: s.source,
      pressurePa: s.targetPa,
      temperatureK: 298.15,
      gauge: GAUGES.find((g) => g.id === s.gauge!.id)!,
    }));
    const a = evaluateUncertainty(readings, {
      ...settings,
      thermometerUncertaintyK: 0.3,
      thermometerResolutionK: 0.1,
      trials: 200000,
    });
    for (const k of ['CH4', 'O2', 'Ar'])
      expect(Math.abs(a.composition[k].mc!.u / a.composition[k].u - 1), k).toBeLessThan(0.02);
    // the mean of a ratio carries a second-order bias of about u^2/value beside the sampling noise
    expect(Math.abs(a.phi!.mc!.mean - a.phi!.value)).toBeLessThan(
      (3 * a.phi!.u) / Math.sqrt(200000) + (2 * a.phi!.u ** 2) / a.phi!.value,
    );
    const b = evaluateUncertainty(readings, {
      ...settings,
      thermometerUncertaintyK: 0.3,
      thermometerResolutionK: 0.1,
      trials: 200000,
    });
    expect(b.phi!.mc!.u).toBe(a.phi!.mc!.u);
  });

  it('JCGM 101 numerical tolerance: u = 0.0023 (two digits) gives delta = 0.00005', () => {
    expect(numericalTolerance(0.0023)).toBeCloseTo(5e-5, 12);
    expect(numericalTolerance(1.5e-5)).toBeCloseTo(5e-7, 15);
  });

  it('the published treatment of cumulative readings (Weber, Sung & Renfro, Combust. Flame 2015): drawing each reading around the previous drawn one makes the partial pressures independent (sd sigma each); drawing each reading around its own nominal value, as a gauge does, gives sqrt(2) sigma for every fill after the first - and our GUM matches the latter', () => {
    // the published scheme, sigma = 346.6/2 Pa per reading, ideal gas, three fills
    const sigma = 346.6 / 2;
    const inc = [1000, 2000, 17000];
    const M = 100000;
    const rng = xoshiro128ss(11);
    const pub: number[][] = [[], [], []];
    const own: number[][] = [[], [], []];
    const ownPartial: number[][] = [[], [], []];
    for (let t = 0; t < M; t++) {
      let prevDraw = 0;
      let prevNominal = 0;
      const pp: number[] = [];
      const po: number[] = [];
      let lastOwn = 0;
      for (let k = 0; k < 3; k++) {
        const nominal = prevNominal + inc[k];
        const drawPub = prevDraw + inc[k] + rng.normal() * sigma;
        pp.push(drawPub - prevDraw);
        prevDraw = drawPub;
        const drawOwn = nominal + rng.normal() * sigma;
        po.push(drawOwn - lastOwn);
        lastOwn = drawOwn;
        prevNominal = nominal;
      }
      const so = po.reduce((a, b) => a + b, 0);
      for (let k = 0; k < 3; k++) {
        pub[k].push(pp[k]);
        ownPartial[k].push(po[k]);
        own[k].push(po[k] / so);
      }
    }
    const sd = (xs: number[]) => {
      const m = xs.reduce((a, b) => a + b, 0) / xs.length;
      return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
    };
    // partial pressures: the first fill is one draw around its nominal in both schemes (sd = sigma) ...
    expect(Math.abs(sd(ownPartial[0]) / sd(pub[0]) - 1)).toBeLessThan(0.02);
    expect(Math.abs(sd(pub[1]) / sigma - 1)).toBeLessThan(0.02);
    // ... the second is a difference of two independent readings in ours: sqrt(2) sigma
    expect(Math.abs(sd(ownPartial[1]) / sd(pub[1]) - Math.SQRT2)).toBeLessThan(0.03);
    // our GUM evaluation of the same case (independent readings, no span) matches our scheme, not the published one
    const g: Gauge = { ...head('g', 10000, 0, 0), resolutionPa: sigma * Math.sqrt(12) };
    const src = ['CH4', 'O2', 'Ar'].map((s) => pureCylinder({ id: s, species: s, purity: 1 }));
    const P = [1000, 3000, 20000];
    const r = evaluateUncertainty(
      src.map((s, i) => ({ step: i + 1, source: s, pressurePa: P[i], temperatureK: 298.15, gauge: g })),
      settings,
    );
    expect(Math.abs(r.composition.O2.u / sd(own[1]) - 1)).toBeLessThan(0.03);
  });

  it('the seeded generator: uniform mean 0.5 and variance 1/12, normal mean 0 and variance 1, within 4 standard errors over 1e5 draws', () => {
    const rng = xoshiro128ss(42);
    const n = 100000;
    let s = 0;
    let s2 = 0;
    let z = 0;
    let z2 = 0;
    for (let i = 0; i < n; i++) {
      const u = rng.next();
      s += u;
      s2 += u * u;
      const g = rng.normal();
      z += g;
      z2 += g * g;
    }
    expect(Math.abs(s / n - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(0.002);
    expect(Math.abs(z / n)).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(z2 / n - 1)).toBeLessThan(0.02);
  });
});
