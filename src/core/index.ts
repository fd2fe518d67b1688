/**
 * The public face of the core. Shells (io, report, cli, tui) import from here
 * only; every name is listed explicitly.
 */
export { R, ATM_PA, TORR_PA } from './constants.js';
export { SPECIES } from './data/species.js';
export type { SpeciesRecord, PolarClass } from './data/species.js';
export { SOURCES, SOURCE_PRIORITY, getSource } from './data/sources.js';
export type { Source, SourceQuality } from './data/sources.js';
export { ELEMENTS } from './data/elements.js';
export type { ElementRecord } from './data/elements.js';
export { molarMassKgPerMol, oxygenDemand } from './formula.js';
export { getSpecies, lookup, resolveSpeciesKey, speciesKeys, suggestSpecies, PROPERTY_NAMES } from './lookup.js';
export type { PropertyName, PropertyValue } from './lookup.js';
export { ProblemError, fail, relocate } from './problems.js';
export type { Problem, ProblemCode, Where } from './problems.js';
export { describeProblem, describeProblemAt, describeWhere } from './messages.js';
export { designMixture, equivalenceRatio, isNormalised, speciesRole } from './composition.js';
export type { Design, DesignInput, DilutionBasis, Fractions, SpeciesRole } from './composition.js';
export { tsonopoulosB, pairConstants, correlationConstants, polarConstants, reducedDipole } from './virial.js';
export type { CorrelationConstants } from './virial.js';
export { referenceB, referenceC, hasReferenceB, VIRIAL_TABLE_RANGE_K, VIRIAL_TABLE_LIBRARY } from './virial-reference.js';
export { virialModel, bMix, cMix, pressureFromDensity, densityFromPressure, compressibility } from './mixture-eos.js';
export type { VirialModel, VirialEntry, VirialMethod } from './mixture-eos.js';
export { cpMolar, enthalpyMolar, entropyMolar, gammaMixture, hasThermo, thermoRangeK } from './thermo.js';
export { nnls } from './nnls.js';
export type { NnlsResult } from './nnls.js';
export { allocate, chooseSources, orderSources, premix, pureCylinder } from './supply.js';
export type { Allocation, GasSource, SourceKind } from './supply.js';
export { canRead, chooseGauge, gaugeReadingPa, gaugeTopAbsolutePa, readingUncertaintyPa } from './gauges.js';
export type { Gauge, GaugeReference, ReadingContext } from './gauges.js';
export { fillLabel, planFill, MODEL_T_RANGE_K, MAX_NON_IDEALITY } from './planner.js';
export type { GaugeAssignment, Plan, PlanInput, PlanStep, TankSpec, Tolerance } from './planner.js';
export { STANDING_CAUTION, describeFinding, worstSeverity } from './findings.js';
export type { Finding, FindingCode, FlammabilityNumbers, PressureFormatter, Severity } from './findings.js';
export { assessFlammability, blendLimits, leChatelier, diagramPoint, envelopePolygon, insidePolygon, limitFlameTemperatureK, worseVerdict } from './flammability.js';
export type { BlendLimits, DiagramPoint, FlammabilityAssessment, Verdict } from './flammability.js';
export { adiabaticCompressionK, closedVesselCombustion, completeCombustion, flameTemperatureK } from './combustion.js';
export { antoinePa, leeKeslerPa, saturationPressure, wagnerPa, waterPsatPa } from './vapour-pressure.js';
export type { Psat, PsatMethod } from './vapour-pressure.js';
export { reviewFill, reviewFillSequence, reviewState } from './safety.js';
export type { FillEvent, SafetyContext, TankState } from './safety.js';
export { adviseOrder, isSaferThan, scoreGivenOrder, sequenceOf } from './order.js';
export type { OrderAdvice, OrderScore } from './order.js';
export { FUEL_SAFETY, INERT_K, MARGINS, ACETYLENE_LIMIT_PA } from './data/safety-data.js';
export type { FuelSafetyRecord, SourcedNumber } from './data/safety-data.js';
export { ANTOINE, WAGNER, IAPWS_WATER } from './data/vapour-data.js';
