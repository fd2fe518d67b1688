/**
 * A two-stage preparation in the plan's text and JSON: stage 1 (the premix in its tank) before the
 * batch, the premix as the batch's source (composition +- U from stage 1), and the premix tank's
 * falling pressure while it delivers. plan-text.ts and plan-json.ts call these; each returns
 * nothing for a single-tank plan. The stage's own plan is rendered by the caller's renderer.
 */
import { describeFinding, predictionOf, type Finding, type Plan } from '../core/index.js';
import { withJsonKeys } from './json-keys.js';
import { fixedSig, pressure, tankName } from './format.js';
import type { PlanMeta } from './plan-json.js';
import type { PressureUnit } from './units.js';

type TwoStage = NonNullable<Plan['twoStage']>;

/** "13.4 % O2 in Ar" */
function premixName(t: TwoStage): string {
  const c = t.choice.composition;
  const minor = t.choice.species.map((k) => `${fixedSig((c[k] ?? 0) * 100, 4)} % ${k}`).join(', ');
  const rest = Object.keys(c).filter((k) => !t.choice.species.includes(k));
  return `${minor} in ${rest.join('+')}`;
}

/** the stage-1 meta: the batch's, without the experiment count (the premix serves the batch) */
function premixMeta(meta: PlanMeta, t: TwoStage): PlanMeta {
  return {
    ...meta,
    recipeId: `${meta.recipeId} (stage 1: premix)`,
    experiments: undefined,
    // the premix's order choice: recommended by the planner, or minor gases first (not a recommendation)
    orderRecommended: t.premix.orderRecommended,
  };
}

function choiceLine(t: TwoStage, unit: PressureUnit): string {
  const order = t.choice.order === 'minor-first' ? 'its minor gases first' : 'the recommended order';
  return (
    `Premix      ${premixName(t)} in ${tankName(t.premix.tank.id)}, ` +
    `filled to ${pressure(t.choice.pressurePa, unit, 5)} ` +
    `in ${order}, read on ${t.choice.gauges.join(', ')} (chosen from ${t.candidates} premix choices planned)`
  );
}

/** what the more precise choice was passed over for: "warnings (a, b)", "notes (c)" or both */
export function passedOverFor(m: {
  readonly warnings: readonly string[];
  readonly notes: readonly string[];
}): string {
  const parts = [
    ...(m.warnings.length ? [`warnings (${m.warnings.join(', ')})`] : []),
    ...(m.notes.length ? [`notes (${m.notes.join(', ')})`] : []),
  ];
  return parts.length ? parts.join(' and ') : 'more findings';
}

/** the more precise choice the search passed over for its warnings or notes, if any */
function alternativeLine(t: TwoStage, unit: PressureUnit): string[] {
  const m = t.mostPrecise;
  if (!m) return [];
  const gases = m.choice.species;
  const share = gases.reduce((a, k) => a + (m.choice.composition[k] ?? 0), 0);
  return [
    `            a more precise choice (worst U ${fixedSig(m.worstRatio * 100, 2)} % of its tolerance) ` +
      `has ${passedOverFor(m)}: ${fixedSig(share * 100, 3)} % ${gases.join('+')}, ` +
      `${pressure(m.choice.pressurePa, unit, 4)}, order ${m.choice.order} (premix: fraction, pressure, order)`,
  ];
}

/** the lines before the batch: the two-stage header and stage 1 rendered whole */
export function twoStageHead(
  plan: Plan,
  meta: PlanMeta,
  unit: PressureUnit,
  render: (p: Plan, m: PlanMeta, u: PressureUnit) => string,
): string[] {
  const t = plan.twoStage;
  if (!t) return [];
  const alt = alternativeLine(t, unit);
  return [
    `Two-stage preparation: stage 1 makes the premix in ${tankName(t.premix.tank.id)}; ` +
      'stage 2 fills the batch from it.',
    choiceLine(t, unit),
    ...alt,
    '',
    `=== Stage 1 of 2: premix in ${tankName(t.premix.tank.id)} ===`,
    render(t.premix, premixMeta(meta, t), unit).trimEnd(),
    '',
    `=== Stage 2 of 2: the batch in ${tankName(plan.tank.id)}, from the premix ===`,
  ];
}

/** the premix as a source of the batch and the premix tank's falling pressure */
export function twoStageDeliveryLines(plan: Plan, unit: PressureUnit): string[] {
  const t = plan.twoStage;
  if (!t) return [];
  const d = t.delivery;
  const stage1 = predictionOf(t.premix);
  const comp = Object.entries(t.source.composition)
    .filter(([, v]) => v >= 1e-4)
    .map(([k, v]) => {
      const st = stage1?.result.composition[k];
      return st ? `${k} ${fixedSig(v, 6)} +- ${fixedSig(2 * st.u, 2)}` : `${k} ${fixedSig(v, 6)}`;
    })
    .join('  ');
  return [
    `Premix source ${t.source.id}: ${comp}  (stage 1 prediction, U with k = 2; carried into the batch's budget)`,
    `Premix tank  ${tankName(t.premix.tank.id)}: ${pressure(d.startPa, unit, 5)} before the batch, ` +
      `${pressure(d.endPa, unit, 5)} after delivering ${fixedSig(d.deliveredMol, 3)} mol (settled; ` +
      `${pressure(d.endFastPa, unit, 5)} at ${fixedSig(d.endFastK, 4)} K if delivered fast); ` +
      `it must stay above ${pressure(d.requiredPa, unit, 5)} (target ${pressure(d.targetPa, unit, 5)} + 10 %)`,
    '',
  ];
}

/** `two_stage` of plan --json: null for one tank; else stage 1 whole, the premix source and the delivery */
export function twoStageJson(
  plan: Plan,
  meta: PlanMeta,
  unit: PressureUnit,
  render: (p: Plan, m: PlanMeta, u: PressureUnit) => object,
): object | null {
  const t = plan.twoStage;
  if (!t) return null;
  const stage1 = predictionOf(t.premix);
  const { twoStage: _, ...batch } = plan;
  void _;
  const d = t.delivery;
  return {
    premix_tank: t.premix.tank.id,
    premix: {
      source: t.source.id,
      composition: t.source.composition,
      unidentified_fraction: t.source.unidentified,
      u: stage1
        ? Object.fromEntries(Object.entries(stage1.result.composition).map(([k, s]) => [k, s.u]))
        : null,
      pressure_Pa: t.choice.pressurePa,
      gases: t.choice.species,
      matched_to_design: t.choice.matched,
      order: t.choice.order,
      gauges: t.choice.gauges,
    },
    delivery: {
      start_Pa: d.startPa,
      end_Pa: d.endPa,
      end_fast_Pa: d.endFastPa,
      end_fast_K: d.endFastK,
      delivered_mol: d.deliveredMol,
      target_Pa: d.targetPa,
      required_Pa: d.requiredPa,
    },
    candidates: t.candidates,
    most_precise: t.mostPrecise
      ? {
          worst_u_over_tolerance: t.mostPrecise.worstRatio,
          warnings: t.mostPrecise.warnings,
          notes: t.mostPrecise.notes,
          gases: t.mostPrecise.choice.species,
          composition: t.mostPrecise.choice.composition,
          pressure_Pa: t.mostPrecise.choice.pressurePa,
          order: t.mostPrecise.choice.order,
        }
      : null,
    stages: [
      { stage: 1, role: 'premix', ...render(t.premix, premixMeta(meta, t), unit) },
      { stage: 2, role: 'batch', ...render(batch, meta, unit) },
    ],
  };
}

/** `two_stage_proposal` of plan --json: the proposal finding in the JSON key style, with its sentence */
export function proposalJson(f: Finding | undefined, unit: PressureUnit): object | null {
  if (!f) return null;
  return { ...(withJsonKeys(f) as object), message: describeFinding(f, (pa) => pressure(pa, unit)) };
}
