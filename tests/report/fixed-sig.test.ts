// Significant digits of printed numbers: counted on the printed value, so that the same quantity prints
// with the same digits whichever side of a power of ten its last bits fall (the re-check's phi of an
// exact design is 1 to within 1e-15, above or below). Formatting only: no outside reference needed
// beyond the rule itself (6 significant digits of 1 are 1.00000).
import { describe, expect, it } from 'vitest';
import { fixedSig } from '../../src/report/format.js';

describe('fixedSig', () => {
  it('prints a value just below a power of ten with the digits of the power it rounds to', () => {
    expect(fixedSig(0.9999999999999998, 6)).toBe('1.00000');
    expect(fixedSig(1.0000000000000002, 6)).toBe('1.00000');
    expect(fixedSig(0.00009999999, 2)).toBe('0.00010');
    expect(fixedSig(0.0001, 2)).toBe('0.00010');
  });
  it('keeps the digits of values that do not round up to the next power', () => {
    expect(fixedSig(0.0275, 6)).toBe('0.0275000');
    expect(fixedSig(0.999994, 6)).toBe('0.999994');
    expect(fixedSig(-0.99999999, 3)).toBe('-1.00');
    expect(fixedSig(1234.5678, 6)).toBe('1234.57');
  });
});
