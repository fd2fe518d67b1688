/**
 * Two-stage preparation: a premix of one or more minor gases in the diluent is made first in a
 * second tank (stage 1), then the batch is filled from it (stage 2). A small fill that a single
 * tank reads as the difference of two large readings is then read as a large fill of the premix,
 * and the premix's own fills are read where the gauges are good.
 *
 * Both stages are planned by the planner (planFill: the same sequence, targets, gauges and safety
 * review of every state and fill path as any plan) and predicted by the re-check's own model
 * (predict.ts). The premix enters the batch as a source whose composition is stage 1's predicted
 * composition and whose uncertainty is stage 1's budget (premix-source.ts), so the batch's
 * predicted U includes the premix's. The premix tank's falling pressure while it delivers is
 * checked against the batch reading it must reach (premix-tank.ts).
 *
 * Without a choice from the caller the premix is searched: which minor gas, its fraction in the
 * premix (matched to the design's ratio to the diluent, or richer with a diluent fill in the
 * batch), its final pressure and the gauge heads that read it. The chosen one has the smallest
 * worst ratio U / tolerance over the batch's design fractions among those with no danger.
 */
import type { Finding } from '../findings.js';
import { designMixture, speciesRole, type Fractions } from '../composition.js';
import { canRead, type Gauge } from '../gauges.js';
import type { GasSource } from '../supply.js';
import { planFill, sharedStages, type SharedStages } from '../planner.js';
import { predictPlan, withPrediction, type PredictedPlan, type PredictionInput } from '../predict.js';
import { fail, ProblemError, type Problem } from '../problems.js';
import { hazardRank, tankDelivery, withDeliveryFindings, type PremixDeliveryCheck } from '../supply-check.js';
export type { PremixDeliveryCheck } from '../supply-check.js';
import { premixSource } from './premix-source.js';
import type { UncertaintyResult } from '../uncertainty.js';
import { countsAgainstSequence } from './search-eval.js';
import type { Plan, PlanInput, TankSpec } from './types.js';
import { refusePremixAboveRating } from './validate.js';

export interface TwoStageInput {
  /** the batch as a single-tank request: design, batch tank, cylinders, gauges, tolerance */
  readonly batch: PlanInput;
  /** the second tank the premix is made in */
  readonly premixTank: TankSpec;
  readonly thermometer: PredictionInput['thermometer'];
  /** the gases the premix carries besides the diluent; default: searched (each minor gas alone) */
  readonly premixSpecies?: readonly string[];
  /** the premix tank's final pressure, Pa absolute; default: searched */
  readonly premixPressurePa?: number;
  /** the mole fraction of the premix's gases (besides the diluent) in the premix; default: searched */
  readonly premixFraction?: number;
  /** stage 1's order; default: searched */
  readonly premixOrder?: PremixChoice['order'];
}

/** what was chosen for the premix */
export interface PremixChoice {
  readonly species: readonly string[];
  /** the premix's composition (design of stage 1) */
  readonly composition: Fractions;
  /** true when the premix holds its gases in the design's ratio to the diluent (no diluent fill in the batch) */
  readonly matched: boolean;
  readonly pressurePa: number;
  /** the gauge heads stage 1 may read on (all the lab's, or one head for every reading) */
  readonly gauges: readonly string[];
  /** stage 1's order: the minor gases first (each read alone), or the planner's recommended order */
  readonly order: 'minor-first' | 'recommended';
}

export interface TwoStagePlan {
  /** stage 1: the premix in the second tank */
  readonly premix: PredictedPlan;
  /** stage 2: the batch, with the premix as a source (its findings include the delivery check's) */
  readonly batch: PredictedPlan;
  /** the premix as the batch's source (composition and uncertainty from stage 1) */
  readonly source: GasSource;
  readonly choice: PremixChoice;
  readonly delivery: PremixDeliveryCheck;
  /** the largest predicted U / tolerance over the batch's design fractions (Infinity: no prediction) */
  readonly worstRatio: number;
  /** premix choices planned in the search */
  readonly candidates: number;
  /**
   * the most precise choice without a danger, when it is not the one chosen (it has more warnings):
   * the user may weigh them and fix its pressure, gas and order
   */
  readonly mostPrecise?: {
    readonly choice: PremixChoice;
    readonly worstRatio: number;
    readonly warnings: readonly Finding['code'][];
    /** its notes that the chosen choice does not have */
    readonly notes: readonly Finding['code'][];
  };
}

/** fractions of the premix tried, as multiples of the matched fraction (capped at PREMIX_MAX_FRACTION) */
const FRACTION_FACTORS = [1, 3, 10] as const;
/** our own cap: a premix stays mostly diluent */
const PREMIX_MAX_FRACTION = 0.5;
/** premix final pressures tried, as fractions of the premix tank's working limit */
const PRESSURE_FRACTIONS = [0.9, 0.6, 0.4] as const;
/** room for the choices of one composition in a choice's place in the enumeration (planTwoStage) */
const ORD_STRIDE = 1e6;

/** the batch's worst predicted U / tolerance over its design fractions */
function worstRatioOf(p: PredictedPlan): number {
  const rows = p.predicted?.rows.filter((r) => r.kind === 'fraction') ?? [];
  return rows.length ? Math.max(...rows.map((r) => r.expandedU / r.tolerance)) : Infinity;
}

function hasDanger(...fs: (readonly Finding[])[]): boolean {
  return fs.some((f) => f.some((x) => x.severity === 'danger'));
}

/** the premix tank's working limit: rating times working fraction, else the highest gauge's top */
function premixLimitPa(tank: TankSpec, gauges: readonly Gauge[]): number {
  if (tank.ratedPressurePa !== undefined) return tank.ratedPressurePa * (tank.workingFraction ?? 1);
  return Math.max(...gauges.map((g) => g.fullScalePa + (g.reference === 'gauge' ? 101325 : 0)));
}

/** the diluent group of the design and the premix compositions to try for the given minor gases */
function premixCompositions(
  input: TwoStageInput,
  species: readonly string[],
): { x: Fractions; matched: boolean }[] {
  const { design } = input.batch;
  const dil = design.groups.diluent;
  const dilSum = Object.values(dil).reduce((a, b) => a + b, 0);
  const minor = species.reduce((a, k) => a + (design.composition[k] ?? 0), 0);
  if (!(dilSum > 0) || !(minor > 0)) return [];
  const matched = minor / (minor + design.diluentFraction);
  const out: { x: Fractions; matched: boolean }[] = [];
  const given = input.premixFraction;
  if (given !== undefined && !(given > 0 && given < 1))
    fail(
      { code: 'out-of-range', what: 'premix fraction', value: given, allowed: '(0, 1)' },
      { field: 'premix.fraction' },
    );
  const fractions = given !== undefined ? [given] : FRACTION_FACTORS.map((k) => k * matched);
  for (const f of fractions) {
    const factor = f / matched;
    if (given === undefined && factor > 1 && f > PREMIX_MAX_FRACTION) continue;
    const x: Record<string, number> = {};
    for (const k of species) x[k] = (f * (design.composition[k] ?? 0)) / minor;
    for (const [k, v] of Object.entries(dil)) x[k] = (x[k] ?? 0) + ((1 - f) * v) / dilSum;
    out.push({ x, matched: Math.abs(factor - 1) < 1e-6 });
  }
  return out;
}

/** the stage-1 gauge choices: all heads, or one head that reads every reading up to the premix pressure */
function gaugeChoices(input: TwoStageInput, pressurePa: number): Gauge[][] {
  const all = input.batch.gauges;
  const single = all.filter((g) => canRead(g, pressurePa, input.batch.reading)).map((g) => [g]);
  return [[...all], ...single];
}

function predicted(plan: ReturnType<typeof planFill>, input: TwoStageInput): PredictedPlan {
  const b = input.batch;
  const p = predictPlan({ plan, gauges: b.gauges, reading: b.reading, thermometer: input.thermometer });
  return withPrediction(plan, p);
}

/**
 * The delivery check: the premix tank's pressure after the batch's premix charges, against the
 * reading its last charge must reach plus PREMIX_DELIVERY_MARGIN; the plan's own supply check
 * (supply-check.ts, which the sequence search applies to every candidate).
 */
export function premixDeliveryCheck(
  batch: Plan,
  source: GasSource,
  premixTank: TankSpec,
  startPa: number,
): { check: PremixDeliveryCheck; findings: Finding[] } {
  const charges = batch.steps.map((s) => ({ ...s, step: s.index }));
  return tankDelivery(source, premixTank, startPa, charges, batch.temperatureK);
}

/**
 * stage 2 planned once per premix composition: the premix source stands in with its nominal
 * composition, in the advised order (the order advice, without the sequence search): the premix
 * choices are ranked on it, and the chosen one's batch gets the full search (`replanned`)
 */
interface BatchDraft {
  readonly plan: ReturnType<typeof planFill>;
  readonly sourceId: string;
  /** the premix source as the draft has it: the nominal composition */
  readonly source: GasSource;
}

function premixId(input: TwoStageInput): string {
  return `premix-${input.premixTank.id}`;
}

/** the batch's sources other than the gases the premix brings */
function othersThan(input: TwoStageInput, choice: Pick<PremixChoice, 'species' | 'matched'>): GasSource[] {
  const b = input.batch;
  const dil = new Set(Object.keys(b.design.groups.diluent));
  return b.sources.filter(
    (s) => !choice.species.includes(s.mainSpecies) && !(choice.matched && dil.has(s.mainSpecies)),
  );
}

/**
 * The chosen batch planned again with the premix as stage 1 makes it (its uncertainty
 * included): the draft's sequence search saw the premix as exact, so its choice and the
 * numbers it states are redone with the source the prediction uses.
 */
function replanned(input: TwoStageInput, c: TwoStagePlan): TwoStagePlan {
  const b = input.batch;
  const plan = planFill({
    ...b,
    sources: [...othersThan(input, c.choice), c.source],
    order: 'recommend',
    charges: undefined,
  });
  const stage2 = predicted(plan, input);
  const { check, findings } = premixDeliveryCheck(stage2, c.source, input.premixTank, c.choice.pressurePa);
  const batch: PredictedPlan = { ...stage2, findings: withDeliveryFindings(stage2.findings, findings) };
  return { ...c, batch, delivery: check, worstRatio: worstRatioOf(batch) };
}

/** the gases a premix is made of: its stage-1 design's species (they name its fills) */
const premixGases = (choice: Pick<PremixChoice, 'composition'>) =>
  Object.keys(choice.composition).filter((k) => choice.composition[k] > 0);

function planBatchDraft(
  input: TwoStageInput,
  choice: Pick<PremixChoice, 'species' | 'matched' | 'composition'>,
  premixGas: { composition: Fractions; unidentified: number; pressurePa: number },
): BatchDraft {
  const b = input.batch;
  const others = othersThan(input, choice);
  const draft = premixSource({
    id: premixId(input),
    gases: premixGases(choice),
    tank: input.premixTank.id,
    tankVolumeM3: input.premixTank.volumeM3,
    ...premixGas,
  });
  // no thermometer: the advice's order, not the sequence search (run once, for the chosen premix)
  const plan = planFill({
    ...b,
    sources: [...others, draft],
    order: 'recommend',
    charges: undefined,
    thermometer: undefined,
  });
  return { plan, sourceId: draft.id, source: draft };
}

/** stage 1 for one choice: the premix planned in its tank, in the order and on the heads chosen (not yet predicted) */
function premixPlan(
  input: TwoStageInput,
  choice: PremixChoice,
  gauges: readonly Gauge[],
  shared?: SharedStages,
): Plan {
  const b = input.batch;
  const cylinders = b.sources.filter(
    (s) => s.kind !== 'premix' && s.kind !== 'in-tank' && s.mainSpecies in choice.composition,
  );
  // minor gases first: each is read alone on an evacuated tank, where a small fill is read best
  const sources =
    choice.order === 'minor-first'
      ? [...cylinders].sort((a, c) => choice.composition[a.mainSpecies] - choice.composition[c.mainSpecies])
      : cylinders;
  const plan = planFill(
    {
      design: designMixture({ kind: 'fractions', fractions: choice.composition }),
      finalPressurePa: choice.pressurePa,
      temperatureK: b.temperatureK,
      tank: input.premixTank,
      sources,
      order: choice.order === 'minor-first' ? 'given' : 'recommend',
      safety: b.safety,
      gauges,
      manifoldGauges: b.gauges,
      reading: b.reading,
      tolerance: b.tolerance,
    },
    shared,
  );
  // the order is the premix choice's, not the user's: say why, not "as given", and name it so in
  // the safer-order warning; not "recommended" either (orderRecommended false for a given order)
  if (choice.order !== 'minor-first') return plan;
  const of = `the premix's order (minor gases first: ${plan.steps.map((s) => s.species).join(' -> ')})`;
  const findings = plan.findings.map((f) => (f.code === 'safer-order' ? { ...f, of } : f));
  return { ...plan, orderReason: MINOR_FIRST_REASON, findings };
}

/** the order reason of a premix filled minor gases first */
export const MINOR_FIRST_REASON =
  'minor gases first, the premix choice: each is read alone on the evacuated tank, where a small fill is read best';

/**
 * What stage 2 depends on of a stage 1: its final pressure, readings, heads and findings. Two choices
 * of the same premix composition with the same stage 1 (the planner put every reading on the same head
 * either way) make the same batch, so the later one can rank neither better nor more precise.
 */
function stageOneKey(choice: PremixChoice, stage1: Plan): string {
  const steps = stage1.steps.map((s) => [s.source.id, s.targetPa, s.gauge?.id ?? '']);
  return JSON.stringify([choice.pressurePa, steps, stage1.findings]);
}

/**
 * both stages for one choice: stage 1, the premix source from its prediction, the batch draft
 * predicted with it; undefined when an earlier choice in `seen` had the same stage 1 (stageOneKey)
 */
function planChoice(
  input: TwoStageInput,
  choice: PremixChoice,
  gauges: readonly Gauge[],
  draft: BatchDraft,
  seen: Set<string>,
  mayWin?: (known: readonly Finding[]) => boolean,
  planned?: { plan: Plan; predicted?: PredictedPlan },
  shared?: SharedStages,
): TwoStagePlan | undefined {
  const plan1 = planned?.plan ?? premixPlan(input, choice, gauges, shared);
  // equal stage-1 plans have equal predictions (the same model on the same readings)
  const key = stageOneKey(choice, plan1);
  if (seen.has(key)) return undefined;
  seen.add(key);
  const sourceWith = (budget?: UncertaintyResult) =>
    premixSource({
      id: draft.sourceId,
      gases: premixGases(choice),
      tank: input.premixTank.id,
      tankVolumeM3: input.premixTank.volumeM3,
      composition: plan1.composition,
      unidentified: plan1.unidentifiedFraction,
      pressurePa: choice.pressurePa,
      budget,
    });
  // the draft's premix stands in for the premix as stage 1 makes it: same id, the predicted composition
  const stand = (source: GasSource) => ({
    ...draft.plan,
    steps: draft.plan.steps.map((s) => (s.source.id === source.id ? { ...s, source } : s)),
  });
  if (mayWin) {
    // every finding but the predictions' (which only add warnings): enough to see a choice that cannot
    // win, before either stage is predicted (the delivery does not depend on the premix's budget)
    const bare = sourceWith();
    const d = premixDeliveryCheck(stand(bare), bare, input.premixTank, choice.pressurePa);
    if (!mayWin([...plan1.findings, ...withDeliveryFindings(draft.plan.findings, d.findings)]))
      return undefined;
  }
  const stage1 = planned?.predicted ?? predicted(plan1, input);
  const source = sourceWith(stage1.predicted?.result);
  const unpredicted = stand(source);
  const { check, findings } = premixDeliveryCheck(unpredicted, source, input.premixTank, choice.pressurePa);
  const stage2 = predicted(unpredicted, input);
  const batch: PredictedPlan = { ...stage2, findings: withDeliveryFindings(stage2.findings, findings) };
  return {
    premix: stage1,
    batch,
    source,
    choice,
    delivery: check,
    worstRatio: worstRatioOf(batch),
    candidates: 1,
  };
}

/**
 * The minor gases a premix may carry, each alone: the caller's, else those the single-tank plan
 * predicts over tolerance (all minor gases when it has no prediction or none is over).
 */
function speciesChoices(input: TwoStageInput, single: PredictedPlan | undefined): (readonly string[])[] {
  if (input.premixSpecies) return [input.premixSpecies];
  const { design } = input.batch;
  const dil = design.groups.diluent;
  const minor = Object.keys(design.composition).filter(
    (k) => design.composition[k] > 0 && !(k in dil) && speciesRole(k) !== 'inert',
  );
  const over = single?.predicted?.rows.filter((r) => r.kind === 'fraction' && !r.within).map((r) => r.name);
  const pick = over?.length ? minor.filter((k) => over.includes(k)) : minor;
  return (pick.length ? pick : minor).map((k) => [k]);
}

/**
 * the single-tank plan with its prediction, when it can be planned (else the search tries every minor
 * gas); the caller's when it has planned it already (the same planFill and prediction, not redone)
 */
function singleTank(input: TwoStageInput, known: PredictedPlan | undefined): PredictedPlan | undefined {
  if (known) return known;
  try {
    return predicted(planFill(input.batch), input);
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
}

/**
 * 'full' searches every choice; 'quick' the matched premix near the tank's limit only; 'proposal'
 * every choice but those whose premix tank certainly runs low (a danger the plan's proposal never
 * offers: the result is the full search's whenever that has no danger), and it predicts a choice's
 * batch only when the choice can still rank before the best so far (rankKeyOf): the same best, found
 * with fewer predictions; it names no most precise choice
 */
export type TwoStageSearch = 'full' | 'quick' | 'proposal';

/**
 * Hazards whose remedy is how a fill is made, not what gas the tank or line holds: compression heating
 * and the compression of oxygen (throttle the fill, oxygen-clean parts: the findings' own advice) and a
 * premix tank whose gas, delivered fast, cools below what a charge needs (deliver slowly)
 */
const PROCEDURE_HAZARDS: ReadonlySet<Finding['code']> = new Set<Finding['code']>([
  'compression-heating',
  'oxygen-compression',
  'premix-cools-low',
]);

/**
 * The ranking of choices (our rule), by the sequence search's own ordering (`hazardRank`,
 * supply-check.ts, which `notLessSafe` uses for the single-tank search) in two parts around the
 * tolerance. First what matters more than precision: every danger of either stage (states and fill
 * paths, then the supply's, so no count of supply findings buys a state or fill-path danger) and the
 * warnings of the gas itself (flammable, near-flammable, detonable states, fill paths and inlets, a
 * reading no gauge covers ...). Then every design fraction within tolerance: a choice that meets it
 * beats one that cannot, whatever their notes and their warnings a fill procedure manages
 * (PROCEDURE_HAZARDS); a careful lab throttles a fill rather than make a batch `check` can never pass.
 * Then those warnings, the notes of the states and fills (near a limit, outside its margin), the
 * fewest warnings of either stage (a careful lab takes the quieter choice that meets the tolerance),
 * the smallest worst U / tolerance.
 */
function rankKeyOf(all: readonly Finding[], worstRatio: number): number[] {
  const counted = all.filter((f) => f.severity === 'danger' || countsAgainstSequence(f));
  const first = (f: Finding) =>
    f.severity === 'danger' || (f.severity === 'warning' && !PROCEDURE_HAZARDS.has(f.code));
  return [
    ...hazardRank(counted.filter(first)),
    worstRatio <= 1 ? 0 : 1,
    ...hazardRank(counted.filter((f) => !first(f))),
    all.filter((f) => f.severity === 'warning').length,
    worstRatio,
  ];
}

/**
 * The quietest choice's key: every hazard of the states, fills and supply (procedure warnings and notes
 * included) before the tolerance, then the warnings, then the worst ratio. The choices are ranked on the
 * batch in its advised order (the draft), whose U the chosen batch's sequence search can only lower: a
 * quieter choice whose draft misses the tolerance may meet it once searched, so it is searched too, and
 * the two are compared by rankKey on their searched batches (planTwoStage)
 */
function quietKeyOf(all: readonly Finding[], worstRatio: number): number[] {
  const counted = all.filter((f) => f.severity === 'danger' || countsAgainstSequence(f));
  return [
    ...hazardRank(counted),
    worstRatio <= 1 ? 0 : 1,
    all.filter((f) => f.severity === 'warning').length,
    worstRatio,
  ];
}

const findingsOf = (c: RankedChoice) => [...c.premix.findings, ...c.batch.findings];
const quietKey = (c: RankedChoice) => quietKeyOf(findingsOf(c), c.worstRatio);

/*
 * Every element of the key is a count of findings (each finding counted by its own code and severity,
 * whatever the others) or grows with the worst ratio: more findings or a larger ratio never make a key
 * smaller. So the key of a choice's findings without its prediction's, at a ratio of 0, is a bound no
 * completed choice goes below (the proposal's pruning).
 */
export function rankKey(c: RankedChoice): number[] {
  return rankKeyOf(findingsOf(c), c.worstRatio);
}

/** what the ranking of choices looks at */
export type RankedChoice = Pick<TwoStagePlan, 'premix' | 'batch' | 'worstRatio'>;

/** does choice c rank before the best so far (none yet: it does) */
export function ranksBefore(c: RankedChoice, best: RankedChoice | undefined): boolean {
  return !best || keyBefore(rankKey(c), rankKey(best));
}

function keyBefore(a: readonly number[], b: readonly number[]): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] < b[i];
  return false;
}

/** the choices for one premix gas and composition: pressures, stage-1 heads and orders */
function choicesFor(
  input: TwoStageInput,
  base: Pick<PremixChoice, 'species' | 'composition' | 'matched'>,
  pressures: readonly number[],
): { choice: PremixChoice; gauges: Gauge[] }[] {
  const out: { choice: PremixChoice; gauges: Gauge[] }[] = [];
  for (const pressurePa of pressures)
    for (const gauges of gaugeChoices(input, pressurePa))
      for (const order of input.premixOrder ? [input.premixOrder] : (['minor-first', 'recommended'] as const))
        out.push({ choice: { ...base, pressurePa, gauges: gauges.map((g) => g.id), order }, gauges });
  return out;
}

/**
 * Every choice of a composition delivers what the draft's premix charges deliver, to the same
 * readings: the delivery check on the draft is each choice's (its premix composition is the draft's
 * nominal one); a premix pressure that certainly runs low is left out of a proposal (kept per pressure).
 */
function runsLowIn(input: TwoStageInput, draft: BatchDraft, search: TwoStageSearch) {
  const low = new Map<number, boolean>();
  return (pressurePa: number) => {
    if (search !== 'proposal') return false;
    if (!low.has(pressurePa)) {
      const { check } = premixDeliveryCheck(draft.plan, draft.source, input.premixTank, pressurePa);
      low.set(pressurePa, check.endPa < check.requiredPa * (1 - 1e-9));
    }
    return low.get(pressurePa)!;
  };
}

/**
 * The leading choices so far: the best (rankKey), the quietest (quietKey: searched too when it is not
 * the best, and compared searched) and the most precise without a danger. Each choice carries its
 * place in the enumeration (species, composition, choice) as a last key: on equal keys the earlier
 * place leads, so the order in which the choices are planned does not change which lead.
 */
function leaders() {
  const ordOf = new Map<TwoStagePlan, number>();
  const keyed = (key: readonly number[], c: TwoStagePlan) => [...key, ordOf.get(c)!];
  const lead = {
    best: undefined as TwoStagePlan | undefined,
    quiet: undefined as TwoStagePlan | undefined,
    precise: undefined as TwoStagePlan | undefined,
    /** can a choice at place `at` with these findings (before its predictions) still lead: the bound */
    mayWin(known: readonly Finding[], at: number): boolean {
      const { best, quiet } = lead;
      return (
        !best ||
        !quiet ||
        keyBefore([...rankKeyOf(known, 0), at], keyed(rankKey(best), best)) ||
        keyBefore([...quietKeyOf(known, 0), at], keyed(quietKey(quiet), quiet))
      );
    },
    offer(c: TwoStagePlan, at: number): void {
      ordOf.set(c, at);
      const { best, quiet, precise } = lead;
      if (!best || keyBefore(keyed(rankKey(c), c), keyed(rankKey(best), best))) lead.best = c;
      if (!quiet || keyBefore(keyed(quietKey(c), c), keyed(quietKey(quiet), quiet))) lead.quiet = c;
      if (hasDanger(c.premix.findings, c.batch.findings)) return;
      if (
        precise
          ? keyBefore(keyed([c.worstRatio], c), keyed([precise.worstRatio], precise))
          : c.worstRatio < Infinity
      )
        lead.precise = c;
    },
  };
  return lead;
}

/**
 * Plan a two-stage preparation: the premix in `premixTank`, then the batch from it. Searches the
 * premix (gas, fraction, pressure, stage-1 order and gauges) unless the caller fixes them; refuses
 * (`two-stage-refused`) when the design has no diluent to make a premix in, the premix tank is
 * the batch tank, or no choice can be planned. Among the choices with no danger the smallest
 * worst U / tolerance wins; a choice with a danger is returned only when every choice has one.
 * `single`: the caller's single-tank plan of `input.batch` with its prediction (planFill and
 * predictPlan with the same gauges, reading and thermometer), so the search does not plan it again.
 */
export function planTwoStage(
  input: TwoStageInput,
  search: TwoStageSearch = 'full',
  single?: PredictedPlan,
): TwoStagePlan {
  const b = input.batch;
  if (input.premixTank.id === b.tank.id)
    fail({ code: 'two-stage-refused', kind: 'same-tank', tank: b.tank.id });
  if (!(b.design.diluentFraction > 0)) fail({ code: 'two-stage-refused', kind: 'no-diluent' });
  // a premix pressure given above the premix tank's rating is refused, not planned (validate.ts)
  if (input.premixPressurePa !== undefined) refusePremixAboveRating(input.premixTank, input.premixPressurePa);
  const limit = premixLimitPa(input.premixTank, b.gauges);
  const pressures =
    input.premixPressurePa !== undefined
      ? [input.premixPressurePa]
      : (search === 'quick' ? [PRESSURE_FRACTIONS[0]] : PRESSURE_FRACTIONS).map((f) => f * limit);
  const lead = leaders();
  let tried = 0;
  let refusal: { problem: Problem; ord: number } | undefined;
  // the first refusal in the order of enumeration (ord), whatever order the choices are planned in
  const attempt = (f: () => void, ord = Infinity) => {
    try {
      f();
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
      if (!refusal || ord < refusal.ord) refusal = { problem: e.problem, ord };
    }
  };
  // compositions richest first (the precise ones: a best within tolerance early lets the proposal's
  // bound leave more choices unpredicted); the leaders are those of the enumeration's order (leaders)
  const species = speciesChoices(input, input.premixSpecies ? undefined : singleTank(input, single));
  const compositions = species.flatMap((sp, i) =>
    premixCompositions(input, sp)
      .slice(0, search === 'quick' ? 1 : undefined)
      .map((c, j) => ({ sp, ...c, ord: (i * FRACTION_FACTORS.length + j) * ORD_STRIDE })),
  );
  for (const { sp, x, matched, ord } of compositions.reverse())
    attempt(() => {
      const base = { species: sp, composition: x, matched };
      // the premix's nominal composition (cylinder impurities included) does not depend on order or heads
      // the choices of one composition differ in pressure, order and heads: the plans of one
      // pressure and order share their amounts and fill order (planner.ts, SharedStages)
      const shared = sharedStages();
      const firstPlan = premixPlan(
        input,
        { ...base, pressurePa: pressures[0], gauges: [], order: 'recommended' },
        b.gauges,
        shared,
      );
      const first = { plan: firstPlan };
      const draft = planBatchDraft(input, base, {
        composition: firstPlan.composition,
        unidentified: firstPlan.unidentifiedFraction,
        pressurePa: pressures[0],
      });
      const seen = new Set<string>();
      const runsLow = runsLowIn(input, draft, search);
      choicesFor(input, base, pressures).forEach(({ choice, gauges }, k) => {
        if (runsLow(choice.pressurePa)) return;
        tried++;
        const at = ord + 1 + k;
        attempt(() => {
          // a proposal wants the best choice only: one whose key cannot go below the leaders' is not
          // predicted (the most precise choice, which a full search also names, is not sought)
          const mayWin =
            search === 'proposal' ? (known: readonly Finding[]) => lead.mayWin(known, at) : undefined;
          // the first premix planned is this choice's when it has the same pressure, heads and order
          const same =
            choice.pressurePa === pressures[0] &&
            choice.order === 'recommended' &&
            gauges.length === b.gauges.length;
          const c = planChoice(input, choice, gauges, draft, seen, mayWin, same ? first : undefined, shared);
          if (c) lead.offer(c, at);
        }, at);
      });
    }, ord);
  const { best, quiet, precise: p } = lead;
  if (!best) return fail({ code: 'two-stage-refused', kind: 'no-plan', tried, cause: refusal?.problem });
  const chosen = searchedChoice(input, best, quiet, attempt);
  const mostPrecise =
    search !== 'proposal' && p && p !== best && p.choice !== chosen.choice && p.worstRatio < chosen.worstRatio
      ? {
          choice: p.choice,
          worstRatio: p.worstRatio,
          warnings: codesOf(p, 'warning'),
          // the notes it has more of than the chosen one (the ranking counts notes too: an oxygen-enriched state)
          notes: moreNotes(p, chosen),
        }
      : undefined;
  return { ...chosen, candidates: tried, mostPrecise };
}

/** the codes of a choice's findings of one severity, both stages, each once */
function codesOf(c: RankedChoice, severity: Finding['severity']): Finding['code'][] {
  return [
    ...new Set(
      findingsOf(c)
        .filter((f) => f.severity === severity)
        .map((f) => f.code),
    ),
  ];
}

/** the note codes choice a has more often than choice b (both stages), each once */
function moreNotes(a: RankedChoice, b: RankedChoice): Finding['code'][] {
  const count = (c: RankedChoice, k: Finding['code']) =>
    findingsOf(c).filter((f) => f.severity === 'note' && f.code === k).length;
  return codesOf(a, 'note').filter((k) => count(a, k) > count(b, k));
}

/**
 * the best choice with its batch searched (replanned), and the quietest one searched too when it is
 * another: its batch may meet the tolerance its unsearched draft missed; the better by rankKey
 */
function searchedChoice(
  input: TwoStageInput,
  best: TwoStagePlan,
  quiet: TwoStagePlan | undefined,
  attempt: (f: () => void) => void,
): TwoStagePlan {
  let chosen = best;
  attempt(() => {
    chosen = replanned(input, best);
  });
  if (quiet && quiet !== best)
    attempt(() => {
      const searched = replanned(input, quiet);
      if (ranksBefore(searched, chosen)) chosen = searched;
    });
  return chosen;
}

/** every finding of a plan and, for a two-stage batch, of its premix stage (stage 1 first): the exit code's */
export function allStageFindings(plan: Plan): Finding[] {
  return [...(plan.twoStage?.premix.findings ?? []), ...plan.findings];
}
