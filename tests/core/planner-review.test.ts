import { describe, expect, it } from 'vitest';
import { reviewFillSequence } from '../../src/core/index.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { planSteps } from '../../src/core/plan/steps.js';
import { crossVirialShift, reviewPlan, safetyClause, safetyFindings } from '../../src/core/plan/review.js';
import { cleanClaim } from '../../src/core/order-words.js';
import { planFill, type Finding } from '../../src/core/index.js';
import { TORR } from '../helpers.js';
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
    // final 1000 Torr (1.33e5 Pa), rated 2.4e5 Pa at a working fraction of 0.5: over the working limit
    // (1.2e5 Pa), within the rating (above the rating is refused: planner-validate.test.ts)
    const input = workedInput();
    const { planned, review } = reviewed({
      ...input,
      tank: { ...input.tank, ratedPressurePa: 2.4e5, workingFraction: 0.5 },
    });
    const f = review.findings.find((x) => x.code === 'tank-over-rating');
    const last = planned.steps[2];
    expect(f).toMatchObject({ severity: 'danger', step: 3, limitPa: 1.2e5 });
    expect(f && f.code === 'tank-over-rating' && f.pressurePa).toBe(last.targetPa + last.bandPa);
  });

  it('the order reason says "free of the hazards checked" only when the final findings are: undiluted H2/O2, a tank over its limit, a clean plan', () => {
    // H2/O2 phi 3 undiluted at 1000 Torr: the finished mixture is detonable (H2 in O2, equivalence
    // ratio 3 inside the published limits), no intermediate state is flammable (pure H2)
    const h2 = planFill({
      ...pureInput({ H2: 6 / 7, O2: 1 / 7 }, ['H2', 'O2'], 295.15, 1000 * TORR),
      order: 'recommend',
    });
    expect(h2.findings.some((f) => f.code === 'detonable-state' && f.severity === 'danger')).toBe(true);
    expect(h2.orderReason).not.toMatch(/every fill path is non-flammable/);
    expect(h2.orderReason).toMatch(
      /short of the finished mixture, which itself has .*detonable-state \(fill 2\)/,
    );
    // the worked vector, advised order, into a tank whose working limit is below the final pressure
    const input = { ...workedInput(), order: 'recommend' as const };
    const over = planFill({
      ...input,
      tank: { ...input.tank, ratedPressurePa: 2.4e5, workingFraction: 0.25 },
    });
    expect(over.findings.some((f) => f.code === 'tank-over-rating')).toBe(true);
    expect(over.orderReason).not.toMatch(/every fill path is non-flammable/);
    expect(over.orderReason).toMatch(/tank-over-rating/);
    // the same plan in a tank that holds it: no intermediate hazard, the flammable batch said apart
    const held = planFill(input);
    expect(held.findings.filter((f) => f.severity === 'danger')).toEqual([]);
    expect(held.orderReason).toMatch(
      /short of the finished mixture, which itself has flammable-mixture \(fill 3\)/,
    );
    // CH4/O2 phi 1 in 98 % Ar (non-flammable batch): nothing to say but the claim
    const x = { CH4: 0.02 / 3, O2: 0.04 / 3, Ar: 0.98 };
    const clean = planFill({ ...pureInput(x, ['CH4', 'O2', 'Ar'], 295.15, 1000 * TORR), order: 'recommend' });
    expect(clean.findings.filter((f) => f.severity === 'danger')).toEqual([]);
    // CH4's LFL, UFL and LOC are tabulated (no flammability-data-estimated note): the plain claim
    expect(clean.findings.some((f) => f.code === 'flammability-data-estimated')).toBe(false);
    expect(clean.orderReason).toContain(cleanClaim(false));
  });

  it('safetyClause: intermediate states, fill paths, the finished mixture and other dangers are said apart', () => {
    const f = (code: string, severity: Finding['severity'], step?: number) =>
      ({ code, severity, step }) as Finding;
    expect(safetyClause([f('oxygen-service', 'note', 3)], 3)).toBe(cleanClaim(false));
    expect(safetyClause([f('flammable-state', 'warning', 2)], 3)).toBe(
      'the full review of the planned fill finds flammable-state (fill 2) on its intermediate states and fill paths (see the findings)',
    );
    expect(safetyClause([f('flammable-fill-path', 'warning', 3)], 3)).toMatch(
      /finds flammable-fill-path \(fill 3\)/,
    );
    expect(safetyClause([f('tank-over-rating', 'danger', 2), f('tank-over-rating', 'danger', 3)], 3)).toBe(
      'the full review of the planned fill finds tank-over-rating (fill 2) on its intermediate states and ' +
        'fill paths, and tank-over-rating (fill 3) on the finished mixture (see the findings)',
    );
    expect(
      safetyClause([f('flammable-mixture', 'warning', 3), f('supply-pressure-low', 'danger', 3)], 3),
    ).toBe(
      'every intermediate tank state is non-flammable and free of the hazards checked, and so is every fill ' +
        'path short of the finished mixture, which itself has flammable-mixture (fill 3) (see the findings); ' +
        'besides the tank states and fills, the plan has 1 more danger: supply-pressure-low (fill 3)',
    );
  });

  it('every fill whose band passes the working limit is over it, not only the last (worked vector, limit 100 Torr)', () => {
    // CH4, O2, Ar to 50, 150, 1000 Torr (ideal partial pressures of 0.05/0.10/0.85 at 1000 Torr, by hand)
    const input = workedInput();
    const limitPa = 100 * TORR;
    // rated 2000 Torr at a working fraction of 0.05 (a final pressure above the rating is refused)
    const { planned, review } = reviewed({
      ...input,
      tank: { ...input.tank, ratedPressurePa: 2000 * TORR, workingFraction: 0.05 },
    });
    const over = review.findings.filter((x) => x.code === 'tank-over-rating');
    const expected = planned.steps.filter((s) => s.targetPa + s.bandPa > limitPa).map((s) => s.index);
    expect(expected).toEqual([2, 3]);
    expect(over.map((x) => x.step)).toEqual(expected);
    for (const x of over) {
      const s = planned.steps[x.step! - 1];
      expect(x.code === 'tank-over-rating' && x.pressurePa).toBe(s.targetPa + s.bandPa);
    }
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
