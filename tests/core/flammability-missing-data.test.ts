/**
 * The branch of assessFlammability for a fuel without limit data. Every fuel mixwright knows has
 * limit data, so this file removes the record of CH4 from the safety table (test only): CH4 is
 * then a real fuel without limits, and the review must not call any state of it non-flammable.
 */
import { describe, expect, it, vi } from 'vitest';

vi.mock('../../src/core/data/safety-data.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/core/data/safety-data.js')>();
  const FUEL_SAFETY = new Map(real.FUEL_SAFETY);
  FUEL_SAFETY.delete('CH4');
  return { ...real, FUEL_SAFETY };
});

const { assessFlammability, describeFinding, FUEL_SAFETY, reviewState } =
  await import('../../src/core/index.js');

const air = (fuel: Record<string, number>) => {
  const f = Object.values(fuel).reduce((a, b) => a + b, 0);
  return { ...fuel, O2: 0.21 * (1 - f), N2: 0.79 * (1 - f) };
};

describe('a fuel without limit data is never judged non-flammable (CH4 limits removed for this file)', () => {
  it('the table of this file has no CH4 record, and H2 keeps its own', () => {
    expect(FUEL_SAFETY.has('CH4')).toBe(false);
    expect(FUEL_SAFETY.has('H2')).toBe(true);
  });

  it('stoichiometric CH4-air (flammable: IEC 60079-20-1 lists 4.4-17 % CH4 in air) is not judged non-flammable; CH4 is listed as missing', () => {
    const a = assessFlammability(air({ CH4: 1 / 10.5238 }), 298.15, 101325);
    expect(a.limits!.missing).toEqual(['CH4']);
    expect(a.limitFlameK).toBeUndefined(); // no calibration without limits
    expect(a.verdict).not.toBe('non-flammable');
  });

  it('0.5 % CH4 + 0.5 % H2 in air: both methods say non-flammable on the data of H2 alone, and the missing-data rule raises it to near-limit', () => {
    // 1 % fuel is far below the blend's LFL (Le Chatelier with 4.0 % for H2, NFPA 497, and 4.4 % for CH4,
    // IEC 60079-20-1: 4.19 %), so non-flammable is right on the data; without CH4's limits it cannot be said
    const y = air({ CH4: 0.005, H2: 0.005 });
    const a = assessFlammability(y, 298.15, 101325);
    expect(a.limits!.missing).toEqual(['CH4']);
    expect(a.byEnvelope).toBe('non-flammable');
    expect(a.byFlameTemperature).toBe('non-flammable');
    expect(a.verdict).toBe('near-limit');
    // the same H2 without the CH4 is judged non-flammable: only the fuel without data raised the verdict
    expect(assessFlammability(air({ H2: 0.005 }), 298.15, 101325).verdict).toBe('non-flammable');
  });

  it('the review reports that state with a note that says why, not as non-flammable', () => {
    const r = reviewState(
      { step: 1, composition: air({ CH4: 0.005, H2: 0.005 }), pressurePa: 101325, final: true },
      { temperatureK: 298.15, tankId: 'T' },
    );
    const f = r.findings.find((x) => x.code === 'near-flammable');
    expect(f).toMatchObject({ severity: 'note', missingData: true });
    expect(describeFinding(f!, (pa) => `${pa} Pa`)).toMatch(
      /no flammability limits on file for a fuel it holds/,
    );
  });

  it('a state with no oxygen stays non-flammable even with the fuel missing (nothing to burn with)', () => {
    const a = assessFlammability({ CH4: 0.5, N2: 0.5 }, 298.15, 101325);
    expect(a.verdict).toBe('non-flammable');
  });
});
