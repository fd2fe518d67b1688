/**
 * The predicted uncertainty of a plan for the terminal (`plan`) and for `plan --json`:
 * every design mole fraction, phi and the diluent fraction as predicted value +- U (k = 2)
 * beside the tolerance, with the two largest contributions. The JSON has the shape of
 * `check --json`'s composition, phi and dilution (value, u, interval95, mc, budget).
 */
import {
  predictionOf,
  type OutputStat,
  type Plan,
  type PredictedPlan,
  type PredictedRow,
} from '../core/index.js';
import { fixedSig, padTable } from './format.js';

/** the same shape as check --json's statistics (mc is null: the prediction is GUM only) */
function statJson(st: OutputStat) {
  return {
    value: st.value,
    u: st.u,
    interval95: [st.low, st.high],
    mc: null,
    budget: st.budget,
  };
}

function rowJson(r: PredictedRow) {
  return {
    name: r.name,
    kind: r.kind,
    design: r.design,
    value: r.stat.value,
    u: r.stat.u,
    expanded_u: r.expandedU,
    coverage_factor: 2,
    // the tolerance is set for the mole fractions: phi and the dilution are shown, not judged (text: "-")
    tolerance: r.kind === 'fraction' ? r.tolerance : null,
    within_tolerance: r.kind === 'fraction' ? r.within : null,
    largest: r.top.map((t) => ({ name: t.name, contribution: t.contribution })),
  };
}

/** `predicted` of plan --json: null for a plan that was not given a prediction */
export function predictedJson(plan: Plan): object | null {
  const p = predictionOf(plan);
  const missing = (plan as PredictedPlan).predictionMissing;
  if (!p) return missing ? { available: false, reason: missing } : null;
  const composition: Record<string, object> = {};
  for (const [k, st] of Object.entries(p.result.composition)) composition[k] = statJson(st);
  const s = p.model.settings;
  return {
    available: true,
    method: 'GUM (JCGM 100:2008) law of propagation, the re-check model on readings at the targets',
    composition,
    phi: p.result.phi ? statJson(p.result.phi) : null,
    dilution: p.result.diluentFraction ? statJson(p.result.diluentFraction) : null,
    unidentified_fraction: p.result.unidentified,
    rows: p.rows.map(rowJson),
    inputs: {
      temperature_K: plan.temperatureK,
      thermometer_u_K: s.thermometerUncertaintyK,
      thermometer_resolution_K: s.thermometerResolutionK,
      temperature_settling_K: p.settlingK,
      barometer_Pa: s.barometricPa,
      barometer_u_Pa: s.barometricUncertaintyPa,
    },
  };
}

function label(r: PredictedRow): string {
  return r.kind === 'fraction' ? `x(${r.name})` : r.kind === 'phi' ? 'phi' : 'dilution';
}

function pct(x: number): string {
  return `${Number((x * 100).toPrecision(2))} %`;
}

/**
 * The sheet's plan summary: one line with each design fraction's (and phi's) predicted value
 * +- U beside its tolerance, so the person at the manifold knows before the first fill whether
 * a perfect fill can be shown within tolerance. [] for a plan without a prediction.
 */
export function predictedSheetLines(plan: Plan): [string, string][] {
  const p = predictionOf(plan);
  if (!p) return [];
  const parts = p.rows
    .filter((r) => r.kind !== 'dilution')
    .map(
      (r) =>
        `${label(r)} ${fixedSig(r.stat.value, 5)} +- ${fixedSig(r.expandedU, 2)} ` +
        `(${pct(r.expandedU / r.design)}` +
        (r.kind === 'fraction'
          ? `; tolerance ${pct(r.tolerance / r.design)}${r.within ? '' : ', OVER'})`
          : ')'),
    );
  return [
    [
      'predicted U',
      `(k = 2) if every reading hits its target: ${parts.join('; ')}` +
        (p.rows.some((r) => r.kind === 'fraction' && !r.within)
          ? ' - a perfect fill cannot be shown within tolerance: see the findings'
          : ''),
    ],
  ];
}

/** one short line for the wizard's preview: the design fraction with the largest U against its tolerance */
export function predictedShortLines(plan: Plan): string[] {
  const p = predictionOf(plan);
  const rows = p ? p.rows.filter((r) => r.kind === 'fraction') : [];
  if (!rows.length) return [];
  const worst = rows.reduce((a, b) => (b.expandedU / b.tolerance > a.expandedU / a.tolerance ? b : a));
  return [
    `predicted U (k = 2): ${label(worst)} ${pct(worst.expandedU / worst.design)} ` +
      `vs tolerance ${pct(worst.tolerance / worst.design)}${worst.within ? '' : ' OVER'}`,
  ];
}

/** the plan's block of predicted uncertainty, or a line saying why there is none; [] without either */
export function predictedLines(plan: Plan): string[] {
  const p = predictionOf(plan);
  const missing = (plan as PredictedPlan).predictionMissing;
  if (!p) return missing ? [`Predicted uncertainty: not available (${missing})`, ''] : [];
  const out = [
    `Predicted uncertainty of a fill read exactly at the targets (check's GUM budget, U with k = 2; ` +
      `gas-thermometer settling ${p.settlingK} K per reading):`,
  ];
  const rows: string[][] = [
    ['', 'predicted', '+- U', 'U rel', 'tolerance', '', 'two largest contributions (u)'],
  ];
  for (const r of p.rows) {
    const top = r.top.map((t) => `${t.name} ${fixedSig(t.contribution, 2)}`).join('; ');
    rows.push([
      label(r),
      fixedSig(r.stat.value, 6),
      fixedSig(r.expandedU, 2),
      pct(r.expandedU / r.design),
      // the tolerance is set for the mole fractions; phi and the dilution are shown, not judged
      r.kind === 'fraction' ? `+-${pct(r.tolerance / r.design)}` : '-',
      r.kind === 'fraction' ? (r.within ? 'within' : 'OVER') : '',
      top,
    ]);
  }
  out.push(...padTable(rows, [false, true, true, true, true, false, false]).map((l) => `  ${l}`));
  const over = p.rows.filter((r) => r.kind === 'fraction' && !r.within).length;
  out.push(
    over
      ? `  ${over} design fraction${over === 1 ? '' : 's'} cannot be shown within tolerance by check even ` +
          `with perfect readings: see the findings`
      : '  every design fraction can be shown within tolerance by check if the readings hit the targets',
  );
  out.push('');
  return out;
}
