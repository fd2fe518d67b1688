/**
 * Two-stage preparation from a recipe's `premix` block (or `--premix-tank`): the premix tank from
 * the lab profile, the gases, fraction, pressure and order when given, and the lab's thermometer;
 * and, for a single-tank plan that cannot meet its tolerance, the proposal of a premix in another
 * tank of the lab (a finding naming the option and the predicted U it gives).
 */
import {
  fail,
  planTwoStage,
  ProblemError,
  withBandEdges,
  relocate,
  resolveSpeciesKey,
  type Finding,
  type PredictedPlan,
  type TwoStageInput,
  type TwoStagePlan,
} from '../core/index.js';
import type { PlanRequest, RecipeSource } from './load.js';
import { DEFAULT_THERMOMETER, settlingOf } from './plan-predict.js';
import { parseQuantity } from './quantity.js';

/** the lab's thermometer as the prediction takes it (plan-predict.ts: the same defaults) */
function thermometerOf(req: PlanRequest): TwoStageInput['thermometer'] {
  const t = req.lab.thermometer ?? DEFAULT_THERMOMETER;
  return { uK: t.uncertaintyK, resolutionK: t.resolutionK, settlingK: settlingOf(req.lab.thermometer) };
}

/** an order as typed: "CH4,Ar@400 Torr,O2,Ar" */
export function orderText(order: NonNullable<PlanRequest['recipe']['order']>): string {
  return order.map((e) => (typeof e === 'string' ? e : `${e.fill}@${e.until}`)).join(',');
}

/** the core's two-stage input from the recipe's premix block; undefined when the recipe asks for none */
export function twoStageInputOf(req: PlanRequest, rs: RecipeSource): TwoStageInput | undefined {
  const pm = req.recipe.premix;
  // a premix log instead of a tank: planned from that log (premix-log-request.ts)
  if (!pm || pm.tank === undefined) return undefined;
  const where = (key: string) => ({ ...rs.locate(['premix', key]), field: `premix.${key}` });
  const premixTank = req.lab.tanks.find((t) => t.id === pm.tank);
  if (!premixTank)
    fail(
      { code: 'unknown-reference', kind: 'tank', id: pm.tank, choices: req.lab.tanks.map((t) => t.id) },
      where('tank'),
    );
  const gases = pm.gases?.map((g) => {
    const key = resolveSpeciesKey(g);
    if (!key) return fail({ code: 'unknown-species', name: g, suggestions: [] }, where('gases'));
    return key;
  });
  // the two-stage plan chooses the batch's order around its premix: an order given would be ignored
  if (req.recipe.order)
    fail(
      { code: 'stage-order', premixTank: pm.tank, order: orderText(req.recipe.order) },
      { field: 'order' }, // pointed at the recipe line or the option by the caller (locateCoreProblem)
    );
  return {
    batch: req.input,
    premixTank,
    thermometer: thermometerOf(req),
    premixSpecies: gases,
    premixPressurePa:
      pm.pressure === undefined
        ? undefined
        : // the request's barometer (given, else the lab profile's; none: refused), the conversion recorded
          parseQuantity(pm.pressure, 'pressure', where('pressure'), req.gaugeContext),
    premixFraction: pm.fraction,
    premixOrder: pm.order,
  };
}

/** the batch plan (stage 2) carrying its stage 1 */
export function asBatchPlan(two: TwoStagePlan): PredictedPlan {
  const { batch, premix, ...rest } = two;
  // each stage's readings inside its bands, taken together, as for a single tank (withBandEdges)
  return { ...withBandEdges(batch), twoStage: { ...rest, premix: withBandEdges(premix) } };
}

/** plan both stages, a refusal pointed at the recipe's premix block (or the option) */
export function planTwoStageFrom(input: TwoStageInput, rs: RecipeSource): PredictedPlan {
  try {
    return asBatchPlan(planTwoStage(input));
  } catch (e) {
    if (e instanceof ProblemError && !e.where.field) {
      // the premix tank itself: at --premix-tank when the command line gave it, else its recipe line
      const p = e.problem;
      const path = p.code === 'two-stage-refused' && p.kind === 'same-tank' ? ['premix', 'tank'] : ['premix'];
      const where = rs.locate(path);
      throw relocate(e, { ...where, field: where.field ?? path.join('.') });
    }
    throw e;
  }
}

/** "1.34 % O2 in Ar" */
export function premixName(composition: Readonly<Record<string, number>>, minor: readonly string[]): string {
  const pct = (x: number) => `${Number((x * 100).toPrecision(3))} %`;
  const rest = Object.entries(composition)
    .filter(([k, v]) => !minor.includes(k) && v >= 0.01)
    .map(([k]) => k);
  return `${minor.map((k) => `${pct(composition[k] ?? 0)} ${k}`).join(', ')} in ${rest.join('+')}`;
}

/**
 * the command line a proposal gives (without the --premix-tank it adds), or why none can run: the
 * recipe file fixes a fill order, which a premix tank refuses (`stage-order`)
 */
export interface ProposalCommand {
  readonly command?: string;
  /** the --order given, left out of the command */
  readonly orderLeftOut?: string;
  readonly recipeOrder?: { readonly file: string; readonly order: string };
}

/**
 * When the single-tank plan predicts a design fraction over tolerance and the lab has another
 * tank: plan the two stages (the search `--premix-tank` runs, less the premix pressures at which the
 * premix tank certainly runs low: a danger the proposal never offers) and, when it does better, a
 * note naming the option and the U it gives. A refusal of the two-stage plan proposes nothing.
 * `plan` is req's single-tank plan with its prediction (`planWithPrediction(planFill(req.input), req)`):
 * the search takes it as its single-tank plan instead of planning it again.
 */
export function twoStageProposal(
  plan: PredictedPlan,
  req: PlanRequest,
  command: ProposalCommand,
): Finding | undefined {
  const over = plan.predicted?.rows.filter((r) => r.kind === 'fraction' && !r.within) ?? [];
  if (!over.length) return undefined;
  const worst = over.reduce((a, r) => (r.expandedU / r.tolerance > a.expandedU / a.tolerance ? r : a));
  const singleRatio = worst.expandedU / worst.tolerance;
  let best: TwoStagePlan | undefined;
  for (const tank of req.lab.tanks.filter((t) => t.id !== plan.tank.id)) {
    try {
      // the single-tank plan is this plan (planFill of req.input, predicted with the lab's thermometer)
      const input = { batch: req.input, premixTank: tank, thermometer: thermometerOf(req) };
      const two = planTwoStage(input, 'proposal', plan);
      const danger = [...two.premix.findings, ...two.batch.findings].some((f) => f.severity === 'danger');
      if (!danger && two.worstRatio < (best?.worstRatio ?? singleRatio)) best = two;
    } catch (e) {
      if (!(e instanceof ProblemError)) throw e;
    }
  }
  const row = best?.batch.predicted?.rows.find((r) => r.name === worst.name);
  if (!best || !row) return undefined;
  return {
    severity: 'note',
    code: 'two-stage-proposed',
    premixTank: best.premix.tank.id,
    premix: premixName(best.choice.composition, best.choice.species),
    species: worst.name,
    singleU: worst.expandedU / worst.design,
    twoStageU: row.expandedU / row.design,
    tolerance: worst.tolerance / worst.design,
    twoStageWorst: best.worstRatio,
    ...(command.command !== undefined
      ? { command: `${command.command} --premix-tank ${best.premix.tank.id}` }
      : {}),
    ...(command.orderLeftOut !== undefined ? { orderLeftOut: command.orderLeftOut } : {}),
    ...(command.recipeOrder ? { recipeOrder: command.recipeOrder } : {}),
    warnings: [
      ...new Set(
        [...best.premix.findings, ...best.batch.findings]
          .filter((f) => f.severity === 'warning')
          .map((f) => f.code),
      ),
    ],
  };
}
