/**
 * The predicted uncertainty of a plan: the re-check's own model and GUM budget
 * (uncertainty.ts, JCGM 100:2008 law of propagation) applied to the planned readings
 * before any valve opens. Each step's target is taken as its reading, at the plan's
 * temperature, on the gauge the plan assigns, with the lab's barometer and thermometer;
 * the inputs are the re-check's (span and zero per gauge shared by its readings, display
 * resolution per reading, barometer for gauge-referenced sensors, thermometer offset and
 * resolution, virial coefficients, purity) plus one the re-check of a log cannot see: the
 * difference between the gas temperature and the thermometer that remains after the
 * settling time (`thermometer.settlingK`, per reading, rectangular).
 *
 * The predicted value is the plan's own composition; what matters is U (k = 2) against the
 * tolerance: when U exceeds it, a perfect fill cannot be proven within tolerance by `check`.
 */
import type { Plan } from './planner.js';
import type { Gauge, ReadingContext } from './gauges.js';
import type { Finding } from './findings.js';
import {
  evaluateUncertainty,
  nominalOutputs,
  type ComponentAbout,
  type OutputStat,
  type UncertaintyResult,
} from './uncertainty.js';
import { recheckModelInput, type RecheckModelInput } from './recheck-input.js';

/**
 * Our own assumption (no published source): after the settling time the gas temperature may
 * still differ from the thermometer by up to 0.05 K (rectangular half-width), independently at
 * each reading. A lab that has measured it gives `thermometer.settling` in its profile.
 */
export const DEFAULT_TEMPERATURE_SETTLING_K = 0.05;

export interface PredictionInput {
  readonly plan: Plan;
  /** the lab's gauges (the plan names them by id) */
  readonly gauges: readonly Gauge[];
  /** the barometer the plan's gauge-referenced targets assume */
  readonly reading: ReadingContext;
  readonly thermometer: { readonly uK: number; readonly resolutionK: number; readonly settlingK: number };
}

export type PredictedQuantity = 'fraction' | 'phi' | 'dilution';

export interface PredictedContribution {
  readonly name: string;
  /** |c_i u_i|, in the unit of the quantity */
  readonly contribution: number;
  readonly about?: ComponentAbout;
}

export interface PredictedRow {
  /** species key, 'phi' or 'dilution' */
  readonly name: string;
  readonly kind: PredictedQuantity;
  readonly design: number;
  readonly stat: OutputStat;
  /** U = 2 u (k = 2) */
  readonly expandedU: number;
  /** the half-width allowed: max(relative x design, absolute) for fractions, relative x design for phi */
  readonly tolerance: number;
  readonly within: boolean;
  /** the two largest contributions, largest first */
  readonly top: readonly PredictedContribution[];
}

export interface PlanPrediction {
  readonly result: UncertaintyResult;
  readonly rows: readonly PredictedRow[];
  readonly model: RecheckModelInput;
  readonly settlingK: number;
}

/** the re-check's model input for the planned readings; undefined when a step has no gauge */
export function plannedModelInput(input: PredictionInput): RecheckModelInput | undefined {
  const { plan } = input;
  if (plan.steps.some((s) => !s.gauge || !input.gauges.some((g) => g.id === s.gauge!.id))) return undefined;
  const T = plan.temperatureK;
  return recheckModelInput(
    {
      sources: new Map(plan.steps.map((s) => [s.source.id, s.source])),
      gauges: new Map(input.gauges.map((g) => [g.id, g])),
      barometer: { pressurePa: input.reading.barometricPa, uPa: input.reading.barometricUncertaintyPa },
      thermometer: input.thermometer,
      diluent: Object.keys(plan.design.groups.diluent),
      start: plan.initial
        ? { composition: plan.initial.composition, pressurePa: plan.initial.pressurePa, temperatureK: T }
        : undefined,
    },
    plan.steps.map((s) => ({
      step: s.index,
      sourceId: s.source.id,
      gaugeId: s.gauge!.id,
      pressurePa: s.targetPa,
      temperatureK: T,
    })),
    { trials: 0, seed: 0 },
  );
}

/**
 * Predicted value +- U (k = 2) of every design mole fraction, phi and the diluent fraction,
 * with the two largest contributions. Undefined when a step has no gauge (the plan then
 * carries a no-gauge-covers danger and nothing can be read).
 */
export function predictPlan(input: PredictionInput): PlanPrediction | undefined {
  const model = plannedModelInput(input);
  if (!model) return undefined;
  const result = evaluateUncertainty(model.readings, model.settings, model.diluent, model.initial);
  const { design, tolerance } = input.plan;
  const aboutOf = new Map(result.components.map((c) => [c.name, c.about]));
  const row = (name: string, kind: PredictedQuantity, d: number, stat: OutputStat): PredictedRow => {
    const allowed =
      kind === 'phi' ? tolerance.relative * d : Math.max(tolerance.relative * d, tolerance.absolute);
    const U = 2 * stat.u;
    const top = stat.budget.slice(0, 2).map((b) => ({ ...b, about: aboutOf.get(b.name) }));
    return { name, kind, design: d, stat, expandedU: U, tolerance: allowed, within: U <= allowed, top };
  };
  const rows: PredictedRow[] = [];
  for (const [k, xd] of Object.entries(design.composition)) {
    const st = result.composition[k];
    if (xd > 0 && st) rows.push(row(k, 'fraction', xd, st));
  }
  if (design.phi !== undefined && result.phi) rows.push(row('phi', 'phi', design.phi, result.phi));
  if (result.diluentFraction && design.diluentFraction > 0)
    rows.push(row('dilution', 'dilution', design.diluentFraction, result.diluentFraction));
  return { result, rows, model, settlingK: input.thermometer.settlingK };
}

/** the group a component belongs to for advice: per-reading terms of one kind (and gauge) together */
function groupKey(a: ComponentAbout): string {
  switch (a.kind) {
    case 'span':
    case 'zero':
    case 'resolution':
      return `${a.kind} ${a.gauge}`;
    case 'virial':
      return 'virial';
    case 'purity':
      return `purity ${a.source}`;
    default:
      return a.kind;
  }
}

/**
 * The dominant group of inputs of a predicted quantity: the per-reading terms of one kind are
 * summed (their u^2), so that four equal temperature terms count as one cause; the group is
 * named by its largest member.
 */
export function dominantGroup(
  p: PlanPrediction,
  st: OutputStat,
): { name: string; share: number; about: ComponentAbout } | undefined {
  const cs = st.contributions;
  if (!cs || !(st.u > 0)) return undefined;
  const groups = new Map<string, { sum: number; best: number; index: number }>();
  cs.forEach((c, i) => {
    const key = groupKey(p.result.components[i].about);
    const g = groups.get(key) ?? { sum: 0, best: 0, index: i };
    g.sum += c * c;
    if (Math.abs(c) > g.best) {
      g.best = Math.abs(c);
      g.index = i;
    }
    groups.set(key, g);
  });
  const top = [...groups.values()].sort((a, b) => b.sum - a.sum)[0];
  if (!top) return undefined;
  const comp = p.result.components[top.index];
  return { name: comp.name, share: top.sum / (st.u * st.u), about: comp.about };
}

/** one warning per design mole fraction whose predicted U exceeds its tolerance, worst first */
export function predictionFindings(p: PlanPrediction): Finding[] {
  return p.rows
    .filter((r) => r.kind === 'fraction' && !r.within)
    .sort((a, b) => b.expandedU / b.tolerance - a.expandedU / a.tolerance)
    .map((r): Finding => {
      const dominant = dominantGroup(p, r.stat);
      const step = dominant && 'step' in dominant.about ? dominant.about.step : undefined;
      return {
        severity: 'warning',
        code: 'predicted-u-over-tolerance',
        step,
        species: r.name,
        design: r.design,
        expandedU: r.expandedU,
        tolerance: r.tolerance,
        dominant: dominant?.name ?? '-',
        dominantShare: dominant?.share ?? 0,
        about: dominant?.about,
      };
    });
}

/** the share of the computed common band share that is said (our margin, module and bandEdgesFinding) */
export const BAND_SHARE_MARGIN = 0.9;

/** the model's output a predicted row is: a species' mole fraction, phi, or the diluent fraction */
const outputOf = (r: PredictedRow) => (r.kind === 'dilution' ? 'diluent' : r.name);

/**
 * Each predicted row with the most it can move with every reading at its band's edge the worst way
 * (`stack`: the sum over the readings of the magnitude of its central difference across the reading's
 * band) and its room (tolerance less U); undefined when the model's readings are not the plan's steps
 */
export function bandEdgeStacks(
  plan: Plan,
  p: PlanPrediction,
): { readonly r: PredictedRow; readonly stack: number; readonly room: number }[] | undefined {
  const { readings, settings, diluent, initial } = p.model;
  if (readings.length !== plan.steps.length) return undefined;
  const at = (i: number, d: number) =>
    nominalOutputs(
      readings.map((r, j) => (j === i ? { ...r, pressurePa: r.pressurePa + d } : r)),
      settings,
      diluent,
      initial,
    );
  const moved = plan.steps.map((s, i) => ({ up: at(i, s.bandPa), down: at(i, -s.bandPa) }));
  return p.rows.map((r) => {
    const o = outputOf(r);
    const stack = moved.reduce((sum, m) => sum + Math.abs(m.up[o] - m.down[o]) / 2, 0);
    return { r, stack, room: r.tolerance - r.expandedU };
  });
}

/**
 * Readings inside every band, taken together. Each fill's band is its own tolerance with the fills
 * before it read at their targets; a paper fill reads every later fill to its printed target whatever
 * the one before read, so the deviations of all readings add up. With each reading moved to its band's
 * edge, one at a time (central differences of the re-check's own model: `nominalOutputs`), the worst
 * way their effects can add (sum of magnitudes, linear: JCGM 100:2008 5.1.2 first-order terms) is set
 * against each design quantity's tolerance less its predicted U (the room a pass needs: check passes a
 * quantity only when |deviation| + U <= tolerance). A warning when the band edges can go past that room;
 * it gives the common share of every band inside which all quantities stay within it. Undefined when the
 * bands hold together, or when the U of some quantity alone fills its tolerance (no readings pass then:
 * predicted-u-over-tolerance says so).
 */
export function bandEdgesFinding(plan: Plan, p: PlanPrediction): Finding | undefined {
  // check passes or fails the design mole fractions only (verdict.ts judge): phi and the dilution are
  // shown beside them, not judged, so their rows set no room here
  const judged = (r: PredictedRow) => r.kind === 'fraction';
  // a quantity whose U alone fills its tolerance passes on no readings: the plan says so already
  // (predicted-u-over-tolerance), and no share of the bands would help (nor is the model run for it)
  if (p.rows.some((r) => judged(r) && !(r.tolerance - r.expandedU > 0))) return undefined;
  const rows = bandEdgeStacks(plan, p);
  if (!rows) return undefined;
  const roomy = rows.filter((x) => judged(x.r) && Number.isFinite(x.stack));
  if (!roomy.length) return undefined;
  const worst = roomy.reduce((a, b) => (b.stack / b.room > a.stack / a.room ? b : a));
  if (!(worst.stack > worst.room)) return undefined;
  // the share said is one the re-check passes at its edges too: U grows a little away from the targets
  // and the stack is first order, so it is taken at BAND_SHARE_MARGIN of the computed one (our margin;
  // at the computed share itself a worst-way fill came out NOT SHOWN by a few 1e-7), and rounded down to
  // two significant digits (as it is printed: never a share wider than computed)
  const exact =
    BAND_SHARE_MARGIN * Math.min(...roomy.map((x) => (x.stack > 0 ? x.room / x.stack : Infinity)));
  const digits = 10 ** (1 - Math.floor(Math.log10(exact)));
  const share = Math.floor(exact * digits) / digits;
  return {
    severity: 'warning',
    code: 'band-edges-past-tolerance',
    species: worst.r.name,
    design: worst.r.design,
    stack: worst.stack,
    tolerance: worst.r.tolerance,
    expandedU: worst.r.expandedU,
    share,
    bands: plan.steps.map((s) => {
      const halfWidthPa = share * s.bandPa;
      // a displayed value is known to half its display step: a narrower half-width cannot be read to
      const step = s.gauge?.resolutionPa;
      return step === undefined
        ? { step: s.index, halfWidthPa, finerThanDisplay: false }
        : {
            step: s.index,
            halfWidthPa,
            gauge: s.gauge!.id,
            displayStepPa: step,
            finerThanDisplay: halfWidthPa <= step / 2,
          };
    }),
  };
}

/**
 * The plan with bandEdgesFinding when its bands can fail together, placed after the warnings (before
 * the first note, as the planner lists findings); the plan unchanged otherwise. For any predicted plan:
 * a single tank, each stage of a two-stage plan, a batch from a premix log.
 */
export function withBandEdges(plan: PredictedPlan): PredictedPlan {
  const edges = plan.predicted && bandEdgesFinding(plan, plan.predicted);
  if (!edges) return plan;
  const at = plan.findings.findIndex((f) => f.severity === 'note');
  const cut = at < 0 ? plan.findings.length : at;
  return { ...plan, findings: [...plan.findings.slice(0, cut), edges, ...plan.findings.slice(cut)] };
}

/** a plan that carries its predicted uncertainty (or why there is none) */
export interface PredictedPlan extends Plan {
  readonly predicted?: PlanPrediction;
  /** why no prediction was made (a step without a gauge, a refused state) */
  readonly predictionMissing?: string;
}

/** the prediction a plan carries, if any */
export function predictionOf(plan: Plan): PlanPrediction | undefined {
  return (plan as PredictedPlan).predicted;
}

/**
 * The plan with its prediction and the prediction's findings (they replace the former
 * per-reading heuristic, which the planner no longer emits: the budget correlates a gauge's
 * span between its readings, the heuristic did not). Without a prediction the plan keeps its
 * findings and says why.
 */
export function withPrediction(plan: Plan, p: PlanPrediction | undefined, missing?: string): PredictedPlan {
  if (!p) return { ...plan, predictionMissing: missing ?? 'a step has no gauge that reads its target' };
  const kept = plan.findings;
  // warnings stand before the notes, as the planner lists them
  const at = kept.findIndex((f) => f.severity === 'note');
  const cut = at < 0 ? kept.length : at;
  return {
    ...plan,
    predicted: p,
    findings: [...kept.slice(0, cut), ...predictionFindings(p), ...kept.slice(cut)],
  };
}
