/**
 * The words of the fill-order advice, shared by the advice (order.ts: why it chose its order) and the
 * safer-order finding (findings.ts: what a given order is beaten by). Kept apart from order.ts so that
 * the wording of findings needs none of the review code.
 */

/**
 * what "non-flammable" rests on: the flammability limits (LFL, UFL, LOC) the review uses, some of them
 * estimated rather than measured (a flammability-data-estimated note names each); said beside a claim
 * only where one of the limits it rests on was estimated (`limitsEstimated`)
 */
export const LIMITS_QUALIFIER =
  'by the flammability limits used (each estimated one is named in a flammability-data-estimated note)';

/** " by the flammability limits used (...)" where a limit the claim rests on was estimated, else nothing */
function qualifier(limitsEstimated: boolean): string {
  return limitsEstimated ? ` ${LIMITS_QUALIFIER}` : '';
}

/**
 * the claim of the full review of a planned fill (plan/review.ts `safetyClause`) that found no hazard
 * on any tank state, the finished mixture's included, nor on any fill path; never an order review's
 * claim (ORDER_REVIEW_CLAIM): an order review does not judge the finished mixture. `limitsEstimated`:
 * the plan's review emitted a flammability-data-estimated note (plan/review.ts knows, not re-derived here).
 */
export function cleanClaim(limitsEstimated: boolean): string {
  return (
    `every intermediate tank state and every fill path is non-flammable${qualifier(limitsEstimated)} ` +
    'and free of the hazards checked'
  );
}

/**
 * What an order review covers where it finds nothing: it reviews no finished mixture (the same in
 * every order: the amounts do not depend on it), and a fill's path is judged against its end states,
 * so the last fill's path is clean only short of the finished mixture. The plan's review
 * (plan/review.ts `safetyClause`) uses these words where only the finished mixture has hazards;
 * tests/core/order-words.test.ts holds the two together.
 */
export function shortOfMixtureClaim(limitsEstimated: boolean): string {
  return (
    `every intermediate tank state is non-flammable${qualifier(limitsEstimated)} and free of the ` +
    'hazards checked, and so is every fill path short of the finished mixture'
  );
}

/**
 * the short-of-mixture claim of an order review, qualified by the limits used: it runs before the plan's
 * review and does not know whether any limit it rests on was estimated
 */
export const SHORT_OF_MIXTURE_CLAIM = shortOfMixtureClaim(true);

/**
 * The claim of an order whose order review (the advice's, order.ts, or the sequence search's,
 * plan/search-result.ts) found no hazard: only what that review computed (SHORT_OF_MIXTURE_CLAIM),
 * so that a reason printed before the plan's review corrects it (the safer-order finding's reason,
 * its --json) claims no more than was found. The plan's review (plan/review.ts `correctedReason`)
 * replaces it by what the full review of the planned fill finds.
 */
export const ORDER_REVIEW_CLAIM = orderReviewClaim(true);

/**
 * an order review's claim qualified as the plan's review qualifies its own (limitsEstimated: whether
 * the plan's review emitted a flammability-data-estimated note); ORDER_REVIEW_CLAIM is the qualified one
 */
export function orderReviewClaim(limitsEstimated: boolean): string {
  return `by the order review, ${shortOfMixtureClaim(limitsEstimated)}`;
}

/** the opening of the advice's reason where no order is free of every hazard it checks */
export const NO_SAFE_ORDER_OPENING = 'no fill order avoids every hazard checked';

/**
 * The safer-order finding: the order given (or `of`, whose order it is) against the advised order.
 * The advice's reason explains its choice against the smallest-first order; where the advised order
 * is clean the finding says only that, by the advice's review: the comparison with the smallest-first
 * order repeated the finding itself when the order given was the smallest-first one, and named a
 * third order otherwise. The advice's clean claim (ORDER_REVIEW_CLAIM) goes only as far as its review:
 * planned in the advised order the finished batch can still be flammable, and then the last fill's
 * path is not non-flammable. An advised order with hazards of its own is never said to avoid them: it has
 * fewer or less severe ones, and the advice's reason says which.
 */
export function describeSaferOrder(f: {
  readonly order: readonly string[];
  readonly reason: string;
  readonly of?: string;
}): string {
  const given = `${f.of ?? 'the order given'} makes flammable or hazardous intermediate states or fills; `;
  const advised = f.order.join(' -> ');
  // the claim as the advice made it, or as the plan's review qualified it (plan/review.ts qualifiedClaims)
  const claim = [ORDER_REVIEW_CLAIM, orderReviewClaim(false)].find((c) => f.reason.endsWith(c));
  if (claim)
    return (
      `${given}${advised} avoids them (${claim}; ` +
      `the finished mixture, the same in every order, is judged by the plan's own findings)`
    );
  if (f.reason.startsWith(NO_SAFE_ORDER_OPENING))
    return `${given}${advised} has fewer or less severe ones (${f.reason})`;
  return `${given}${advised} is advised instead (${f.reason})`;
}
