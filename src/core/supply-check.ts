/**
 * Does a source's supply hold to the end of its charges? One judgement for the plan's steps (so for
 * every candidate of the sequence search, which reviews the steps of each) and for the delivery
 * checks of a two-stage plan and of a batch drawn from a premix log: the supply must stay at least
 * PREMIX_DELIVERY_MARGIN (10 %, our own choice, premix-tank.ts) above the reading the tank must reach,
 * so that the last part of a charge still flows through the metering valve at a controllable rate.
 * - A source drawn from a tank of known volume (GasSource.supplyTank, a premix tank): its pressure
 *   falls as it delivers. premixDelivery gives its settled and fast end pressures after all its
 *   charges; a danger (`premix-runs-low`) when the settled end is below target x (1 + margin) of its
 *   last charge, a warning (`premix-cools-low`) when only the fast delivery's cold gas is.
 * - A regulated source (a cylinder's regulator, a vapour): its delivery pressure stays; a danger
 *   (`supply-pressure-low`) at each charge whose target x (1 + margin) is above it.
 * A tank's starting pressure at or below a charge's target is also `supply-pressure-low` (the charge
 * cannot be completed at all): where every order runs a tank short, the search still prefers the one
 * whose charges the tank can at least begin. By hand: a regulator at 1100 Torr holds a charge to
 * 1000 Torr (1000 x 1.1 = 1100 Torr, just enough); at 1099 Torr it is refused.
 */
import type { Finding } from './findings.js';
import { premixDelivery, PREMIX_DELIVERY_MARGIN, type Delivery } from './premix-tank.js';
import type { GasSource } from './supply.js';

/** one charge of a plan, as the supply check needs it */
export interface SupplyCharge {
  /** 1-based step */
  readonly step: number;
  readonly source: GasSource;
  /** the absolute reading the tank must reach in this charge, Pa */
  readonly targetPa: number;
  readonly amountMol: number;
}

/** a tank source's delivery after all its charges, against what its last charge needs */
export interface PremixDeliveryCheck extends Delivery {
  /** the premix tank's pressure before the batch draws from it, Pa absolute */
  readonly startPa: number;
  readonly deliveredMol: number;
  /** the batch reading the premix's last charge must reach, Pa absolute */
  readonly targetPa: number;
  /** the lowest settled end pressure allowed: target (1 + PREMIX_DELIVERY_MARGIN), Pa */
  readonly requiredPa: number;
}

/** the lowest supply (or settled end) pressure that holds a charge to targetPa, Pa */
export function requiredSupplyPa(targetPa: number): number {
  return targetPa * (1 + PREMIX_DELIVERY_MARGIN);
}

/**
 * The delivery of a source drawn from a tank (its volume, and its pressure startPa before the batch
 * draws), over the charges of the plan that draw from it, at the plan's temperature K.
 */
export function tankDelivery(
  source: GasSource,
  tank: { readonly id: string; readonly volumeM3: number },
  startPa: number,
  charges: readonly SupplyCharge[],
  temperatureK: number,
): { check: PremixDeliveryCheck; findings: Finding[] } {
  const from = charges.filter((c) => c.source.id === source.id);
  const deliveredMol = from.reduce((a, c) => a + c.amountMol, 0);
  const last = from.at(-1);
  const targetPa = last?.targetPa ?? 0;
  const requiredPa = requiredSupplyPa(targetPa);
  const d = premixDelivery({
    composition: source.composition,
    volumeM3: tank.volumeM3,
    temperatureK,
    startPa,
    deliveredMol,
  });
  const check: PremixDeliveryCheck = { ...d, startPa, deliveredMol, targetPa, requiredPa };
  const common = { step: last?.step, tank: tank.id, startPa, targetPa, requiredPa, deliveredMol };
  const findings: Finding[] = [];
  if (d.endPa < requiredPa)
    findings.push({ severity: 'danger', code: 'premix-runs-low', endPa: d.endPa, ...common });
  else if (d.endFastPa < requiredPa)
    findings.push({
      severity: 'warning',
      code: 'premix-cools-low',
      endPa: d.endFastPa,
      endK: d.endFastK,
      ...common,
    });
  return { check, findings };
}

/** the supply findings of a plan's charges (module comment), in step order */
export function supplyFindings(charges: readonly SupplyCharge[], temperatureK: number): Finding[] {
  const found: Finding[] = [];
  const tanks = new Set<string>();
  for (const c of charges) {
    const s = c.source;
    const fromTank = s.supplyTank !== undefined && s.supplyPressurePa !== undefined;
    if (fromTank && !tanks.has(s.id)) {
      found.push(...tankDelivery(s, s.supplyTank!, s.supplyPressurePa!, charges, temperatureK).findings);
      tanks.add(s.id);
    }
    const supplyPa = s.supplyPressurePa;
    const requiredPa = requiredSupplyPa(c.targetPa);
    // a tank's fall and margin are its delivery's; its start must at least be above the target
    if (supplyPa !== undefined && (fromTank ? supplyPa <= c.targetPa : supplyPa < requiredPa))
      found.push({
        severity: 'danger',
        code: 'supply-pressure-low',
        step: c.step,
        source: s.id,
        supplyPa,
        targetPa: c.targetPa,
        requiredPa,
      });
  }
  return found.sort((a, b) => (a.step ?? 0) - (b.step ?? 0));
}

/** a batch's findings with its tank deliveries' findings replaced by these (a later, final check) */
export function withDeliveryFindings(batch: readonly Finding[], delivery: readonly Finding[]): Finding[] {
  const replaced = (f: Finding) => f.code === 'premix-runs-low' || f.code === 'premix-cools-low';
  return [...batch.filter((f) => !replaced(f)), ...delivery];
}

/**
 * a finding of the supply (this module's), not of a tank state or a fill: a careful lab makes more
 * premix or raises a regulator rather than take a less safe sequence, so rankings count these after
 * the hazards of the states and fills
 */
export function isSupplyFinding(f: Finding): boolean {
  return f.code === 'supply-pressure-low' || f.code === 'premix-runs-low' || f.code === 'premix-cools-low';
}

/**
 * The ranking of a sequence's hazards, for the single-tank search (search-eval.ts notLessSafe) and the
 * two-stage search alike (two-stage.ts rankKey): the dangers, warnings
 * and notes of the tank's states and fills first, severity by severity, then the supply's dangers and
 * warnings. A flammable or detonable state or fill path of any severity is a physical hazard; a supply
 * that runs short says the fill cannot be completed, not that it is dangerous: so no count of supply
 * findings buys a state or fill hazard (a sequence that trades two supply dangers for one and a
 * flammable state ranks after the one with the two supply dangers).
 */
export function hazardRank(findings: readonly Finding[]): number[] {
  const count = (supply: boolean, severity: Finding['severity']) =>
    findings.filter((f) => isSupplyFinding(f) === supply && f.severity === severity).length;
  return [
    count(false, 'danger'),
    count(false, 'warning'),
    count(false, 'note'),
    count(true, 'danger'),
    count(true, 'warning'),
  ];
}
