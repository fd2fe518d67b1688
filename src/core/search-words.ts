/**
 * The wording of the sequence search's findings (plan/search.ts): why the chosen sequence
 * won, with its reading and U beside the advised order's, and a more precise sequence that
 * is offered but not recommended because of its hazard. Kept beside findings.ts so that it
 * stays short.
 */
import type { Finding } from './findings.js';

/** a relative size in per cent, two significant digits ("2.9 %", "0.45 %") */
function relPct(x: number): string {
  return `${Number((x * 100).toPrecision(2)).toString()} %`;
}

/** x(species) for a species key, phi as it is */
const quantity = (name: string) => (name === 'phi' ? 'phi' : `x(${name})`);

/** the finding `sequence-chosen` the sentence words */
type SequenceChosen = Extract<Finding, { code: 'sequence-chosen' }>;

/**
 * "O2 read at 410 Torr on head-1kT: U (k = 2) of x(O2) 0.4 % instead of 2.9 % (read at
 * 1500 Torr on head-10kT in CH4 -> Ar -> O2, the advised single-charge order); ..."
 */
export function describeSequenceChosen(f: SequenceChosen, p: (pa: number) => string): string {
  // phi and the dilution are not read at one fill: no reading to name
  const read = f.gauge !== '-';
  const largest =
    `the largest predicted U of the design fractions and phi is ` +
    `${relPct(f.worstRelativeU)} (${quantity(f.worst)}) instead of ${relPct(f.baselineWorstRelativeU)} ` +
    `(${quantity(f.baselineWorst)})`;
  // the same reading on the same gauge as the advised order: its U moved through the other readings
  if (read && f.gauge === f.baselineGauge && p(f.readingPa) === p(f.baselineReadingPa))
    return (
      `${f.source} read at ${p(f.readingPa)} on ${f.gauge} as in ${f.baselineOrder.join(' -> ')}, the ` +
      `advised single-charge order; through the other readings of this sequence, U (k = 2) of ` +
      `${quantity(f.species)} is ${relPct(f.relativeU)} instead of ${relPct(f.baselineRelativeU)}; ${largest}`
    );
  return (
    (read ? `${f.source} read at ${p(f.readingPa)} on ${f.gauge}: ` : '') +
    `U (k = 2) of ${quantity(f.species)} ${relPct(f.relativeU)} instead of ${relPct(f.baselineRelativeU)} (` +
    (read && f.baselineGauge !== '-' ? `read at ${p(f.baselineReadingPa)} on ${f.baselineGauge} ` : '') +
    `in ${f.baselineOrder.join(' -> ')}, the advised single-charge order); ` +
    `the largest predicted U of the design fractions and phi is ` +
    `${relPct(f.worstRelativeU)} (${quantity(f.worst)}) instead of ${relPct(f.baselineWorstRelativeU)} ` +
    `(${quantity(f.baselineWorst)})`
  );
}

/** the finding `precise-sequence-hazard` the sentence words */
type PreciseOption = Extract<Finding, { code: 'precise-sequence-hazard' }>;

/** the order as --order takes it: fill labels, a split charge's stop reading after "@" */
function orderText(f: PreciseOption, p: (pa: number) => string): string {
  return f.charges.map((c) => (c.stopPa === undefined ? c.label : `${c.label}@${p(c.stopPa)}`)).join(',');
}

/**
 * "no sequence as safe as the advised order meets the tolerance of 0.5 %; CH4 -> Ar -> O2 -> Ar
 * does (...) but passes flammable-state (fill 3): ..."
 */
export function describePreciseOption(f: PreciseOption, p: (pa: number) => string): string {
  const hazards = [
    ...new Set(f.hazards.map((h) => (h.step === undefined ? h.code : `${h.code} (fill ${h.step})`))),
  ].join(', ');
  return (
    `no sequence as safe as the advised order meets the tolerance of ${relPct(f.toleranceRelative)}; ` +
    `${f.charges.map((c) => c.label).join(' -> ')} does (largest predicted U ${relPct(f.worstRelativeU)}, ` +
    `${quantity(f.worst)}) but passes ${hazards}. It is not recommended; to fill it anyway, have ` +
    `those states reviewed under your lab's rules and give the order "${orderText(f, p)}" (--order)`
  );
}
