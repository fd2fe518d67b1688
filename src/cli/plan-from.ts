/** A recipe file and the design options -> the plan, with every refusal pointed at the file line or option. */
import { planWithPrediction } from '../io/plan-predict.js';
import {
  orderText,
  planTwoStageFrom,
  twoStageInputOf,
  twoStageProposal,
  type ProposalCommand,
} from '../io/two-stage-request.js';
import {
  planFromPremixLog,
  premixLogAsked,
  premixOverrides,
  premixRecordOf,
} from '../io/premix-log-request.js';
import {
  batchSizeFinding,
  experimentsServed,
  planFill,
  premixFindings,
  ProblemError,
  type Finding,
  type Plan,
} from '../core/index.js';
import {
  buildPlanRequest,
  locateCoreProblem,
  readRecipe,
  type PlanRequest,
  type RecipeSource,
} from '../io/load.js';
import { gaugeConversionWords, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import type { Cli } from './context.js';
import type { PlanMeta } from '../report/plan-json.js';
import { VERSION } from '../version.js';
import {
  attributeOf,
  DESIGN_OPTIONS,
  mergeOptions,
  optionName,
  type DesignValues,
} from './design-options.js';
import { shellLine } from '../io/stage-log.js';
import { parseBarometer } from './numbers.js';

export interface Planned {
  readonly plan: Plan;
  readonly req: PlanRequest;
  readonly unit: PressureUnit;
  readonly meta: PlanMeta & { readonly barometer: NonNullable<PlanMeta['barometer']> };
  /** a premix in another tank, proposed for a single-tank plan over tolerance (`plan` only) */
  readonly proposal?: Finding;
}

/** the unit of the tables: --units, else the unit the final pressure was given in when it is one of ours, else Torr */
function tableUnit(units: string | undefined, pressureText: string | undefined): PressureUnit {
  const given = /[A-Za-z]+$/.exec((pressureText ?? '').trim())?.[0] ?? '';
  return units && isPressureUnit(units) ? units : isPressureUnit(given) ? given : 'Torr';
}

function metaOf(plan: Plan, req: PlanRequest, barometerGiven: boolean): Planned['meta'] {
  const served = req.sizing ? experimentsServed(req.sizing, plan.final.pressurePa) : undefined;
  return {
    recipeId: req.recipe.id,
    labName: req.lab.name,
    orderRecommended: req.orderRecommended,
    version: VERSION,
    experiments:
      served && req.sizing
        ? {
            count: served.experiments,
            sizedFor: req.sizedFor,
            reactor: req.sizing.reactor,
            perExperimentMol: served.sizing.perExperimentMol,
            minTankPa: served.sizing.minTankPa,
            margin: req.sizing.margin,
          }
        : undefined,
    barometer: {
      pressurePa: req.input.reading.barometricPa,
      uncertaintyPa: req.input.reading.barometricUncertaintyPa,
      given: barometerGiven,
    },
  };
}

/**
 * every gauge pressure of the request (recipe, options, lab profile) made absolute with a barometer,
 * stated ("mixwright: note: 15 psig (rating) read as 1535.7 Torr absolute with the lab profile's
 * barometer 760.0 Torr"): the command prints these on stderr, so the text and the JSON stay as they are
 */
export function stateGaugeConversions(req: PlanRequest, cli: Pick<Cli, 'err'>): void {
  for (const c of req.gaugeContext.conversions) cli.err(`mixwright: note: ${gaugeConversionWords(c)}\n`);
}

/**
 * the command a proposal names, runnable as it stands but for the premix tank the proposal adds:
 * the plan of this recipe file with the design options as given. A premix tank takes no fill order
 * (`stage-order`): a --order given is left out and named (`orderLeftOut`); a recipe file that fixes
 * an order gets no command (the file would still give it), only why (`recipeOrder`)
 */
function proposalCommand(rs: RecipeSource | undefined, o: DesignValues): ProposalCommand {
  const fileOrder = rs?.recipe.order;
  if (rs && fileOrder) return { recipeOrder: { file: rs.origin, order: orderText(fileOrder) } };
  const words = ['mixwright', 'plan'];
  if (rs) words.push(rs.origin);
  for (const d of DESIGN_OPTIONS) {
    const v = o[attributeOf(d)];
    if (v === undefined || d.recipe === 'order' || d.recipe === 'premix.tank' || d.recipe === 'premix.log')
      continue;
    words.push(optionName(d), v);
  }
  return { command: shellLine(words), ...(o.order !== undefined ? { orderLeftOut: o.order } : {}) };
}

/**
 * recipe and options -> plan, with errors pointed at the file line or option; `propose`: a
 * single-tank plan over tolerance proposes a premix in another tank (`plan` asks for it)
 */
export function planFrom(recipeFile: string | undefined, o: DesignValues, propose = false): Planned {
  const barometricPa = o.barometer === undefined ? undefined : parseBarometer(o.barometer);
  const base = recipeFile ? readRecipe(recipeFile) : undefined;
  const rs = mergeOptions(base, o);
  // an existing premix tank named by its log: re-checked first, so that the order may name it
  const premixAsk = premixLogAsked(rs);
  const premixRec = premixAsk && premixRecordOf(premixAsk);
  const req = buildPlanRequest(rs, o.lab, premixOverrides(premixRec, { barometricPa }));
  let plan: Plan;
  let proposal: Finding | undefined;
  try {
    // two stages when the recipe or --premix-tank asks; from a premix log when one is named; else
    // one tank, and a premix proposed when it helps
    const two = twoStageInputOf(req, rs);
    plan = two
      ? planTwoStageFrom(two, rs)
      : premixAsk && premixRec
        ? planFromPremixLog(req, premixAsk, premixRec)
        : planWithPrediction(planFill(req.input), req);
    proposal =
      two || premixAsk || !propose ? undefined : twoStageProposal(plan, req, proposalCommand(base, o));
  } catch (e) {
    // the core names the recipe field (pressure, temperature, ...): point at it in the file or option;
    // a refused premix log is already pointed at the option or recipe line that named it
    if (e instanceof ProblemError && e.problem.code !== 'premix-log-refused') throw locateCoreProblem(e, rs);
    throw e;
  }
  // a batch too small for one experiment is a warning finding, with the plan's own
  const tooSmall = req.sizing ? batchSizeFinding(req.sizing, plan.final.pressurePa) : undefined;
  if (tooSmall) plan = { ...plan, findings: [...plan.findings, tooSmall] };
  // a premix filled in place of single gases is stated, with the composition change it causes
  const inPlace = premixFindings(req.premixInPlace, plan);
  if (inPlace.length) plan = { ...plan, findings: [...plan.findings, ...inPlace] };
  return {
    plan,
    req,
    unit: tableUnit(o.units, req.recipe.pressure),
    meta: metaOf(plan, req, o.barometer !== undefined),
    proposal,
  };
}
