/**
 * The re-check of readings typed from a paper record (CSV): each row a charge of the source it
 * names (a gas, a premix fill "N2+O2", or a cylinder id of the lab profile), re-checked with a
 * recipe's design and cylinders or with the lab profile alone; and the readings against the
 * tank's working limit and rating and against a named gauge's range, as the log audit does.
 */
import { evaluateUncertaintyParallel } from './parallel-mc.js';
import { chargeNumbers, fillLabel } from '../core/index.js';
import {
  chooseGauge,
  fail,
  judge,
  withReadingsPastRange,
  planFill,
  ProblemError,
  pureCylinder,
  relocate,
  type CheckedReading,
  type Design,
  type Gauge,
  type GasSource,
  type TankSpec,
  type Tolerance,
} from '../core/index.js';
import { describeLogFinding, type LogFinding } from './log-audit.js';
import { buildPlanRequest, loadLab, readRecipe, type LoadedLab } from './load.js';
import { csvRowNames, readReadingsCsv, slipRefused, type CsvReading } from './readings-csv.js';
import { sourceNames, type SourceNames } from './csv-names.js';
import { gaugeConversionWords, isPressureUnit, type GaugeConversion, type PressureUnit } from './quantity.js';
import { DEFAULT_THERMOMETER, settlingOf } from './plan-predict.js';
import {
  readingsPastRange,
  planDangersNotAcknowledged,
  verdictCaveats,
  withinFile,
  type CheckOptions,
  type CheckReport,
} from './check-shared.js';
import type { PlanDanger } from '../report/check-types.js';
import { recordedFillOf } from './check-recorded.js';
import { premixLogReport, readPremixLog, refuseNotThePremix, type PremixRecord } from './premix-check.js';
import { resolve } from 'node:path';

/** the tank the readings were filled in: its working limit and rating, Pa, where known */
interface CsvTank {
  readonly id: string;
  readonly ratedPa?: number;
  readonly limitPa?: number;
  /** where the tank came from, for the report */
  readonly from: 'recipe' | '--tank';
}

/** what CSV rows are re-checked with: the recipe's plan and lab profile, or the lab profile alone */
interface CsvBasis {
  readonly id: string;
  readonly design?: Design;
  readonly tolerance: Tolerance;
  readonly gauges: readonly Gauge[];
  readonly ctx: { barometricPa: number; barometricUncertaintyPa: number };
  readonly thermo: { uncertaintyK: number; resolutionK: number; settlingK?: number };
  readonly baroGiven: boolean;
  /** whose barometer converts gauge readings: "--barometer" or "the lab profile's" */
  readonly barometerFrom: string;
  readonly names: SourceNames;
  readonly tank?: CsvTank;
  readonly warnings: string[];
  /** --premix-log: the premix tank the readings drew from, re-checked from its log */
  readonly premix?: PremixRecord;
  /** the danger findings of the recipe's plan: CSV readings record no acknowledgement of them */
  readonly planDangers?: readonly PlanDanger[];
  /** the recipe's safety-review settings (coldest wall, condensation fraction) */
  readonly safety?: { readonly coldestK?: number; readonly condensationFraction?: number };
  /** the sources in the order of the recipe's plan */
  readonly plannedOrder?: readonly string[];
  /** the plan's fills' sources, in its order */
  readonly plannedSources?: readonly GasSource[];
  /** the plan's tank pressure after each fill, Pa (absolute) */
  readonly targetsPa?: readonly number[];
}

function tankOf(t: TankSpec, from: CsvTank['from']): CsvTank {
  const ratedPa = t.ratedPressurePa;
  return {
    id: t.id,
    ratedPa,
    limitPa: ratedPa === undefined ? undefined : ratedPa * (t.workingFraction ?? 1),
    from,
  };
}

/** --tank: the lab profile's tank of that id (refused when the profile has none) */
function labTank(lab: LoadedLab, id: string): CsvTank {
  const t = lab.tanks.find((x) => x.id === id);
  if (!t)
    return fail(
      { code: 'unknown-reference', kind: 'tank', id, choices: lab.tanks.map((x) => x.id) },
      { field: '--tank' },
    );
  return tankOf(t, '--tank');
}

function csvBasisFromRecipe(file: string, opts: CheckOptions & { recipeFile: string }): CsvBasis {
  const req = buildPlanRequest(readRecipe(opts.recipeFile), opts.labFile, {
    barometricPa: opts.barometricPa,
  });
  const plan = planFill(req.input);
  // the recipe's and lab profile's gauge pressures made absolute: said with the readings' own
  const warnings: string[] = req.gaugeContext.conversions.map(
    (c) => `gauge pressure ${gaugeConversionWords(c)}`,
  );
  if (!req.lab.thermometer) warnings.push('the lab profile gives no thermometer uncertainty; 0.5 K was used');
  // the readings cannot say whether the fill went through the plan's dangers, nor who accepted them:
  // no acknowledgement is recorded, so none stands (a caveat and no pass, as a log without one)
  const planDangers = planDangersNotAcknowledged(
    plan.findings.map((f) => ({ code: f.code, step: f.step ?? null, severity: f.severity })),
    [],
  );
  const tank = opts.tankId === undefined ? tankOf(plan.tank, 'recipe') : labTank(req.lab, opts.tankId);
  if (tank.id !== plan.tank.id)
    warnings.push(
      `--tank ${tank.id} is not the tank of the recipe (${plan.tank.id}): the readings are checked ` +
        `against the limits of ${tank.id}`,
    );
  const premix = premixOfOption(file, opts, req.lab, plan.design);
  const filled = [...plan.steps.map((s) => s.source), ...(premix ? [premix.source] : [])];
  const names = sourceNames({
    filled,
    cylinders: req.lab.cylinders,
    premixes: { tanks: req.lab.tanks.map((t) => t.id), given: premix?.source.id },
    notFilled: (name, where) =>
      fail(
        {
          code: 'csv-species-not-filled',
          species: name,
          recipe: opts.recipeFile,
          // the fills by the names a row may give them (csv-names.ts: the plan's step labels)
          fills: [...new Set(filled.map(fillLabel))],
          // a premix named by its gases ("Ar+O2") with no --premix-log: say how it is given
          ...(name.includes('+') && !premix ? { premixLogMissing: true } : {}),
        },
        where,
      ),
  });
  return {
    id: req.recipe.id,
    design: plan.design,
    tolerance: plan.tolerance,
    gauges: req.input.gauges,
    ctx: req.input.reading,
    thermo: req.lab.thermometer ?? DEFAULT_THERMOMETER,
    baroGiven: opts.barometricPa !== undefined || req.lab.file.barometer !== undefined,
    barometerFrom: opts.barometricPa !== undefined ? '--barometer' : "the lab profile's",
    names,
    tank,
    warnings,
    premix,
    planDangers,
    safety: req.input.safety,
    plannedOrder: plan.steps.map((s) => s.source.id),
    plannedSources: plan.steps.map((s) => s.source),
    targetsPa: plan.steps.map((s) => s.targetPa),
  };
}

function csvBasisFromLab(file: string, opts: CheckOptions): CsvBasis {
  const lab = loadLab(opts.labFile);
  const premix = premixOfOption(file, opts, lab);
  const premixes = [...lab.cylinders.filter((c) => c.kind === 'premix'), ...(premix ? [premix.source] : [])];
  const names = sourceNames({
    filled: premixes,
    cylinders: lab.cylinders,
    premixes: { tanks: lab.tanks.map((t) => t.id), given: premix?.source.id },
    pure: (sp) => pureCylinder({ id: sp, species: sp, purity: 1 }),
    notFilled: (name, where) =>
      fail(
        {
          code: 'unknown-reference',
          kind: 'cylinder or premix',
          id: name,
          choices: lab.cylinders.map((c) => c.id),
        },
        where,
      ),
  });
  return {
    id: file,
    tolerance: { relative: 0.005, absolute: 0 },
    gauges: lab.gauges,
    ctx: {
      barometricPa: opts.barometricPa ?? lab.barometricPa,
      barometricUncertaintyPa: lab.barometricUncertaintyPa,
    },
    thermo: lab.thermometer ?? DEFAULT_THERMOMETER,
    baroGiven: opts.barometricPa !== undefined || lab.file.barometer !== undefined,
    barometerFrom: opts.barometricPa !== undefined ? '--barometer' : "the lab profile's",
    names,
    tank: opts.tankId === undefined ? undefined : labTank(lab, opts.tankId),
    premix,
    warnings: [
      ...lab.gaugeConversions.map((c) => `gauge pressure ${gaugeConversionWords(c)}`),
      'no recipe given: the gases named by species are taken as pure (purity 1), a cylinder id ' +
        'or premix as the lab profile lists it, the gauges from the lab profile, and there is no ' +
        'design to compare with (use --recipe)',
    ],
  };
}

/**
 * --premix-log given, but no row draws from that premix: refused, not ignored (a re-check that left
 * the named premix out would read as one of a batch filled from it)
 */
function refuseUndrawnPremix(
  file: string,
  premix: PremixRecord | undefined,
  rows: readonly CsvReading[],
  sources: readonly { readonly id: string }[],
): void {
  if (!premix || sources.some((s) => s.id === premix.source.id)) return;
  fail(
    {
      code: 'premix-log-refused',
      log: premix.named,
      cause: {
        kind: 'not-drawn',
        file,
        names: [...new Set([premix.source.id, fillLabel(premix.source)])],
        rows: [...new Set(rows.map((r) => r.species))],
      },
    },
    { field: '--premix-log' },
  );
}

/** the CSV rows as the re-check's readings: each row a charge of the source it names, on its gauge */
function csvReadings(
  file: string,
  b: CsvBasis,
  conversions: GaugeConversion[],
): { rows: CsvReading[]; readings: CheckedReading[] } {
  // gauge-referenced sensors (lab profile) and gauge units are made absolute with the barometer given
  // (--barometer, else the lab profile's; none: refused), each conversion recorded for the report
  const rows = readReadingsCsv(file, {
    barometricPa: b.baroGiven ? b.ctx.barometricPa : undefined,
    barometerFrom: b.barometerFrom,
    conversions,
    referenceOf: (id) => b.gauges.find((g) => g.id === id)?.reference,
    fullScaleOf: (id) => b.gauges.find((g) => g.id === id)?.fullScalePa,
    // the highest absolute pressure a gauge reads (a gauge-referenced one: its full scale above the barometer)
    ...(b.gauges.length
      ? {
          widestFullScalePa: Math.max(
            ...b.gauges.map((g) => g.fullScalePa + (g.reference === 'gauge' ? (b.ctx.barometricPa ?? 0) : 0)),
          ),
        }
      : {}),
    gaugeUnitOf: (id) => b.gauges.find((g) => g.id === id)?.unit,
    targetsPa: b.targetsPa,
    ...(b.tank ? { tank: { id: b.tank.id, limitPa: b.tank.limitPa } } : {}),
    acceptsName: b.names.accepts,
  });
  const sources = rows.map((r) => b.names.resolve(r.species, { file, line: r.line, field: 'species' }));
  refuseUndrawnPremix(file, b.premix, rows, sources);
  const charges = chargeNumbers(sources.map((s) => s.id));
  const readings = rows.map((r, i): CheckedReading => {
    let gauge: Gauge | undefined;
    if (r.gauge) {
      gauge = b.gauges.find((g) => g.id === r.gauge);
      if (!gauge)
        fail(
          { code: 'unknown-reference', kind: 'gauge', id: r.gauge, choices: b.gauges.map((g) => g.id) },
          { file, line: r.line, field: 'gauge' },
        );
    } else {
      gauge = chooseGauge(b.gauges, r.pressurePa, r.pressurePa, b.ctx)?.gauge;
      // a row that would fit the fill in the other rows' unit says so (readings-csv.ts unitSlipOf)
      const unitSlip = r.unitSlip && slipRefused(r.unitSlip);
      if (!gauge)
        fail(
          { code: 'no-gauge', pressurePa: r.pressurePa, ...(unitSlip ? { unitSlip } : {}) },
          { file, line: r.line },
        );
    }
    const source = sources[i];
    return {
      step: i + 1,
      source,
      charge: charges[i],
      pressurePa: r.pressurePa,
      temperatureK: r.temperatureK,
      gauge,
    };
  });
  return { rows, readings };
}

const unitOf = (g: Gauge): PressureUnit => (isPressureUnit(g.unit) ? g.unit : 'Torr');

/**
 * Each reading against the tank's working limit (and rating) and its gauge's full scale: a
 * danger, worded as the log audit words it (a CSV row is a record of the fill as a log line is).
 */
function csvLimitFindings(
  rows: readonly CsvReading[],
  readings: readonly CheckedReading[],
  tank: CsvTank | undefined,
  barometricPa: number,
): LogFinding[] {
  const out: LogFinding[] = [];
  readings.forEach((x, i) => {
    // a likely unit slip is said in full once, on the row's first finding; the danger stands as typed
    const slip = (first: boolean) =>
      rows[i].unitSlip
        ? {
            unitSlip: first
              ? rows[i].unitSlip
              : `The same LIKELY UNIT SLIP on line ${rows[i].line} (see above)`,
          }
        : {};
    const at = { step: x.step, line: rows[i].line, unit: unitOf(x.gauge), replaced: false };
    const before = out.length;
    if (tank?.limitPa !== undefined && x.pressurePa > tank.limitPa)
      out.push({
        code: 'above-working-limit',
        severity: 'danger',
        ...at,
        pressurePa: x.pressurePa,
        limitPa: tank.limitPa,
        ...(tank.ratedPa !== undefined ? { ratedPa: tank.ratedPa } : {}),
        ...slip(true),
      });
    const shownPa = x.gauge.reference === 'gauge' ? x.pressurePa - barometricPa : x.pressurePa;
    if (shownPa > x.gauge.fullScalePa)
      out.push({
        code: 'above-gauge-range',
        severity: 'danger',
        ...at,
        gauge: x.gauge.id,
        shownPa,
        fullScalePa: x.gauge.fullScalePa,
        ...slip(out.length === before),
      });
  });
  return out;
}

/**
 * the species a source fills: its main gas, a premix's gases, or a component of 1 % or more (a mixed
 * cylinder; our own margin: a cylinder's impurities are ppm). An impurity (Ar in the O2) is no fill of
 * Ar, so a missing Ar row is not read as one
 */
const carried = (s: GasSource) => [
  s.mainSpecies,
  ...(s.gases ?? []),
  ...Object.keys(s.composition).filter((k) => s.composition[k] >= 0.01),
];

/**
 * The plan's fills no row reads when the rows are the plan's first fills in its order (charges
 * included) and the last row stopped where the plan's fill of the same place stops, not at the plan's
 * final pressure. A split diluent's missing last charge leaves every species read, so the species alone
 * cannot show it; a source filled in one charge where the plan splits it (a complete fill) ends near the
 * final pressure, and is not called incomplete here.
 */
function unreadTail(b: CsvBasis, readings: readonly CheckedReading[]): number[] {
  const planned = b.plannedSources;
  const targets = b.targetsPa;
  const n = readings.length;
  if (!planned || !targets || n === 0 || n >= planned.length) return [];
  if (readings.some((r, i) => r.source.id !== planned[i].id)) return [];
  const last = readings[n - 1].pressurePa;
  const final = targets[targets.length - 1];
  if (!(Math.abs(last - targets[n - 1]) < Math.abs(last - final))) return [];
  return planned.slice(n).map((_, j) => n + j);
}

/**
 * Every planned fill the rows lack, each named once with its gas, cylinder, charge and the plan's fill
 * number: "O2 (cyl-O2, the plan's fill 3)", "Ar (cyl-Ar charge 2 of 2, the plan's fill 4)". A fill is
 * missing when no row fills a design species it carries (every plan fill of that species), or when
 * the rows stop short of the plan's last fills in its order (unreadTail). A design species no planned
 * fill carries is named alone.
 */
function missingFills(b: CsvBasis, design: Design, readings: readonly CheckedReading[]): string[] {
  const covered = new Set(readings.flatMap((r) => carried(r.source)));
  const unfilled = Object.keys(design.composition).filter(
    (k) => design.composition[k] > 0 && !covered.has(k),
  );
  const planned = b.plannedSources ?? [];
  const missing = new Set(unreadTail(b, readings));
  planned.forEach((s, i) => {
    if (carried(s).some((k) => unfilled.includes(k))) missing.add(i);
  });
  const charges = chargeNumbers(planned.map((s) => s.id));
  // one entry a cylinder: its missing charges together ("cyl-Ar charges 1 and 2 of 2")
  const bySource = new Map<string, number[]>();
  for (const i of [...missing].sort((x, y) => x - y))
    bySource.set(planned[i].id, [...(bySource.get(planned[i].id) ?? []), i]);
  const named = [...bySource.values()].map((is) => {
    const s = planned[is[0]];
    const of = charges[is[0]].of;
    const c =
      of === 1
        ? ''
        : ` charge${is.length > 1 ? 's' : ''} ${andList(is.map((i) => charges[i].number))} of ${of}`;
    return `${fillLabel(s)} (${s.id}${c}, the plan's fill${is.length > 1 ? 's' : ''} ${andList(is.map((i) => i + 1))})`;
  });
  const carriedByNamed = new Set([...missing].flatMap((i) => carried(planned[i])));
  return [...named, ...unfilled.filter((k) => !carriedByNamed.has(k))];
}

/** "2", "2 and 4", "1, 2 and 4" */
const andList = (xs: readonly number[]) =>
  xs.length === 1 ? `${xs[0]}` : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`;

/** the verdict's word on rows that are likely unit slips: the dangers above rest on them as typed */
function slipCaveat(rows: readonly CsvReading[]): string[] {
  const lines = rows.filter((r) => r.unitSlip).map((r) => r.line);
  if (!lines.length) return [];
  const ls = `line${lines.length > 1 ? 's' : ''} ${lines.join(', ')}`;
  return [
    `LIKELY UNIT SLIP: ${ls} as typed ${lines.length > 1 ? 'go' : 'goes'} past a limit, but read in the ` +
      `unit of the other rows or of ${lines.length > 1 ? 'their gauges' : 'its gauge'} would fit the fill ` +
      `(see the findings). The dangers and the composition above rest on ${ls} as typed and stand until ` +
      `the record is corrected: check the paper record, correct ${ls} and check again`,
  ];
}

/** what the report says of the tank's limits: not checked, and why, when they are not known */
function tankWarning(tank: CsvTank | undefined): string | undefined {
  if (!tank)
    return (
      'the tank is not known (no --recipe, no --tank): the readings were NOT checked against a ' +
      "tank's working limit or pressure rating; give --tank ID (a tank of the lab profile) to check them"
    );
  if (tank.limitPa === undefined)
    return (
      `tank ${tank.id} has no pressure rating (lab profile or recipe): the readings were NOT ` +
      `checked against a working limit`
    );
  return undefined;
}

export async function checkCsv(file: string, opts: CheckOptions): Promise<CheckReport> {
  const b = opts.recipeFile
    ? csvBasisFromRecipe(file, { ...opts, recipeFile: opts.recipeFile })
    : csvBasisFromLab(file, opts);
  const { design, tolerance, ctx, thermo } = b;
  const warnings = [...b.warnings];
  const conversions: GaugeConversion[] = [];
  const { rows, readings } = csvReadings(file, b, conversions);
  warnings.push(...conversions.map((c) => `reading ${gaugeConversionWords(c)}`));
  const result = await withinFile(file, () =>
    evaluateUncertaintyParallel(
      readings,
      {
        barometricPa: ctx.barometricPa,
        barometricUncertaintyPa: ctx.barometricUncertaintyPa,
        thermometerUncertaintyK: thermo.uncertaintyK,
        thermometerResolutionK: thermo.resolutionK,
        temperatureSettlingK: settlingOf(thermo),
        trials: opts.trials,
        seed: opts.seed,
      },
      design ? Object.keys(design.groups.diluent) : undefined,
    ),
  );
  let verdict = judge(result, design, tolerance);
  const incomplete = design ? missingFills(b, design, readings) : [];
  if (incomplete.length) {
    warnings.push(
      `no row fills ${incomplete.join(', ')}: a row is missing from the CSV, or the batch is not ` +
        `finished; the batch is incomplete`,
    );
    verdict = { ...verdict, verdict: 'fail' };
  }
  const unchecked = tankWarning(b.tank);
  if (unchecked) warnings.push(unchecked);
  const found = csvLimitFindings(rows, readings, b.tank, ctx.barometricPa);
  const findings = found.map((f) => ({ ...f, message: describeLogFinding(f) }));
  const past = readingsPastRange(findings, new Set(rows.map((r) => r.line)));
  verdict = withReadingsPastRange(verdict, readings, past);
  // the fill as recorded, by the planner's own safety review: a CSV records no acceptance of a danger
  const recorded = recordedFillOf(
    readings,
    undefined,
    {
      tankId: b.tank?.id ?? '(not known)',
      workingLimitPa: b.tank?.limitPa,
      coldestK: b.safety?.coldestK,
      condensationFraction: b.safety?.condensationFraction,
    },
    [],
    b.plannedOrder,
    b.planDangers,
  );
  return {
    file,
    id: b.id,
    kind: 'csv',
    readings,
    // who read each row (its by column; a CSV records no correction)
    readBy: rows.map((r) => ({ by: r.by ?? null, corrected: null })),
    result,
    verdict,
    design,
    tolerance,
    warnings,
    incomplete,
    findings,
    amendments: [],
    barometer: {
      pressurePa: ctx.barometricPa,
      uPa: ctx.barometricUncertaintyPa,
      from: opts.recipeFile ? 'plan' : 'lab',
    },
    tank: b.tank
      ? { id: b.tank.id, ratedPa: b.tank.ratedPa, limitPa: b.tank.limitPa, from: b.tank.from }
      : undefined,
    caveats: [
      ...verdictCaveats(
        findings,
        'recorded reading',
        [],
        { dangers: b.planDangers ?? [], recipe: opts.recipeFile },
        recorded.dangers,
        incomplete.length > 0,
      ),
      ...slipCaveat(rows),
    ],
    planDangersNotAcknowledged: b.planDangers ?? [],
    recordedFill: recorded.recordedFill,
    recordedFillDangers: recorded.dangers,
    premixLogs: b.premix ? [premixLogReport(b.premix)] : [],
  };
}

/**
 * --premix-log: the premix log re-checked (as typed, from the working folder), refusals at the
 * option; first refused when it is not the log of the premix a row of `file` names
 */
function premixOfOption(
  file: string,
  opts: CheckOptions,
  lab: LoadedLab,
  design?: Design,
): PremixRecord | undefined {
  if (opts.premixLog === undefined) return undefined;
  const gases = design && Object.keys(design.composition).filter((k) => design.composition[k] > 0);
  try {
    refuseNotThePremix(opts.premixLog, resolve(opts.premixLog), csvRowNames(file), {
      file,
      tanks: lab.tanks.map((t) => t.id),
      design: gases,
    });
    return readPremixLog(opts.premixLog, resolve(opts.premixLog), lab.name);
  } catch (e) {
    if (e instanceof ProblemError) throw relocate(e, { field: '--premix-log' });
    throw e;
  }
}
