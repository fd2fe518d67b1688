import { describe, expect, it } from 'vitest';
import { adviseOrder } from '../../src/core/index.js';
import { scoreOrder } from '../../src/core/order.js';
import { reviewFillPath } from '../../src/core/fill-path.js';
import { reviewState } from '../../src/core/safety.js';
import { sequenceOf } from '../../src/core/order.js';
import { validatePlanInput } from '../../src/core/plan/validate.js';
import { planAmounts } from '../../src/core/plan/amounts.js';
import { planSequence } from '../../src/core/plan/sequence.js';
import { workedInput } from './planner-input.js';

// structural checks of the order stage; the hazards it weighs are checked against their references
// in safety.test.ts and fill-path.test.ts
describe('plan stage 3: sequence of charges', () => {
  it('a given order: one charge per source, in that order, without stop readings; "as given"', () => {
    const input = workedInput();
    const basis = validatePlanInput(input);
    const seq = planSequence(basis, planAmounts(basis));
    expect(seq.charges.map((c) => c.source)).toEqual(input.sources);
    expect(seq.charges.every((c) => c.stopPa === undefined)).toBe(true);
    expect(seq.reason).toBe('as given');
    expect(seq.recommended).toBe(false);
  });

  it('CH4 then O2 passes through a stoichiometric CH4/O2 state (CH4 + 2 O2, textbook stoichiometry): the given order gets a safer-order warning naming the advice', () => {
    const basis = validatePlanInput(workedInput());
    const amounts = planAmounts(basis);
    const seq = planSequence(basis, amounts);
    const advice = adviseOrder(
      basis.input.sources,
      amounts.allocation.amountsMol,
      basis.finalPressurePa,
      basis.safety,
    );
    const f = seq.findings.find((x) => x.code === 'safer-order');
    expect(f && f.code === 'safer-order' && f.order).toEqual(advice.sources.map((s) => s.mainSpecies));
    expect(f?.severity).toBe('warning');
  });

  it('recommend: the charges are the advice’s order (each source once) and its reason', () => {
    const basis = validatePlanInput({ ...workedInput(), order: 'recommend' });
    const amounts = planAmounts(basis);
    const seq = planSequence(basis, amounts);
    const advice = adviseOrder(
      basis.input.sources,
      amounts.allocation.amountsMol,
      basis.finalPressurePa,
      basis.safety,
    );
    expect(seq.charges.map((c) => c.source)).toEqual(advice.sources);
    expect(new Set(seq.charges.map((c) => c.source)).size).toBe(basis.input.sources.length);
    expect(seq.reason).toBe(advice.reason);
    expect(seq.recommended).toBe(true);
    expect(seq.findings.some((f) => f.code === 'no-safe-order')).toBe(advice.noSafeOrder);
  });

  it("the advice's reason claims no more than its review found: a flammable batch's last fill path is never called non-flammable", () => {
    // the worked vector (CH4/O2 in Ar) is flammable when finished; the advised order keeps its
    // intermediate states clean, but the last fill ends in the flammable mixture
    const basis = validatePlanInput({ ...workedInput(), order: 'recommend' });
    const amounts = planAmounts(basis);
    const amountsMol = amounts.allocation.amountsMol;
    const advice = adviseOrder(basis.input.sources, amountsMol, basis.finalPressurePa, basis.safety);
    expect(advice.noSafeOrder).toBe(false);
    // the order review finds nothing on the last fill's path: a path is judged against its end
    // states, and the end of this one is the finished mixture, which is flammable (the order
    // review does not judge it; the state review does)
    const byId = new Map(basis.input.sources.map((s, i) => [s, amountsMol[i]]));
    const { fills } = sequenceOf(advice.sources, byId, basis.finalPressurePa);
    const last = fills[fills.length - 1];
    expect(last.after.final).toBe(true);
    expect(reviewFillPath(last, basis.safety, false)).toEqual([]);
    const finished = reviewState(last.after, basis.safety, 'severity').findings.map((x) => x.code);
    expect(finished).toContain('flammable-mixture');
    // so no reason (the plan's uncorrected one, the safer-order finding's, printed and in --json)
    // says every fill path is non-flammable: it says "short of the finished mixture"
    expect(advice.reason).not.toMatch(/every fill path is non-flammable/);
    expect(advice.reason).toMatch(/every fill path short of the finished mixture$/);
    const given = planSequence(
      validatePlanInput(workedInput()),
      planAmounts(validatePlanInput(workedInput())),
    );
    const f = given.findings.find((x) => x.code === 'safer-order');
    expect(f && f.code === 'safer-order' && f.reason).toBe(advice.reason);
  });

  it('scoreOrder: a shared review cache gives the same score as a fresh one; the reversed order has n(n-1)/2 inversions', () => {
    const basis = validatePlanInput(workedInput());
    const amountsMol = planAmounts(basis).allocation.amountsMol;
    const amounts = new Map(basis.input.sources.map((s, i) => [s, amountsMol[i]]));
    const ascending = [...basis.input.sources].sort((a, b) => amounts.get(a)! - amounts.get(b)!);
    const common = { amounts, ascending, finalPa: basis.finalPressurePa, ctx: basis.safety };
    const cache = new Map();
    const warm = scoreOrder({ order: ascending, ...common, cache });
    const again = scoreOrder({ order: ascending, ...common, cache });
    const fresh = scoreOrder({ order: ascending, ...common });
    expect(again).toEqual(warm);
    expect(fresh).toEqual(warm);
    expect(cache.size).toBe(3);
    expect(scoreOrder({ order: [...ascending].reverse(), ...common }).inversions).toBe(3);
    expect(warm.inversions).toBe(0);
    // CH4 -> O2 makes a stoichiometric CH4/O2 mixture before the Ar: a danger
    expect(warm.danger).toBeGreaterThan(0);
  });
});
