// The wizard refuses a final pressure above the tank's rating as `plan` does (core validate.ts: a tank is
// never filled past its rating, our rule after common practice), on the pressure field, with the
// refusal's own words; within the rating it plans. No outside reference: the demo lab's MT-1 rating
// (4 bar = 3000.25 Torr) against typed pressures on either side of it.
import { describe, expect, it } from 'vitest';
import { DEFAULTS } from '../../src/tui/wizard-state.js';
import { makeEvaluator } from '../../src/tui/wizard-eval.js';

const V = { ...DEFAULTS, id: 'wiz-rating', tank: 'MT-1', dilution: '0.98', temperature: '25 degC' };

describe('the wizard and the tank rating', () => {
  const evaluate = makeEvaluator();

  it('3500 Torr in MT-1: refused on the pressure field, nothing previewed', () => {
    const e = evaluate({ ...V, pressure: '3500 Torr' });
    expect(e.preview).toBeUndefined();
    expect(e.error?.field).toBe('pressure');
    expect(e.error?.message).toContain('is above the rating of tank MT-1');
    expect(e.error?.message).toContain('lower the final pressure');
  });

  it('1500 Torr in MT-1: planned (no error)', () => {
    const e = evaluate({ ...V, pressure: '1500 Torr' });
    expect(e.error).toBeUndefined();
    expect(e.preview).toBeDefined();
  });
});
