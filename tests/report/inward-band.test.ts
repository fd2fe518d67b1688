import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { inwardBand } from '../../src/report/format.js';

// Torr = 101325/760 Pa exactly (definition of the torr, ISO 80000-4 / BIPM SI brochure)
const TORR = 101325 / 760;

describe('inwardBand: a printed band lies inside the true band (limits rounded toward the safe side, common practice)', () => {
  it('fill 1 of the demo recipe: 10.01276 +- 0.05 Torr at 0.01 prints 9.97 - 10.06, not 9.96 (9.9628 is below the step 9.97)', () => {
    expect(inwardBand(10.01276 * TORR, 0.05 * TORR, 'Torr', 2)).toEqual({ low: '9.97', high: '10.06' });
  });
  it('1890.16 +- 1.5 Torr at 0.1 prints 1888.7 - 1891.6, never 1891.7 (the end is 1891.66)', () => {
    expect(inwardBand(1890.16 * TORR, 1.5 * TORR, 'Torr', 1)).toEqual({ low: '1888.7', high: '1891.6' });
  });
  it('a band narrower than the display step has no printed ends', () => {
    expect(inwardBand(10.015 * TORR, 0.003 * TORR, 'Torr', 2)).toBeUndefined();
  });
  it('property: every value on the display steps between the printed ends is inside the true band (exact, no tolerance)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1e4, noNaN: true }),
        fc.double({ min: 1e-3, max: 50, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        (centerTorr, halfTorr, dec) => {
          const b = inwardBand(centerTorr * TORR, halfTorr * TORR, 'Torr', dec);
          if (!b) return;
          for (const text of [b.low, b.high]) {
            // the reading a lab member would type, converted as the fill converts it
            expect(Math.abs(Number(text) * TORR - centerTorr * TORR)).toBeLessThanOrEqual(halfTorr * TORR);
          }
          // and the printed ends are within one display step of the true ends (not needlessly narrow)
          const step = 10 ** -dec;
          expect(Number(b.low) - (centerTorr - halfTorr)).toBeLessThanOrEqual(step * (1 + 1e-6));
          expect(centerTorr + halfTorr - Number(b.high)).toBeLessThanOrEqual(step * (1 + 1e-6));
        },
      ),
    );
  });
});
