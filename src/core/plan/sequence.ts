/**
 * Stage 3 of the fill plan: the sequence of charges. A charge is one opening of a
 * source's valve: the source, and (for a charge that is not its source's last) the
 * absolute tank reading to stop at. Today every source is filled in one charge, in the
 * order given or in the order the advice (order.ts) recommends; a sequence search can
 * replace `planSequence` without touching the stages around it.
 */
import type { GasSource } from '../supply.js';
import { fillLabel } from '../supply.js';
import type { Finding } from '../findings.js';
import { adviseOrder, isSaferThan, scoreGivenOrder } from '../order.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import { searchSequence } from './search.js';

export interface Charge {
  readonly source: GasSource;
  /** absolute tank pressure to stop this charge at, Pa; only on a charge that is not its source's last */
  readonly stopPa?: number;
}

/** what the sequence stage hands on */
export interface PlanSequence {
  readonly charges: readonly Charge[];
  /** why this order, for the plan's reader */
  readonly reason: string;
  /** true when the planner chose the order (else it is the order given) */
  readonly recommended: boolean;
  /** no-safe-order, or safer-order when a given order is beaten by the advice */
  readonly findings: readonly Finding[];
}

/** the order of the fills: as given (with a finding when a safer one exists), or recommended */
export function planSequence(basis: PlanBasis, amounts: PlanAmounts): PlanSequence {
  const { input, finalPressurePa: Pf, safety, initial } = basis;
  const amountsMol = amounts.allocation.amountsMol;
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  const findings: Finding[] = [];
  const single = (sources: readonly GasSource[]) => sources.map((source) => ({ source }));
  // the sequence search (plan/search.ts), when the lab's thermometer lets it predict the uncertainty
  if (input.order === 'recommend' && input.thermometer)
    return searchSequence(basis, amounts, input.thermometer);
  if (input.order === 'recommend') {
    const advice = adviseOrder(input.sources, amountsMol, Pf, safety, inTank);
    if (advice.noSafeOrder)
      findings.push({ severity: 'warning', code: 'no-safe-order', reason: advice.reason });
    return { charges: single(advice.sources), reason: advice.reason, recommended: true, findings };
  }
  const given = scoreGivenOrder(input.sources, amountsMol, Pf, safety, inTank);
  if (given.danger + given.warning > 0) {
    const advice = adviseOrder(input.sources, amountsMol, Pf, safety, inTank);
    if (isSaferThan(advice.score, given))
      findings.push({
        severity: 'warning',
        code: 'safer-order',
        order: advice.sources.map(fillLabel),
        reason: advice.reason,
      });
  }
  return { charges: single(input.sources), reason: 'as given', recommended: false, findings };
}
