import { describe, expect, it } from 'vitest';
import { reviewFillSequence } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { planSteps } from '../../src/core/plan/steps.js';
import { crossVirialShift, reviewPlan, safetyFindings } from '../../src/core/plan/review.js';
import { pureInput, workedInput } from './planner-input.js';
import type { PlanInput } from '../../src/core/index.js';

function reviewed(input: PlanInput) {
  const basis = validatePlanInput(input);
  const amounts = planAmounts(basis);
  const seq = planSequence(basis, amounts);
  const planned = planSteps(basis, amounts, seq);
  return { basis, amounts, seq, planned, review: reviewPlan(basis, amounts, seq, planned) };
}

describe('plan stage 5: review', () => {
  it('the safety review sees every state at the real-gas targets of the steps, and the final state as final', () => {
    const { basis, planned } = reviewed(workedInput());
    const found = safetyFindings(basis, planned.steps);
    // after CH4 then O2 the tank holds CH4/O2 1:2 (stoichiometric, textbook): flammable at step 2
    expect(found.some((f) => f.code === 'flammable-state' && f.step === 2)).toBe(true);
    // the state review alone, given the same states, gives the same state findings first
    const states = planned.steps.map((s) => ({
      step: s.index,
      composition: s.compositionAfter,
      pressurePa: s.targetPa,
      final: s.index === 3,
    }));
    const fills = planned.steps.map((s, i) => ({
      step: s.index,
      sourceId: s.source.id,
      sourceComposition: s.source.composition,
      before: i ? states[i - 1] : undefined,
      after: states[i],
    }));
    expect(found.slice(0, reviewFillSequence(states, fills, basis.safety).length)).toEqual(
      reviewFillSequence(states, fills, basis.safety),
    );
  });

  it('tank over its working limit: a danger at the last step, with the top of its band', () => {
    const input = workedInput();
    const { planned, review } = reviewed({
      ...input,
      tank: { ...input.tank, ratedPressurePa: 1.2e5, workingFraction: 1 },
    });
    const f = review.findings.find((x) => x.code === 'tank-over-rating');
    const last = planned.steps[2];
    expect(f).toMatchObject({ severity: 'danger', step: 3, limitPa: 1.2e5 });
    expect(f && f.code === 'tank-over-rating' && f.pressurePa).toBe(last.targetPa + last.bandPa);
  });

  it('one isolate-gauge note per gauge the steps close off', () => {
    const { planned, review } = reviewed(workedInput());
    const isolated = planned.steps.flatMap((s) => s.isolateBefore.map((g) => g.id));
    const notes = review.findings.filter((f) => f.code === 'isolate-gauge');
    expect(notes.map((f) => f.code === 'isolate-gauge' && f.gauge)).toEqual(isolated);
  });

  it('a given order keeps its reason; an assumed purity is a note per source', () => {
    const input = workedInput();
    const { review } = reviewed({
      ...input,
      sources: input.sources.map((s) => ({ ...s, purityAssumed: true })),
    });
    expect(review.orderReason).toBe('as given');
    expect(review.findings.filter((f) => f.code === 'purity-assumed')).toHaveLength(3);
  });

  it('cross-coefficient estimate: He/Ar 50/50 at 10 bar is rho 2 y1 y2 u with u = 4 cm3/mol (our VIRIAL_U.cross floor), within 1e-9', () => {
    const { basis, amounts, planned } = reviewed(pureInput({ He: 0.5, Ar: 0.5 }, ['He', 'Ar'], 300, 10e5));
    const c = crossVirialShift(basis.model, planned.steps, basis.temperatureK);
    expect(c?.pairs).toEqual(['He-Ar']);
    expect(c?.step).toBe(2);
    expect(Math.abs(c!.relative / (amounts.densityMolPerM3 * 2 * 0.25 * 4e-6) - 1)).toBeLessThan(1e-9);
    expect(c!.shiftPa).toBeCloseTo(c!.relative * planned.steps[1].targetPa, 9);
  });
});
