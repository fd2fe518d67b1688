/**
 * What the re-check of a batch log is built from: its design, start, barometer and the core's model
 * input, for `check` (check.ts) and for a premix log's re-check (premix-check.ts). Apart from both,
 * so that neither imports the other: the premix logs a log names come in as a function.
 */
import {
  chargeNumbers,
  fail,
  judge,
  ProblemError,
  recheckModelInput,
  type Design,
  type GasSource,
  type RecheckModelInput,
  type UncertaintyResult,
} from '../core/index.js';
import { gaugeFromLog, sourceFromLog, type LogHeader, type ParsedLog } from './batch-log.js';
import { settlingOf } from './plan-predict.js';
import { hashedOnlyMarks } from './log-audit.js';
import type { ChargeNumber, CheckReport } from './check-shared.js';

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

/**
 * the composition's verdict of a log's re-check against its header's design and tolerance; a log with
 * steps not read is a fail (an incomplete batch), whatever the fills logged so far give
 */
export function logVerdict(log: ParsedLog, result: UncertaintyResult, missingSteps: readonly number[]) {
  const h = log.header;
  const v = judge(result, designFromHeader(h), h.tolerance);
  return missingSteps.length ? { ...v, verdict: 'fail' as const } : v;
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

/** the premix logs a batch log names, each re-checked (io/premix-check.ts premixLogsOf), as sources and records */
export type PremixLogsOf<R> = () => { sources: ReadonlyMap<string, GasSource>; records: R[] };

/**
 * What the re-check of a log is built from (shared by `check` and a premix log's re-check): its
 * start, barometer, model input (the premix logs it names re-checked in turn by `premix`, which
 * the caller passes in: io/premix-check.ts re-checks a premix log with this same function; without
 * it, a premix as the header recorded it) and the steps without a reading.
 */
export function logRecheckBasis<R = never>(
  log: ParsedLog,
  premixLogs: PremixLogsOf<R> = () => ({ sources: new Map(), records: [] }),
  mc: { trials: number; seed: number } = { trials: 0, seed: 0 },
) {
  const h = log.header;
  if (log.readings.length === 0) fail({ code: 'log-no-readings' }, { file: log.file });
  const start = startOf(log);
  const barometer = barometerOf(log);
  const premix = premixLogs();
  const model = logModelInput(log, barometer, start, mc, premix.sources);
  const done = new Set(log.readings.map((r) => r.step));
  const missingSteps = h.steps.map((s) => s.step).filter((s) => !done.has(s));
  return { start, barometer, model, missingSteps, premix: premix.records };
}

/** the lines of a log that do not match their hash chain: changed after writing, or not mixwright's */
export function alteredLinesOf(log: ParsedLog): number[] {
  const edited = log.issues.flatMap((i) =>
    i.code === 'line-edited' || i.code === 'line-unhashed' ? [i.line] : [],
  );
  // a hashed log whose hashes were stripped and format set back to /1: its header is the altered line
  return hashedOnlyMarks(log).length ? [1, ...edited.filter((l) => l !== 1)] : edited;
}
