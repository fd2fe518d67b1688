/**
 * From a batch log, or CSV readings with a recipe, to the core's re-check input;
 * and the header of a new log from a plan.
 */
import { evaluateUncertaintyParallel } from './parallel-mc.js';
import {
  chooseGauge,
  describeFinding,
  fail,
  ProblemError,
  judge,
  planFill,
  pureCylinder,
  type CheckedReading,
  type Design,
  type GasSource,
  type Gauge,
  type Plan,
  type Tolerance,
} from '../core/index.js';
import {
  gaugeFromLog,
  gaugeToLog,
  LOG_FORMAT,
  readLog,
  sourceFromLog,
  sourceToLog,
  type LogHeader,
  type ParsedLog,
} from './batch-log.js';
import { auditLog, describeLogFinding, type LogFinding } from './log-audit.js';
import { buildPlanRequest, loadLab, readRecipe, type PlanRequest } from './load.js';
import { readReadingsCsv } from './readings-csv.js';
import { TORR_PA } from '../core/index.js';
import type { CheckReportOf } from '../report/check-types.js';

export interface CheckOptions {
  readonly trials: number;
  readonly seed: number;
  readonly recipeFile?: string;
  readonly labFile?: string;
  /** --barometer: the barometric pressure at the fill, Pa, for CSV readings (gauge-referenced sensors, "psig") */
  readonly barometricPa?: number;
}

/** the report of `check`; its record findings carry their sentence (the type lives beside the renderers) */
export type CheckReport = CheckReportOf<LogFinding & { readonly message: string }>;

/** the sentences beside a verdict: the composition may pass while the record says the tank is not fit to use */
export function verdictCaveats(findings: readonly LogFinding[]): string[] {
  const out: string[] = [];
  const dangers = findings.filter((f) => f.severity === 'danger');
  if (dangers.length) {
    out.push(
      `DANGER: ${dangers.length === 1 ? 'a logged reading' : `${dangers.length} logged readings`} ` +
        `went past the tank's working limit or a gauge's range (see the findings). ` +
        `Whatever the composition, do not label or use this tank as fit until it ` +
        `and its gauges have been inspected under local practice`,
    );
  }
  const edited = findings.filter(
    (f) =>
      f.code === 'text-number-mismatch' ||
      (f.code === 'record' && (f.issue.code === 'line-edited' || f.issue.code === 'line-unhashed')),
  );
  if (edited.length)
    out.push(
      `the record was changed after it was written (${edited.length} line${edited.length === 1 ? '' : 's'}, ` +
        `see the findings): the verdict rests on numbers that are not as first logged`,
    );
  return out;
}

/**
 * Run the uncertainty evaluation for a file: a refusal from inside it (a Monte Carlo
 * trial whose readings no longer increase) names the file and says what it means.
 */
async function withinFile<T>(file: string, f: () => Promise<T>): Promise<T> {
  try {
    return await f();
  } catch (e) {
    if (e instanceof ProblemError && e.problem.code === 'schema' && 'reason' in e.problem) {
      return fail(
        {
          code: 'schema',
          reason:
            `the readings are too close together, or too close to zero, for their uncertainty: ` +
            `in the uncertainty evaluation, ${e.problem.reason}. Check the pressures, ` +
            `and the gauge named for each reading`,
        },
        { file },
      );
    }
    if (e instanceof ProblemError) throw e.at({ file });
    throw e;
  }
}

const DEFAULT_THERMOMETER = { uncertaintyK: 0.5, resolutionK: 0 };

export function headerFromPlan(plan: Plan, req: PlanRequest, id: string, created: string): LogHeader {
  const d = plan.design;
  return {
    kind: 'batch',
    format: LOG_FORMAT,
    id,
    created,
    lab: req.lab.name,
    tank: {
      id: plan.tank.id,
      volume_m3: plan.tank.volumeM3,
      rated_pressure_Pa: plan.tank.ratedPressurePa ?? null,
      working_limit_Pa:
        plan.tank.ratedPressurePa === undefined
          ? null
          : plan.tank.ratedPressurePa * (plan.tank.workingFraction ?? 1),
    },
    design: {
      composition: { ...d.composition },
      phi: d.phi ?? null,
      diluent: Object.keys(d.groups.diluent),
      diluent_fraction: d.diluentFraction,
    },
    tolerance: { relative: plan.tolerance.relative, absolute: plan.tolerance.absolute },
    temperature_K: plan.temperatureK,
    final_pressure_Pa: plan.final.pressurePa,
    barometer: {
      pressure_Pa: req.input.reading.barometricPa,
      u_Pa: req.input.reading.barometricUncertaintyPa,
    },
    thermometer: {
      u_K: (req.lab.thermometer ?? DEFAULT_THERMOMETER).uncertaintyK,
      resolution_K: (req.lab.thermometer ?? DEFAULT_THERMOMETER).resolutionK,
    },
    gauges: req.input.gauges.map(gaugeToLog),
    sources: plan.steps.map((s) => sourceToLog(s.source)),
    steps: plan.steps.map((s) => ({
      step: s.index,
      source: s.source.id,
      species: s.species,
      target_Pa: s.targetPa,
      band_Pa: s.bandPa,
      gauge: s.gauge?.id ?? null,
    })),
    in_tank: plan.initial
      ? { composition: { ...plan.initial.composition }, pressure_Pa: plan.initial.pressurePa }
      : null,
    recipe: req.recipe,
    findings: plan.findings.map((f) => ({
      severity: f.severity,
      code: f.code,
      step: f.step ?? null,
      message: describeFinding(f, (pa) => `${(pa / TORR_PA).toPrecision(6)} Torr`),
    })),
  };
}

export function designFromHeader(h: LogHeader): Design {
  const diluent: Record<string, number> = {};
  for (const k of h.design.diluent) diluent[k] = h.design.composition[k] ?? 0;
  return {
    composition: h.design.composition,
    phi: h.design.phi ?? undefined,
    fuelFraction: NaN,
    oxidizerFraction: NaN,
    diluentFraction: h.design.diluent_fraction,
    stoichO2PerFuel: undefined,
    groups: { fuel: {}, oxidizer: {}, diluent },
  };
}

export async function checkLog(log: ParsedLog, opts: CheckOptions): Promise<CheckReport> {
  const h = log.header;
  const gauges = new Map(h.gauges.map((g) => [g.id, gaugeFromLog(g)]));
  const sources = new Map(h.sources.map((s) => [s.id, sourceFromLog(s)]));
  if (log.readings.length === 0)
    fail(
      { code: 'schema', reason: 'the log holds no readings yet; nothing to re-check' },
      { file: log.file },
    );
  const start: CheckReport['start'] = h.in_tank
    ? log.start
      ? {
          pressurePa: log.start.pressure_Pa,
          temperatureK: log.start.temperature_K,
          composition: h.in_tank.composition,
          read: true,
          by: log.start.by,
          time: log.start.time,
        }
      : {
          pressurePa: h.in_tank.pressure_Pa,
          temperatureK: h.temperature_K,
          composition: h.in_tank.composition,
          read: false,
        }
    : undefined;
  let prev = start?.pressurePa ?? 0;
  const readings: CheckedReading[] = log.readings.map((r) => {
    const source = sources.get(r.source);
    if (!source)
      fail(
        {
          code: 'schema',
          reason: `reading of step ${r.step} names the source "${r.source}", which the header does not list`,
        },
        { file: log.file, line: r.line },
      );
    const gauge = gauges.get(r.gauge);
    if (!gauge)
      fail(
        {
          code: 'schema',
          reason: `reading of step ${r.step} names the gauge "${r.gauge}", which the header does not list`,
        },
        { file: log.file, line: r.line },
      );
    if (!(r.pressure_Pa > prev))
      fail(
        {
          code: 'schema',
          reason:
            `the reading of step ${r.step} is not above the one before it${start && prev === start.pressurePa ? ' (the starting pressure of the top-up)' : ''}; ` +
            `readings must increase`,
        },
        { file: log.file, line: r.line },
      );
    if (!(r.temperature_K >= 200 && r.temperature_K <= 600))
      fail(
        { code: 'out-of-range', what: 'tank temperature', value: r.temperature_K, allowed: '200-600 K' },
        { file: log.file, line: r.line },
      );
    prev = r.pressure_Pa;
    return { step: r.step, source, pressurePa: r.pressure_Pa, temperatureK: r.temperature_K, gauge };
  });
  const done = new Set(log.readings.map((r) => r.step));
  const missingSteps = h.steps.map((s) => s.step).filter((s) => !done.has(s));
  // the log's own record issues (torn tail, edited lines) are findings, listed once with the others
  const warnings: string[] = [];
  const acked = new Set(log.acknowledgements.map((a) => a.code));
  const unacked = [
    ...new Set(
      (h.findings ?? []).filter((f) => f.severity === 'danger' && !acked.has(f.code)).map((f) => f.code),
    ),
  ];
  if (unacked.length)
    warnings.push(
      `the plan of this batch had danger findings (${unacked.join(', ')}) that the log shows no acknowledgement of`,
    );
  for (const a of log.acknowledgements)
    warnings.push(
      `danger finding ${a.code}${a.step ? ` (fill ${a.step})` : ''} was acknowledged by ${a.by} at ${a.time}`,
    );
  if (missingSteps.length)
    warnings.push(
      `the log has no reading for step ${missingSteps.join(', ')}: the batch is ` +
        `incomplete and the re-check covers the fills logged so far`,
    );
  const findings = auditLog(log).map((f) => ({ ...f, message: describeLogFinding(f) }));
  const design = designFromHeader(h);
  const b = log.barometer;
  const barometer: NonNullable<CheckReport['barometer']> = b
    ? {
        pressurePa: b.pressure_Pa,
        uPa: b.u_Pa ?? h.barometer.u_Pa,
        from: 'log',
        by: b.by,
        time: b.time,
        text: b.reading,
      }
    : { pressurePa: h.barometer.pressure_Pa, uPa: h.barometer.u_Pa, from: 'plan' };
  const result = await withinFile(log.file, () =>
    evaluateUncertaintyParallel(
      readings,
      {
        barometricPa: barometer.pressurePa,
        barometricUncertaintyPa: barometer.uPa,
        thermometerUncertaintyK: h.thermometer.u_K,
        thermometerResolutionK: h.thermometer.resolution_K,
        trials: opts.trials,
        seed: opts.seed,
      },
      h.design.diluent,
      start
        ? { composition: start.composition, pressurePa: start.pressurePa, temperatureK: start.temperatureK }
        : undefined,
    ),
  );
  const tolerance = h.tolerance;
  const verdict = missingSteps.length
    ? { ...judge(result, design, tolerance), verdict: 'fail' as const }
    : judge(result, design, tolerance);
  return {
    file: log.file,
    id: h.id,
    kind: 'log',
    readings,
    result,
    verdict,
    design,
    tolerance,
    warnings,
    incomplete: missingSteps.map((s) => `step ${s}`),
    findings,
    amendments: log.amendments,
    barometer,
    start,
    caveats: verdictCaveats(findings),
  };
}

/** one line per finding, for the terminal and the folder summary */
export function findingLines(r: CheckReport): string[] {
  return r.findings.map((f) => `${f.severity}: ${describeLogFinding(f)}`);
}

export async function checkCsv(file: string, opts: CheckOptions): Promise<CheckReport> {
  const warnings: string[] = [];
  let design: Design | undefined;
  let tolerance: Tolerance = { relative: 0.005, absolute: 0 };
  let gauges: readonly Gauge[];
  let ctx: { barometricPa: number; barometricUncertaintyPa: number };
  let thermo: { uncertaintyK: number; resolutionK: number };
  let sourceFor: (species: string, line: number) => GasSource;
  let id = file;
  let baroGiven: boolean;
  if (opts.recipeFile) {
    const req = buildPlanRequest(readRecipe(opts.recipeFile), opts.labFile, {
      barometricPa: opts.barometricPa,
    });
    const plan = planFill(req.input);
    design = plan.design;
    tolerance = plan.tolerance;
    gauges = req.input.gauges;
    ctx = req.input.reading;
    baroGiven = opts.barometricPa !== undefined || req.lab.file.barometer !== undefined;
    thermo = req.lab.thermometer ?? DEFAULT_THERMOMETER;
    if (!req.lab.thermometer)
      warnings.push('the lab profile gives no thermometer uncertainty; 0.5 K was used');
    id = req.recipe.id;
    const bySpecies = new Map(plan.steps.map((s) => [s.source.mainSpecies, s.source]));
    sourceFor = (sp, line) => {
      const s = bySpecies.get(sp) ?? plan.steps.find((x) => (x.source.composition[sp] ?? 0) >= 0.01)?.source;
      if (!s)
        return fail(
          {
            code: 'schema',
            reason: `${sp} is not filled in the design of ${opts.recipeFile} (its fills: ${plan.steps.map((x) => x.species).join(', ')})`,
          },
          { file, line, field: 'species' },
        );
      return s;
    };
  } else {
    const lab = loadLab(opts.labFile);
    gauges = lab.gauges;
    ctx = {
      barometricPa: opts.barometricPa ?? lab.barometricPa,
      barometricUncertaintyPa: lab.barometricUncertaintyPa,
    };
    baroGiven = opts.barometricPa !== undefined || lab.file.barometer !== undefined;
    thermo = lab.thermometer ?? DEFAULT_THERMOMETER;
    warnings.push(
      'no recipe given: the gases are taken as pure (purity 1), the gauges from ' +
        'the lab profile, and there is no design to compare with (use --recipe)',
    );
    sourceFor = (sp) => pureCylinder({ id: sp, species: sp, purity: 1 });
  }
  // gauge-referenced sensors (lab profile) and gauge units are made absolute with the barometer given
  const rows = readReadingsCsv(file, {
    barometricPa: baroGiven ? ctx.barometricPa : undefined,
    referenceOf: (id) => gauges.find((g) => g.id === id)?.reference,
  });
  const used = new Set<string>();
  const readings: CheckedReading[] = rows.map((r, i) => {
    const source = sourceFor(r.species, r.line);
    if (used.has(source.id))
      fail(
        { code: 'schema', reason: `${r.species} is filled twice; each fill has one row` },
        { file, line: r.line, field: 'species' },
      );
    used.add(source.id);
    let gauge: Gauge | undefined;
    if (r.gauge) {
      gauge = gauges.find((g) => g.id === r.gauge);
      if (!gauge)
        fail(
          { code: 'unknown-reference', kind: 'gauge', id: r.gauge, choices: gauges.map((g) => g.id) },
          { file, line: r.line, field: 'gauge' },
        );
    } else {
      gauge = chooseGauge(gauges, r.pressurePa, r.pressurePa, ctx)?.gauge;
      if (!gauge)
        fail(
          {
            code: 'no-gauge',
            reason:
              `no gauge in the lab profile reads ${r.pressurePa.toPrecision(6)} Pa; name ` +
              `the gauge in a "gauge" column`,
          },
          { file, line: r.line },
        );
    }
    return { step: i + 1, source, pressurePa: r.pressurePa, temperatureK: r.temperatureK, gauge };
  });
  const result = await withinFile(file, () =>
    evaluateUncertaintyParallel(
      readings,
      {
        barometricPa: ctx.barometricPa,
        barometricUncertaintyPa: ctx.barometricUncertaintyPa,
        thermometerUncertaintyK: thermo.uncertaintyK,
        thermometerResolutionK: thermo.resolutionK,
        trials: opts.trials,
        seed: opts.seed,
      },
      design ? Object.keys(design.groups.diluent) : undefined,
    ),
  );
  let verdict = judge(result, design, tolerance);
  let incomplete: string[] = [];
  if (design) {
    const covered = new Set(readings.flatMap((r) => Object.keys(r.source.composition)));
    incomplete = Object.keys(design.composition).filter((k) => design.composition[k] > 0 && !covered.has(k));
    if (incomplete.length) {
      warnings.push(`no row fills ${incomplete.join(', ')}: the batch is incomplete`);
      verdict = { ...verdict, verdict: 'fail' };
    }
  }
  return {
    file,
    id,
    kind: 'csv',
    readings,
    result,
    verdict,
    design,
    tolerance,
    warnings,
    incomplete,
    findings: [],
    amendments: [],
    barometer: {
      pressurePa: ctx.barometricPa,
      uPa: ctx.barometricUncertaintyPa,
      from: opts.recipeFile ? 'plan' : 'lab',
    },
    caveats: [],
  };
}

export async function checkFile(file: string, opts: CheckOptions): Promise<CheckReport> {
  if (/\.csv$/i.test(file)) return checkCsv(file, opts);
  if (opts.recipeFile)
    fail(
      {
        code: 'design-conflict',
        reason: 'a batch log carries its own design; --recipe is for CSV readings only',
      },
      { field: '--recipe' },
    );
  if (opts.barometricPa !== undefined)
    fail(
      {
        code: 'design-conflict',
        reason:
          'a batch log records the barometric pressure of its fill; --barometer is for CSV readings only',
      },
      { field: '--barometer' },
    );
  return checkLog(readLog(file), opts);
}
