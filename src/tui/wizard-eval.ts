/** The wizard's evaluator: field values -> recipe -> plan preview, or the first problem and its field. */
import { describeProblem, planFill, ProblemError, type Plan, type PredictedPlan } from '../core/index.js';
import { buildPlanRequest, loadLab, validateRecipeObject, type PlanRequest } from '../io/load.js';
import { planWithPrediction } from '../io/plan-predict.js';
import { planTwoStageFrom, twoStageInputOf } from '../io/two-stage-request.js';
import {
  planFromPremixLog,
  premixLogAsked,
  premixOverrides,
  premixRecordOf,
} from '../io/premix-log-request.js';
import { findingLines, stepLines, twoStagePreview } from './stage-preview.js';
import type { RecipeFile } from '../io/recipe.js';
import { fromPa } from '../io/quantity.js';
import { fixedSig } from '../report/format.js';
import { rankFor, type Evaluation, type FieldName } from './wizard-state.js';

const FIELD_OF: [RegExp, FieldName][] = [
  [/^id/, 'id'],
  [/^mixture\.fuel/, 'fuel'],
  [/^mixture\.oxidizer/, 'oxidizer'],
  [/^mixture\.phi/, 'phi'],
  [/^mixture\.diluent\b(?!_)/, 'diluent'],
  [/^mixture\.dilution/, 'dilution'],
  [/^mixture/, 'fuel'],
  [/^(tank|volume)/, 'tank'],
  [/^premix/, 'premix'],
  [/^(pressure|experiments)/, 'pressure'],
  [/^temperature/, 'temperature'],
];

export function recipeFromValues(v: Readonly<Record<FieldName, string>>): Record<string, unknown> {
  const num = (t: string) => (/^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(t) ? Number(t) : t);
  const mixture: Record<string, unknown> = { fuel: v.fuel, oxidizer: v.oxidizer, phi: num(v.phi) };
  if (v.diluent.trim()) {
    mixture.diluent = v.diluent;
    mixture.dilution = num(v.dilution);
  } else if (v.dilution.trim() && Number(v.dilution) !== 0) mixture.dilution = num(v.dilution);
  const r: Record<string, unknown> = { id: v.id, mixture, temperature: v.temperature };
  if (/^\s*[\d.]+\s*(l|L|m\^3|cm\^3|mL)\s*$/.test(v.tank)) r.volume = v.tank.trim();
  else if (v.tank.trim()) r.tank = v.tank.trim();
  // the premix field: a second tank to make a premix in (stage 1), or a premix log to fill from (stage 2)
  const premix = v.premix.trim();
  if (premix) r.premix = isPremixLog(premix) ? { log: premix } : { tank: premix };
  const ex = /^\s*(\d+)\s*(exp|experiments?)\s*$/i.exec(v.pressure);
  if (ex) r.experiments = { count: Number(ex[1]) };
  else r.pressure = v.pressure;
  return r;
}

export interface WizardBuild {
  readonly recipe: RecipeFile;
  readonly req: PlanRequest;
  readonly plan: Plan;
}

/**
 * The recipe, request and plan of the wizard's values, planned as `plan` plans them (the sequence
 * search included): what the preview shows, the sheet writes and the guided fill starts. `quick`:
 * the advised order without the search (hundreds of ms per design), for the check made on every
 * key; its fills and U are not the plan and are never shown.
 */
export function buildFromValues(
  v: Readonly<Record<FieldName, string>>,
  labFile?: string,
  quick = false,
): WizardBuild {
  const raw = recipeFromValues(v);
  const locate = (path: readonly (string | number)[]) => ({ field: path.join('.') });
  const recipe = validateRecipeObject(raw, 'wizard', locate);
  const rs = { recipe, locate, baseDir: process.cwd(), origin: 'wizard' };
  // a premix log: re-checked first, its premix a source of the batch (as `plan --premix-log`)
  const ask = premixLogAsked(rs);
  const rec = ask && premixRecordOf(ask);
  const req = buildPlanRequest(rs, labFile, premixOverrides(rec, {}));
  if (ask && rec) return { recipe, req, plan: planFromPremixLog(req, ask, rec) };
  // two stages: the same plan (and search) as `plan --premix-tank`, quick or not
  const two = twoStageInputOf(req, rs);
  if (two) return { recipe, req, plan: planTwoStageFrom(two, rs) };
  const input = quick ? { ...req.input, thermometer: undefined } : req.input;
  return { recipe, req, plan: planWithPrediction(planFill(input), req) };
}

const NUMBER = /^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/;

/** the problems the wizard finds before planning, each saying what is wrong, why and what to type */
export function fieldProblem(
  v: Readonly<Record<FieldName, string>>,
  tankIds: readonly string[],
): Evaluation['error'] {
  if (!/^[A-Za-z0-9._-]+$/.test(v.id)) {
    const what =
      v.id === ''
        ? 'the id is empty'
        : `the id "${v.id}" holds ` +
          (/\s/.test(v.id) ? 'a space' : 'a character other than letters, digits, ".", "_" and "-"');
    return {
      field: 'id',
      message:
        `${what}; it names the files (recipes/<id>.yaml, fill-<id>.html, batches/<id>-...), ` +
        `so use letters, digits, ".", "_" and "-" only`,
    };
  }
  const tanks = tankIds.length ? ` (${tankIds.join(', ')})` : '';
  if (!v.tank.trim())
    return {
      field: 'tank',
      message: `the tank is empty: name a tank of the lab profile${tanks} or give a volume such as 30 L`,
    };
  if (
    /^\s*[\d.]/.test(v.tank) &&
    !tankIds.includes(v.tank.trim()) &&
    !/^\s*[\d.]+\s*(l|L|m\^3|cm\^3|mL)\s*$/.test(v.tank)
  ) {
    return {
      field: 'tank',
      message:
        `"${v.tank}" is not a volume the wizard reads: write a number and L, mL, ` +
        `cm^3 or m^3 (30 L), or name a tank of the lab profile${tanks}`,
    };
  }
  const label = {
    phi: 'phi (the equivalence ratio)',
    dilution: 'dilution (the diluent mole fraction)',
  } as const;
  const example = {
    phi: 'a number above 0 such as 1 or 0.8',
    dilution: 'a number from 0 to below 1 such as 0.95',
  } as const;
  for (const f of ['phi', 'dilution'] as const) {
    if (f === 'dilution' && !v.diluent.trim()) {
      if (v.dilution.trim() && !NUMBER.test(v.dilution))
        return {
          field: f,
          message: `${label[f]} "${v[f]}" is not a number; with no diluent leave it empty or 0`,
        };
      continue;
    }
    if (!v[f].trim()) return { field: f, message: `${label[f]} is empty: give ${example[f]}` };
    if (!NUMBER.test(v[f]))
      return { field: f, message: `${label[f]} "${v[f]}" is not a number: give ${example[f]}` };
  }
  const premix = v.premix.trim();
  if (premix && !isPremixLog(premix) && !tankIds.includes(premix))
    return {
      field: 'premix',
      message:
        `"${premix}" is not a tank of the lab profile${tanks}: name a second tank to make the ` +
        'premix in, a finished premix log (.jsonl) to fill from, or leave it empty for a single tank',
    };
  if (premix && premix === v.tank.trim())
    return {
      field: 'premix',
      message: `the premix must be made in another tank than the batch (both are ${premix}); name a second tank`,
    };
  return undefined;
}

/** a premix field naming a premix log (a batch log file) rather than a tank */
export const isPremixLog = (text: string): boolean => /\.jsonl$/i.test(text.trim());

/** what the preview shows while a two-stage design waits for a pause in typing */
export const PENDING_LINES = ['two stages: planned after a short pause in typing ...'];

/**
 * What a one-tank preview shows until the sequence search has run (after a pause in typing): the
 * design's composition and final state (the same in any fill order), and no fills, no U: those of
 * the advised order are not the plan the sheet and the fill use.
 */
export const SEARCHING_LINES = ['fills: searching the order ...', '(as plan, sheet and fill do)'];

export function makeEvaluator(labFile?: string) {
  let tankIds: string[] = [];
  try {
    tankIds = loadLab(labFile).tanks.map((t) => t.id);
  } catch {
    // a lab profile that does not load: the plan below reports it, on the tank field or as the first problem
  }
  return (v: Readonly<Record<FieldName, string>>, full = false): Evaluation => {
    const early = fieldProblem(v, tankIds);
    if (early) return { error: early };
    // a two-stage plan takes about a second: not on every key, after a pause in typing (wizard-app.tsx)
    if (v.premix.trim() && !full) return { pending: true, preview: { lines: PENDING_LINES, danger: false } };
    try {
      if (!full) {
        // on every key: the design planned in the advised order (fast) for its problems and final
        // state; the plan itself (the sequence search, hundreds of ms) after a pause in typing
        const quick = buildFromValues(v, labFile, true).plan;
        return {
          pending: true,
          preview: { lines: [...designLines(quick), ...SEARCHING_LINES], danger: false },
        };
      }
      // the plan the sheet and the guided fill use: the same call, the sequence search included
      const { plan } = buildFromValues(v, labFile);
      const preview = plan.twoStage ? twoStagePreview(plan) : previewOf(plan);
      if (!plan.premixLog) return { preview };
      // planned as `plan --premix-log` plans it (the sequence search included), not in the advised order
      const lines = preview.lines.filter((l) => !l.startsWith('preview in the advised order'));
      return {
        preview: { ...preview, lines: [`from premix log ${plan.premixLog.log} (re-checked)`, ...lines] },
      };
    } catch (e) {
      // not a problem the core words (a bug): say so rather than end the wizard with the design in it
      if (!(e instanceof ProblemError))
        return {
          error: {
            message:
              `the plan failed unexpectedly (${(e as Error).message}); this is a bug: note ` +
              `the values on screen and report them`,
          },
        };
      const f = e.where.field ?? '';
      const field = FIELD_OF.find(([re]) => re.test(f))?.[1];
      // "did you mean" in the wizard's own ranking, the one Tab completes to (air first in a whole oxidizer)
      const p =
        e.problem.code === 'unknown-species' && field
          ? { ...e.problem, suggestions: rankFor(field, e.problem.name, !/[,:]/.test(v[field])).slice(0, 3) }
          : e.problem;
      return { error: { field, message: describeProblem(p) } };
    }
  };
}

/** the text columns inside the wizard's preview box (wizard-app.tsx: 36 wide, border and padding) */
export const PREVIEW_WIDTH = 32;

/** the design's composition and final state: the same whatever the order of the fills */
function designLines(plan: Plan): string[] {
  const parts = Object.entries(plan.design.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, x]) => `${k} ${fixedSig(x, 4)}`);
  // the species on as many lines as the preview's width needs (none cut)
  const comp: string[] = [];
  for (const p of parts) {
    const last = comp.length ? `${comp[comp.length - 1]}  ${p}` : '';
    if (last && last.length <= PREVIEW_WIDTH) comp[comp.length - 1] = last;
    else comp.push(p);
  }
  return [
    ...comp,
    `final ${fixedSig(fromPa(plan.final.pressurePa, 'Torr'), 6)} Torr, Z ${plan.final.compressibility.toFixed(5)}`,
  ];
}

const pct = (x: number) => `${Number((x * 100).toPrecision(2))} %`;

/** the worst predicted design fraction, in the preview's 32 columns: "U x(O2) 0.98 % (tol 2 %)" */
function uLine(plan: Plan): string {
  const rows = (plan as PredictedPlan).predicted?.rows.filter((r) => r.kind === 'fraction') ?? [];
  if (!rows.length) return 'U: no prediction (see plan)';
  const w = rows.reduce((a, b) => (b.expandedU / b.tolerance > a.expandedU / a.tolerance ? b : a));
  const u = `U x(${w.name}) ${pct(w.expandedU / w.design)}`;
  return w.within
    ? `${u} (tol ${pct(w.tolerance / w.design)})`
    : `${u} OVER tol ${pct(w.tolerance / w.design)}`;
}

function previewOf(plan: Plan): { lines: string[]; danger: boolean } {
  const lines = [...designLines(plan), ...stepLines(plan), uLine(plan), ...findingLines(plan.findings)];
  return { lines, danger: plan.findings.some((f) => f.severity === 'danger') };
}
