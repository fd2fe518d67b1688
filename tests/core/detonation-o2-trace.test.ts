// Detonation limits published in O2 only (CH4: 8.3-55 % in O2, Kuchta, USBM Bulletin 680, 1985, values
// from memory, data/detonation-data.ts) apply to O2 with a trace of inert: the ppm of N2 a cylinder
// of O2 carries must not switch them off for "our conservative rule where no detonation limits are
// on file" (a trial found the plan of `--order CH4,O2,Ar` saying so while `species CH4` lists them).
// O2 diluted past a trace (under 99 % of O2 + inert, thresholds.ts: our choice) is judged, inside
// the limits in O2, by the conservative rule, and says that limits are on file in pure O2 only.
// References: the limits turned into equivalence ratios by phi = 2 x / (1 - x) for CH4 in O2 (exact
// stoichiometry, CH4 + 2 O2), compared within 1e-9.
import { describe, expect, it } from 'vitest';
import { describeFinding, detonability, reviewState, type Finding } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import { planFill } from '../../src/core/index.js';

const torr = (pa: number) => `${((pa * 760) / 101325).toFixed(3)} Torr`;
const phiInO2 = (x: number) => (2 * x) / (1 - x);
/** stoichiometric CH4/O2 with `n2` (mole fraction) of N2 */
const ch4o2 = (n2: number) => ({ CH4: (1 - n2) / 3, O2: (2 * (1 - n2)) / 3, N2: n2 });

function detonable(composition: Record<string, number>): Extract<Finding, { code: 'detonable-state' }> {
  const f = reviewState(
    { step: 2, composition, pressurePa: 4000, final: false },
    { temperatureK: 295.15, tankId: 'T', workingLimitPa: 360000 },
  ).findings.find((x) => x.code === 'detonable-state');
  if (f?.code !== 'detonable-state') throw new Error('no detonable-state finding');
  return f;
}

describe('detonation limits in O2 only: a trace of inert keeps them, O2 diluted further says so', () => {
  it('CH4/O2 with 17 ppm N2 (cylinder impurity): detonable by the published limits in O2, said so', () => {
    const d = detonability(ch4o2(17e-6));
    expect(d.detonable).toBe(true);
    expect(d.basis).toBe('published-limits');
    expect(Math.abs(d.limits!.phiLow - phiInO2(0.083))).toBeLessThan(1e-9);
    expect(Math.abs(d.limits!.phiHigh - phiInO2(0.55))).toBeLessThan(1e-9);
    const f = detonable(ch4o2(17e-6));
    expect(f.severity).toBe('danger');
    expect(f.limitsIn).toEqual(['O2']);
    const text = describeFinding(f, torr);
    expect(text).toContain(
      'inside the published detonation limits in O2 (equivalence ratio 1.00 within 0.18-2.44',
    );
    expect(text).toContain(
      'kuchta-1985-memory, recalled values; with 0.00170 % N2-equivalent inert, a trace)',
    );
    expect(text).not.toMatch(/no detonation limits are on file/);
  });

  it('pure CH4/O2: the published limits, with no trace clause', () => {
    const text = describeFinding(detonable(ch4o2(0)), torr);
    expect(text).toContain('inside the published detonation limits in O2 (');
    expect(text).not.toContain('a trace');
  });

  it('CH4/O2 with 30 % N2 (O2 share 0.49): the conservative rule, saying the limits on file are for pure O2 only', () => {
    const d = detonability(ch4o2(0.3));
    expect(d.detonable).toBe(true);
    expect(d.basis).toBe('inert-rule');
    const text = describeFinding(detonable(ch4o2(0.3)), torr);
    expect(text).toContain(
      'with 30.0 % N2-equivalent inert, by our conservative rule where limits are on file for this fuel in pure O2 only',
    );
    expect(text).not.toMatch(/no detonation limits are on file/);
  });

  it('a fuel with no limits on file (C2H6) keeps the plain conservative-rule wording', () => {
    const f = detonable({ C2H6: 2 / 9, O2: 7 / 9 });
    expect(f.basis).toBe('inert-rule');
    expect(describeFinding(f, torr)).toContain(
      'where no detonation limits are on file for this fuel in this oxidizer',
    );
  });

  it('the demo recipe in the order CH4, O2, Ar: fill 2 is detonable by the limits in O2, still a danger', () => {
    const rs = readRecipe('recipes/ch4-o2-ar-phi1.yaml');
    const req = buildPlanRequest({ ...rs, recipe: { ...rs.recipe, order: ['CH4', 'O2', 'Ar'] } });
    const f = planFill(req.input).findings.find((x) => x.code === 'detonable-state' && x.step === 2);
    if (f?.code !== 'detonable-state') throw new Error('no detonable-state at fill 2');
    expect(f.severity).toBe('danger');
    expect(f.basis).toBe('published-limits');
    expect(describeFinding(f, torr)).toMatch(
      /undiluted fuel\/O2 at [\d.]+ Torr, inside the published detonation limits in O2/,
    );
  });
});
