/**
 * Final tank states with published flammability verdicts (tests/fixtures/reference/flammability-states.json):
 * each entry names its sources (NFPA 497 and IEC 60079-20-1 limits in air, Coward & Jones USBM
 * Bulletin 503 limits in O2, ASTM E2079 LOCs, Zabetakis USBM Bulletin 627; entries marked
 * from_memory rest on a recalled value). The review may be more cautious than the published
 * verdict but never less: no "non-flammable" or "near-limit" verdict on a flammable state, and no
 * danger finding on a state clearly outside the published limits.
 */
import { describe, expect, it } from 'vitest';
import { assessFlammability, reviewState, SOURCES, type Fractions } from '../../src/core/index.js';
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
    expect(new Set(states.map((e) => e.fuel))).toEqual(new Set(['H2', 'CH4', 'C2H4', 'C2H2', 'C3H8', 'CO', 'n-C7H16']));
    for (const f of ['H2', 'CH4', 'C2H4', 'C3H8', 'CO']) {
      // both sides of LFL and UFL, in air and in O2
      const of = states.filter((e) => e.fuel === f);
      for (const where of ['air', 'O2'] as const) {
        expect(of.some((e) => e.in === where && e.published === 'flammable'), `${f} flammable in ${where}`).toBe(true);
        expect(of.filter((e) => e.in === where && e.published === 'non-flammable').length, `${f} outside in ${where}`).toBeGreaterThanOrEqual(where === 'air' ? 3 : 2);
      }
    }
  });

  it('0 false "safe" verdicts: every published-flammable state is judged flammable (the tolerance is exact: no margin)', () => {
    const falseSafe = states.filter((e) => e.published === 'flammable').filter((e) => assessFlammability(composition(e), T, e.pressure_kPa * 1000).verdict !== 'flammable');
    expect(falseSafe.map((e) => e.id)).toEqual([]);
  });

  it('0 danger findings, and no flammable verdict, on states clearly outside the published limits (rich side and acetylene included)', () => {
    const clear = states.filter((e) => e.published === 'non-flammable' && e.clearly);
    expect(clear.length).toBeGreaterThanOrEqual(30);
    const dangers: string[] = [];
    const flagged: string[] = [];
    for (const e of clear) {
      const r = reviewState({ step: 2, composition: composition(e), pressurePa: e.pressure_kPa * 1000, final: true }, ctx);
      for (const f of r.findings) if (f.severity === 'danger') dangers.push(`${e.id}: ${f.code}`);
      if (r.flammability.verdict === 'flammable') flagged.push(e.id);
    }
    expect(dangers).toEqual([]);
    expect(flagged).toEqual([]);
  });

  it('states above the UFL in air and in O2 are judged on the rich side against the UFL calibration, not the LFL one', () => {
    for (const e of states.filter((s) => s.published === 'non-flammable' && s.clearly && s.note.startsWith('1.25 x the higher listed UFL'))) {
      const a = assessFlammability(composition(e), T, e.pressure_kPa * 1000);
      expect(a.distance!.side, e.id).toBe('rich');
      expect(a.distance!.fuelOverUfl!, e.id).toBeGreaterThan(1);
      expect(a.richCalibration, e.id).not.toBe('none');
    }
  });
});
