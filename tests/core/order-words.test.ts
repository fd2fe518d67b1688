// The safer-order finding's words (core/order-words.ts): a claim the advised order's review made, never
// "avoids them" for an advised order with hazards of its own, and never the given order's hazard again.
// Wording only: no computed number is checked here.
import { describe, expect, it } from 'vitest';
import { describeFinding } from '../../src/core/index.js';
import {
  cleanClaim,
  describeSaferOrder,
  NO_SAFE_ORDER_OPENING,
  ORDER_REVIEW_CLAIM,
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
});
