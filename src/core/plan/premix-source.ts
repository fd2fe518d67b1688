/**
 * The premix made in a first stage as a source of the batch: its composition is the first stage's
 * predicted (or re-checked) composition, and its uncertainty is that stage's GUM budget, carried as
 * one composition term per input of the budget (GasSource.compositionTerms). Each term keeps the
 * input's distribution and moves every mole fraction of the premix by its sensitivity
 * c_i = (contribution c_i u_i) / u_i, so the premix's covariance u(x_a, x_b) = sum_i c_ai c_bi u_i^2
 * (JCGM 100:2008, 5.2.2 with the inputs independent) reaches the batch whole, correlations included.
 */
import { fillLabel, premix, type CompositionTerm, type GasSource, type SharedInstrument } from '../supply.js';
import type { Fractions } from '../composition.js';
import type { UncertaintyResult } from '../uncertainty.js';

/** a term whose largest change of a mole fraction per standard uncertainty is below this is left out */
const NEGLIGIBLE_TERM = 1e-12;

/**
 * The composition terms of a stage's budget: one per input that moves the composition. With
 * `share`, a gauge's span and zero and the thermometer's offset say which instrument they are
 * (CompositionTerm.shared), so that a batch read by the same instrument counts them once.
 */
export function compositionTermsOf(result: UncertaintyResult, scale = 1, share = true): CompositionTerm[] {
  const terms: CompositionTerm[] = [];
  result.components.forEach((c, j) => {
    if (!(c.u > 0)) return;
    const sensitivity: Record<string, number> = {};
    let largest = 0;
    for (const k of result.species) {
      const cu = result.composition[k]?.contributions?.[j] ?? 0;
      sensitivity[k] = (scale * cu) / c.u;
      largest = Math.max(largest, Math.abs(cu));
    }
    if (!(largest > NEGLIGIBLE_TERM)) return;
    const a = c.about;
    const shared: SharedInstrument | undefined = !share
      ? undefined
      : a.kind === 'span' || a.kind === 'zero'
        ? { kind: a.kind, gauge: a.gauge }
        : a.kind === 'thermometer'
          ? { kind: 'thermometer' }
          : undefined;
    terms.push({ name: c.name, dist: c.dist, scale: c.scale, unit: c.unit, sensitivity, shared });
  });
  return terms;
}

export interface PremixSourceArgs {
  readonly id: string;
  /** where the premix is: its tank's id */
  readonly tank: string;
  /** mole fractions of the identified species (summing to 1) */
  readonly composition: Fractions;
  /** the gases the premix was made of (its design's species): they name its fills (fillLabel) */
  readonly gases: readonly string[];
  /** share of the premix that is unidentified cylinder impurity */
  readonly unidentified: number;
  /** the premix tank's pressure before the batch draws from it, Pa absolute */
  readonly pressurePa: number;
  /** the premix tank's volume, m^3: the plan then judges the tank's falling pressure (supply-check.ts) */
  readonly tankVolumeM3?: number;
  /** the first stage's budget (a prediction or a re-check); undefined: the composition taken as exact */
  readonly budget?: UncertaintyResult;
  /**
   * false when the batch is read by other instruments than the premix (another lab's log): its
   * gauge spans and zeros and thermometer offset stay independent inputs (default true)
   */
  readonly sharedInstruments?: boolean;
}

/** the premix as a source: identified composition scaled to 1 - unidentified, its uncertainty as terms */
export function premixSource(a: PremixSourceArgs): GasSource {
  const base = premix({
    id: a.id,
    composition: a.composition,
    gases: a.gases,
    supplyPressurePa: a.pressurePa,
  });
  const keep = 1 - a.unidentified;
  const composition = Object.fromEntries(Object.entries(a.composition).map(([k, v]) => [k, v * keep]));
  return {
    ...base,
    label: `${fillLabel(base)} premix in ${a.tank}`,
    composition,
    unidentified: a.unidentified,
    ...(a.tankVolumeM3 === undefined ? {} : { supplyTank: { id: a.tank, volumeM3: a.tankVolumeM3 } }),
    compositionTerms: a.budget ? compositionTermsOf(a.budget, keep, a.sharedInstruments ?? true) : undefined,
  };
}
