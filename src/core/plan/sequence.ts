/**
 * Stage 3 of the fill plan: the sequence of charges. A charge is one opening of a
 * source's valve: the source, and (for a charge that is not its source's last) the
 * absolute tank reading to stop at. Without charges every source is filled in one charge,
 * in the order given or in the order the advice (order.ts) recommends. With charges
 * (order 'given', a source possibly more than once) they are checked (charges.ts), every
 * missing stop reading is chosen (split-point.ts), and the sequence is scored as given,
 * split charges and all, against the advice. A sequence search can replace `planSequence`
 * without touching the stages around it.
 */
import type { GasSource } from '../supply.js';
import { fillLabel } from '../supply.js';
import type { Finding } from '../findings.js';
import { adviseOrder, isSaferThan, scoreGivenCharges, scoreGivenOrder, type OrderScore } from '../order.js';
import type { PlanBasis } from './validate.js';
import type { PlanAmounts } from './amounts.js';
import { chargeAmounts, checkCharges, type Charge } from './charges.js';
import { chooseSplitPoints } from './split-point.js';
import { searchSequence } from './search.js';

export type { Charge } from './charges.js';

/** what the sequence stage hands on */
export interface PlanSequence {
  readonly charges: readonly Charge[];
  /** why this order, for the plan's reader */
  readonly reason: string;
  /** true when the planner chose the order (else it is the order given) */
  readonly recommended: boolean;
  /** no-safe-order, or safer-order when a given order is beaten by the advice; split-point-chosen */
  readonly findings: readonly Finding[];
}

/** the order of the fills: as given (with a finding when a safer one exists), or recommended */
export function planSequence(basis: PlanBasis, amounts: PlanAmounts): PlanSequence {
  const { input, finalPressurePa: Pf, safety, initial } = basis;
  const amountsMol = amounts.allocation.amountsMol;
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  if (input.charges) return givenCharges(basis, amounts);
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
  findings.push(...saferOrder(basis, amounts, given));
  return { charges: single(input.sources), reason: 'as given', recommended: false, findings };
}

/** the safer-order finding when the advice beats a given order that has hazards */
function saferOrder(basis: PlanBasis, amounts: PlanAmounts, given: OrderScore): Finding[] {
  if (given.danger + given.warning === 0) return [];
  const { input, finalPressurePa: Pf, safety, initial } = basis;
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  const advice = adviseOrder(input.sources, amounts.allocation.amountsMol, Pf, safety, inTank);
  if (!isSaferThan(advice.score, given)) return [];
  return [
    { severity: 'warning', code: 'safer-order', order: advice.sources.map(fillLabel), reason: advice.reason },
  ];
}

/**
 * Charges as given: checked, every missing stop chosen, the amounts worked out (which refuses
 * a stop that cannot be filled), and the sequence scored with its split charges against the advice.
 */
function givenCharges(basis: PlanBasis, amounts: PlanAmounts): PlanSequence {
  const { input, finalPressurePa: Pf, safety, initial } = basis;
  const requested = checkCharges(input.charges ?? [], input.sources, input.order);
  const choice = chooseSplitPoints(basis, amounts, requested);
  const mols = chargeAmounts(basis, choice.charges, input.sources, amounts.allocation.amountsMol);
  const inTank = initial ? { composition: initial.composition, amountMol: initial.amountMol } : undefined;
  const given = scoreGivenCharges(
    choice.charges.map((c, k) => ({ source: c.source, mol: mols[k] })),
    Pf,
    safety,
    inTank,
  );
  const findings = [...saferOrder(basis, amounts, given), ...choice.findings];
  const reason = choice.reason ? `as given; ${choice.reason}` : 'as given';
  return { charges: choice.charges, reason, recommended: false, findings };
}
