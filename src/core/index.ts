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
export { fillLabel, planFill, recommendOrder } from './planner.js';
export type { GaugeAssignment, Plan, PlanInput, PlanStep, TankSpec, Tolerance } from './planner.js';
export { STANDING_CAUTION, describeFinding, worstSeverity } from './findings.js';
export type { Finding, FindingCode, PressureFormatter, Severity } from './findings.js';
