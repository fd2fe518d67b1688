/**
 * The one home of the defaults and decision thresholds of the safety review. Every
 * entry says what it decides and on what it rests:
 *  - 'published': a value read in the source its `source` key names (data/sources.ts);
 *  - 'from-memory': a published value recalled, not read in a stored copy (its source
 *    key is of quality "from-memory"): check it before it gates safety;
 *  - 'exact': a definition or a stoichiometric fact;
 *  - 'common-practice': what careful labs do, no single published source;
 *  - 'our-choice': our own conservative choice where no source gives one.
 * The modules that apply a threshold import its named constant from here; the table is
 * what tests and documentation read (`tests/core/thresholds.test.ts` checks every entry
 * names its basis).
 */

export type ThresholdBasis = 'published' | 'from-memory' | 'exact' | 'common-practice' | 'our-choice';

export interface Threshold {
  readonly value: number;
  /** 'Pa', 'K', 'mole fraction', or '1' for a plain ratio */
  readonly unit: 'Pa' | 'K' | 'mole fraction' | '1';
  readonly basis: ThresholdBasis;
  /** a key of data/sources.ts: required for 'published' and 'from-memory' */
  readonly source?: string;
  /** what the threshold decides and why this value */
  readonly note: string;
}

/** 1 lbf/in^2 in Pa, exact (0.45359237 kg x 9.80665 m/s^2 / (0.0254 m)^2) */
const PSI_PA = (0.45359237 * 9.80665) / (0.0254 * 0.0254);

export const THRESHOLDS = {
  n2oDecompositionAbovePa: {
    value: 1e5,
    unit: 'Pa',
    basis: 'our-choice',
    note:
      'N2O partial pressure above which a state is flagged for decomposition: pure N2O can ' +
      'decompose explosively from about 1-2 bar with a strong enough ignition (recalled); ' +
      '1 bar is our conservative trigger',
  },
  n2oOxygenEquivalent: {
    value: 0.5,
    unit: '1',
    basis: 'exact',
    note:
      'mol O2 per mol N2O counted towards oxygen enrichment: N2O -> N2 + 1/2 O2. ISO 10156 ' +
      'lists an oxygen-equivalence coefficient of 0.6 for N2O in its oxidizing-power ' +
      'classification (recalled), which this review does not use',
  },
  oxygenEnrichedAbove: {
    value: 0.235,
    unit: 'mole fraction',
    basis: 'from-memory',
    source: 'osha-1910-146-memory',
    note:
      'O2-equivalent mole fraction above which gas is oxygen-enriched (the state note, and ' +
      'the resident gas of the oxygen-compression check): more than 23.5 % O2 by volume',
  },
  oxygenCompressionK: {
    value: 473.15,
    unit: 'K',
    basis: 'our-choice',
    note:
      'end temperature of compressed oxygen-rich gas flagged as a hazard to valve seats ' +
      'and seals in oxygen service (200 degC): adiabatic compression ignition is common ' +
      'practice knowledge, the value is ours and conservative',
  },
  compressionWarningMarginK: {
    value: 100,
    unit: 'K',
    basis: 'our-choice',
    note: 'compression to within this much of a fuel autoignition temperature is a warning',
  },
  fuelShareThatMatters: {
    value: 0.01,
    unit: '1',
    basis: 'our-choice',
    note:
      'a fuel counts for the compression check when it is at least this share of all fuel ' +
      '(a cylinder trace impurity does not stand in for the fuel)',
  },
  fuelFractionThatMatters: {
    value: 1e-4,
    unit: 'mole fraction',
    basis: 'our-choice',
    note: '... and at least this mole fraction of the tank',
  },
  condensationFraction: {
    value: 0.5,
    unit: '1',
    basis: 'our-choice',
    note:
      'default share of the saturation pressure a partial pressure may reach before a ' +
      'condensation warning (a lab profile may set its own)',
  },
  inertCoefficientFallback: {
    value: 0.5,
    unit: '1',
    basis: 'published',
    source: 'iso-10156-2017',
    note:
      'nitrogen-equivalence coefficient used for an inert with none listed: the smallest ' +
      'listed K (Kr, Xe); a smaller K widens the flammable zone',
  },
  nfpa69LflFraction: {
    value: 0.6,
    unit: '1',
    basis: 'from-memory',
    source: 'nfpa-69-margins-memory',
    note: 'near the limit: fuel at or above this fraction of the LFL (instrumented practice)',
  },
  nfpa69LocOffset: {
    value: 0.02,
    unit: 'mole fraction',
    basis: 'from-memory',
    source: 'nfpa-69-margins-memory',
    note: 'near the limit: oxygen at or above LOC minus this, when the LOC is 5 % or more',
  },
  nfpa69LocFractionLow: {
    value: 0.6,
    unit: '1',
    basis: 'from-memory',
    source: 'nfpa-69-margins-memory',
    note: 'near the limit: oxygen at or above this fraction of the LOC, when the LOC is below 5 %',
  },
  nfpa69LowLocBelow: {
    value: 0.05,
    unit: 'mole fraction',
    basis: 'from-memory',
    source: 'nfpa-69-margins-memory',
    note: 'the LOC below which the fractional oxygen margin applies instead of the offset',
  },
  flammabilityDataMargin: {
    value: 0.1,
    unit: '1',
    basis: 'common-practice',
    note:
      'the uncertainty margin of the flammability limits: a state outside the listed envelope ' +
      'but inside it with the LFL and the LOC lowered by this share (fuel at 0.90 x LFL or more ' +
      'at enough O2, O2 at 0.90 x LOC or more at enough fuel), or whose flame temperature rise ' +
      'reaches this share short of the limit flame rise (calibrated on the same limits), is a ' +
      'warning, not shown non-flammable: handbook LFL and LOC values scatter by around 10 % ' +
      'between tables, apparatus and ignition energies (common practice), and the fill itself ' +
      'has errors (gauge, temperature, purity), so a state just below a listed limit may burn',
  },
  nearLimitFlameShare: {
    value: 0.6,
    unit: '1',
    basis: 'our-choice',
    note:
      'near the limit by flame temperature: a temperature rise of at least this share of the ' +
      "limit flame's rise (the same share as NFPA 69's LFL margin)",
  },
  detonableInertBelow: {
    value: 0.5,
    unit: 'mole fraction',
    basis: 'our-choice',
    note:
      'where no detonation limits are published, a flammable state with less N2-equivalent ' +
      'inert than this can detonate',
  },
  detonableOxygenShareFrom: {
    value: 0.2,
    unit: '1',
    basis: 'our-choice',
    note:
      '... or whose oxidizer is about as rich as air or richer, O2 / (O2 + N2-equivalent inert); ' +
      'stoichiometric alkane-air mixtures detonate in large enough geometries (common practice)',
  },
  pureOxygenShareFrom: {
    value: 0.99,
    unit: '1',
    basis: 'our-choice',
    note:
      'detonation limits published in O2 apply to an oxidizer at least this rich, O2 / (O2 + ' +
      'N2-equivalent inert): the trace inert of the cylinders (ppm of N2 in O2) does not switch ' +
      'them off; O2 diluted further is judged, inside them, by the conservative rule',
  },
  undilutedInertBelow: {
    value: 0.1,
    unit: 'mole fraction',
    basis: 'our-choice',
    note: 'a fuel/oxidizer state with less N2-equivalent inert than this counts as undiluted',
  },
  reflectedOverCj: {
    value: 2.5,
    unit: '1',
    basis: 'common-practice',
    note: 'reflected detonation pressure over the Chapman-Jouguet pressure (about 2.5)',
  },
  acetyleneLimitPa: {
    value: 101325 + 15 * PSI_PA,
    unit: 'Pa',
    basis: 'common-practice',
    source: 'acetylene-practice',
    note: 'acetylene outside the cylinder at no more than 15 psig (about 1 bar gauge), Pa absolute',
  },
  traceOxygen: {
    value: 1e-3,
    unit: 'mole fraction',
    basis: 'our-choice',
    note:
      'a fill segment with less O2-equivalent than this cannot burn: no fuel heats the gas by ' +
      'more than about 30 K (about 570 kJ per mol O2 at most, over cp of 20.8 J/mol K)',
  },
  traceFuelOfLfl: {
    value: 0.2,
    unit: '1',
    basis: 'our-choice',
    note:
      'a fill segment with less fuel than this share of the lowest LFL cannot burn ' +
      '(Burgess-Wheeler: LFL x heat of combustion about constant)',
  },
  releaseAirOxygen: {
    value: 0.21,
    unit: 'mole fraction',
    basis: 'common-practice',
    note:
      'O2 in the air a released tank gas mixes with (the rest N2): dry air holds 20.95 % O2, taken as ' +
      "21 %, the flammability diagram's air line; the gas is judged flammable in air on that mixing line",
  },
  releasePressurePa: {
    value: 101325,
    unit: 'Pa',
    basis: 'common-practice',
    note:
      'pressure at which a tank gas released into air is judged (one standard atmosphere: a leak or ' +
      'a vent mixes with the room air at about ambient pressure)',
  },
  psatExtrapolationK: {
    value: 10,
    unit: 'K',
    basis: 'our-choice',
    note: 'how far outside its fitted range an Antoine equation is used (said as extrapolated)',
  },
  psatEstimateNoteAbove: {
    value: 0.05,
    unit: '1',
    basis: 'our-choice',
    note:
      'an estimated saturation pressure is worth a note only where a partial pressure reaches ' +
      'this share of it',
  },
} as const satisfies Record<string, Threshold>;

export type ThresholdName = keyof typeof THRESHOLDS;

export const N2O_DECOMPOSITION_ABOVE_PA = THRESHOLDS.n2oDecompositionAbovePa.value;
export const N2O_OXYGEN_EQUIVALENT = THRESHOLDS.n2oOxygenEquivalent.value;
export const OXYGEN_ENRICHED_ABOVE = THRESHOLDS.oxygenEnrichedAbove.value;
export const OXYGEN_COMPRESSION_LIMIT_K = THRESHOLDS.oxygenCompressionK.value;
export const COMPRESSION_WARNING_MARGIN_K = THRESHOLDS.compressionWarningMarginK.value;
export const FUEL_SHARE_THAT_MATTERS = THRESHOLDS.fuelShareThatMatters.value;
export const FUEL_FRACTION_THAT_MATTERS = THRESHOLDS.fuelFractionThatMatters.value;
export const DEFAULT_CONDENSATION_FRACTION = THRESHOLDS.condensationFraction.value;
export const INERT_K_FALLBACK = THRESHOLDS.inertCoefficientFallback.value;
export const NEAR_LIMIT_FLAME_SHARE = THRESHOLDS.nearLimitFlameShare.value;
/**
 * the flammability data's uncertainty margin (thresholds table: common practice, handbook LFL and
 * LOC values scatter by around 10 %): a state within it of the LFL or the LOC is a warning
 */
export const FLAMMABILITY_DATA_MARGIN = THRESHOLDS.flammabilityDataMargin.value;
export const DETONABLE_INERT_BELOW = THRESHOLDS.detonableInertBelow.value;
export const DETONABLE_OXYGEN_SHARE_FROM = THRESHOLDS.detonableOxygenShareFrom.value;
export const UNDILUTED_INERT_BELOW = THRESHOLDS.undilutedInertBelow.value;
export const PURE_OXYGEN_SHARE_FROM = THRESHOLDS.pureOxygenShareFrom.value;
export const REFLECTED_OVER_CJ = THRESHOLDS.reflectedOverCj.value;
export const ACETYLENE_LIMIT_PA = THRESHOLDS.acetyleneLimitPa.value;
export const TRACE_OXYGEN = THRESHOLDS.traceOxygen.value;
export const TRACE_FUEL_OF_LFL = THRESHOLDS.traceFuelOfLfl.value;
export const RELEASE_AIR_OXYGEN = THRESHOLDS.releaseAirOxygen.value;
export const RELEASE_PRESSURE_PA = THRESHOLDS.releasePressurePa.value;
export const PSAT_EXTRAPOLATION_K = THRESHOLDS.psatExtrapolationK.value;
export const PSAT_ESTIMATE_NOTE_ABOVE = THRESHOLDS.psatEstimateNoteAbove.value;

/** NFPA 69 operating margins used for "near the limit" (the shape the review has always read) */
export const MARGINS = {
  /** fraction of the LFL (instrumented practice) */
  lflFraction: THRESHOLDS.nfpa69LflFraction.value,
  /** vol-fraction below the LOC when LOC >= 5 % */
  locOffset: THRESHOLDS.nfpa69LocOffset.value,
  /** fraction of the LOC when LOC < 5 % */
  locFractionLow: THRESHOLDS.nfpa69LocFractionLow.value,
  /** the LOC below which locFractionLow applies instead of locOffset */
  lowLocBelow: THRESHOLDS.nfpa69LowLocBelow.value,
  source: 'nfpa-69-margins-memory',
} as const;
