import { describe, expect, it } from 'vitest';
import { describeProblem, ProblemError } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { planSteps } from '../../src/core/plan/steps.js';
import { chargeAmounts } from '../../src/core/plan/charges.js';
import { workedInput } from './planner-input.js';
import { fixture, TORR } from '../helpers.js';

const worked = fixture('worked-plan.json');

function stepsOf(input = workedInput()) {
  const basis = validatePlanInput(input);
  const amounts = planAmounts(basis);
  const seq = planSequence(basis, amounts);
  return { basis, amounts, seq, planned: planSteps(basis, amounts, seq) };
}

describe('plan stage 4: steps and gauges', () => {
  it('worked vector of properties.md 1.2 (CoolProp 8.0): targets 50.038 / 150.106 / 1000.000 Torr within 0.01 Torr', () => {
    const { planned } = stepsOf();
    planned.steps.forEach((s, i) =>
      expect(Math.abs(s.targetPa / TORR - worked.targets_Torr[i])).toBeLessThan(0.01),
    );
  });

  it('consistency: increments add up to the final pressure, amounts to the total, ideal targets end at P_f', () => {
    const { basis, amounts, planned } = stepsOf();
    const steps = planned.steps;
    const inc = steps.reduce((a, s) => a + s.incrementPa, 0);
    expect(Math.abs(inc / basis.finalPressurePa - 1)).toBeLessThan(1e-12);
    const mol = steps.reduce((a, s) => a + s.amountMol, 0);
    expect(Math.abs(mol / amounts.totalMol - 1)).toBeLessThan(1e-12);
    expect(Math.abs(steps[2].idealTargetPa / basis.finalPressurePa - 1)).toBeLessThan(1e-12);
    expect(steps.map((s) => s.index)).toEqual([1, 2, 3]);
    expect(steps.map((s) => s.species)).toEqual(['CH4', 'O2', 'Ar']);
  });

  it('gauges: the 1000 Torr head reads the first two fills; the last (1000 Torr + its band) needs the 10 kTorr head after isolating the others', () => {
    const { planned } = stepsOf();
    expect(planned.steps.map((s) => s.gauge?.id)).toEqual(['h1k', 'h1k', 'h10k']);
    expect(planned.steps[0].isolateBefore.map((g) => g.id)).toEqual(['h10']);
    expect(planned.steps[2].isolateBefore.map((g) => g.id)).toEqual(['h1k']);
    expect(planned.findings.filter((f) => f.code === 'no-gauge-covers')).toEqual([]);
  });

  it('a supply pressure at or below a target is a danger finding of that step', () => {
    const input = workedInput();
    const sources = input.sources.map((s) => (s.id === 'O2' ? { ...s, supplyPressurePa: 100 * TORR } : s));
    const { planned } = stepsOf({ ...input, sources });
    const f = planned.findings.find((x) => x.code === 'supply-pressure-low');
    expect(f).toMatchObject({ severity: 'danger', step: 2, source: 'O2' });
  });

  it('chargeAmounts: one charge per source gets that source’s amount; a non-last charge without a stop is refused', () => {
    const { basis, amounts, seq } = stepsOf();
    const src = basis.input.sources;
    const mol = amounts.allocation.amountsMol;
    expect(chargeAmounts(basis, seq.charges, src, mol)).toEqual(mol);
    // the sequence stage chooses every missing stop; called without one, the amounts refuse
    let problem: unknown;
    try {
      chargeAmounts(
        basis,
        [seq.charges[0], seq.charges[1], { source: src[2] }, { source: src[1] }, { source: src[2] }],
        src,
        mol,
      );
    } catch (e) {
      problem = e instanceof ProblemError ? e.problem : e;
    }
    expect(problem).toMatchObject({ code: 'split-stop', kind: 'stop-missing', source: 'O2', charge: 2 });
    expect(describeProblem(problem as ProblemError['problem'])).toContain('has no stop reading');
  });
});
