/**
 * From a batch log (or, through check-csv.ts, CSV readings) to the core's re-check input and
 * the report of `check`; and the header of a new log from a plan.
 */
import { evaluateUncertaintyParallel } from './parallel-mc.js';
import {
  bMix,
  cMix,
  densityFromPressure,
  describeFinding,
  fail,
  ProblemError,
  virialModel,
  type Plan,
} from '../core/index.js';
import {
  gaugeToLog,
  LOG_FORMAT,
  readLog,
  sourceToLog,
  workingLimitOf,
  type LogHeader,
  type LogAck,
  type ParsedLog,
} from './batch-log.js';
import { auditLog, describeLogFinding, ventOf } from './log-audit.js';
import type { PlanRequest } from './load.js';
import { premixMixingElapsed, TORR_PA, withReadingsPastRange } from '../core/index.js';
import { DEFAULT_THERMOMETER, settlingOf } from './plan-predict.js';
import {
  readingsPastRange,
  verdictCaveats,
  withinFile,
  type CheckOptions,
  type CheckReport,
} from './check-shared.js';
import { readerOf, type PremixCheckRecord, type VentRecordOf } from '../report/check-types.js';
import { checkCsv } from './check-csv.js';
import { logRecordOutcome } from './check-recorded.js';
import { gaugeConversionWords } from './quantity.js';
import { premixLogReport, premixLogsOf } from './premix-check.js';
import { alteredLinesOf, designFromHeader, logRecheckBasis, logVerdict } from './log-recheck.js';
import { dirname, relative, resolve } from 'node:path';

export { verdictCaveats, type CheckOptions, type CheckReport } from './check-shared.js';
export { alteredLinesOf, designFromHeader, logModelInput, logRecheckBasis } from './log-recheck.js';

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
      from:
        req.gaugeContext.barometerFrom === '--barometer'
          ? 'option'
          : req.lab.file.barometer
            ? 'lab-profile'
            : 'default',
    },
    ...(req.gaugeContext.conversions.length
      ? { gauge_pressures: req.gaugeContext.conversions.map(gaugeConversionWords) }
      : {}),
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

/** what the operator chose at a review of the re-targeted remainder, in words */
function reviewChoice(r: NonNullable<LogAck['review']>): string {
  if (r.outcome === 'stopped') return 'stopped the batch there (closed, not finished)';
  if (!r.stop) return 'went on through it (accepted)';
  const torr = (pa: number) => (pa / TORR_PA).toFixed(2);
  const { step, to_Pa, from_Pa } = r.stop;
  return `took the safer stop of fill ${step}, ${torr(to_Pa)} Torr instead of ${torr(from_Pa)} Torr absolute`;
}

/** the warnings of a log's record: acknowledgements, missing steps (a plan danger not acknowledged: a caveat) */
function logWarnings(log: ParsedLog, missingSteps: readonly number[]): string[] {
  const h = log.header;
  const warnings: string[] = [];
  // a value typed past its gauge's range is a finding of the record (auditLog), listed there
  for (const a of log.acknowledgements.filter((x) => !x.over_range))
    warnings.push(
      a.below
        ? // `next` on a fill read below its band: the fill left incomplete, the fills after it re-targeted
          `fill ${a.step ?? '?'} was read below its band (${a.below.reading}, ` +
            `${(a.below.pressure_Pa / TORR_PA).toFixed(2)} Torr absolute against its target ` +
            `${(a.below.target_Pa / TORR_PA).toFixed(2)} Torr): ${a.by} at ${a.time} went on from that reading ` +
            `(the fills after it re-targeted from it; the composition above is judged from the readings)`
        : a.cap
          ? // the guided fill's stop screen of a re-target held below the working limit: the cost and the choice
            `before fill ${a.step ?? '?'} the re-target was held below the working limit (final ` +
            `${(a.cap.final_Pa / TORR_PA).toFixed(2)} Torr` +
            `${a.cap.outside.length ? `, ${a.cap.outside.join(', ')} outside the tolerance` : ''}): ${a.by} at ` +
            `${a.time} ${a.cap.outcome === 'continued' ? 'went on to the capped targets' : 'stopped the batch there'}`
          : a.review
            ? // the guided fill's review of its re-targeted remainder: what it found and what was chosen
              `before fill ${a.step ?? '?'}, the review of the re-targeted remaining fills found ` +
              `${a.review.hazards.map((z) => `${z.code}${z.step ? ` (fill ${z.step})` : ''}`).join(', ')}, ` +
              `which the plan did not have; ${a.by} at ${a.time}: ` +
              reviewChoice(a.review)
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
 * The re-check of a batch log. `withPremix` false (for `label` of a batch whose premix log is
 * missing or changed): the premix as the header recorded it, without its budget; the caller says so.
 */
export async function checkLog(log: ParsedLog, opts: CheckOptions, withPremix = true): Promise<CheckReport> {
  const h = log.header;
  const { start, barometer, model, missingSteps, premix } = logRecheckBasis(
    log,
    withPremix ? () => premixLogsOf(log) : undefined,
    opts,
  );
  // the log's own record issues (torn tail, edited lines) are findings, listed once with the others
  const warnings = logWarnings(log, missingSteps);
  const findings = auditLog(log).map((f) => ({ ...f, message: describeLogFinding(f) }));
  const design = designFromHeader(h);
  const result = await withinFile(log.file, () =>
    evaluateUncertaintyParallel(model.readings, model.settings, model.diluent, model.initial),
  );
  const { accepted, unacknowledged, recorded } = logRecordOutcome(log, model);
  const tolerance = h.tolerance;
  const used = new Set([...log.readings.map((r) => r.line), ...(log.start ? [log.start.line] : [])]);
  const verdict = withReadingsPastRange(
    logVerdict(log, result, missingSteps),
    model.readings,
    readingsPastRange(findings, used),
  );
  return {
    file: log.file,
    id: h.id,
    kind: 'log',
    readings: model.readings,
    readBy: model.readings.map((x) =>
      readerOf(
        log.readings.find((r) => r.step === x.step),
        log.amendments,
      ),
    ),
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
    caveats: verdictCaveats(findings, undefined, accepted, { dangers: unacknowledged }, recorded.dangers),
    planDangersNotAcknowledged: unacknowledged,
    recordedFill: recorded.recordedFill,
    recordedFillDangers: recorded.dangers,
    record: {
      alteredLines: alteredLinesOf(log),
      closed: log.closed,
      acceptedHazards: accepted,
    },
    premixLogs: premix.map(premixLogReport),
    premixChecks: premixChecksOf(log),
    vent: ventReport(
      log,
      Object.fromEntries(Object.entries(result.composition).map(([k, st]) => [k, st.value])),
    ),
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

/** stage 2: the premix tank's checks before the first fill from it (mixed, read), in log order */
function premixChecksOf(log: ParsedLog): PremixCheckRecord[] {
  const h = log.header;
  const pc = h.stage?.premix_check;
  const unitOf = (gauge: string) =>
    (pc?.gauge?.id === gauge ? pc.gauge.unit : h.gauges.find((g) => g.id === gauge)?.unit) ?? 'Torr';
  // drawn before the least mixing time after the premix log closed (the guided fill's own rule): the
  // re-check assumes a uniform premix, which the record then does not show
  const mixing = pc?.mixing && { stirred: pc.mixing.stirred, restS: pc.mixing.rest_s };
  const mixed = log.premixMixed.map((m): PremixCheckRecord => {
    const t = premixMixingElapsed({ premixClosed: pc?.premix_log_closed, mixing }, m.time);
    return {
      kind: 'mixed',
      line: m.line,
      tank: m.tank,
      by: m.by,
      time: m.time,
      ...(m.note ? { note: m.note } : {}),
      ...(t?.early
        ? {
            early: {
              elapsedS: t.elapsedS,
              neededS: t.neededS,
              ...(mixing ? { stirred: mixing.stirred } : {}),
              ...(pc?.premix_log_closed ? { closed: pc.premix_log_closed } : {}),
            },
          }
        : {}),
    };
  });
  const read = log.premixReadings.map((r): PremixCheckRecord => ({
    kind: 'reading',
    line: r.line,
    tank: r.tank,
    gauge: r.gauge,
    reading: r.reading,
    pressurePa: r.pressure_Pa,
    minimumPa: r.minimum_Pa,
    enough: r.enough,
    unit: unitOf(r.gauge),
    by: r.by,
    time: r.time,
    ...(r.note ? { note: r.note } : {}),
  }));
  return [...mixed, ...read].sort((a, b) => a.line - b.line);
}

/**
 * The amount of gas in the tank (mol): the tank volume times the density of the composition at P and T
 * (the virial equation the re-check inverts; V from the log's header). Undefined where the model
 * refuses (a temperature outside its range).
 */
function amountIn(
  volumeM3: number,
  y: Readonly<Record<string, number>>,
  pressurePa: number,
  temperatureK: number,
) {
  try {
    const keys = Object.keys(y).filter((k) => y[k] > 0);
    const sum = keys.reduce((a, k) => a + y[k], 0);
    const yn = Object.fromEntries(keys.map((k) => [k, y[k] / sum]));
    const model = virialModel(keys, temperatureK);
    return volumeM3 * densityFromPressure(pressurePa, temperatureK, bMix(model, yn), cMix(model, yn));
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
}

/**
 * A vent after the last reading: the tank before it (the last reading in force) and as read after it,
 * each with its amount; the composition is the re-check's (venting lets out gas of the tank's own
 * composition)
 */
function ventReport(log: ParsedLog, composition: Readonly<Record<string, number>>): VentRecordOf | undefined {
  const v = ventOf(log);
  const last = log.readings[log.readings.length - 1];
  if (!v || !last) return undefined;
  const V = log.header.tank.volume_m3;
  const a = v.after;
  return {
    step: v.step,
    line: v.line,
    by: v.by,
    time: v.time,
    targetPa: v.targetPa,
    before: {
      pressurePa: last.pressure_Pa,
      temperatureK: last.temperature_K,
      amountMol: amountIn(V, composition, last.pressure_Pa, last.temperature_K),
    },
    after: a && {
      pressurePa: a.pressure_Pa,
      temperatureK: a.temperature_K,
      text: a.reading,
      gauge: a.gauge,
      by: a.by,
      time: a.time,
      line: a.line,
      amountMol: amountIn(V, composition, a.pressure_Pa, a.temperature_K),
    },
  };
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
