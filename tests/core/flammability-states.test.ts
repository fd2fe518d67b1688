/**
 * Final tank states with published flammability verdicts (tests/fixtures/reference/flammability-states.json):
 * each entry names its sources (NFPA 497 and IEC 60079-20-1 limits in air, Coward & Jones USBM
 * Bulletin 503 limits in O2, ASTM E2079 LOCs, Zabetakis USBM Bulletin 627; entries marked
 * from_memory rest on a recalled value). The review may be more cautious than the published
 * verdict but never less: no "non-flammable" or "near-limit" verdict on a flammable state, and no
 * danger finding on a state clearly outside the published limits.
 */
import { describe, expect, it } from 'vitest';
import {
  assessFlammability,
  blendLimits,
  describeFinding,
  envelopePolygon,
  insidePolygon,
  reviewState,
  richLimitCalibration,
  SOURCES,
  uflAtOxygenShare,
  type Fractions,
} from '../../src/core/index.js';
import { fixture } from '../helpers.js';

interface Entry {
  id: string;
  fuel: string;
  fuel_pct: number;
  in: 'air' | 'O2' | 'N2+O2';
  o2_pct?: number;
  pressure_kPa: number;
  published: 'flammable' | 'non-flammable';
  clearly: boolean;
  source: string[];
  from_memory: boolean;
  note: string;
}

const states = fixture<{ states: Entry[] }>('flammability-states.json').states;

function composition(e: Entry): Fractions {
  const x = e.fuel_pct / 100;
  if (e.in === 'air') return { [e.fuel]: x, O2: 0.21 * (1 - x), N2: 0.79 * (1 - x) };
  if (e.in === 'O2') return { [e.fuel]: x, O2: 1 - x };
  const o = e.o2_pct! / 100;
  return { [e.fuel]: x, O2: o, N2: 1 - x - o };
}

const T = 298.15;
/** a tank with a working limit of 3 bar absolute: the closed-vessel pressure of most of these states exceeds it */
const ctx = { temperatureK: T, tankId: 'T-ref', workingLimitPa: 3e5 };

describe('final states with published verdicts', () => {
  it('at least 60 states, each source key resolves, both verdicts and all seven fuels represented', () => {
    expect(states.length).toBeGreaterThanOrEqual(60);
    for (const e of states) for (const k of e.source) expect(SOURCES.has(k), `${e.id}: ${k}`).toBe(true);
    expect(new Set(states.map((e) => e.fuel))).toEqual(
      new Set(['H2', 'CH4', 'C2H4', 'C2H2', 'C3H8', 'CO', 'n-C7H16']),
    );
    for (const f of ['H2', 'CH4', 'C2H4', 'C3H8', 'CO']) {
      // both sides of LFL and UFL, in air and in O2
      const of = states.filter((e) => e.fuel === f);
      for (const where of ['air', 'O2'] as const) {
        expect(
          of.some((e) => e.in === where && e.published === 'flammable'),
          `${f} flammable in ${where}`,
        ).toBe(true);
        expect(
          of.filter((e) => e.in === where && e.published === 'non-flammable').length,
          `${f} outside in ${where}`,
        ).toBeGreaterThanOrEqual(where === 'air' ? 3 : 2);
      }
    }
  });

  it('0 false "safe" verdicts: every published-flammable state is judged flammable (the tolerance is exact: no margin)', () => {
    const falseSafe = states
      .filter((e) => e.published === 'flammable')
      .filter((e) => assessFlammability(composition(e), T, e.pressure_kPa * 1000).verdict !== 'flammable');
    expect(falseSafe.map((e) => e.id)).toEqual([]);
  });

  it('0 danger findings, and no flammable verdict, on states clearly outside the published limits (rich side and acetylene included)', () => {
    const clear = states.filter((e) => e.published === 'non-flammable' && e.clearly);
    expect(clear.length).toBeGreaterThanOrEqual(30);
    const dangers: string[] = [];
    const flagged: string[] = [];
    for (const e of clear) {
      const r = reviewState(
        { step: 2, composition: composition(e), pressurePa: e.pressure_kPa * 1000, final: true },
        ctx,
      );
      for (const f of r.findings) if (f.severity === 'danger') dangers.push(`${e.id}: ${f.code}`);
      if (r.flammability.verdict === 'flammable') flagged.push(e.id);
    }
    expect(dangers).toEqual([]);
    expect(flagged).toEqual([]);
  });

  it('states above the UFL in air and in O2 are judged on the rich side against the UFL calibration, not the LFL one', () => {
    for (const e of states.filter(
      (s) =>
        s.published === 'non-flammable' && s.clearly && s.note.startsWith('1.25 x the higher listed UFL'),
    )) {
      const a = assessFlammability(composition(e), T, e.pressure_kPa * 1000);
      expect(a.distance!.side, e.id).toBe('rich');
      expect(a.distance!.fuelOverUfl!, e.id).toBeGreaterThan(1);
      expect(a.richCalibration, e.id).not.toBe('none');
    }
  });
});

describe('degenerate envelope edges', () => {
  it('acetylene (LOC 0, UFL 100 % in air and in O2): no zero-length edge; 0.1 % C2H2 in air and 1 % in O2 lie below its LFL (2.3 %, IEC 60079-20-1) and are not flammable', () => {
    const l = blendLimits({ C2H2: 1 }, T, 101325);
    const poly = envelopePolygon(l);
    for (let i = 0; i < poly.length; i++) {
      const [a, b] = [poly[i], poly[(i + 1) % poly.length]];
      expect(Math.hypot(a[0] - b[0], a[1] - b[1]), `edge ${i}`).toBeGreaterThan(1e-9);
    }
    expect(assessFlammability({ C2H2: 0.001, O2: 0.21 * 0.999, N2: 0.79 * 0.999 }, T, 101325).verdict).toBe(
      'non-flammable',
    );
    expect(assessFlammability({ C2H2: 0.01, O2: 0.99 }, T, 101325).byEnvelope).not.toBe('flammable');
    // inside stays inside: stoichiometric C2H2-air (7.7 %, between 2.3 and 100 %)
    expect(
      assessFlammability({ C2H2: 0.0775, O2: 0.21 * 0.9225, N2: 0.79 * 0.9225 }, T, 101325).verdict,
    ).toBe('flammable');
  });
  it('any limits with a LOC of 0 and a UFL of 100 % give a polygon without repeated vertices, and a point far from it is outside', () => {
    const l = { lfl: 0.05, ufl: 1, uflO2: 1, loc: 0, z: 2, estimated: [], missing: [], sources: [] };
    const poly = envelopePolygon(l);
    expect(poly.length).toBe(4);
    expect(insidePolygon([0.001, 0.5], poly)).toBe(false);
    expect(insidePolygon([0.3, 0.3], poly)).toBe(true);
    // a zero-length edge handed in directly holds only its own point
    expect(
      insidePolygon(
        [0.001, 0.5],
        [
          [0.05, 0.95],
          [0.05, 0.2],
          [1, 0],
          [1, 0],
        ],
      ),
    ).toBe(false);
  });
});

describe('a LOC of 0 in a blend', () => {
  it('1 % C2H2 in the fuel no longer drags the blend LOC to 0: CH4 LOC 10.7 % (ASTM E2079) x 0.99 (our linear rule, exact), and 8 % of that fuel with 5 % O2 in N2 is not flammable; pure C2H2 keeps its LOC of 0', () => {
    expect(blendLimits({ CH4: 0.99, C2H2: 0.01 }, T, 101325).loc).toBeCloseTo(0.107 * 0.99, 12);
    expect(blendLimits({ C2H2: 1 }, T, 101325).loc).toBe(0);
    expect(assessFlammability({ CH4: 0.0792, C2H2: 0.0008, O2: 0.05, N2: 0.87 }, T, 101325).verdict).not.toBe(
      'flammable',
    );
  });
});

describe('rich-side calibration', () => {
  it('the rich-limit flame temperature reproduces the UFL it is calibrated on: CH4, C3H8, H2 in air at 0.98 x the IEC 60079-20-1 UFL flammable by flame temperature, at 1.02 x not (tolerance 2 % of the UFL)', () => {
    for (const [fuel, ufl] of [
      ['CH4', 0.17],
      ['C3H8', 0.109],
      ['H2', 0.77],
    ] as const) {
      expect(richLimitCalibration(fuel)!.air.ufl).toBe(ufl);
      const at = (x: number) =>
        assessFlammability({ [fuel]: x, O2: 0.21 * (1 - x), N2: 0.79 * (1 - x) }, T, 101325);
      expect(at(0.98 * ufl).byFlameTemperature, fuel).toBe('flammable');
      expect(at(1.02 * ufl).byFlameTemperature, fuel).not.toBe('flammable');
      expect(at(1.02 * ufl).distance!.side).toBe('rich');
    }
  });
  it('in O2 the calibration is the UFL in O2 (Coward & Jones: CH4 60.5 %, H2 95.8 %): 0.98 x flammable, 1.02 x not, by flame temperature', () => {
    for (const [fuel, ufl] of [
      ['CH4', 0.605],
      ['H2', 0.958],
    ] as const) {
      expect(richLimitCalibration(fuel)!.oxygen!.ufl).toBe(ufl);
      expect(
        assessFlammability({ [fuel]: 0.98 * ufl, O2: 1 - 0.98 * ufl }, T, 101325).byFlameTemperature,
        fuel,
      ).toBe('flammable');
      expect(
        assessFlammability(
          { [fuel]: Math.min(0.999, 1.02 * ufl), O2: 1 - Math.min(0.999, 1.02 * ufl) },
          T,
          101325,
        ).byFlameTemperature,
        fuel,
      ).not.toBe('flammable');
    }
  });
  it('acetylene has no rich calibration (UFL 100 %): its rich states are judged by the envelope alone', () => {
    expect(richLimitCalibration('C2H2')).toBeUndefined();
    expect(assessFlammability({ C2H2: 0.5, O2: 0.5 }, T, 101325).richCalibration).toBe('none');
  });
  it('the UFL at an oxygen share is the UFL in air at 0.21 and the UFL in O2 at 1 (IEC 60079-20-1 17 %; Coward & Jones 60.5 %, exact)', () => {
    const l = blendLimits({ CH4: 1 }, T, 101325);
    expect(uflAtOxygenShare(l, 0.21)).toBeCloseTo(0.17, 12);
    expect(uflAtOxygenShare(l, 1)).toBeCloseTo(0.605, 12);
    expect(uflAtOxygenShare(l, 0.02)).toBeUndefined(); // below the nose at the LOC
  });
});

describe('near-flammable wording says how far the state is from the region', () => {
  const say = (y: Fractions) => {
    const r = reviewState({ step: 1, composition: y, pressurePa: 101325, final: true }, ctx);
    const f = r.findings.find((x) => x.code === 'near-flammable');
    expect(f, JSON.stringify(y)).toBeDefined();
    return describeFinding(f!, (pa) => `${pa} Pa`);
  };
  it('lean: 3.5 % CH4 in air is "fuel at 0.80 x LFL (3.50 % against 4.40 %)" (IEC 60079-20-1 LFL 4.4 %)', () => {
    const m = say({ CH4: 0.035, O2: 0.21 * 0.965, N2: 0.79 * 0.965 });
    expect(m).toContain('not flammable but near');
    expect(m).toContain('fuel at 0.80 x LFL (3.50 % against 4.40 %)');
    expect(m).not.toContain('x LOC');
  });
  it('oxygen: 8 % CH4 with 9.5 % O2 in N2 is "O2 at 0.89 x LOC (9.50 % against 10.7 %)" (ASTM E2079 LOC 10.7 %)', () => {
    expect(say({ CH4: 0.08, O2: 0.095, N2: 0.825 })).toContain('O2 at 0.89 x LOC (9.50 % against 10.7 %)');
  });
  it('rich: 20 % CH4 in air is "fuel at 1.18 x the UFL at this O2 share (20.0 % against 17.0 %)" (IEC 60079-20-1 UFL 17 %)', () => {
    const m = say({ CH4: 0.2, O2: 0.21 * 0.8, N2: 0.79 * 0.8 });
    expect(m).toContain('fuel at 1.18 x the UFL at this O2 share (20.0 % against 17.0 %)');
    expect(m).not.toContain('x LFL');
  });
});

describe('the limit flame temperature is continuous across stoichiometric', () => {
  it('at phi = 1 -/+ 1e-6 the lean and rich thresholds agree within 0.01 K (both the nose calibration at the LOC, or the LFL one without a LOC), in air-like and O2-rich oxidizers', () => {
    for (const fuel of ['H2', 'CO', 'CH4', 'C2H4', 'C3H8', 'n-C7H16', 'CH3OH']) {
      for (const share of [0.15, 0.21, 0.5, 1]) {
        const at = (phi: number) => {
          // O2 = 0.1 of the mixture at oxygen share `share`, fuel set by phi
          const z = blendLimits({ [fuel]: 1 }, T, 101325).z;
          const o = 0.1;
          const f = (phi * o) / z;
          const n = o / share - o;
          const s = f + o + n;
          return assessFlammability({ [fuel]: f / s, O2: o / s, N2: n / s }, T, 101325);
        };
        const lean = at(1 - 1e-6);
        const rich = at(1 + 1e-6);
        expect(lean.distance!.side).toBe('lean');
        expect(rich.distance!.side).toBe('rich');
        expect(Math.abs(lean.limitFlameK! - rich.limitFlameK!), `${fuel} at O2 share ${share}`).toBeLessThan(
          0.01,
        );
      }
    }
  });
});
