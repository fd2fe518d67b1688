/**
 * A batch planned from an existing premix tank: the recipe's `premix.log` (relative to the recipe
 * file) or `--premix-log LOG` (as typed, from the working folder). The premix log is re-checked
 * (premix-check.ts: check's model and GUM budget), the draws of the other batch logs in its folder
 * that name it are subtracted from its last reading, and the core plans the batch with the premix
 * as a source (core plan/premix-log.ts). Every refusal points at the recipe line or the option.
 */
import { resolve } from 'node:path';
import {
  fail,
  planFromPremix,
  premixDelivery,
  ProblemError,
  relocate,
  withBandEdges,
  type GasSource,
  type PredictedPlan,
  type Where,
} from '../core/index.js';
import type { Overrides, PlanRequest, RecipeSource } from './load.js';
import { predictionThermometer } from './plan-predict.js';
import { drawsFrom, readPremixLog, type PremixRecord } from './premix-check.js';

/** the premix log a recipe (or --premix-log) names, with where it was named; undefined: none */
export interface PremixLogAsk {
  readonly named: string;
  readonly path: string;
  readonly where: Where;
}

/**
 * The premix log asked for: `premix.log` of the merged recipe. Refused together with
 * `premix.tank` (a premix to make), naming both places.
 */
export function premixLogAsked(rs: RecipeSource): PremixLogAsk | undefined {
  const pm = rs.recipe.premix;
  if (!pm?.log) return undefined;
  const where = {
    ...rs.locate(['premix', 'log']),
    field: rs.locate(['premix', 'log']).field ?? 'premix.log',
  };
  const fromOption = where.field === '--premix-log';
  // a premix to make (its tank, gases, fraction, pressure or order) is not a premix that exists
  const making = (['tank', 'gases', 'fraction', 'pressure', 'order'] as const).find(
    (k) => pm[k] !== undefined,
  );
  if (making !== undefined) {
    const tankAt = rs.locate(['premix', making]);
    const place = (w: Where, key: string) =>
      w.field?.startsWith('--')
        ? w.field
        : `${key}${w.line ? ` (${w.file ?? rs.origin} line ${w.line})` : ''}`;
    fail(
      {
        code: 'premix-log-refused',
        log: pm.log,
        cause: {
          kind: 'with-premix-tank',
          places: [place(tankAt, `premix.${making}`), place(where, 'premix.log')],
        },
      },
      where,
    );
  }
  return {
    named: pm.log,
    path: fromOption ? resolve(pm.log) : resolve(rs.baseDir, pm.log),
    where,
  };
}

/** the premix log re-checked, a refusal pointed at where it was named */
export function premixRecordOf(ask: PremixLogAsk): PremixRecord {
  try {
    return readPremixLog(ask.named, ask.path, undefined);
  } catch (e) {
    if (e instanceof ProblemError) throw relocate(e, ask.where);
    throw e;
  }
}

/** the order may name the premix by its source id (or its gases): the request's extra source */
export function premixOverrides(rec: PremixRecord | undefined, o: Overrides): Overrides {
  return rec ? { ...o, extraSources: [rec.source] } : o;
}

/** the source without shared instruments: the premix was filled in another lab */
function unshared(s: GasSource): GasSource {
  return { ...s, compositionTerms: s.compositionTerms?.map((t) => ({ ...t, shared: undefined })) };
}

/**
 * The premix tank's pressure now: its last reading less what other batches drew, settled at the
 * temperature of that reading (the premix tank's falling pressure of the two-stage plan,
 * core premix-tank.ts). 0 when they drew it empty.
 */
function presentPressure(rec: PremixRecord, drawnMol: number): number {
  const last = rec.log.readings[rec.log.readings.length - 1];
  if (!(drawnMol > 0)) return last.pressure_Pa;
  return premixDelivery({
    composition: rec.source.composition,
    volumeM3: rec.tank.volumeM3,
    temperatureK: last.temperature_K,
    startPa: last.pressure_Pa,
    deliveredMol: drawnMol,
  }).endPa;
}

/** plan the batch from the premix log: the core's planFromPremix, the record's particulars on the plan */
export function planFromPremixLog(req: PlanRequest, ask: PremixLogAsk, rec: PremixRecord): PredictedPlan {
  const source = rec.log.header.lab === req.lab.name ? rec.source : unshared(rec.source);
  const draws = drawsFrom(rec.path);
  const drawn = draws.reduce((a, d) => a + d.mol, 0);
  const startPa = presentPressure(rec, drawn);
  try {
    const planned = planFromPremix({
      batch: req.input,
      premix: { ...source, supplyPressurePa: startPa },
      premixTank: rec.tank,
      startPa,
      thermometer: predictionThermometer(req.lab.thermometer),
      log: ask.named,
    });
    const r = rec.result;
    // the batch's readings inside their bands, taken together, as for any plan (withBandEdges)
    return {
      ...withBandEdges(planned.batch),
      premixLog: {
        log: ask.named,
        path: rec.path,
        lastEntrySha256: rec.lastEntrySha256,
        source: planned.source,
        tank: rec.tank,
        composition: Object.fromEntries(r.species.map((k) => [k, r.composition[k].value])),
        u: Object.fromEntries(r.species.map((k) => [k, r.composition[k].u])),
        lastReadingPa: rec.lastReadingPa,
        draws: draws.map((d) => ({ log: d.log, mol: d.mol })),
        delivery: planned.delivery,
      },
    };
  } catch (e) {
    if (e instanceof ProblemError && e.problem.code === 'premix-log-refused') throw relocate(e, ask.where);
    throw e;
  }
}
