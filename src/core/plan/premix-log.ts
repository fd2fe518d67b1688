/**
 * A batch planned from a premix that already exists: a tank filled earlier (its batch log
 * re-checked by `check`'s model) is a source of the batch. The premix source carries the
 * re-check's composition and its whole GUM budget as composition terms (premix-source.ts), so the
 * batch's predicted U includes the premix's, correlations kept, and an instrument that read both
 * (a gauge's span and zero, the thermometer's offset) is one input of both stages
 * (CompositionTerm.shared). The planner is the single-tank planner (planFill) and its prediction
 * (predict.ts); the premix tank's falling pressure is the two-stage plan's delivery check
 * (premixDeliveryCheck), and a settled end below the batch reading the premix must reach (plus the
 * margin) is a refusal here: the gas is what it is, no search of the premix can make more of it.
 */
import type { Fractions } from '../composition.js';
import type { Finding } from '../findings.js';
import { planFill } from '../planner.js';
import { predictPlan, withPrediction, type PredictedPlan, type PredictionInput } from '../predict.js';
import { fail } from '../problems.js';
import type { GasSource } from '../supply.js';
import { bMix, cMix, densityFromPressure, virialModel } from '../mixture-eos.js';
import { inverseSetup, invertReadings } from '../recheck.js';
import type { CheckedReading, InTank } from '../uncertainty.js';
import { premixDeliveryCheck, type PremixDeliveryCheck } from './two-stage.js';
import { withDeliveryFindings } from '../supply-check.js';
import type { PlanInput, TankSpec } from './types.js';

/** a gas of the premix at or above this mole fraction must be a gas of the design (below: an impurity) */
const PREMIX_GAS_MIN = 1e-4;

export interface PremixLogPlanInput {
  /**
   * The batch as a single-tank request: design, batch tank, cylinders, gauges, tolerance. With
   * order 'given' its sources (and charges) are the fill order and must name the premix source;
   * with 'recommend' the premix replaces the cylinders of its minor gases and the sequence is
   * searched as for a two-stage plan's batch.
   */
  readonly batch: PlanInput;
  /** the premix as a source (premixSource: composition and budget of the premix log's re-check) */
  readonly premix: GasSource;
  /** the tank the premix is in */
  readonly premixTank: TankSpec;
  /** the premix tank's pressure before this batch draws from it, Pa absolute */
  readonly startPa: number;
  readonly thermometer: PredictionInput['thermometer'];
  /** what the refusals call the premix log (its path as named) */
  readonly log: string;
}

export interface PremixLogPlan {
  /** the batch, its prediction and findings (a premix-cools-low warning among them) */
  readonly batch: PredictedPlan;
  readonly source: GasSource;
  readonly delivery: PremixDeliveryCheck;
}

/** the gases of the premix besides the design's diluent (at PREMIX_GAS_MIN or more) */
export function premixMinorGases(premix: GasSource, diluent: Fractions): string[] {
  return Object.keys(premix.composition).filter(
    (k) => premix.composition[k] >= PREMIX_GAS_MIN && !(k in diluent),
  );
}

/**
 * Plan a batch that draws from an existing premix tank. Refuses (`premix-log-refused`) a premix in
 * the batch tank itself, a premix holding a gas the design does not, a given order that does not
 * name the premix, and a premix tank that would fall below the reading the batch needs from it.
 */
export function planFromPremix(input: PremixLogPlanInput): PremixLogPlan {
  const { batch: b, log } = input;
  // drawn from its tank: the plan (and its sequence search) judges the tank's falling pressure
  const premix: GasSource = {
    ...input.premix,
    supplyPressurePa: input.startPa,
    supplyTank: { id: input.premixTank.id, volumeM3: input.premixTank.volumeM3 },
  };
  const refuse = (cause: Extract<Parameters<typeof fail>[0], { code: 'premix-log-refused' }>['cause']) =>
    fail({ code: 'premix-log-refused', log, cause });
  if (input.premixTank.id === b.tank.id) refuse({ kind: 'same-tank', tank: b.tank.id });
  const design = Object.keys(b.design.composition).filter((k) => b.design.composition[k] > 0);
  const foreign = Object.keys(premix.composition).filter(
    (k) => premix.composition[k] >= PREMIX_GAS_MIN && !design.includes(k),
  );
  if (foreign.length) refuse({ kind: 'foreign-gas', species: foreign, design });
  let sources: readonly GasSource[];
  if (b.order === 'given') {
    if (!b.sources.some((s) => s.id === premix.id)) refuse({ kind: 'not-in-order', source: premix.id });
    sources = b.sources.map((s) => (s.id === premix.id ? premix : s));
  } else {
    const minor = premixMinorGases(premix, b.design.groups.diluent);
    sources = [...b.sources.filter((s) => s.id !== premix.id && !minor.includes(s.mainSpecies)), premix];
  }
  const charges = b.charges?.map((c) => (c.source.id === premix.id ? { ...c, source: premix } : c));
  const plan = planFill({ ...b, sources, charges: b.order === 'given' ? charges : undefined });
  const predicted = withPrediction(
    plan,
    predictPlan({ plan, gauges: b.gauges, reading: b.reading, thermometer: input.thermometer }),
  );
  const { check, findings } = premixDeliveryCheck(predicted, premix, input.premixTank, input.startPa);
  const low = findings.find((f): f is Finding & { code: 'premix-runs-low' } => f.code === 'premix-runs-low');
  if (low)
    refuse({
      kind: 'too-little-gas',
      tank: input.premixTank.id,
      startPa: input.startPa,
      endPa: low.endPa,
      targetPa: check.targetPa,
      requiredPa: check.requiredPa,
      deliveredMol: check.deliveredMol,
    });
  return {
    batch: { ...predicted, findings: withDeliveryFindings(predicted.findings, findings) },
    source: premix,
    delivery: check,
  };
}

/** a batch's premix log as the plan reports it (the shell fills in the record's particulars) */
export interface PremixLogUse {
  /** the premix log as named (recipe: relative to the recipe file; option: as typed) */
  readonly log: string;
  /** the premix log's absolute path */
  readonly path: string;
  /** the hash link of the log's last entry (its chain): the batch log records it */
  readonly lastEntrySha256: string;
  readonly source: GasSource;
  readonly tank: TankSpec;
  /** the re-checked mole fractions (identified species) and their standard uncertainties */
  readonly composition: Fractions;
  readonly u: Fractions;
  /** the premix log's last reading, Pa absolute */
  readonly lastReadingPa: number;
  /** what other batch logs that name this premix log drew from it (real gas), subtracted */
  readonly draws: readonly { readonly log: string; readonly mol: number }[];
  readonly delivery: PremixDeliveryCheck;
}

/**
 * The amount a batch drew from one source, mol: for each of its readings from that source, the
 * tank's real-gas density after the reading less the density before it (the re-check's inverse
 * model, recheck.ts), times the batch tank's volume.
 */
export function amountDrawn(
  readings: readonly CheckedReading[],
  sourceId: string,
  volumeM3: number,
  initial?: InTank,
): number {
  if (!readings.some((r) => r.source.id === sourceId)) return 0;
  const setup = inverseSetup(
    readings.map((r) => ({ source: r.source, pressurePa: r.pressurePa, temperatureK: r.temperatureK })),
    initial,
  );
  const { rho } = invertReadings(
    setup,
    undefined,
    readings.map((r) => r.pressurePa),
  );
  let before = initial ? initialDensity(initial) : 0;
  let mol = 0;
  readings.forEach((r, k) => {
    if (r.source.id === sourceId) mol += (rho[k] - before) * volumeM3;
    before = rho[k];
  });
  return mol;
}

/** the density of the gas in the tank before the first fill (virial equation at its reading) */
function initialDensity(g: InTank): number {
  const species = Object.keys(g.composition).filter((k) => g.composition[k] > 0);
  const m = virialModel(species, g.temperatureK);
  return densityFromPressure(g.pressurePa, g.temperatureK, bMix(m, g.composition), cMix(m, g.composition));
}
