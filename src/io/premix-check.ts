/**
 * A premix made in an earlier stage, named by its batch log, as a source of the batch: its
 * composition is the log's re-checked composition (GUM, the same model and inputs as `check`)
 * and its uncertainty that re-check's budget, carried into the batch's budget as composition
 * terms (core plan/premix-source.ts). A premix tank whose log is the record of a previous batch
 * is a source the same way.
 *
 * The hook `check` needs (src/io/check.ts, branch recheck): where a CSV row or a batch log's
 * source names a premix log, use `premixSourceFromLog(path)` as that row's source.
 */
import { dirname, resolve } from 'node:path';
import { evaluateUncertainty, premixSource, ProblemError, type GasSource } from '../core/index.js';
import { readLog } from './batch-log.js';
import { logModelInput } from './check.js';

/** the premix log's re-check: its composition, unidentified share, budget and last reading */
export function premixSourceFromLog(file: string, relativeTo?: string): GasSource {
  const path = relativeTo ? resolve(dirname(relativeTo), file) : file;
  const log = readLog(path);
  const h = log.header;
  const b = log.barometer;
  const barometer = b
    ? { pressurePa: b.pressure_Pa, uPa: b.u_Pa ?? h.barometer.u_Pa }
    : { pressurePa: h.barometer.pressure_Pa, uPa: h.barometer.u_Pa };
  const start =
    h.in_tank &&
    (log.start
      ? {
          pressurePa: log.start.pressure_Pa,
          temperatureK: log.start.temperature_K,
          composition: h.in_tank.composition,
        }
      : {
          pressurePa: h.in_tank.pressure_Pa,
          temperatureK: h.temperature_K,
          composition: h.in_tank.composition,
        });
  const model = logModelInput(
    log,
    { ...barometer },
    start ? { ...start, read: log.start !== undefined } : undefined,
    {
      trials: 0,
      seed: 0,
    },
  );
  try {
    const result = evaluateUncertainty(model.readings, model.settings, model.diluent, model.initial);
    const composition = Object.fromEntries(result.species.map((k) => [k, result.composition[k].value]));
    const last = log.readings[log.readings.length - 1];
    return premixSource({
      id: `premix-${h.id}`,
      tank: h.tank.id,
      composition,
      unidentified: result.unidentified,
      pressurePa: last?.pressure_Pa ?? 0,
      budget: result,
    });
  } catch (e) {
    if (e instanceof ProblemError) throw e.at({ file: path });
    throw e;
  }
}
