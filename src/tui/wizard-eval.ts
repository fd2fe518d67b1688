/** The wizard's evaluator: field values -> recipe -> plan preview, or the first problem and its field. */
import { describeProblem, fillLabel, planFill, ProblemError, type Plan } from '../core/index.js';
import { buildPlanRequest, validateRecipeObject, type PlanRequest } from '../io/load.js';
import type { RecipeFile } from '../io/recipe.js';
import { fromPa, isPressureUnit } from '../io/quantity.js';
import { decimalsFor, fixedSig } from '../report/format.js';
import type { Evaluation, FieldName } from './wizard-state.js';

const FIELD_OF: [RegExp, FieldName][] = [
  [/^id/, 'id'],
  [/^mixture\.fuel/, 'fuel'],
  [/^mixture\.oxidizer/, 'oxidizer'],
  [/^mixture\.phi/, 'phi'],
  [/^mixture\.diluent\b(?!_)/, 'diluent'],
  [/^mixture\.dilution/, 'dilution'],
  [/^mixture/, 'fuel'],
  [/^(tank|volume)/, 'tank'],
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

export function buildFromValues(v: Readonly<Record<FieldName, string>>, labFile?: string): WizardBuild {
  const raw = recipeFromValues(v);
  const locate = (path: readonly (string | number)[]) => ({ field: path.join('.') });
  const recipe = validateRecipeObject(raw, 'wizard', locate);
  const req = buildPlanRequest({ recipe, locate, baseDir: process.cwd(), origin: 'wizard' }, labFile);
  return { recipe, req, plan: planFill(req.input) };
}

export function makeEvaluator(labFile?: string) {
  return (v: Readonly<Record<FieldName, string>>): Evaluation => {
    if (!/^[A-Za-z0-9._-]+$/.test(v.id)) return { error: { field: 'id', message: 'letters, digits, ".", "_" and "-" only' } };
    if (!v.tank.trim()) return { error: { field: 'tank', message: 'name a tank of the lab profile or give a volume (30 L)' } };
    for (const f of ['phi', 'dilution'] as const) {
      if (v[f].trim() && !/^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(v[f])) return { error: { field: f, message: `"${v[f]}" is not a number` } };
    }
    try {
      const { plan } = buildFromValues(v, labFile);
      return { preview: previewOf(plan) };
    } catch (e) {
      if (e instanceof ProblemError) {
        const f = e.where.field ?? '';
        const field = FIELD_OF.find(([re]) => re.test(f))?.[1];
        return { error: { field, message: describeProblem(e.problem) } };
      }
      return { error: { message: (e as Error).message } };
    }
  };
}

function previewOf(plan: Plan): { lines: string[]; danger: boolean } {
  const lines: string[] = [];
  lines.push(
    Object.entries(plan.design.composition)
      .sort((a, b) => b[1] - a[1])
      .map(([k, x]) => `${k} ${fixedSig(x, 4)}`)
      .join('  '),
  );
  lines.push(`final ${fixedSig(fromPa(plan.final.pressurePa, 'Torr'), 6)} Torr, Z ${plan.final.compressibility.toFixed(5)}`);
  for (const s of plan.steps) {
    const u = s.gauge && isPressureUnit(s.gauge.unit) ? s.gauge.unit : 'Torr';
    const dec = s.gauge ? decimalsFor(fromPa(s.gauge.resolutionPa, u)) : 3;
    lines.push(`${s.index} ${fillLabel(s.source).padEnd(7)} ${s.gauge?.id ?? 'NO GAUGE'} ${s.gauge ? fromPa(s.gauge.readingPa, u).toFixed(dec) : '-'} ${u}`);
  }
  const rank = { danger: 0, warning: 1, note: 2 } as const;
  const top = [...plan.findings].filter((f) => f.severity !== 'note').sort((a, b) => rank[a.severity] - rank[b.severity]);
  for (const f of top.slice(0, 4)) lines.push(`${f.severity === 'danger' ? 'DANGER' : 'warning'} ${f.code}${f.step ? ` (fill ${f.step})` : ''}`);
  if (top.length > 4) lines.push(`+${top.length - 4} more; see mixwright plan`);
  return { lines, danger: plan.findings.some((f) => f.severity === 'danger') };
}
