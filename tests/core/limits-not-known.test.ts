/**
 * A fuel without limit data in the findings' words: no "LFL Infinity %" or "UFL NaN %". Every
 * fuel mixwright knows has limit data, so this file removes the record of H2 from the safety
 * table (test only; the demo H2 cylinder has no listed impurity, so no other fuel is present).
 */
import { describe, expect, it, vi } from 'vitest';

vi.mock('../../src/core/data/safety-data.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../../src/core/data/safety-data.js')>();
  const FUEL_SAFETY = new Map(real.FUEL_SAFETY);
  FUEL_SAFETY.delete('H2');
  return { ...real, FUEL_SAFETY };
});

const { describeFinding, FUEL_SAFETY, reviewState } = await import('../../src/core/index.js');
const { runCli } = await import('../helpers.js');

const pa = (x: number) => `${x} Pa`;

describe('limits of a fuel without data are "not known", never Infinity or NaN', () => {
  it('this file has no H2 record', () => {
    expect(FUEL_SAFETY.has('H2')).toBe(false);
  });

  it('a stoichiometric H2/O2 state in Ar: the flammability finding says LFL, LOC and UFL are not known', () => {
    const r = reviewState(
      { step: 3, composition: { H2: 0.02, O2: 0.01, Ar: 0.97 }, pressurePa: 2e5, final: true },
      { temperatureK: 298.15, tankId: 'T' },
    );
    const words = r.findings.map((f) => describeFinding(f, pa)).join('\n');
    const flam = r.findings.find((f) => f.code === 'flammable-mixture' || f.code === 'near-flammable');
    expect(flam).toBeDefined();
    expect(words).not.toMatch(/Infinity|NaN/);
    expect(flam!.code).toBe('flammable-mixture');
    expect(words).toContain('on the N2-equivalent diagram; LFL not known; LOC not known; by envelope)');
  });

  it('plan, plan --json and the text sheet of an H2 batch carry no Infinity or NaN in their findings', async () => {
    const args = ['recipes/ch4-o2-ar-phi1.yaml', '--fuel', 'H2'];
    for (const cmd of [['plan'], ['plan', '--json'], ['sheet', '--format', 'md']]) {
      const r = await runCli([...cmd, ...args]);
      expect(r.code, r.stderr).toBe(3);
      const findings = r.stdout.split('\n').filter((l) => /flammable|LFL/.test(l) && !/Hatched/.test(l));
      expect(findings.length).toBeGreaterThan(0);
      for (const l of findings) expect(l).not.toMatch(/Infinity|NaN/);
      expect(r.stdout).toContain('LFL not known');
    }
  });
});
