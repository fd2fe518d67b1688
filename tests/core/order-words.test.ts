// The safer-order finding's words (core/order-words.ts): a claim the advised order's review made, never
// "avoids them" for an advised order with hazards of its own, and never the given order's hazard again.
// Wording only: no computed number is checked here.
import { describe, expect, it } from 'vitest';
import { describeFinding, planFill } from '../../src/core/index.js';
import { buildPlanRequest, readRecipe } from '../../src/io/load.js';
import {
  cleanClaim,
  describeSaferOrder,
  NO_SAFE_ORDER_OPENING,
  ORDER_REVIEW_CLAIM,
  orderReviewClaim,
  SHORT_OF_MIXTURE_CLAIM,
  shortOfMixtureClaim,
} from '../../src/core/order-words.js';
import { safetyClause } from '../../src/core/plan/review.js';
import type { Finding } from '../../src/core/index.js';

describe('describeSaferOrder', () => {
  it('a clean advised order: it avoids them, by the advice review, without the smallest-first comparison', () => {
    const reason = `not the smallest-first order (cyl-CH4, cyl-O2, cyl-Ar), which would give flammable-state after fill 2; ${ORDER_REVIEW_CLAIM}`;
    const words = describeSaferOrder({ order: ['CH4', 'Ar', 'O2'], reason });
    expect(words).toBe(
      'the order given makes flammable or hazardous intermediate states or fills; CH4 -> Ar -> O2 avoids ' +
        `them (by the order review, ${SHORT_OF_MIXTURE_CLAIM}; the finished mixture, the same in ` +
        "every order, is judged by the plan's own findings)",
    );
    // the advice reviews no finished mixture: its clean claim is never repeated whole (a flammable batch
    // makes the last fill's path flammable, which the advice did not judge)
    expect(words).not.toContain(cleanClaim(true));
    expect(words).not.toMatch(/every fill path is non-flammable/);
    expect(
      describeSaferOrder({ order: ['A'], reason: ORDER_REVIEW_CLAIM, of: "the premix's own order" }),
    ).toMatch(/^the premix's own order makes /);
  });

  it('an advised order with hazards of its own: fewer or less severe, with the advice reason, never "avoids"', () => {
    const reason = `${NO_SAFE_ORDER_OPENING} (intermediate states, fill paths, fill lines); this one has the fewest`;
    const words = describeSaferOrder({ order: ['CH4', 'Ar', 'O2'], reason });
    expect(words).not.toContain('avoids them');
    expect(words).toContain(`CH4 -> Ar -> O2 has fewer or less severe ones (${reason})`);
  });

  it('a reason that is neither clean nor no-safe-order: never the whole clean claim either', () => {
    const words = describeSaferOrder({
      order: ['A', 'B'],
      reason: `some other reason; ${ORDER_REVIEW_CLAIM}, as searched`,
    });
    expect(words).not.toContain(cleanClaim(true));
    expect(words).toContain(SHORT_OF_MIXTURE_CLAIM);
  });

  it("an order review's claim is the plan review's short-of-the-mixture words, never the full review's clean claim", () => {
    expect(ORDER_REVIEW_CLAIM).toContain(SHORT_OF_MIXTURE_CLAIM);
    expect(ORDER_REVIEW_CLAIM).not.toContain(cleanClaim(true));
    expect(ORDER_REVIEW_CLAIM).not.toMatch(/every fill path is non-flammable/);
  });

  it("one wording: the plan's review words the states and paths short of a hazardous mixture the same", () => {
    const f = { code: 'flammable-mixture', severity: 'warning', step: 3 } as Finding;
    const estimated = {
      code: 'flammability-data-estimated',
      severity: 'note',
      what: 'X (UFL in O2)',
    } as Finding;
    expect(safetyClause([f, estimated], 3)).toContain(
      `${SHORT_OF_MIXTURE_CLAIM}, which itself has flammable-mixture`,
    );
    expect(safetyClause([f], 3)).toContain(
      `${shortOfMixtureClaim(false)}, which itself has flammable-mixture`,
    );
  });

  it('the limits qualifier only where a limit was estimated (a flammability-data-estimated note)', () => {
    const estimated = { code: 'flammability-data-estimated', severity: 'note', what: 'X (LOC)' } as Finding;
    expect(safetyClause([estimated], 3)).toBe(
      'every intermediate tank state and every fill path is non-flammable by the flammability limits used ' +
        '(each estimated one is named in a flammability-data-estimated note) and free of the hazards checked',
    );
    expect(safetyClause([], 3)).toBe(
      'every intermediate tank state and every fill path is non-flammable and free of the hazards checked',
    );
  });

  it('describeFinding words safer-order by it', () => {
    const f = {
      severity: 'warning',
      code: 'safer-order',
      order: ['X', 'Y'],
      reason: ORDER_REVIEW_CLAIM,
    } as const;
    expect(describeFinding(f, (pa) => `${pa} Pa`)).toBe(describeSaferOrder(f));
  });

  it('a given order beaten by the advice: the safer-order claim qualified only where the plan estimated a limit', () => {
    // the demo recipes in the order fuel, O2, Ar (flammable after the O2): CH4's limits are tabulated,
    // n-C7H16's UFL in O2 and LOC are estimated (the review's flammability-data-estimated notes)
    const given = (file: string, fuel: string) => {
      const req = buildPlanRequest(readRecipe(file));
      const src = (sp: string) => req.input.sources.find((x) => x.mainSpecies === sp)!;
      return planFill({ ...req.input, order: 'given', sources: [fuel, 'O2', 'Ar'].map(src) });
    };
    for (const [file, fuel, estimated] of [
      ['recipes/ch4-o2-ar-phi1.yaml', 'CH4', false],
      ['recipes/nc7h16-o2-ar.yaml', 'n-C7H16', true],
    ] as const) {
      const plan = given(file, fuel);
      expect(plan.findings.some((f) => f.code === 'flammability-data-estimated')).toBe(estimated);
      const safer = plan.findings.find((f) => f.code === 'safer-order');
      if (!safer || safer.code !== 'safer-order') throw new Error(`no safer-order for ${fuel}`);
      expect(safer.reason.endsWith(orderReviewClaim(estimated))).toBe(true);
      const words = describeFinding(safer, (pa) => `${pa} Pa`);
      expect(words).toContain(`avoids them (${orderReviewClaim(estimated)};`);
      expect(words.includes('by the flammability limits used')).toBe(estimated);
    }
  });
});
