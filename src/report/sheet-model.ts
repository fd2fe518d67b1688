/**
 * The fill checklist as one report model; each format (sheet-render.ts) is a pure
 * function of it. Everything a person holds at the manifold: the design, the checks
 * before and after, one row per fill with the target in the gauge's own unit and its
 * band, blanks to write in, the findings and the caution, and the diagram.
 */
import { describeFinding, fillLabel, STANDING_CAUTION, type Finding, type MixingEstimate, type Plan, type Severity } from '../core/index.js';
import { duration } from './ready-report.js';
import { fromPa, isPressureUnit, type PressureUnit } from '../io/quantity.js';
import type { RecipeFile } from '../io/recipe.js';
import { decimalsFor, fixedSig, pressure } from './format.js';
import { detailSvg, diagramData, diagramSvg } from './diagram.js';

export interface SheetRow {
  readonly n: number;
  readonly fill: string;
  readonly source: string;
  readonly sourceLabel: string;
  readonly gauge: string;
  readonly target: string;
  readonly low: string;
  readonly high: string;
  readonly unit: string;
  readonly reference: 'absolute' | 'gauge';
  readonly absoluteTarget: string;
  readonly before: readonly string[];
}

export interface SheetModel {
  readonly title: string;
  readonly batchId: string;
  readonly recipeId: string;
  readonly labName: string;
  readonly version: string;
  readonly paper: 'a4' | 'letter';
  readonly design: readonly [string, string][];
  readonly composition: readonly [string, string][];
  readonly preChecks: readonly string[];
  readonly rows: readonly SheetRow[];
  readonly postChecks: readonly string[];
  readonly label: readonly string[];
  readonly findings: readonly { readonly severity: Severity; readonly code: string; readonly where: string; readonly message: string }[];
  readonly caution: string;
  readonly diagram?: { readonly triangle: string; readonly detail: string; readonly legend: string };
  readonly hasDanger: boolean;
}

export interface SheetMeta {
  readonly recipe: RecipeFile;
  readonly labName: string;
  readonly orderRecommended: boolean;
  readonly unit: PressureUnit;
  readonly batchId?: string;
  readonly version: string;
  readonly paper: 'a4' | 'letter';
  /** the diffusion estimate of `mixwright ready`, when the tank height is known */
  readonly mixing?: MixingEstimate;
}

const SEVERITY_ORDER: Severity[] = ['danger', 'warning', 'note'];

function mixingLine(m?: MixingEstimate): string {
  if (!m?.pair || m.to1PercentS === undefined || m.to01PercentS === undefined) return 'Mixing: stirrer on ________ min, or rest ________ h before the first use (diffusion alone takes hours)';
  const est = `diffusion alone: about ${duration(m.to1PercentS)} to 1 %, ${duration(m.to01PercentS)} to 0.1 % (slowest pair ${m.pair.a}-${m.pair.b})`;
  return m.stirred ? `Mixing: stirrer on ________ min (${est} without it)` : `Mixing: unstirred tank, ${est}; rest at least ________ h before the first use`;
}

export function buildSheetModel(plan: Plan, meta: SheetMeta): SheetModel {
  const P = (pa: number) => pressure(pa, meta.unit, 6);
  const d = plan.design;
  const design: [string, string][] = [
    ['phi', d.phi === undefined ? 'n/a' : d.phi.toFixed(4)],
    ['fuel', Object.entries(d.groups.fuel).map(([k, v]) => (v === 1 ? k : `${k} ${fixedSig(v, 4)}`)).join(', ') || '-'],
    ['oxidizer', Object.entries(d.groups.oxidizer).map(([k, v]) => (v === 1 ? k : `${k} ${fixedSig(v, 4)}`)).join(', ') || '-'],
    ['diluent', `${Object.keys(d.groups.diluent).join(', ') || '-'} (${fixedSig(d.diluentFraction, 5)})`],
    ['tank', `${plan.tank.id}, ${fixedSig(plan.tank.volumeM3 * 1000, 4)} L${plan.tank.ratedPressurePa ? `, rated ${pressure(plan.tank.ratedPressurePa, meta.unit, 4)}` : ', rating not known'}`],
    ['final', `${P(plan.final.pressurePa)} absolute at ${(plan.temperatureK - 273.15).toFixed(1)} degC (Z ${plan.final.compressibility.toFixed(5)}, ${fixedSig(plan.final.amountMol, 5)} mol)`],
    ['order', `${plan.steps.map((s) => s.species).join(' -> ')}${meta.orderRecommended ? ' (recommended)' : ''}`],
    ['tolerance', `each mole fraction within ${(plan.tolerance.relative * 100).toFixed(2)} %`],
  ];
  const composition: [string, string][] = Object.entries(d.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => [k, fixedSig(v, 6)]);
  const firstGauge = plan.steps.find((s) => s.gauge)?.gauge;
  const preChecks = [
    'Leak-up test of tank and manifold under vacuum: rise ________ per ________ min (limit from your procedure)',
    'Base vacuum before the first fill: ________',
    `Gauge zeros checked (${[...new Set(plan.steps.map((s) => s.gauge?.id).filter(Boolean))].join(', ')}), heads at temperature`,
    `Barometer (for gauge-referenced sensors): ________${firstGauge ? '' : ''}`,
    'Valve line-up checked: only the cylinder of the current fill open to the manifold; vent and pump valves as the procedure says',
    'Before each fill: purge/evacuate the line, fill it from the cylinder above the tank pressure, then open the tank valve slowly',
    'Cylinders secured; regulators and lines cleaned for the gas they carry (oxygen service for oxidizers)',
  ];
  const rows: SheetRow[] = plan.steps.map((s) => {
    const gu: PressureUnit = s.gauge && isPressureUnit(s.gauge.unit) ? s.gauge.unit : meta.unit;
    const dec = s.gauge ? Math.max(decimalsFor(fromPa(s.gauge.resolutionPa, gu)), 0) : 3;
    const reading = s.gauge ? s.gauge.readingPa : s.targetPa;
    const band = s.bandPa;
    return {
      n: s.index,
      fill: s.species,
      source: s.source.id,
      sourceLabel: s.source.label,
      gauge: s.gauge?.id ?? 'NO GAUGE',
      target: fromPa(reading, gu).toFixed(dec),
      low: fromPa(reading - band, gu).toFixed(dec),
      high: fromPa(reading + band, gu).toFixed(dec),
      unit: gu,
      reference: s.gauge?.reference ?? 'absolute',
      absoluteTarget: P(s.targetPa),
      before: s.isolateBefore.map((g) => `close off ${g.id} (reads only up to ${P(g.topPa)})`),
    };
  });
  const postChecks = [
    'All cylinder and line valves closed; tank valve closed; line evacuated or vented safely',
    mixingLine(meta.mixing),
    'Final reading after mixing: ________ at ________ degC',
  ];
  const today = new Date().toISOString().slice(0, 10);
  const batchId = meta.batchId ?? `${meta.recipe.id}-${today}`;
  const label = [
    `${batchId}`,
    `${Object.entries(d.composition)
      .sort((a, b) => b[1] - a[1])
      .map(([k, v]) => `${k} ${(v * 100).toPrecision(4)} %`)
      .join(', ')}`,
    `phi ${d.phi === undefined ? 'n/a' : d.phi.toFixed(3)}; ${P(plan.final.pressurePa)} abs; filled ________ by ________`,
    plan.findings.some((f) => f.code === 'flammable-mixture') ? 'FLAMMABLE GAS MIXTURE' : 'check the findings before use',
  ];
  const stepOf = (f: Finding) => (f.step ? `fill ${f.step}` : 'batch');
  const findings = [...plan.findings]
    .filter((f) => f.code !== 'isolate-gauge')
    .sort((a, b) => SEVERITY_ORDER.indexOf(a.severity) - SEVERITY_ORDER.indexOf(b.severity))
    .map((f) => ({ severity: f.severity, code: f.code, where: stepOf(f), message: describeFinding(f, (pa) => pressure(pa, meta.unit, 5)) }));
  const dd = diagramData(plan);
  const diagram = dd && {
    triangle: diagramSvg(dd, 'fuel / O2 / inert diagram with the flammable zone and the fill path'),
    detail: detailSvg(dd, 'detail near the inert corner'),
    legend: `Hatched: flammable zone of ${Object.keys(d.groups.fuel).join('/') || 'the fuel'} (LFL ${(dd.lfl * 100).toPrecision(3)} %, UFL ${(dd.ufl * 100).toPrecision(3)} % in air, inerts as N2-equivalent). Dashed: air line; dotted: stoichiometric line. Numbered points: the tank after each fill (${plan.steps.map((s) => `${s.index} ${fillLabel(s.source)}`).join(', ')}).`,
  };
  return {
    title: meta.recipe.title ?? meta.recipe.id,
    batchId,
    recipeId: meta.recipe.id,
    labName: meta.labName,
    version: meta.version,
    paper: meta.paper,
    design,
    composition,
    preChecks,
    rows,
    postChecks,
    label,
    findings,
    caution: STANDING_CAUTION,
    diagram,
    hasDanger: plan.findings.some((f) => f.severity === 'danger'),
  };
}
