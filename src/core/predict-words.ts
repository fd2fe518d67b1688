/**
 * The wording of the predicted-uncertainty finding: what the largest contribution is, and
 * what would make it smaller. Kept beside findings.ts so that it stays short.
 */
import type { ComponentAbout } from './uncertainty.js';
import type { Finding } from './findings.js';

/** the fields of the `predicted-u-over-tolerance` finding that the sentence uses */
export interface PredictedOver {
  readonly species: string;
  readonly design: number;
  readonly expandedU: number;
  readonly tolerance: number;
  readonly dominant: string;
  readonly dominantShare: number;
  readonly about?: ComponentAbout;
}

/** a relative size in per cent, two significant digits ("2.1 %", "0.50 %") */
function relPct(x: number): string {
  return `${Number((x * 100).toPrecision(2)).toString()} %`;
}

/** what the contribution is, and what would reduce it */
export function contributionAdvice(
  about: ComponentAbout | undefined,
  p: (pa: number) => string,
): { what: string; fix: string } {
  if (!about) return { what: 'an input of the budget', fix: 'see the budget of the prediction' };
  switch (about.kind) {
    case 'resolution':
      return {
        what:
          `the display resolution of ${about.gauge} ` +
          `(largest at the reading of step ${about.step}, ${p(about.pressurePa)})`,
        fix:
          `read step ${about.step} at ${p(about.pressurePa)} on a gauge head with a finer resolution, ` +
          `or fill that charge earlier in the order, where a lower-range head reads it (only an ` +
          `order the safety review passes)`,
      };
    case 'span':
    case 'zero':
      return {
        what: `the ${about.kind === 'span' ? 'span (of-reading)' : 'zero (of-full-scale)'} accuracy of ${about.gauge}`,
        fix: `a more accurate or recently calibrated gauge than ${about.gauge}, or a lower-range head for its readings`,
      };
    case 'barometer':
      return {
        what: 'the barometer (gauge-referenced readings)',
        fix: 'absolute gauges for the readings, or a better barometer',
      };
    case 'thermometer':
      return {
        what: 'the thermometer offset',
        fix: 'a better (calibrated) thermometer: a smaller standard uncertainty in the lab profile',
      };
    case 'temperature-resolution':
      return {
        what: `the thermometer's display resolution (largest at the reading of step ${about.step})`,
        fix:
          'a better thermometer with a finer display resolution, or an order that reads this fill ' +
          'at a lower tank pressure, where a temperature error moves less gas (only an order the ' +
          'safety review passes)',
      };
    case 'temperature-settling':
      return {
        what: `the gas temperature not yet settled (largest at the reading of step ${about.step})`,
        fix:
          'a longer wait before each reading, then a smaller thermometer.settling in the ' +
          'lab profile once measured; or an order that reads this fill at a lower tank pressure ' +
          '(only an order the safety review passes)',
      };
    case 'virial':
      return {
        what: `the second virial coefficient ${about.pair[0]}-${about.pair[1]}`,
        fix: 'a lower final pressure (the real-gas correction shrinks with it)',
      };
    case 'purity':
      return {
        what: `the unidentified impurity of ${about.source}`,
        fix: `a certified analysis or a higher grade for ${about.source}`,
      };
    // raised by a two-stage plan: the premix's own budget carried into the batch
    case 'source-composition':
      return {
        what: `the composition of premix ${about.source} (its first-stage input ${about.input})`,
        fix: `a more precise first stage for ${about.source} (see its own budget), or a re-check of its log`,
      };
  }
}

/**
 * "the predicted U (k = 2) of x(O2) is 2.1 % of its design value, beyond the tolerance of
 * 0.50 %: ..."
 */
export function describePredictedOver(f: PredictedOver, p: (pa: number) => string): string {
  const a = contributionAdvice(f.about, p);
  return (
    `the predicted U (k = 2) of x(${f.species}) is ${relPct(f.expandedU / f.design)} of its design ` +
    `value, beyond the tolerance of ${relPct(f.tolerance / f.design)}: even readings exactly at the ` +
    `targets cannot show the batch within tolerance. The largest cause ` +
    `(${Math.round(f.dominantShare * 100)} % of u^2) is ${a.what}; what would reduce it: ${a.fix} ` +
    `(re-plan to see the new U)`
  );
}

/** the `band-edges-past-tolerance` finding (findings.ts), which the sentence words */
export type BandEdges = Extract<Finding, { readonly code: 'band-edges-past-tolerance' }>;

/** "x(O2)", "phi", "the diluent fraction" */
function quantityName(name: string): string {
  return name === 'phi' ? 'phi' : name === 'dilution' ? 'the diluent fraction' : `x(${name})`;
}

/**
 * "readings inside every band can fail together: ... read each fill within 12 % of its band
 * (fill 1 +-0.0018 Torr, ...)"
 */
export function describeBandEdges(f: BandEdges, p: (pa: number) => string): string {
  const head =
    `readings inside every band can fail together: a band assumes the fills before it on target, and ` +
    `all at their band edges the worst way take ${quantityName(f.species)} ` +
    `${relPct(f.stack / f.design)} off its design (room: tolerance ${relPct(f.tolerance / f.design)} ` +
    `less U ${relPct(f.expandedU / f.design)})`;
  const guided = 'fill with `mixwright fill`, which re-targets the later fills from each reading';
  const bands = f.bands.map((b) => `fill ${b.step} +-${p(b.halfWidthPa)}`).join(', ');
  const finer = f.bands.filter((b) => b.finerThanDisplay);
  const finerOne = (b: BandEdges['bands'][number]) =>
    `fill ${b.step}'s is finer than ${b.gauge} displays (step ${p(b.displayStepPa!)})`;
  const cannot = finer.length
    ? `; ${finer.map(finerOne).join(', ')}: no reading from the sheet can keep to ` +
      `${finer.length > 1 ? 'them' : 'it'}, so`
    : '; or';
  return `${head}. From the sheet, read each fill within ${relPct(f.share)} of its band (${bands})${cannot} ${guided}`;
}
