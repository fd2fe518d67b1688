import { describe, expect, it } from 'vitest';
import { fromPa, parseQuantity, paPerUnit, toSI } from '../../src/io/quantity.js';
import { ProblemError, R } from '../../src/core/index.js';

const code = (f: () => unknown) => {
  try {
    f();
  } catch (e) {
    return e instanceof ProblemError ? e.problem.code : 'other';
  }
  return undefined;
};

describe('units, exact by definition', () => {
  it('1 Torr = 101325/760 Pa exactly (ISO 80000-4 / NIST SP 811); 760 Torr = 101325 Pa', () => {
    expect(parseQuantity('760 Torr', 'pressure')).toBe(101325);
    expect(parseQuantity('1 torr', 'pressure')).toBeCloseTo(101325 / 760, 12);
    expect(paPerUnit('Torr')).toBe(101325 / 760);
  });
  it('1 psi = 0.45359237 kg x 9.80665 m/s^2 / (0.0254 m)^2 = 6894.757293168 Pa (exact chain of definitions)', () => {
    expect(Math.abs(parseQuantity('1 psi', 'pressure') - 6894.757293168)).toBeLessThan(1e-6);
    expect(Math.abs(paPerUnit('psi') - 6894.757293168)).toBeLessThan(1e-6);
    expect(toSI(1, 'psi')).toBeCloseTo(paPerUnit('psi'), 9);
  });
  it('1 bar = 1e5 Pa, 1 atm = 101325 Pa, 1 mbar = 100 Pa (SI Brochure)', () => {
    expect(parseQuantity('1 bar', 'pressure')).toBe(1e5);
    expect(parseQuantity('1 atm', 'pressure')).toBe(101325);
    expect(parseQuantity('2.5 mbar', 'pressure')).toBeCloseTo(250, 12);
    expect(fromPa(1e5, 'bar')).toBe(1);
  });
  it('R = 8.314462618 J/(mol K) (CODATA 2018: N_A k, exact)', () => {
    expect(R).toBeCloseTo(8.314462618, 9);
    expect(R).toBeCloseTo(6.02214076e23 * 1.380649e-23, 12);
  });
  it('offset temperatures are converted, not scaled: 25 degC = 298.15 K, 32 degF = 273.15 K', () => {
    expect(parseQuantity('25 degC', 'temperature')).toBeCloseTo(298.15, 10);
    expect(parseQuantity('32 degF', 'temperature')).toBeCloseTo(273.15, 10);
    expect(parseQuantity('300 K', 'temperature')).toBe(300);
  });
  it('volumes: 30 L = 0.03 m^3, 500 cm^3 = 5e-4 m^3', () => {
    expect(parseQuantity('30 L', 'volume')).toBeCloseTo(0.03, 15);
    expect(parseQuantity('500 cm^3', 'volume')).toBeCloseTo(5e-4, 15);
  });
  it('refuses a bare number, the wrong dimension, and text that is no quantity', () => {
    expect(code(() => parseQuantity('1000', 'pressure'))).toBe('bad-quantity');
    expect(code(() => parseQuantity('30 L', 'pressure'))).toBe('wrong-dimension');
    expect(code(() => parseQuantity('1500 Torr', 'temperature'))).toBe('wrong-dimension');
    expect(code(() => parseQuantity('lots', 'pressure'))).toBe('bad-quantity');
    expect(code(() => parseQuantity('10 furlongs', 'volume'))).toBe('bad-quantity');
  });
});

describe('fast path for common units', () => {
  it('every fast-path unit gives what mathjs (our instance, exact Torr and psi) gives, to 1e-12 relative', async () => {
    const { FAST_UNITS, mathjs } = await import('../../src/io/quantity.js');
    const SI: Record<string, string> = {
      pressure: 'Pa',
      temperature: 'K',
      volume: 'm^3',
      time: 's',
      mass: 'kg',
      length: 'm',
      'pressure rate': 'Pa/s',
    };
    for (const [u, def] of Object.entries(FAST_UNITS)) {
      for (const v of [0, 1, 22.5, -3.25e2, 1e4]) {
        if (def.dim === 'temperature' && (v < -273 || (u === 'K' && v < 1))) continue; // below 1 K is refused
        const ours = parseQuantity(`${v} ${u}`, def.dim);
        const theirs = mathjs().unit(`${v} ${u}`).toNumber(SI[def.dim]);
        expect(Math.abs(ours - theirs), `${v} ${u}`).toBeLessThanOrEqual(
          1e-12 * Math.max(1, Math.abs(theirs)),
        );
      }
    }
  });
  it('units outside the fast path still parse through mathjs', () => {
    expect(parseQuantity('1 mmHg', 'pressure')).toBeCloseTo(133.322, 3); // mathjs' conventional mmHg
    expect(parseQuantity('2 ft^3', 'volume')).toBeCloseTo(2 * 0.3048 ** 3, 12);
    expect(parseQuantity('1e-4 Torr/min', 'pressure rate')).toBeCloseTo((1e-4 * 101325) / 760 / 60, 15);
  });
});
