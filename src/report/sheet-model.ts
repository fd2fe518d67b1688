/**
 * The fill checklist as one report model; each format (sheet-render.ts) is a pure
 * function of it. Everything a person holds at the manifold: the design, the checks
 * before and after, one row per fill with the target in the gauge's own unit and its
 * band, blanks to write in, the findings and the caution, and the diagram.
 */
import {
  blendLimits,
  describeFinding,
  diagramPoint,
  fillLabel,
  GIVEN_VOLUME_TANK,
  mixingEstimate,
  STANDING_CAUTION,
  type Finding,
  type Gauge,
  type MixingEstimate,
  type Plan,
  type PlanStep,
  type Severity,
} from '../core/index.js';
import { duration } from './ready-report.js';
import { fromPa, isPressureUnit, type PressureUnit } from './units.js';
import {
  bandWords,
  decimalsFor,
  fixedSig,
  inwardBand,
  mixtureTitle,
  noneInsideWords,
  pressure,
  tankName,
  tankRating,
} from './format.js';
import { detailSvg, diagramData, diagramSvg } from './diagram.js';
import { TORR_PA } from '../core/index.js';
import { predictedSheetLines } from './predicted-text.js';
import { chargeName, chargeShort, chargeWords, isSplit, siblingWords } from './charges.js';
import { dangerHeadline, toleranceHeadline } from './headlines.js';
import { gasHazard } from './gas-caution.js';
import { FLAMMABLE_IN_AIR_MARK, FLAMMABLE_MARK, NEAR_FLAMMABLE_MARK, oxidizerMark } from './tank-hazards.js';

export interface SheetRow {
  readonly n: number;
  readonly fill: string;
  readonly source: string;
  readonly sourceLabel: string;
  readonly gauge: string;
  readonly target: string;
  readonly low: string;
  readonly high: string;
  /** the band as printed: "low - high", or its half-width where the gauge's display cannot show it */
  readonly band: string;
  /** where no value the gauge shows lies inside the band: the fill screen's sentence (noneInsideWords) */
  readonly noneInside?: string;
  /**
   * where readings inside every band can fail together (band-edges-past-tolerance): the narrower band
   * every fill is read inside for the readings together to hold, printed as the band is (the finding's
   * own half-width about the same reading); absent when the finding does not fire
   */
  readonly shared?: string;
  /** where no value the gauge shows lies inside the shared band: said under the row */
  readonly sharedNoneInside?: string;
  readonly unit: string;
  readonly reference: 'absolute' | 'gauge';
  readonly absoluteTarget: string;
  readonly before: readonly string[];
  /** a source filled in more than one charge: which charge this row is (absent for a source filled once) */
  readonly charge?: { readonly number: number; readonly of: number };
  /**
   * the charge in words under its row: "Ar, charge 1 of 2 - stop at 400.00 Torr on head-1kT ...";
   * a non-last charge's stop reading is its target
   */
  readonly chargeNote?: string;
  /** a reading to take and tick before this fill, printed as its own row of the Fills table above it */
  readonly check?: SheetCheck;
  /**
   * the dangers and warnings of the plan that concern this fill (its path, the gas it compresses, its
   * state: "throttle this fill"), printed above its row as well as in the findings
   */
  readonly cautions: readonly SheetCaution[];
}

/** a danger or warning of one fill, as its row carries it */
export interface SheetCaution {
  readonly severity: 'danger' | 'warning';
  readonly code: string;
  readonly message: string;
}

/**
 * Findings of one fill that the row carries: dangers and warnings with that fill's step; not the
 * prediction's U over tolerance (a property of the finished batch, said with the uncertainty)
 */
export function fillCautions(plan: Plan, step: number, unit: PressureUnit): SheetCaution[] {
  const out: SheetCaution[] = [];
  for (const f of plan.findings)
    if (f.step === step && f.severity !== 'note' && f.code !== 'predicted-u-over-tolerance')
      out.push({
        severity: f.severity,
        code: f.code,
        message: describeFinding(f, (pa) => pressure(pa, unit, 5)),
      });
  return out.sort((a, b) => SEVERITY_ORDER.indexOf(a.severity) - SEVERITY_ORDER.indexOf(b.severity));
}

/**
 * A reading to take and tick before a fill, as a row of the Fills table: what to read, on which
 * gauge, the lowest reading allowed, and what to do below it (the premix tank before it delivers).
 */
export interface SheetCheck {
  /** what is read, e.g. "Premix tank MT-2" */
  readonly what: string;
  /** when, e.g. "before fill 3" */
  readonly when: string;
  readonly gauge: string;
  readonly reference: 'absolute' | 'gauge';
  /** the lowest reading allowed, in the gauge's unit, rounded up to its display step */
  readonly minimum: string;
  readonly unit: string;
  /** the reading the plan expects, in the gauge's unit */
  readonly planned: string;
  /** the check in words under its row: how to read it, and what to do below the minimum */
  readonly note: string;
}

/** what the sheet needs of the lab profile beyond the plan: gauges for a check reading, tank heights for mixing */
export interface SheetLab {
  readonly gauges: readonly Gauge[];
  readonly reading: { readonly barometricPa: number; readonly barometricUncertaintyPa: number };
  readonly tanks: readonly { readonly id: string; readonly heightM?: number; readonly stirred?: boolean }[];
}

export interface SheetModel {
  readonly title: string;
  readonly batchId: string;
  readonly recipeId: string;
  readonly labName: string;
  readonly version: string;
  readonly paper: 'a4' | 'letter';
  /** label and value; a value of several lines (one gas a line) holds '\n' between them */
  readonly design: readonly [string, string][];
  readonly composition: readonly [string, string][];
  readonly preChecks: readonly string[];
  readonly rows: readonly SheetRow[];
  readonly postChecks: readonly string[];
  readonly label: readonly string[];
  readonly findings: readonly {
    readonly severity: Severity;
    readonly code: string;
    readonly where: string;
    readonly message: string;
  }[];
  readonly caution: string;
  readonly diagram?: { readonly triangle: string; readonly detail: string; readonly legend: string };
  /** the plan's DANGER headline (how many, which codes and fills), when a danger stands */
  readonly danger?: string;
  /** the plan's CANNOT MEET ITS TOLERANCE headline, when even a fill exactly at the targets cannot be shown within */
  readonly tolerance?: string;
  /** where a target is read on a gauge-referenced sensor: the barometric pressure it assumes and how to correct it */
  readonly barometer?: readonly string[];
  /** the Fills table's shared-band column in words (under the table), when band-edges-past-tolerance fires */
  readonly sharedNote?: string;
}

export interface SheetMeta {
  /** the recipe's id and title (a recipe file fits as it is) */
  readonly recipe: { readonly id: string; readonly title?: string };
  /** the options given that override a recipe field its title may state, e.g. "--pressure 3000 Torr" */
  readonly overrides?: readonly string[];
  readonly labName: string;
  readonly orderRecommended: boolean;
  readonly unit: PressureUnit;
  readonly batchId?: string;
  readonly version: string;
  readonly paper: 'a4' | 'letter';
  /** the diffusion estimate of `mixwright ready`, when the tank height is known (else from `lab`) */
  readonly mixing?: MixingEstimate;
  /** the lab profile's gauges and tanks: the premix tank's check reading and the tanks' mixing times */
  readonly lab?: SheetLab;
  /**
   * stage 1 of a two-stage preparation: the batch that draws from this premix, so that the
   * mixing line says the premix must be uniform before stage 2 draws from it
   */
  readonly premixFor?: string;
  /** the barometric pressure the gauge-referenced targets assume, and whether it was given for today (--barometer) */
  readonly barometer?: {
    readonly pressurePa: number;
    readonly uncertaintyPa: number;
    readonly given: boolean;
  };
}

/** a title for a design given on the command line (no recipe title): its gases, phi and dilution, tank and pressure */
export function designTitle(plan: Plan, unit: PressureUnit): string {
  const tank =
    plan.tank.id === GIVEN_VOLUME_TANK ? `a ${fixedSig(plan.tank.volumeM3 * 1000, 4)} L tank` : plan.tank.id;
  return mixtureTitle(plan.design, plan.final.pressurePa, tank, unit);
}

/**
 * the recipe's title as this sheet's: as it is, or, where an option overrode a field the title may
 * state (pressure, tank, ...), the planned design's title with the recipe's quoted as the recipe's
 */
export function recipeTitle(plan: Plan, meta: SheetMeta): string | undefined {
  const own = meta.recipe.title;
  if (!own || !meta.overrides?.length) return own;
  const planned = `planned here with ${meta.overrides.join(', ')}`;
  return `${designTitle(plan, meta.unit)} (${planned}; the recipe's title: "${own}")`;
}

/** the batch-id stem of a command-line design: its gases, e.g. "ch4-o2-ar" */
function designSlug(plan: Plan): string {
  return Object.keys(plan.design.composition)
    .filter((k) => plan.design.composition[k] > 0)
    .join('-')
    .toLowerCase()
    .replace(/[^a-z0-9.-]+/g, '-');
}

/** the limits the diagram shows are the listed ones corrected for the tank's state; say so, with the listed values */
function limitsNote(plan: Plan, lfl: number, ufl: number): string {
  const fuel = diagramPoint(plan.steps[plan.steps.length - 1].compositionAfter).fuelBlend;
  const base = blendLimits(fuel, 298.15, 101325);
  const pct = (v: number) => `${(v * 100).toPrecision(3)} %`;
  const lflMoved = Math.abs(lfl - base.lfl) > 1e-9;
  const uflMoved = Math.abs(ufl - base.ufl) > 1e-9;
  if (!lflMoved && !uflMoved) return '';
  const why: string[] = [];
  if (plan.temperatureK > 298.15)
    why.push(`widened for ${(plan.temperatureK - 273.15).toFixed(1)} degC (modified Burgess-Wheeler)`);
  if (plan.final.pressurePa > 101325)
    why.push(`UFL raised for ${pressure(plan.final.pressurePa, 'Torr', 5)} (Zabetakis)`);
  return (
    ` Limits shown pressure/temperature-corrected: ${why.join('; ')}; listed ` +
    `values at 25 degC and 1 atm: LFL ${pct(base.lfl)}, UFL ${pct(base.ufl)}.`
  );
}

function barometerLines(plan: Plan, meta: SheetMeta): string[] | undefined {
  const refSteps = plan.steps.filter((s) => s.gauge?.reference === 'gauge');
  if (!refSteps.length || !meta.barometer) return undefined;
  const b = meta.barometer;
  const g = refSteps[0].gauge!;
  const gu: PressureUnit = isPressureUnit(g.unit) ? g.unit : meta.unit;
  const perTorr = fromPa(TORR_PA, gu);
  const dec = Math.max(decimalsFor(fromPa(g.resolutionPa, gu)), 0);
  const ex = refSteps[0];
  const exTarget = fromPa(ex.gauge!.readingPa, gu);
  const today = b.pressurePa - 10 * TORR_PA;
  const given = b.given ? 'given for this sheet' : "the lab profile value, not today's";
  return [
    `The gauge-referenced targets (fill ${refSteps.map((s) => s.index).join(', ')} ` +
      `on ${[...new Set(refSteps.map((s) => s.gauge!.id))].join(', ')}) assume ` +
      `a barometric pressure of ${pressure(b.pressurePa, 'Torr', 5)} (${given}; ` +
      `u ${pressure(b.uncertaintyPa, 'Torr', 2)}).`,
    `Read the barometer before the first fill: ________ Torr. Target to stop ` +
      `at today = printed target + (${pressure(b.pressurePa, 'Torr', 5)} - today's ` +
      `barometer), in the gauge's unit (1 Torr = ${fixedSig(perTorr, 5)} ${gu}).`,
    `Example: fill ${ex.index} printed ${exTarget.toFixed(dec)} ${gu}; with today's ` +
      `barometer 10 Torr lower (${pressure(today, 'Torr', 5)}) stop at ${(exTarget + 10 * perTorr).toFixed(dec)} ` +
      `${gu}. Or re-print the sheet with --barometer.`,
  ];
}

const SEVERITY_ORDER: Severity[] = ['danger', 'warning', 'note'];

/** the diffusion estimate of the plan's own tank: given by the caller, else from the lab profile's height */
function mixingOf(plan: Plan, meta: SheetMeta): { m: MixingEstimate; heightM?: number } | undefined {
  const tank = meta.lab?.tanks.find((t) => t.id === plan.tank.id);
  if (meta.mixing) return { m: meta.mixing, heightM: tank?.heightM };
  if (!tank?.heightM) return undefined;
  return {
    m: mixingEstimate(
      plan.composition,
      plan.temperatureK,
      plan.final.pressurePa,
      tank.heightM,
      Boolean(tank.stirred),
    ),
    heightM: tank.heightM,
  };
}

/** the diffusion times and their basis: the tank's height, the final pressure and temperature, the D used */
function mixingBasis(plan: Plan, meta: SheetMeta, m: MixingEstimate, heightM?: number): string {
  const pair = m.pair!;
  const over = heightM
    ? ` over the ${fixedSig(heightM * 100, 3)} cm height of ${plan.tank.id} (lab profile)`
    : '';
  return (
    `by diffusion alone${over} at ${pressure(plan.final.pressurePa, meta.unit, 5)} and ` +
    `${(plan.temperatureK - 273.15).toFixed(1)} degC: ${duration(m.to1PercentS!)} to 1 %, ` +
    `${duration(m.to01PercentS!)} to 0.1 % residual non-uniformity (slowest pair ${pair.a}-${pair.b}, ` +
    `D ${pair.governingM2s.toExponential(2)} m2/s, the smaller of Fuller and Chapman-Enskog` +
    (m.findings.some((f) => f.severity === 'warning')
      ? '; pairs without diffusion data left out: may take longer)'
      : ')')
  );
}

function mixingLine(plan: Plan, meta: SheetMeta): string {
  const mix = mixingOf(plan, meta);
  const m = mix?.m;
  if (!m?.pair || m.to1PercentS === undefined || m.to01PercentS === undefined)
    return meta.premixFor
      ? `Premix uniform before stage 2 (${meta.premixFor}) draws from it: stirrer on ________ min, or rest ` +
          '________ h (no diffusion estimate: the lab profile gives no height for this tank; diffusion ' +
          'alone takes hours)'
      : 'Mixing: stirrer on ________ min, or rest ________ h before the first use (diffusion alone takes hours)';
  const est =
    `diffusion alone: about ${duration(m.to1PercentS)} to 1 %, ${duration(m.to01PercentS)} ` +
    `to 0.1 % (slowest pair ${m.pair.a}-${m.pair.b}` +
    (m.findings.some((f) => f.severity === 'warning')
      ? '; pairs without diffusion data left out: may take longer)'
      : ')');
  if (meta.premixFor) {
    // stage 1: the premix must be uniform before stage 2 draws from it; the basis on its own line
    const basis = mixingBasis(plan, meta, m, mix?.heightM);
    return m.stirred
      ? `Premix uniform before stage 2 (${meta.premixFor}) draws from it: stirrer on ________ min (common ` +
          `practice: 15-30 min); without the stirrer rest at least ${duration(m.to01PercentS)}\n${basis}`
      : `Premix uniform before stage 2 (${meta.premixFor}) draws from it: unstirred tank, rest at least ` +
          `${duration(m.to01PercentS)}, from ______ to ______\n${basis}`;
  }
  return m.stirred
    ? `Mixing: stirrer on ________ min (${est} without it)`
    : `Mixing: unstirred tank, ${est}; rest at least ________ h before the first use`;
}

const groupText = (g: Readonly<Record<string, number>>) =>
  Object.entries(g)
    .map(([k, v]) => (v === 1 ? k : `${k} ${fixedSig(v, 4)}`))
    .join(', ') || '-';

/** the design block: phi, the gas groups, tank, final state, order and tolerance */
function designRows(plan: Plan, meta: SheetMeta): [string, string][] {
  const P = (pa: number) => pressure(pa, meta.unit, 6);
  const d = plan.design;
  const t = plan.tank;
  // the working limit beside the rating, as the plan says it
  const rating = `, ${tankRating(plan, (pa, sig) => pressure(pa, meta.unit, sig))}`;
  return [
    ['phi', d.phi === undefined ? 'n/a' : d.phi.toFixed(4)],
    ['fuel', groupText(d.groups.fuel)],
    ['oxidizer', groupText(d.groups.oxidizer)],
    ['diluent', `${Object.keys(d.groups.diluent).join(', ') || '-'} (${fixedSig(d.diluentFraction, 5)})`],
    ['tank', `${tankName(t.id)}, ${fixedSig(t.volumeM3 * 1000, 4)} L${rating}`],
    [
      'final',
      `${P(plan.final.pressurePa)} absolute at ${(plan.temperatureK - 273.15).toFixed(1)} ` +
        `degC (Z ${plan.final.compressibility.toFixed(5)}, ${fixedSig(plan.final.amountMol, 5)} mol)`,
    ],
    [
      'order',
      `${plan.steps.map((s) => chargeShort(s.species, s.charge)).join(' -> ')}` +
        `${meta.orderRecommended ? ' (recommended)' : ''}`,
    ],
    ['tolerance', `each mole fraction within ${(plan.tolerance.relative * 100).toFixed(2)} %`],
  ];
}

/**
 * the cylinders' check, with the house caution of each kind of gas the fills bring (flammable, oxidizer,
 * both) and the cylinders that carry it: the guided fill's words for each fill (gasHazard)
 */
function cylinderCheck(plan: Plan): string {
  const by = new Map<string, string[]>();
  for (const s of plan.steps) {
    const h = gasHazard(s.source.composition);
    if (!h) continue;
    const said = `${h.kind.toLowerCase()}, ${h.advice}`;
    const ids = by.get(said) ?? [];
    if (!ids.includes(s.source.id)) by.set(said, [...ids, s.source.id]);
  }
  const gases = [...by].map(([said, ids]) => `${ids.join(', ')}: ${said}`);
  return gases.length
    ? `Cylinders secured; regulators and lines cleaned for their gas. ${gases.join('. ')}`
    : 'Cylinders secured; regulators and lines cleaned for the gas they carry';
}

/** the checks before the first fill; a top-up reads, logs and confirms its starting pressure first */
function preChecks(plan: Plan, meta: SheetMeta): string[] {
  const gaugeIds = [...new Set(plan.steps.map((s) => s.gauge?.id).filter(Boolean))].join(', ');
  const baroCheck = plan.steps.some((s) => s.gauge?.reference === 'gauge')
    ? 'Barometer read before the first fill: ________ Torr (the gauge-referenced ' +
      'targets assume the value under the fills; correct them as said there)'
    : 'Barometer: ________ (every target here is on an absolute gauge; the value is for the record)';
  const common = [
    `Gauge zeros checked (${gaugeIds}), heads at temperature`,
    baroCheck,
    'Valve line-up checked: only the cylinder of the current fill open to the ' +
      'manifold; vent and pump valves as the procedure says',
    'Before each fill: purge/evacuate the line, fill it from the cylinder above ' +
      'the tank pressure, then open the tank valve slowly',
    cylinderCheck(plan),
  ];
  const start = plan.initial;
  const first = plan.steps[0];
  if (!start)
    return [
      'Leak-up test of tank and manifold under vacuum: rise ________ per ________ min (limit from your procedure)',
      'Base vacuum before the first fill: ________',
      ...common,
    ];
  // a top-up: the tank holds gas, so no leak-up under vacuum
  const held = Object.entries(start.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => `${k} ${fixedSig(v, 4)}`)
    .join(', ');
  return [
    'Gas already in the tank (top-up): do NOT evacuate the tank. Leak-check the ' +
      'manifold and line up to the closed tank valve: rise ________ per ________ ' +
      'min (limit from your procedure)',
    'Line evacuated before the tank valve is opened; line vacuum: ________',
    `Starting pressure, read before any fill on ${first.gauge?.id ?? 'a gauge that reads it'}: ` +
      `________ at ________ degC, time ______, initials ____. The targets assume ` +
      `${pressure(start.pressurePa, meta.unit, 6)} absolute of ${held}; if the reading differs by more ` +
      `than the band of fill 1 (+-${pressure(first.bandPa, meta.unit, 2)}), stop and re-plan from ` +
      `the reading (recipe in_tank.pressure)`,
    ...common,
  ];
}

/**
 * a charge of a split source in words: where to stop, and the other charges of the same
 * cylinder, so its two openings are never taken for one another
 */
function chargeNoteOf(plan: Plan, k: number, stopText: string): string {
  const s = plan.steps[k];
  const others = siblingWords(
    plan.steps.map((x) => ({ index: x.index, source: x.source.id, charge: x.charge })),
    k,
  );
  const last = s.charge.number === s.charge.of;
  return (
    `${chargeName(s.species, s.charge)} - ${last ? 'fill on to' : 'stop at'} ${stopText}` +
    `${last ? '' : ', then close the cylinder valve'}; ${others}`
  );
}

type BandEdges = Extract<Finding, { readonly code: 'band-edges-past-tolerance' }>;

/** the plan's band-edges-past-tolerance finding: readings inside every band can fail together */
const bandEdgesOf = (plan: Plan): BandEdges | undefined =>
  plan.findings.find((f): f is BandEdges => f.code === 'band-edges-past-tolerance');

/** the shared-band column under the Fills table, in words (the fills whose share no display reads: said so) */
function sharedNote(f: BandEdges): string {
  const finer = f.bands.filter((b) => b.finerThanDisplay).map((b) => b.step);
  const read = finer.length
    ? `Fill${finer.length > 1 ? 's' : ''} ${finer.join(', ')}: finer than the gauge displays, no reading from ` +
      'this sheet can keep to it: fill with `mixwright fill`, which re-targets the later fills from each reading.'
    : 'From this sheet, read every fill inside its shared band; or fill with `mixwright fill`, which ' +
      're-targets the later fills from each reading.';
  return (
    `Shared band: ${Number((f.share * 100).toPrecision(2))} % of each fill's band (band-edges-past-tolerance, ` +
    'findings). A band alone assumes the fills before it read on target; readings inside every band can ' +
    `still fail together. ${read}`
  );
}

/**
 * a fill's shared band (band-edges-past-tolerance: the finding's half-width for this fill about the
 * same reading), printed as its band is: rounded inward at the gauge's display step, in words where
 * the display cannot show it, and the sentence where no value the gauge shows lies inside it
 */
function sharedOf(
  f: BandEdges | undefined,
  s: PlanStep,
  reading: number,
  gu: PressureUnit,
  dec: number,
): Pick<SheetRow, 'shared' | 'sharedNoneInside'> {
  const band = f?.bands.find((b) => b.step === s.index);
  if (!band) return {};
  const half = band.halfWidthPa;
  // where the finding finds the share finer than half the display step, no displayed value keeps to it
  // (a displayed value is known to half its step): said so, never "only X reads inside it"
  const inward = band.finerThanDisplay ? undefined : inwardBand(reading, half, gu, dec);
  const shared = bandWords(inward, half, s.gauge?.resolutionPa ?? 0, gu, dec);
  if (band.finerThanDisplay) return { shared: `${shared}: guided fill only` };
  const none = s.gauge ? noneInsideWords(s.gauge.id, reading, half, gu, dec, true) : undefined;
  return { shared, ...(none ? { sharedNoneInside: none } : {}) };
}

/** one fill: the target and its band in the gauge's own unit */
function sheetRow(s: PlanStep, meta: SheetMeta, plan: Plan): SheetRow {
  const P = (pa: number) => pressure(pa, meta.unit, 6);
  const gu: PressureUnit = s.gauge && isPressureUnit(s.gauge.unit) ? s.gauge.unit : meta.unit;
  const dec = s.gauge ? Math.max(decimalsFor(fromPa(s.gauge.resolutionPa, gu)), 0) : 3;
  const reading = s.gauge ? s.gauge.readingPa : s.targetPa;
  const band = s.bandPa;
  // rounded inward: a reading written inside the printed band lies inside the true band
  const inward = inwardBand(reading, band, gu, dec);
  const low = inward?.low ?? fromPa(reading - band, gu).toFixed(dec);
  const high = inward?.high ?? fromPa(reading + band, gu).toFixed(dec);
  // no value the gauge shows inside the band: said as the fill screen says it
  const noneInside = s.gauge ? noneInsideWords(s.gauge.id, reading, band, gu, dec) : undefined;
  return {
    n: s.index,
    fill: s.species,
    source: s.source.id,
    sourceLabel: s.source.label,
    gauge: s.gauge?.id ?? 'NO GAUGE',
    target: fromPa(reading, gu).toFixed(dec),
    low,
    high,
    band: bandWords(inward, band, s.gauge?.resolutionPa ?? 0, gu, dec),
    ...(noneInside ? { noneInside } : {}),
    ...sharedOf(bandEdgesOf(plan), s, reading, gu, dec),
    unit: gu,
    reference: s.gauge?.reference ?? 'absolute',
    absoluteTarget: P(s.targetPa),
    before: s.isolateBefore.map((g) => `close off ${g.id} (reads only up to ${P(g.topPa)})`),
    cautions: fillCautions(plan, s.index, meta.unit),
    ...(isSplit(s.charge)
      ? {
          charge: { number: s.charge.number, of: s.charge.of },
          chargeNote: chargeNoteOf(
            plan,
            plan.steps.indexOf(s),
            `${fromPa(reading, gu).toFixed(dec)} ${gu}${s.gauge?.reference === 'gauge' ? ' (gauge)' : ''} ` +
              `on ${s.gauge?.id ?? 'the gauge'}`,
          ),
        }
      : {}),
  };
}

/** the design label: marked so, since the as-filled one comes from the log */
function designLabel(plan: Plan, meta: SheetMeta, batchId: string): string[] {
  const d = plan.design;
  return [
    `${batchId} - DESIGN, NOT YET CONFIRMED: after the fill, label the tank with \`mixwright label\` of its log`,
    `design: ${Object.entries(d.composition)
      .sort((a, b) => b[1] - a[1])
      .map(([k, v]) => `${k} ${(v * 100).toPrecision(4)} %`)
      .join(', ')}`,
    `phi ${d.phi === undefined ? 'n/a' : d.phi.toFixed(3)}; ${pressure(plan.final.pressurePa, meta.unit, 6)} ` +
      `abs; filled ________ by ________`,
    // the verdict is check's printed one (it has more outcomes than a person would circle), copied as printed
    're-check verdict (copy as printed by `mixwright check` of the log): ____________________',
    ...designMarks(plan),
  ];
}

/**
 * the design label's hazard marks, from the plan's findings on the finished mixture: flammable by itself
 * or in air (tank-hazards.ts words the as-filled label the same way), oxygen-enriched
 */
function designMarks(plan: Plan): string[] {
  const has = (code: string) => plan.findings.some((f) => f.code === code);
  const last = plan.steps[plan.steps.length - 1]?.index;
  const enriched = plan.findings.find(
    (f) => f.code === 'oxygen-enriched' && (f.step === undefined || f.step === last),
  );
  const marks = has('flammable-mixture')
    ? [FLAMMABLE_MARK]
    : has('flammable-in-air')
      ? [FLAMMABLE_IN_AIR_MARK]
      : has('near-flammable-in-air')
        ? [NEAR_FLAMMABLE_MARK]
        : [];
  if (enriched?.code === 'oxygen-enriched')
    marks.push(oxidizerMark(enriched.oxygenFraction, plan.design.composition));
  return marks.length ? marks : ['check the findings before use'];
}

/** the findings, dangers first (gauge isolation is said in the step rows) */
function sheetFindings(plan: Plan, meta: SheetMeta): SheetModel['findings'] {
  const stepOf = (f: Finding) => {
    if (!f.step) return 'batch';
    const s = plan.steps.find((x) => x.index === f.step);
    return s && isSplit(s.charge)
      ? `fill ${f.step}, ${s.species} ${chargeWords(s.charge)}`
      : `fill ${f.step}`;
  };
  return [...plan.findings]
    .filter((f) => f.code !== 'isolate-gauge')
    .sort((a, b) => SEVERITY_ORDER.indexOf(a.severity) - SEVERITY_ORDER.indexOf(b.severity))
    .map((f) => ({
      severity: f.severity,
      code: f.code,
      where: stepOf(f),
      message: describeFinding(f, (pa) => pressure(pa, meta.unit, 5)),
    }));
}

/** the fuel / O2 / inert diagram with its detail and legend, where the plan has one */
function sheetDiagram(plan: Plan): SheetModel['diagram'] {
  const dd = diagramData(plan);
  return (
    dd && {
      triangle: diagramSvg(dd, 'fuel / O2 / inert diagram with the flammable zone and the fill path'),
      detail: detailSvg(dd, 'detail near the inert corner'),
      legend:
        `Hatched: flammable zone of ${Object.keys(plan.design.groups.fuel).join('/') || 'the fuel'} ` +
        `(LFL ${(dd.lfl * 100).toPrecision(3)} %, UFL ${(dd.ufl * 100).toPrecision(3)} ` +
        `% in air, inerts as N2-equivalent).${limitsNote(plan, dd.lfl, dd.ufl)} Dashed: ` +
        `air line; dotted: stoichiometric line. Numbered points: the tank after each ` +
        `fill (${plan.steps.map((s) => `${s.index} ${chargeShort(fillLabel(s.source), s.charge)}`).join(', ')}).`,
    }
  );
}

export function buildSheetModel(plan: Plan, meta: SheetMeta): SheetModel {
  const composition: [string, string][] = Object.entries(plan.design.composition)
    .sort((a, b) => b[1] - a[1])
    .map(([k, v]) => [k, fixedSig(v, 6)]);
  const postChecks = [
    'All cylinder and line valves closed; tank valve closed; line evacuated or vented safely',
    mixingLine(plan, meta),
    'Final reading after mixing: ________ at ________ degC',
  ];
  const today = new Date().toISOString().slice(0, 10);
  // a design from the command line has no recipe id of its own ("inline"): name it by its gases
  const inline = meta.recipe.id === 'inline' && !meta.recipe.title;
  const batchId = meta.batchId ?? `${inline ? designSlug(plan) : meta.recipe.id}-${today}`;
  const edges = bandEdgesOf(plan);
  return {
    title: recipeTitle(plan, meta) ?? (inline ? designTitle(plan, meta.unit) : meta.recipe.id),
    batchId,
    recipeId: inline ? 'none (design from the command line)' : meta.recipe.id,
    labName: meta.labName,
    version: meta.version,
    paper: meta.paper,
    design: [...designRows(plan, meta), ...predictedSheetLines(plan)],
    composition,
    preChecks: preChecks(plan, meta),
    rows: plan.steps.map((s) => sheetRow(s, meta, plan)),
    postChecks,
    label: designLabel(plan, meta, batchId),
    findings: sheetFindings(plan, meta),
    caution: STANDING_CAUTION,
    diagram: sheetDiagram(plan),
    danger: dangerHeadline(plan),
    tolerance: toleranceHeadline(plan, meta.unit, true)[0],
    barometer: barometerLines(plan, meta),
    ...(edges ? { sharedNote: sharedNote(edges) } : {}),
  };
}
