/**
 * The words of the fill-order advice, shared by the advice (order.ts: why it chose its order) and the
 * safer-order finding (findings.ts: what a given order is beaten by). Kept apart from order.ts so that
 * the wording of findings needs none of the review code.
 */

/**
 * the claim of a sequence whose review found no hazard on any intermediate state or fill path; the
 * plan's review (plan/review.ts) replaces it by what the full review of the planned fill finds
 */
export const CLEAN_CLAIM =
  'every intermediate tank state and every fill path is non-flammable and free of the hazards checked';

/** the opening of the advice's reason where no order is free of every hazard it checks */
export const NO_SAFE_ORDER_OPENING = 'no fill order avoids every hazard checked';

/**
 * The safer-order finding: the order given (or `of`, whose order it is) against the advised order.
 * The advice's reason explains its choice against the smallest-first order; where the advised order
 * is clean the finding says only that, by the advice's review: the comparison with the smallest-first
 * order repeated the finding itself when the order given was the smallest-first one, and named a
 * third order otherwise. An advised order with hazards of its own is never said to avoid them: it has
 * fewer or less severe ones, and the advice's reason says which.
 */
export function describeSaferOrder(f: {
  readonly order: readonly string[];
  readonly reason: string;
  readonly of?: string;
}): string {
  const given = `${f.of ?? 'the order given'} makes flammable or hazardous intermediate states or fills; `;
  const advised = f.order.join(' -> ');
  if (f.reason.endsWith(CLEAN_CLAIM))
    return `${given}${advised} avoids them (by the order advice's review, ${CLEAN_CLAIM})`;
  if (f.reason.startsWith(NO_SAFE_ORDER_OPENING))
    return `${given}${advised} has fewer or less severe ones (${f.reason})`;
  return `${given}${advised} is advised instead (${f.reason})`;
}
