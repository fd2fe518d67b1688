/**
 * Sources as asked: an order that names gases one by one fills each from its single-gas
 * cylinder; without an order a premix taken in place of single gases is stated, with the
 * composition change it causes; split orders reach the planner and plan end to end.
 */
import { describe, expect, it } from 'vitest';
import { describeFinding, type Finding } from '../../src/core/index.js';
import { planFrom } from '../../src/cli/plan-from.js';
import { runCli } from '../helpers.js';

const NG = 'recipes/ng-blend-air.yaml';
type InPlace = Extract<Finding, { code: 'premix-in-place' }>;
const inPlace = (fs: readonly Finding[]) => fs.filter((f): f is InPlace => f.code === 'premix-in-place');
const torrText = (pa: number) => `${pa} Pa`;

describe('ng-blend-air: the air cylinder, stated; the gases named one by one: single cylinders', () => {
  it('without an order it fills from cyl-air as the demo intends, and the plan says so with the numbers', () => {
    const { plan, req } = planFrom(NG, {});
    expect(plan.steps.map((s) => s.source.id)).toEqual(['cyl-C2H6', 'cyl-CH4', 'cyl-air']);
    expect(req.premixInPlace.map((s) => s.id)).toEqual(['cyl-air']);
    const [f] = inPlace(plan.findings);
    expect(f).toMatchObject({ severity: 'note', source: 'cyl-air', gases: ['N2', 'O2'] });
    // design: CH4 0.9 / C2H6 0.1 at phi 0.8 in air: stoichiometric O2 per mol fuel 0.9 x 2 + 0.1 x 3.5
    // = 2.15 (c + h/4), O2 = 2.15/0.8 per fuel, N2 = O2 x 79/21; x(O2) = 2.6875 / (1 + 2.6875/0.21)
    // by hand = 0.1947802; to 1e-9 relative
    const xO2 = 2.6875 / (1 + 2.6875 / 0.21);
    const o2 = f.changes.find((c) => c.species === 'O2')!;
    const n2 = f.changes.find((c) => c.species === 'N2')!;
    expect(o2.design / xO2 - 1).toBeCloseTo(0, 9);
    expect(n2.design / ((xO2 * 79) / 21) - 1).toBeCloseTo(0, 9);
    // filled: the plan's own composition (with every cylinder's impurities, < 1e-5 relative here)
    expect(o2.filled).toBe(plan.composition.O2);
    expect(n2.filled).toBe(plan.composition.N2);
    expect(Math.abs(o2.filled / o2.design - 1)).toBeLessThan(1e-5);
    expect(f.order).toEqual(['C2H6', 'CH4', 'N2', 'O2']);
    const text = describeFinding(f, torrText);
    expect(text).toContain('cyl-air, synthetic air (certified 21.0 % O2 in N2), fills N2 and O2 together');
    expect(text).toContain(`x(O2) ${o2.design.toPrecision(6)} designed, ${o2.filled.toPrecision(6)} filled`);
    expect(text).toContain('--order C2H6,CH4,N2,O2');
  });

  it('--order CH4,C2H6,O2,N2 plans with four single-gas cylinders (once refused: "names N2 more than once")', async () => {
    const { plan, req } = planFrom(NG, { order: 'CH4,C2H6,O2,N2' });
    expect(req.input.sources.map((s) => s.id)).toEqual(['cyl-CH4', 'cyl-C2H6', 'cyl-O2', 'cyl-N2']);
    expect(req.input.charges).toBeUndefined();
    expect(plan.steps.map((s) => s.source.id)).toEqual(['cyl-CH4', 'cyl-C2H6', 'cyl-O2', 'cyl-N2']);
    expect(req.premixInPlace).toEqual([]);
    expect(inPlace(plan.findings)).toEqual([]);
    // O2 straight onto the fuel: the review says so (danger, exit 3), it is not refused
    const r = await runCli(['plan', NG, '--order', 'CH4,C2H6,O2,N2', '--json']);
    expect(r.code, r.stderr).toBe(3);
    const j = JSON.parse(r.stdout) as { steps: { source: string }[]; findings: { code: string }[] };
    expect(j.steps.map((s) => s.source)).toEqual(['cyl-CH4', 'cyl-C2H6', 'cyl-O2', 'cyl-N2']);
    expect(j.findings.map((x) => x.code)).toContain('detonable-state');
  });

  it('an order may name the premix by its id or by its gases; then nothing is stated as substituted', () => {
    for (const order of ['C2H6,CH4,cyl-air', 'C2H6,CH4,N2+O2']) {
      const { plan, req } = planFrom(NG, { order });
      expect(plan.steps.map((s) => s.source.id)).toEqual(['cyl-C2H6', 'cyl-CH4', 'cyl-air']);
      expect(req.premixInPlace).toEqual([]);
      expect(inPlace(plan.findings)).toEqual([]);
    }
  });

  it('an order that names O2 but not N2 is refused, naming N2 (a species named is a single-gas cylinder)', async () => {
    const r = await runCli(['plan', NG, '--order', 'C2H6,CH4,O2']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--order: the fill order leaves out N2; name every fill at least once');
    expect(r.stderr).toContain('(error code: order-missing)');
  });
});

describe('the composition change of a premix taken for a design slightly off its ratio', () => {
  const design = {
    fractions: 'CH4:0.05,O2:0.1996,N2:0.7504',
    tank: 'MT-1',
    pressure: '1000 Torr',
    temperature: '25 degC',
  };
  it('design O2:N2 0.1996:0.7504 (0.063 % off 21:79): the filled fractions are the least-squares fit, by hand', () => {
    const { plan } = planFrom(undefined, design);
    const [f] = inPlace(plan.findings);
    expect(f.severity).toBe('note');
    // hand reference (normal equation of the relative least squares the allocation solves, cylinder
    // impurities left out): air amount t = (a + b)/(a^2 + b^2) with a = 0.21/0.1996, b = 0.79/0.7504,
    // per 0.05 mol CH4; x(O2) = 0.21 t/(0.05 + t) = 0.1995018, x(N2) = 0.79 t/(0.05 + t) = 0.7505069.
    // Tolerance 3e-6 absolute: the CH4 cylinder's 30 ppm impurities shift them by less.
    const a = 0.21 / 0.1996;
    const b = 0.79 / 0.7504;
    const t = (a + b) / (a * a + b * b);
    const byHand = { O2: (0.21 * t) / (0.05 + t), N2: (0.79 * t) / (0.05 + t) };
    for (const c of f.changes) {
      expect(c.design).toBe(c.species === 'O2' ? 0.1996 : 0.7504);
      expect(Math.abs(c.filled - byHand[c.species as 'O2' | 'N2'])).toBeLessThan(3e-6);
    }
    expect(describeFinding(f, torrText)).toContain('x(O2) 0.199600 designed, 0.199502 filled (-0.049 %)');
  });

  it('a tolerance tighter than that change makes the statement a warning', () => {
    const { plan } = planFrom(undefined, { ...design, tolerance: '0.0001' });
    const [f] = inPlace(plan.findings);
    expect(f.severity).toBe('warning');
    expect(describeFinding(f, torrText)).toContain('- outside the tolerance.');
  });

  it('naming the gases in the order fills them from single cylinders, at the design ratio', () => {
    const { plan } = planFrom(undefined, { ...design, order: 'CH4,N2,O2' });
    expect(plan.steps.map((s) => s.source.id)).toEqual(['cyl-CH4', 'cyl-N2', 'cyl-O2']);
    expect(inPlace(plan.findings)).toEqual([]);
    // impurities only (< 30 ppm of any cylinder): the design ratio is kept within 1e-4 relative
    expect(Math.abs(plan.composition.O2 / 0.1996 - 1)).toBeLessThan(1e-4);
  });
});

describe('a split order plans end to end (core planner of the charges branch)', () => {
  it('--order "CH4,Ar@400 Torr,O2,Ar": four steps, Ar in charges 1 and 2 of 2, the first ending at 400 Torr', () => {
    const { plan, req } = planFrom('recipes/ch4-o2-ar-phi1.yaml', { order: 'CH4,Ar@400 Torr,O2,Ar' });
    expect(req.input.charges![1].stopPa).toBeCloseTo((400 * 101325) / 760, 9);
    expect(plan.steps.map((s) => [s.species, s.charge.number, s.charge.of])).toEqual([
      ['CH4', 1, 1],
      ['Ar', 1, 2],
      ['O2', 1, 1],
      ['Ar', 2, 2],
    ]);
    // the stop is the target of that charge: 400 Torr = 53328.947 Pa exactly (definition of the Torr)
    expect(plan.steps[1].targetPa).toBeCloseTo((400 * 101325) / 760, 6);
    expect(plan.steps[3].targetPa).toBeCloseTo(plan.final.pressurePa, 6);
  });
});
