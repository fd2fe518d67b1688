/**
 * The public face of the core. Shells (io, report, cli, tui) import from here
 * only; every name is listed explicitly.
 */
export { R, ATM_PA, TORR_PA } from './constants.js';
export { SPECIES } from './data/species.js';
export type { SpeciesRecord, PolarClass } from './data/species.js';
export { SOURCES, getSource } from './data/sources.js';
export type { Source, SourceQuality } from './data/sources.js';
export { ELEMENTS } from './data/elements.js';
export type { ElementRecord } from './data/elements.js';
export { molarMassKgPerMol, oxygenDemand } from './formula.js';
export {
  getSpecies,
  lookup,
  resolveSpeciesKey,
  speciesKeys,
  suggestSpecies,
  PROPERTY_NAMES,
} from './lookup.js';
export { rankSpecies } from './lookup.js';
export type { PropertyName, PropertyValue } from './lookup.js';
export { ProblemError, fail, relocate } from './problems.js';
export type { PremixLogCause, Problem, ProblemCode, Where } from './problems.js';
export type {
  FieldIssue,
  ListFault,
  LockHolder,
  LogFault,
  ReadCause,
  ShownValue,
  WriteCause,
  YamlFault,
  StopFault,
} from './problems.js';
export { describeProblem, describeProblemAt, describeWhere, formatNumber } from './messages.js';
export { designMixture, equivalenceRatio, isNormalised, oxygenBalance, speciesRole } from './composition.js';
export type { Design, DesignInput, DilutionBasis, Fractions, SpeciesRole } from './composition.js';
export {
  tsonopoulosB,
  pairConstants,
  correlationConstants,
  polarConstants,
  reducedDipole,
  sizeDifferenceKij,
} from './virial.js';
export type { CorrelationConstants } from './virial.js';
export {
  referenceB,
  referenceC,
  hasReferenceB,
  referenceCrossB,
  referenceCrossC,
  referenceCrossPartners,
  VIRIAL_TABLE_RANGE_K,
  VIRIAL_TABLE_LIBRARY,
  CROSS_TABLE_LIBRARY,
} from './virial-reference.js';
export {
  virialModel,
  bMix,
  cMix,
  pressureFromDensity,
  densityFromPressure,
  compressibility,
  VIRIAL_U,
  virialU,
} from './mixture-eos.js';
export type { VirialModel, VirialEntry, VirialMethod, ThirdVirialPair } from './mixture-eos.js';
export { cpMolar, enthalpyMolar, entropyMolar, gammaMixture, hasThermo, thermoRangeK } from './thermo.js';
export { nnls } from './nnls.js';
export type { NnlsResult, NnlsOptions } from './nnls.js';
export {
  allocate,
  chooseSources,
  orderCharges,
  premix,
  premixFindings,
  pureCylinder,
  sourcesByName,
  sourcesFromList,
} from './supply.js';
export type { Allocation, GasSource, OrderEntry, OrderedCharges, SourceKind } from './supply.js';
export { canRead, chooseGauge, gaugeReadingPa, gaugeTopAbsolutePa, readingUncertaintyPa } from './gauges.js';
export type { Gauge, GaugeReference, ReadingContext } from './gauges.js';
export { fillLabel, planFill, MODEL_T_RANGE_K, MAX_NON_IDEALITY } from './planner.js';
export type {
  ChargeRequest,
  GaugeAssignment,
  Plan,
  PlanInput,
  PlanStep,
  TankSpec,
  Tolerance,
} from './planner.js';
export { STANDING_CAUTION, describeFinding, worstSeverity } from './findings.js';
export type {
  ClosedVesselNumbers,
  DetonationNumbers,
  Finding,
  FindingCode,
  FlammabilityNumbers,
  PressureFormatter,
  Severity,
} from './findings.js';
export { GIVEN_VOLUME_TANK } from './findings.js';
export {
  assessFlammability,
  blendLimits,
  leChatelier,
  diagramPoint,
  envelopePolygon,
  flameShareOf,
  flameShareToLimit,
  insidePolygon,
  limitFlameTemperatureK,
  locFlameTemperatureK,
  richLimitCalibration,
  uflAtOxygenShare,
  leanLimitAtOxygen,
  uflRisesWithPressure,
  worseVerdict,
} from './flammability.js';
export type {
  BlendLimits,
  DiagramPoint,
  FlammabilityAssessment,
  FlammabilityDistance,
  RichCalibration,
  Verdict,
} from './flammability.js';
export {
  adiabaticCompressionK,
  closedVesselCombustion,
  completeCombustion,
  flameTemperatureK,
} from './combustion.js';
export {
  equilibriumGaps,
  equilibriumHP,
  equilibriumTP,
  equilibriumUV,
  EQUILIBRIUM_SPECIES_COUNT,
} from './equilibrium.js';
export type { EquilibriumState } from './equilibrium.js';
export { chapmanJouguet, detonability } from './detonation.js';
export type { ChapmanJouguet, Detonability } from './detonation.js';
export {
  DETONATION_LIMITS,
  DETONABLE_INERT_BELOW,
  REFLECTED_OVER_CJ,
  UNDILUTED_INERT_BELOW,
} from './data/detonation-data.js';
export type { DetonationLimits } from './data/detonation-data.js';
export {
  closedVesselFinding,
  detonationFinding,
  equilibriumFlameK,
  QUICK_CJ_MARGIN,
} from './explosion-review.js';
export { antoinePa, leeKeslerPa, saturationPressure, wagnerPa, waterPsatPa } from './vapour-pressure.js';
export type { Psat, PsatMethod } from './vapour-pressure.js';
export { reviewFill, reviewFillSequence, reviewState } from './safety.js';
export { detonableByRule } from './safety.js';
export {
  bulkPressure,
  mix,
  detonableStretchFinding,
  reviewBulkPath,
  reviewFillPath,
  reviewInlet,
  reviewSegment,
} from './fill-path.js';
export type { PathPoint, PathRank, SegmentReview } from './fill-path.js';
// the finished tank gas's own hazards: flammable in air, oxygen-enriched
export {
  flammableInAir,
  inAirFinding,
  oxygenEnriched,
  oxygenEquivalent,
  RELEASE_AIR,
  type InAirReview,
  type InAirVerdict,
} from './tank-gas.js';
export { fuelsThatMatter, reviewCompression, OXYGEN_COMPRESSION_LIMIT_K } from './compression.js';
export type { FillEvent, SafetyContext, TankState } from './safety.js';
export { adviseOrder, isSaferThan, scoreGivenOrder, sequenceOf } from './order.js';
export type { OrderAdvice, OrderScore } from './order.js';
export { FUEL_SAFETY, INERT_K, MARGINS, ACETYLENE_LIMIT_PA } from './data/safety-data.js';
export type { FuelSafetyRecord, SourcedNumber } from './data/safety-data.js';
export { ANTOINE, WAGNER, IAPWS_WATER } from './data/vapour-data.js';
export { xoshiro128ss } from './prng.js';
export type { Rng } from './prng.js';
export { inverseSetup, invertReadings, workspaceFor } from './recheck.js';
export type { InverseResult, InverseSetup, Perturbation, ReadingInput, Workspace } from './recheck.js';
export {
  evaluateUncertainty,
  MC_STREAMS,
  monteCarloSamples,
  nominalOutputs,
  numericalTolerance,
  streamSeed,
  streamTrials,
} from './uncertainty.js';
export type {
  CheckedReading,
  InputComponent,
  OutputStat,
  UncertaintyResult,
  UncertaintySettings,
} from './uncertainty.js';
export { judge, withReadingsPastRange, worstAgainstTolerance } from './verdict.js';
export type {
  CheckVerdict,
  FractionAgainstTolerance,
  ReadingPastRange,
  SpeciesDeviation,
  VerdictKind,
} from './verdict.js';
export { retarget, ventBack } from './retarget.js';
export type { Kept, RetargetInput, RetargetResult, VentBack } from './retarget.js';
export type { RetargetCharge, RetargetStop } from './retarget.js';
export { chapmanEnskogD, diffusionMixingTimeS, fullerD, neufeldOmegaD, slowestPair } from './diffusion.js';
export type { PairDiffusion } from './diffusion.js';
export {
  batchSizeFinding,
  drawDownPressures,
  experimentsServed,
  finalPressureForExperiments,
  sizingBasis,
} from './sizing.js';
export type { ReactorSpec, Sizing, SizingInput } from './sizing.js';
export { contamination, drawDown, ingressPerDayAt, mixingEstimate } from './readiness.js';
export type {
  Contamination,
  ContaminationInput,
  DrawDown,
  DrawDownInput,
  DrawnState,
  MixingEstimate,
} from './readiness.js';
export { LENNARD_JONES, FULLER_VOLUMES } from './data/transport-data.js';
export { speciesProperties } from './properties.js';
export type { PropertyId, PropertyRow } from './properties.js';
// defaults and thresholds of the safety review, each with its basis
export { THRESHOLDS } from './thresholds.js';
export type { Threshold, ThresholdBasis, ThresholdName } from './thresholds.js';
// data coverage: the tables each species needs and the explicit "not known" entries
export {
  coverageGaps,
  FUEL_TABLES,
  NOT_KNOWN,
  notKnown,
  onFile,
  SPECIES_TABLES,
  TABLE_FILE,
} from './data/coverage.js';
export type { DataTable, NotKnown } from './data/coverage.js';
export { transportGaps } from './diffusion.js';
// the predicted uncertainty of a plan, and the re-check's model input it shares with check
export {
  DEFAULT_TEMPERATURE_SETTLING_K,
  plannedModelInput,
  predictionFindings,
  bandEdgesFinding,
  bandEdgeStacks,
  withBandEdges,
  predictionOf,
  predictPlan,
  withPrediction,
} from './predict.js';
export type {
  PlanPrediction,
  PredictedContribution,
  PredictedQuantity,
  PredictedRow,
  PredictedPlan,
  PredictionInput,
} from './predict.js';
export { contributionAdvice } from './predict-words.js';
export { READING_TEMPERATURE_RANGE_K, recheckModelInput } from './recheck-input.js';
export type { RecheckBasis, RecheckModelInput, RecheckRecord } from './recheck-input.js';
export type { ComponentAbout, InTank, MonteCarloJob } from './uncertainty.js';
// two-stage preparation: a premix in a second tank, then the batch from it
export { allStageFindings, planTwoStage, premixDeliveryCheck } from './plan/two-stage.js';
export type {
  PremixChoice,
  PremixDeliveryCheck,
  TwoStageInput,
  TwoStagePlan,
  TwoStageSearch,
} from './plan/two-stage.js';
export { compositionTermsOf, premixSource } from './plan/premix-source.js';
export type { PremixSourceArgs } from './plan/premix-source.js';
export { amountDrawn, planFromPremix, premixMinorGases } from './plan/premix-log.js';
export type { PremixLogPlan, PremixLogPlanInput, PremixLogUse } from './plan/premix-log.js';
export {
  premixDelivery,
  premixMixingElapsed,
  premixStartForEndPa,
  PREMIX_DELIVERY_MARGIN,
  PREMIX_STIR_MIN_S,
} from './premix-tank.js';
export type { Delivery, DeliveryInput, StartForEndInput } from './premix-tank.js';
export type { CompositionTerm, SharedInstrument } from './supply.js';
export { chargeNumbers } from './plan/charges.js';
// the guided fill of a two-stage preparation: its refusals (worded in stage-words.ts)
export type { StageFillCause, StageProblem } from './problems.js';
// the safety review of a sequence, shared by the plan and the guided fill's re-targeted remainder
export { reviewSequence, sequenceEvents } from './sequence-review.js';
export type { SequenceFill, SequenceStart } from './sequence-review.js';
export { hazardKey, isSequenceHazard, reviewBelowBand, reviewRemainder } from './remainder-review.js';
export type {
  PlannedFinding,
  RemainderReview,
  RemainderReviewInput,
  SaferStop,
  Continuation,
  BelowBandReview,
} from './remainder-review.js';
export { roundUpToGrid } from './reading-grid.js';
export type { ReadingGrid } from './reading-grid.js';
export { recordedStates, reviewRecordedFill, type ReadingTemperatures } from './recorded-review.js';
export type {
  RecordedFillInput,
  RecordedFillReview,
  RecordedReading,
  RecordedState,
} from './recorded-review.js';
