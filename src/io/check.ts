/**
 * From a batch log (or, through check-csv.ts, CSV readings) to the core's re-check input and
 * the report of `check`; and the header of a new log from a plan.
 */
import { evaluateUncertaintyParallel } from './parallel-mc.js';
import {
  describeFinding,
  fail,
  judge,
  ProblemError,
  recheckModelInput,
  type Design,
  type GasSource,
  type Plan,
  type RecheckModelInput,
} from '../core/index.js';
import {
  gaugeFromLog,
  gaugeToLog,
  LOG_FORMAT,
  readLog,
  sourceFromLog,
  sourceToLog,
  workingLimitOf,
  type LogHeader,
  type ParsedLog,
} from './batch-log.js';
import { auditLog, describeLogFinding } from './log-audit.js';
import type { PlanRequest } from './load.js';
import { chargeNumbers, TORR_PA } from '../core/index.js';
import { DEFAULT_THERMOMETER, settlingOf } from './plan-predict.js';
import {
  verdictCaveats,
  withinFile,
  type ChargeNumber,
  type CheckOptions,
  type CheckReport,
} from './check-shared.js';
import { checkCsv } from './check-csv.js';
import { premixLogReport, premixLogsOf } from './premix-check.js';
import { dirname, relative, resolve } from 'node:path';

export { verdictCaveats, type CheckOptions, type CheckReport } from './check-shared.js';

/**
 * The header of a new batch log from its plan. `logFile`: where the log is written, so that a
 * premix log the plan draws from is recorded relative to it (else relative to the working folder).
 */
export function headerFromPlan(
  plan: Plan,
  req: PlanRequest,
  id: string,
  created: string,
  logFile?: string,
): LogHeader {
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
      settling_K: settlingOf(req.lab.thermometer),
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
    ...(plan.premixLog
      ? {
          premix_logs: [
            {
              source: plan.premixLog.source.id,
              path: relative(logFile ? dirname(resolve(logFile)) : process.cwd(), plan.premixLog.path),
              last_entry_sha256: plan.premixLog.lastEntrySha256,
            },
          ],
        }
      : {}),
    ...(req.input.safety
      ? {
          safety: {
            ...(req.input.safety.coldestK !== undefined ? { coldest_K: req.input.safety.coldestK } : {}),
            ...(req.input.safety.condensationFraction !== undefined
              ? { condensation_fraction: req.input.safety.condensationFraction }
              : {}),
          },
        }
      : {}),
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

/** a top-up's starting gas: the logged starting reading, else the plan's */
function startOf(log: ParsedLog): CheckReport['start'] {
  const h = log.header;
  if (!h.in_tank) return undefined;
  return log.start
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
      };
}

/** the barometer of the fill: the last one logged, else the plan's */
function barometerOf(log: ParsedLog): NonNullable<CheckReport['barometer']> {
  const b = log.barometer;
  const h = log.header;
  return b
    ? {
        pressurePa: b.pressure_Pa,
        uPa: b.u_Pa ?? h.barometer.u_Pa,
        from: 'log',
        by: b.by,
        time: b.time,
        text: b.reading,
      }
    : { pressurePa: h.barometer.pressure_Pa, uPa: h.barometer.u_Pa, from: 'plan' };
}

/** the warnings of a log's record: unacknowledged dangers of its plan, acknowledgements, missing steps */
function logWarnings(log: ParsedLog, missingSteps: readonly number[]): string[] {
  const h = log.header;
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
      a.review
        ? // the guided fill's review of its re-targeted remainder: what it found and what was chosen
          `before fill ${a.step ?? '?'}, the review of the re-targeted remaining fills found ` +
            `${a.review.hazards.map((z) => `${z.code}${z.step ? ` (fill ${z.step})` : ''}`).join(', ')}, ` +
            `which the plan did not have; ${a.by} at ${a.time}: ` +
            (a.review.stop
              ? `took the safer stop of fill ${a.review.stop.step}, ${(a.review.stop.to_Pa / TORR_PA).toFixed(2)} ` +
                `Torr instead of ${(a.review.stop.from_Pa / TORR_PA).toFixed(2)} Torr absolute`
              : 'went on through it (accepted)')
        : `danger finding ${a.code}${a.step ? ` (fill ${a.step})` : ''} was acknowledged by ${a.by} at ${a.time}`,
    );
  if (workingLimitOf(h) === undefined)
    warnings.push(
      `the log gives no pressure rating for tank ${h.tank.id}: the readings were NOT checked against a ` +
        `working limit or rating (only against the gauges' ranges)`,
    );
  if (h.thermometer.settling_K === undefined)
    warnings.push(
      `the log does not record the thermometer's settling value (made before logs recorded it); ` +
        `our default of ${settlingOf(undefined)} K per reading was used, the value plan predicts with`,
    );
  if (missingSteps.length)
    warnings.push(
      `the log has no reading for step ${missingSteps.join(', ')}: the batch is ` +
        `incomplete and the re-check covers the fills logged so far`,
    );
  return warnings;
}

/**
 * The re-check's model input of a log: its header's sources, gauges and instruments, its
 * readings in force (the core's recheckModelInput, the same code the plan's prediction uses).
 */
export function logModelInput(
  log: ParsedLog,
  barometer: { pressurePa: number; uPa: number },
  start: CheckReport['start'],
  mc: { trials: number; seed: number },
  premix: ReadonlyMap<string, GasSource> = new Map(),
): RecheckModelInput {
  const h = log.header;
  try {
    const model = recheckModelInput(
      {
        // a premix named by its log (header premix_logs) is that log's re-checked gas, with its budget
        sources: new Map(h.sources.map((s) => [s.id, premix.get(s.id) ?? sourceFromLog(s)])),
        gauges: new Map(h.gauges.map((g) => [g.id, gaugeFromLog(g)])),
        barometer,
        thermometer: {
          uK: h.thermometer.u_K,
          resolutionK: h.thermometer.resolution_K,
          settlingK: h.thermometer.settling_K ?? settlingOf(undefined),
        },
        diluent: h.design.diluent,
        start: start && {
          composition: start.composition,
          pressurePa: start.pressurePa,
          temperatureK: start.temperatureK,
        },
      },
      log.readings.map((r) => ({
        step: r.step,
        sourceId: r.source,
        gaugeId: r.gauge,
        pressurePa: r.pressure_Pa,
        temperatureK: r.temperature_K,
        line: r.line,
      })),
      mc,
    );
    const charges = logCharges(h);
    return { ...model, readings: model.readings.map((r) => ({ ...r, charge: charges.get(r.step) })) };
  } catch (e) {
    if (e instanceof ProblemError) throw e.at({ file: log.file });
    throw e;
  }
}

/** a step's `charge` as the log records it, when it does (never required: older logs have none) */
function loggedCharge(step: object): ChargeNumber | undefined {
  const c = (step as { charge?: { number?: unknown; of?: unknown } | null }).charge;
  const n = c?.number;
  const of = c?.of;
  return Number.isInteger(n) && Number.isInteger(of) && (n as number) >= 1 && (n as number) <= (of as number)
    ? { number: n as number, of: of as number }
    : undefined;
}

/**
 * The charge of each planned step (a source filled in more than one charge): the log's own
 * `charge` where its header records one, else counted from the source ids in step order.
 */
function logCharges(h: LogHeader): Map<number, ChargeNumber> {
  const counted = chargeNumbers(h.steps.map((s) => s.source));
  return new Map(h.steps.map((s, i) => [s.step, loggedCharge(s) ?? counted[i]]));
}

/**
 * What the re-check of a log is built from (shared by `check` and a premix log's re-check): its
 * start, barometer, model input (a premix log it names re-checked in turn, unless `withPremix`
 * is false: then the premix as the header recorded it) and the steps without a reading.
 */
export function logRecheckBasis(
  log: ParsedLog,
  seen: ReadonlySet<string> = new Set([resolve(log.file)]),
  withPremix = true,
  mc: { trials: number; seed: number } = { trials: 0, seed: 0 },
) {
  const h = log.header;
  if (log.readings.length === 0) fail({ code: 'log-no-readings' }, { file: log.file });
  const start = startOf(log);
  const barometer = barometerOf(log);
  const premix = withPremix ? premixLogsOf(log, seen) : { sources: new Map(), records: [] };
  const model = logModelInput(log, barometer, start, mc, premix.sources);
  const done = new Set(log.readings.map((r) => r.step));
  const missingSteps = h.steps.map((s) => s.step).filter((s) => !done.has(s));
  return { start, barometer, model, missingSteps, premix: premix.records };
}

/**
 * The re-check of a batch log. `withPremix` false (for `label` of a batch whose premix log is
 * missing or changed): the premix as the header recorded it, without its budget; the caller says so.
 */
export async function checkLog(log: ParsedLog, opts: CheckOptions, withPremix = true): Promise<CheckReport> {
  const h = log.header;
  const { start, barometer, model, missingSteps, premix } = logRecheckBasis(log, undefined, withPremix, opts);
  // the log's own record issues (torn tail, edited lines) are findings, listed once with the others
  const warnings = logWarnings(log, missingSteps);
  const findings = auditLog(log).map((f) => ({ ...f, message: describeLogFinding(f) }));
  const design = designFromHeader(h);
  const result = await withinFile(log.file, () =>
    evaluateUncertaintyParallel(model.readings, model.settings, model.diluent, model.initial),
  );
  const tolerance = h.tolerance;
  const verdict = missingSteps.length
    ? { ...judge(result, design, tolerance), verdict: 'fail' as const }
    : judge(result, design, tolerance);
  return {
    file: log.file,
    id: h.id,
    kind: 'log',
    readings: model.readings,
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
    tank: {
      id: h.tank.id,
      ratedPa: h.tank.rated_pressure_Pa ?? undefined,
      limitPa: workingLimitOf(h),
      from: 'log',
    },
    caveats: verdictCaveats(findings),
    record: { alteredLines: alteredLinesOf(log), closed: log.closed },
    premixLogs: premix.map(premixLogReport),
    ...(h.stage
      ? {
          stage: {
            number: h.stage.number,
            of: h.stage.of,
            batch: h.stage.batch,
            nextCommand: h.stage.next_command,
            premixLog: h.stage.premix_log?.file,
          },
        }
      : {}),
  };
}

/** the lines of a log that do not match their hash chain: changed after writing, or not mixwright's */
export function alteredLinesOf(log: ParsedLog): number[] {
  return log.issues.flatMap((i) => (i.code === 'line-edited' || i.code === 'line-unhashed' ? [i.line] : []));
}

/** one line per finding, for the terminal and the folder summary */
export function findingLines(r: CheckReport): string[] {
  return r.findings.map((f) => `${f.severity}: ${describeLogFinding(f)}`);
}

export async function checkFile(file: string, opts: CheckOptions): Promise<CheckReport> {
  if (/\.csv$/i.test(file)) return checkCsv(file, opts);
  if (opts.recipeFile)
    fail(
      { code: 'option-for-csv-only', option: '--recipe', logCarries: 'its own design' },
      { field: '--recipe' },
    );
  if (opts.barometricPa !== undefined)
    fail(
      {
        code: 'option-for-csv-only',
        option: '--barometer',
        logCarries: 'the barometric pressure of its fill',
      },
      { field: '--barometer' },
    );
  if (opts.tankId !== undefined)
    fail({ code: 'option-for-csv-only', option: '--tank', logCarries: 'its own tank' }, { field: '--tank' });
  if (opts.premixLog !== undefined)
    fail(
      {
        code: 'option-for-csv-only',
        option: '--premix-log',
        logCarries: 'its own premix logs (premix_logs)',
      },
      { field: '--premix-log' },
    );
  return checkLog(readLog(file), opts);
}
