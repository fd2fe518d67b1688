import { describe, expect, it } from 'vitest';
import { planFill, R } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { planSteps } from '../../src/core/plan/steps.js';
import { reviewPlan } from '../../src/core/plan/review.js';
import { planResult } from '../../src/core/plan/result.js';
import { workedInput } from './planner-input.js';
import { fixture } from '../helpers.js';

const worked = fixture('worked-plan.json');

describe('plan stage 6: result', () => {
  it('the stages run by hand give exactly planFill’s plan; findings in stage order', () => {
    const input = { ...workedInput(), order: 'recommend' as const };
    const basis = validatePlanInput(input);
    const amounts = planAmounts(basis);
    const seq = planSequence(basis, amounts);
    const planned = planSteps(basis, amounts, seq);
    const review = reviewPlan(basis, amounts, seq, planned);
    const plan = planResult(basis, amounts, seq, planned, review);
    expect(plan).toEqual(planFill(input));
    expect(plan.findings).toEqual([...seq.findings, ...planned.findings, ...review.findings]);
    expect(plan.orderRecommended).toBe(true);
    expect(plan.orderReason).toBe(review.orderReason);
  });

  it('worked vector of properties.md 1.2 (CoolProp 8.0): ideal amount PV/RT 0.537816 mol within 1e-5 relative; final state from the amount stage', () => {
    const basis = validatePlanInput(workedInput());
    const amounts = planAmounts(basis);
    const seq = planSequence(basis, amounts);
    const planned = planSteps(basis, amounts, seq);
    const plan = planResult(basis, amounts, seq, planned, reviewPlan(basis, amounts, seq, planned));
    expect(Math.abs(plan.final.idealAmountMol / worked.ideal_amount_mol - 1)).toBeLessThan(1e-5);
    expect(plan.final.idealAmountMol).toBeCloseTo((basis.finalPressurePa * 0.01) / (R * 298.15), 12);
    expect(plan.final.amountMol).toBe(amounts.totalMol);
    expect(plan.final.compressibility).toBe(amounts.compressibility);
    expect(plan.steps).toBe(planned.steps);
    expect(plan.virial).toBe(basis.model);
  });
});
