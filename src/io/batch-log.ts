/**
 * The batch log: JSON Lines, one event per line, append-only, every line written in full
 * (the byte count checked) and fsync'd before the fill says "logged". Format
 * "mixwright-batch/2" (a /1 log is read too; it has no line hashes, which is a note):
 *
 *   {"kind":"batch", ...}            header: design, tank (rating and working limit), gauges,
 *                                    sources, planned steps, gas already in the tank (top-up),
 *                                    safety? {coldest_K?, condensation_fraction?} (review settings)
 *   {"kind":"barometer", ...}        today's barometric pressure: reading (as typed, with unit),
 *                                    pressure_Pa, u_Pa?, by (initials), time
 *   {"kind":"start-pressure", ...}   top-up: the tank's pressure before the first fill, read and
 *                                    logged first: gauge, reading, pressure_Pa (absolute),
 *                                    barometer_Pa?, temperature, temperature_K, by, time
 *   {"kind":"reading", ...}          one per fill: step, source, gauge, reading (as typed, with
 *                                    unit), pressure_Pa (absolute), barometer_Pa? (gauge-referenced
 *                                    gauges), temperature (as typed), temperature_K, time, by?
 *                                    (who read it: the session's operator; older logs lack it),
 *                                    charge? ({number, of}: which charge of a split source; must be
 *                                    the header step's; logs before split charges lack it)
 *   {"kind":"correction", ...}       a reading's fields again, plus by, reason and replaces_line
 *                                    (the line of the reading it replaces); the original stays
 *   {"kind":"withdraw", ...}         step, withdraws_line, by, time, reason?: takes back the last
 *                                    reading logged, before the next fill; the step is read again
 *   {"kind":"acknowledge", ...}      an operator's acknowledgement of a danger finding; code
 *                                    "remainder-review" with review? {trigger, outcome, hazards,
 *                                    stop?}: the outcome of the review of the re-targeted remainder;
 *                                    code "limit-cap" with cap? {outcome, final_Pa, outside}: the
 *                                    choice on a re-target held below the working limit;
 *                                    code "went-on-below-band" with below? {reading, pressure_Pa,
 *                                    target_Pa, band_Pa}: `next` on a fill read below its band (the
 *                                    fill left incomplete, the fills ahead re-targeted from it);
 *                                    code "over-range" with over_range? {outcome, typed, gauge, ...}:
 *                                    a value typed past its gauge's range, logged when typed, then
 *                                    declared a slip or re-read on a gauge that covers it
 *   {"kind":"vent", ...}             the operator vents the tank back after a reading past the working
 *                                    limit: step (the fill just read), target_Pa (the vent target
 *                                    shown), by, time; the composition stays, the pressure does not
 *   {"kind":"vent-reading", ...}     the tank read after venting, settled: step, gauge, reading,
 *                                    pressure_Pa (absolute), barometer_Pa?, temperature,
 *                                    temperature_K, by, time; the last one after a vent is the tank's
 *                                    final pressure. No fill reading may follow a vent
 *   {"kind":"premix-mixed", ...}     stage 2: the premix confirmed mixed before the first fill from it:
 *                                    tank, by, time, note? (the mixing time asked)
 *   {"kind":"premix-reading", ...}   stage 2: the premix tank read before the first fill from it: tank,
 *                                    gauge, reading, pressure_Pa (absolute), barometer_Pa?, minimum_Pa,
 *                                    enough, by, time; not a reading of the batch (no composition)
 *   {"kind":"close", ...}            the batch is finished
 *
 * Every line carries "chain": the SHA-256 (hex) of the previous line's chain, a line feed,
 * and this line's JSON without its chain (for a previous line without a chain, the SHA-256
 * of its bytes stands in). An edited line no longer matches its chain; a removed line
 * breaks the next one's. It is a check against accidents and quiet edits, not a signature.
 *
 * Split charges: a source filled in more than one charge has one step per charge. A header step
 * carries charge {number, of} (written by createLog; a header without it gets the charges counted
 * from its steps' sources, the way the plan numbers them), and so does each new reading. A line
 * whose charge is not its step's is refused: a reading of Ar's first charge is never taken for
 * its second.
 *
 * A line counts when its line feed is written: a last line without one was cut off mid-write
 * (a crash or a full disk) and is never used. A guided fill opens the log with
 * openLogForFill: an exclusive lock file beside the log, and a torn last line moved aside to
 * a side file before anything is appended. A log is never overwritten.
 */
import { nodeCrypto, nodeOs } from './builtins.js';
import {
  closeSync,
  fstatSync,
  fsyncSync,
  ftruncateSync,
  linkSync,
  lstatSync,
  openSync,
  readdirSync,
  readFileSync,
  renameSync,
  unlinkSync,
} from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { readTextFile } from './read-text.js';
import { z } from './zod.js';
import { fail, ProblemError } from '../core/index.js';
import type { Gauge, GasSource, LogFault, Problem } from '../core/index.js';
import { fsyncFolder, writeAllSync, writeCauseCodeAfter as writeCauseOf, writeFileAtomic } from './atomic.js';
import { chargesOf, type ChargeOf } from '../report/charges.js';

export const LOG_FORMAT = 'mixwright-batch/2';
const LOG_VERSION = 2;

/** a value built on first use, then kept: the log's zod schemas cost start-up, and most commands
 * (plan, sheet) never read a log */
function lazy<T>(build: () => T): () => T {
  let value: T | undefined;
  return () => (value ??= build());
}

const fractions = lazy(() => z.record(z.string(), z.number().min(0).max(1)));

const gaugeSchema = lazy(() =>
  z.object({
    id: z.string(),
    label: z.string(),
    reference: z.enum(['absolute', 'gauge']),
    full_scale_Pa: z.number().positive(),
    minimum_Pa: z.number(),
    accuracy_of_reading: z.number().min(0),
    accuracy_of_full_scale: z.number().min(0),
    resolution_Pa: z.number().min(0),
    unit: z.string(),
    /** the pressure the head survives without damage (its basis), when the lab profile gives it; older logs lack it */
    overpressure_Pa: z.number().positive().optional(),
  }),
);

/** charge `number` of the `of` charges of a split source (1 of 1 for a source filled once) */
const chargeSchema = lazy(() =>
  z
    .object({ number: z.number().int().positive(), of: z.number().int().positive() })
    .refine((c) => c.number <= c.of, { message: 'the charge number is above the number of charges' }),
);

const sourceSchema = lazy(() =>
  z.object({
    id: z.string(),
    label: z.string(),
    kind: z.enum(['cylinder', 'premix', 'vapour', 'in-tank']),
    composition: fractions(),
    unidentified: z.number().min(0).max(1),
    main_species: z.string(),
  }),
);

/**
 * The stage of a two-stage preparation a log records: stage 1 the premix (`next_command` fills the
 * batch from it), stage 2 the batch (`premix_log` names the premix log and the sha256 of its bytes
 * when the batch was started from it). Optional: a log without it is a single-tank batch.
 */
const stageSchema = lazy(() =>
  z.object({
    number: z.union([z.literal(1), z.literal(2)]),
    of: z.literal(2),
    /** the batch id both stages belong to */
    batch: z.string().min(1),
    next_command: z.string().optional(),
    premix_log: z
      .object({ file: z.string().min(1), id: z.string(), sha256: z.string().regex(/^[0-9a-f]{64}$/) })
      .optional(),
    /** stage 1: the premix tank's height and stirrer (lab profile), for the mixing time of the end screen */
    premix_tank: z.object({ height_m: z.number().positive(), stirred: z.boolean() }).optional(),
    /**
     * stage 2: the premix tank's check before the first fill from it, as the stage-2 sheet prints it
     * (report/two-stage-sheet.ts premixTankCheck); the guided fill asks for it. Absent in older logs.
     */
    premix_check: z
      .object({
        tank: z.string(),
        /** the gauge to read the premix tank on (null: no gauge of the lab profile covers it) */
        gauge: gaugeSchema().nullable(),
        /** the lowest reading allowed on that gauge, rounded up to its display step, with its unit */
        minimum: z.string(),
        /** that minimum as an absolute pressure (gauge-referenced: + the barometer the plan assumed) */
        minimum_Pa: z.number().positive(),
        planned_Pa: z.number().positive(),
        /** the settled premix-tank pressure that must remain after the draw, and the batch reading it serves */
        required_Pa: z.number().positive(),
        target_Pa: z.number().positive(),
        delivered_mol: z.number().min(0),
        /** the batch's fills from the premix (the check comes before the first) */
        fills: z.array(z.number().int().positive()).min(1),
        /**
         * the heads to close off before the line is filled from the premix tank (their range ends below
         * its pressure), the top of each (absolute) and whether a later reading needs it open again;
         * the sheet's close-off (premixTankCheck.closeOff). Absent in older logs.
         */
        close_off: z
          .array(z.object({ gauge: z.string(), top_Pa: z.number().positive(), reopen: z.boolean() }))
          .optional(),
        /** stirred (lab profile), and diffusion alone to 0.1 % at the premix pressure, s */
        mixing: z.object({ stirred: z.boolean(), rest_s: z.number().positive() }).optional(),
        /**
         * the premix log as the batch was started from it: when it was closed (the mixing time is
         * counted from it), its last reading (absolute) and how many other batches drew from it;
         * planned_Pa is that reading less their draws. Absent in older logs.
         */
        premix_log_closed: z.string().optional(),
        premix_log_last_Pa: z.number().positive().optional(),
        premix_log_draws: z.number().int().min(0).optional(),
      })
      .optional(),
  }),
);

export const headerSchema = lazy(() =>
  z.object({
    kind: z.literal('batch'),
    format: z.string(),
    id: z.string().min(1),
    created: z.string(),
    lab: z.string(),
    tank: z.object({
      id: z.string(),
      volume_m3: z.number().positive(),
      rated_pressure_Pa: z.number().positive().nullable(),
      /** rating x working fraction; absent in /1 logs (then the rating is the limit) */
      working_limit_Pa: z.number().positive().nullable().optional(),
    }),
    design: z.object({
      composition: fractions(),
      phi: z.number().nullable(),
      diluent: z.array(z.string()),
      diluent_fraction: z.number(),
    }),
    tolerance: z.object({ relative: z.number().min(0), absolute: z.number().min(0) }),
    temperature_K: z.number().positive(),
    final_pressure_Pa: z.number().positive(),
    barometer: z.object({
      pressure_Pa: z.number().positive(),
      u_Pa: z.number().min(0),
      /**
       * whose value the plan assumed: the lab profile's, --barometer's, or the default (the profile gives
       * none); the guided fill converts a typed gauge pressure ("15 psig") only with a measured one.
       * Absent in older logs.
       */
      from: z.enum(['lab-profile', 'option', 'default']).optional(),
    }),
    /** the plan's gauge pressures (recipe, options, lab profile) made absolute, as stated. Absent: none */
    gauge_pressures: z.array(z.string()).optional(),
    thermometer: z.object({
      u_K: z.number().min(0),
      resolution_K: z.number().min(0),
      /** gas-thermometer difference after settling (K, rectangular half-width); older logs lack it */
      settling_K: z.number().min(0).optional(),
    }),
    gauges: z.array(gaugeSchema()),
    sources: z.array(sourceSchema()),
    steps: z.array(
      z.object({
        step: z.number().int().positive(),
        source: z.string(),
        species: z.string(),
        target_Pa: z.number(),
        band_Pa: z.number(),
        gauge: z.string().nullable(),
        /** absent in logs made before split charges: then counted from the sources (chargesOfHeader) */
        charge: chargeSchema().optional(),
      }),
    ),
    /** top-up: the gas the plan assumed already in the tank */
    in_tank: z.object({ composition: fractions(), pressure_Pa: z.number().positive() }).nullable().optional(),
    recipe: z.unknown().optional(),
    /**
     * the premix logs this batch draws from: the source id the steps name, the premix log's path
     * relative to this log's folder, and the hash link (chain) of its last entry when the batch was
     * planned; absent in logs of batches without one
     */
    premix_logs: z
      .array(
        z.object({
          source: z.string(),
          path: z.string().min(1),
          last_entry_sha256: z.string().regex(/^[0-9a-f]{64}$/),
        }),
      )
      .optional(),
    /** two-stage preparation: which stage this log records (absent: a single-tank batch; io/stage-log.ts) */
    stage: stageSchema().optional(),
    /**
     * the plan's safety-review settings the guided fill reviews its re-targeted remainder with (coldest
     * wetted temperature, condensation fraction); absent in older logs (then the fill temperature and 0.5)
     */
    safety: z
      .object({
        coldest_K: z.number().positive().optional(),
        condensation_fraction: z.number().positive().max(1).optional(),
      })
      .optional(),
    findings: z
      .array(
        z.object({
          severity: z.enum(['danger', 'warning', 'note']),
          code: z.string(),
          step: z.number().nullable(),
          message: z.string(),
        }),
      )
      .optional(),
  }),
);

const chain = lazy(() =>
  z
    .string()
    .regex(/^[0-9a-f]{64}$/)
    .optional(),
);
const initials = lazy(() => z.string().trim().min(1).max(16));

/** who logged an event and when, an optional note, and the line's hash link: the tail of most events */
const signedFields = lazy(() => ({
  by: initials(),
  time: z.string(),
  note: z.string().optional(),
  chain: chain(),
}));

/**
 * a tank read on a gauge: the gauge, the reading as shown, the absolute pressure (described by
 * `pressure`) and, for a gauge-referenced gauge, the barometer it was made absolute with
 */
function gaugeReadFields(pressure: string, reading = 'as shown on the gauge, with its unit') {
  return {
    gauge: z.string(),
    reading: z.string().describe(reading),
    pressure_Pa: z.number().positive().describe(pressure),
    barometer_Pa: z.number().positive().optional(),
  };
}

/** the temperature read with a pressure: as typed, and in kelvin */
const temperatureFields = lazy(() => ({ temperature: z.string(), temperature_K: z.number().positive() }));

const readingFields = lazy(() => ({
  step: z.number().int().positive(),
  source: z.string(),
  ...gaugeReadFields('absolute tank pressure', 'as shown on the gauge, with its unit, e.g. "50.04 Torr"'),
  ...temperatureFields(),
  ...signedFields(),
  /** a reading's initials are optional (older logs lack them); the events below require them */
  by: initials().optional(),
  /** which charge of its source the step is; absent in logs made before split charges */
  charge: chargeSchema().optional(),
}));

const readingSchema = lazy(() => z.object({ kind: z.literal('reading'), ...readingFields() }));
const correctionSchema = lazy(() =>
  z.object({
    kind: z.literal('correction'),
    ...readingFields(),
    reason: z.string().optional(),
    replaces_line: z.number().int().positive().optional(),
  }),
);
const withdrawSchema = lazy(() =>
  z.object({
    kind: z.literal('withdraw'),
    step: z.number().int().positive(),
    withdraws_line: z.number().int().positive(),
    by: initials(),
    time: z.string(),
    reason: z.string().optional(),
    chain: chain(),
  }),
);
const barometerSchema = lazy(() =>
  z.object({
    kind: z.literal('barometer'),
    reading: z.string().describe('as typed, with its unit, e.g. "752.1 Torr"'),
    pressure_Pa: z.number().positive(),
    u_Pa: z.number().min(0).optional(),
    ...signedFields(),
  }),
);
const startSchema = lazy(() =>
  z.object({
    kind: z.literal('start-pressure'),
    ...gaugeReadFields(
      'absolute tank pressure before the first fill',
      'as shown on the gauge, with its unit',
    ),
    ...temperatureFields(),
    ...signedFields(),
  }),
);
/**
 * the outcome of a review of the re-targeted remainder (code "remainder-review"): what triggered it,
 * the hazards the plan did not have, and whether the operator went on through them or took the safer
 * stop the review computed; absent on other acknowledgements and in older logs
 */
const remainderReviewSchema = lazy(() =>
  z.object({
    trigger: z.enum(['reading', 'undo', 'correction', 'resume', 'temperature', 'start']),
    /** stopped: the batch was stopped at the review (closed there, not finished; logs before it lack it) */
    outcome: z.enum(['accepted', 'safer-stop', 'stopped']),
    hazards: z.array(
      z.object({
        code: z.string(),
        step: z.number().int().nullable(),
        severity: z.enum(['danger', 'warning', 'note']),
      }),
    ),
    /** the safer stop taken: the charge's step, the stop it held and the one it holds now (absolute) */
    stop: z
      .object({
        step: z.number().int().positive(),
        from_Pa: z.number().positive(),
        to_Pa: z.number().positive(),
      })
      .optional(),
  }),
);
/**
 * the operator's choice on the stop screen of a re-target held below the working limit (code
 * "limit-cap"): go on to the capped targets, or stop; the final pressure the cap allows and the
 * design species it leaves outside the tolerance; absent on other acknowledgements and in older logs
 */
const capSchema = lazy(() =>
  z.object({
    outcome: z.enum(['continued', 'stopped']),
    final_Pa: z.number().positive(),
    outside: z.array(z.string()),
  }),
);
/**
 * the code of the choice to go on from a fill read below its band (`next INITIALS` on its screen): the
 * fill is left incomplete at the reading in force and the fills ahead are re-targeted from it
 */
export const WENT_ON_BELOW_BAND = 'went-on-below-band';
/**
 * what a `went-on-below-band` acknowledgement records: the reading left in force (absolute), the target
 * and band of that fill then; absent on other acknowledgements
 */
const belowSchema = lazy(() =>
  z.object({
    reading: z.string(),
    pressure_Pa: z.number().positive(),
    target_Pa: z.number().positive(),
    band_Pa: z.number().min(0),
  }),
);
/** the code of a value typed past its gauge's range (acknowledge with over_range) */
export const OVER_RANGE_CODE = 'over-range';
/**
 * a value typed past the range of the gauge its fill is read on (code "over-range"): logged when typed
 * (outcome "typed": the tank NOT read on a gauge that covers it), then its resolution, a later line of the
 * same fill: "slip" (the operator says it was a typing slip) or "re-read" (the tank read on `read_on`, the
 * reading logged next). Absent on other acknowledgements and in older logs.
 */
const overRangeSchema = lazy(() =>
  z.object({
    outcome: z.enum(['typed', 'slip', 're-read']),
    typed: z.string(),
    gauge: z.string(),
    /** the value typed on that gauge's basis (gauge-referenced: above ambient), and absolute */
    shown_Pa: z.number(),
    pressure_Pa: z.number(),
    full_scale_Pa: z.number().positive(),
    overpressure_Pa: z.number().positive().optional(),
    read_on: z.string().optional(),
  }),
);
const ackSchema = lazy(() =>
  z.object({
    kind: z.literal('acknowledge'),
    code: z.string(),
    step: z.number().int().nullable(),
    by: z.string(),
    time: z.string(),
    note: z.string().optional(),
    review: remainderReviewSchema().optional(),
    cap: capSchema().optional(),
    below: belowSchema().optional(),
    over_range: overRangeSchema().optional(),
    chain: chain(),
  }),
);
/** the operator vents the tank back (a reading past the working limit): what was chosen, by whom */
const ventSchema = lazy(() =>
  z.object({
    kind: z.literal('vent'),
    step: z.number().int().positive(),
    target_Pa: z.number().positive().describe('the absolute pressure the tank is vented back to (at most)'),
    ...signedFields(),
  }),
);
/** the tank read after venting, once settled: its final pressure (the composition is the readings') */
const ventReadingSchema = lazy(() =>
  z.object({
    kind: z.literal('vent-reading'),
    step: z.number().int().positive(),
    ...gaugeReadFields('absolute tank pressure after venting'),
    ...temperatureFields(),
    ...signedFields(),
  }),
);
/** stage 2: the operator confirms the premix was mixed (stirred or rested for the stated time) before the draw */
const premixMixedSchema = lazy(() =>
  z.object({ kind: z.literal('premix-mixed'), tank: z.string(), ...signedFields() }),
);
/**
 * stage 2: the premix tank read before the first fill from it, against the minimum the plan needs
 * (`enough` false: below it; the fill does not draw from it). Not a reading of the batch: it does not
 * enter the batch's composition.
 */
const premixReadingSchema = lazy(() =>
  z.object({
    kind: z.literal('premix-reading'),
    tank: z.string(),
    ...gaugeReadFields('absolute premix-tank pressure'),
    minimum_Pa: z.number().positive(),
    enough: z.boolean(),
    ...signedFields(),
  }),
);
const closeSchema = lazy(() =>
  z.object({
    kind: z.literal('close'),
    time: z.string(),
    note: z.string().optional(),
    chain: chain(),
  }),
);

export type LogHeader = z.infer<ReturnType<typeof headerSchema>>;
export type LogReading =
  z.infer<ReturnType<typeof readingSchema>> | z.infer<ReturnType<typeof correctionSchema>>;
export type LogCorrection = z.infer<ReturnType<typeof correctionSchema>>;
export type LogWithdraw = z.infer<ReturnType<typeof withdrawSchema>>;
export type LogBarometer = z.infer<ReturnType<typeof barometerSchema>>;
export type LogStartPressure = z.infer<ReturnType<typeof startSchema>>;
export type LogAck = z.infer<ReturnType<typeof ackSchema>>;
export type LogRemainderReview = z.infer<ReturnType<typeof remainderReviewSchema>>;
export type LogClose = z.infer<ReturnType<typeof closeSchema>>;
export type LogVent = z.infer<ReturnType<typeof ventSchema>>;
export type LogVentReading = z.infer<ReturnType<typeof ventReadingSchema>>;
export type LogPremixMixed = z.infer<ReturnType<typeof premixMixedSchema>>;
export type LogPremixReading = z.infer<ReturnType<typeof premixReadingSchema>>;
export type LogEvent =
  | LogHeader
  | LogReading
  | LogWithdraw
  | LogBarometer
  | LogStartPressure
  | LogAck
  | LogClose
  | LogVent
  | LogVentReading
  | LogPremixMixed
  | LogPremixReading;
/** what a writer hands to append: any event but the header, without its chain (the writer adds it) */
export type NewLogEvent = Exclude<LogEvent, LogHeader>;

export function gaugeToLog(g: Gauge): LogHeader['gauges'][number] {
  return {
    id: g.id,
    label: g.label,
    reference: g.reference,
    full_scale_Pa: g.fullScalePa,
    minimum_Pa: g.minimumPa,
    accuracy_of_reading: g.accuracyOfReading,
    accuracy_of_full_scale: g.accuracyOfFullScale,
    resolution_Pa: g.resolutionPa,
    unit: g.unit,
    ...(g.overpressurePa !== undefined ? { overpressure_Pa: g.overpressurePa } : {}),
  };
}

export function gaugeFromLog(g: LogHeader['gauges'][number]): Gauge {
  return {
    id: g.id,
    label: g.label,
    reference: g.reference,
    fullScalePa: g.full_scale_Pa,
    minimumPa: g.minimum_Pa,
    accuracyOfReading: g.accuracy_of_reading,
    accuracyOfFullScale: g.accuracy_of_full_scale,
    resolutionPa: g.resolution_Pa,
    unit: g.unit,
    ...(g.overpressure_Pa !== undefined ? { overpressurePa: g.overpressure_Pa } : {}),
  };
}

export function sourceToLog(s: GasSource): LogHeader['sources'][number] {
  return {
    id: s.id,
    label: s.label,
    kind: s.kind,
    composition: { ...s.composition },
    unidentified: s.unidentified,
    main_species: s.mainSpecies,
  };
}

export function sourceFromLog(s: LogHeader['sources'][number]): GasSource {
  return {
    id: s.id,
    label: s.label,
    kind: s.kind,
    composition: s.composition,
    unidentified: s.unidentified,
    mainSpecies: s.main_species,
  };
}

/** the charge of every planned step: as the header logs it, else counted from the steps' sources */
export function chargesOfHeader(h: Pick<LogHeader, 'steps'>): ChargeOf[] {
  const counted = chargesOf(h.steps);
  return h.steps.map((s, i) => s.charge ?? counted[i]);
}

/** the header with every step's charge written out (a new log's header; the charges counted where absent) */
export function withCharges(h: LogHeader): LogHeader {
  const charges = chargesOfHeader(h);
  return { ...h, steps: h.steps.map((s, i) => ({ ...s, charge: { ...charges[i] } })) };
}

/** the working limit a log's readings are held to: rating x working fraction, else the rating */
export function workingLimitOf(h: LogHeader): number | undefined {
  return h.tank.working_limit_Pa ?? h.tank.rated_pressure_Pa ?? undefined;
}

// ---------------------------------------------------------------- line hashes

const sha256 = (s: string) => nodeCrypto().createHash('sha256').update(s, 'utf8').digest('hex');

/** the chain of a line: SHA-256 of the previous link, a line feed, and the line's JSON without its chain */
export function chainOf(previousLink: string, eventJson: string): string {
  return sha256(`${previousLink}\n${eventJson}`);
}

/** the link the next line chains to: this line's chain, or for a line without one, the hash of its bytes */
function linkOf(obj: unknown, raw: string): string {
  const c = (obj as { chain?: unknown })?.chain;
  return typeof c === 'string' ? c : sha256(raw);
}

function withoutChain(obj: Record<string, unknown>): string {
  const { chain: _drop, ...rest } = obj;
  void _drop;
  return JSON.stringify(rest);
}

function lineFor(previousLink: string, event: LogEvent): { text: string; chain: string } {
  const { chain: _drop, ...body } = event as LogEvent & { chain?: string };
  void _drop;
  const json = JSON.stringify(body);
  const c = chainOf(previousLink, json);
  return { text: JSON.stringify({ ...body, chain: c }) + '\n', chain: c };
}

// ---------------------------------------------------------------- reading

/** what the reader found in the record itself (not in the chemistry), worded by describeRecordIssue */
export type RecordIssue =
  | { readonly code: 'line-edited'; readonly line: number }
  | { readonly code: 'line-unhashed'; readonly line: number }
  | { readonly code: 'log-unhashed'; readonly format: string }
  | { readonly code: 'torn-tail'; readonly line: number; readonly bytes: number }
  | {
      readonly code: 'amend-target';
      readonly line: number;
      readonly step: number;
      readonly named: number | null;
      readonly inForce: number | null;
    }
  | {
      readonly code: 'withdraw-not-last';
      readonly line: number;
      readonly step: number;
      readonly later: number;
    };

export function recordIssueSeverity(i: RecordIssue): 'warning' | 'note' {
  return i.code === 'log-unhashed' ? 'note' : 'warning';
}

export function describeRecordIssue(i: RecordIssue): string {
  switch (i.code) {
    case 'line-edited':
      return (
        `line ${i.line} does not match its hash: it was changed after it was written, ` +
        `or a line before it was removed`
      );
    case 'line-unhashed':
      return `line ${i.line} carries no hash although the log format has them: it was not written by mixwright`;
    case 'log-unhashed':
      return `this log (format ${i.format}) predates the line hashes, so an edit after writing cannot be detected`;
    case 'torn-tail':
      return (
        `line ${i.line} is incomplete (${i.bytes} bytes without a line end: the write ` +
        `was cut off, e.g. by a crash or a full disk) and was ignored; every line ` +
        `before it is used`
      );
    case 'amend-target':
      return i.named === null
        ? `line ${i.line} amends step ${i.step}, which has no reading in force`
        : `line ${i.line} amends step ${i.step} naming line ${i.named}, but the reading ` +
            `in force for that step is ${i.inForce === null ? 'none' : `on line ${i.inForce}`}; ` +
            `it was applied to the step`;
    case 'withdraw-not-last':
      return (
        `line ${i.line} withdraws the reading of step ${i.step}, but step ${i.later} ` +
        `was already filled after it; only the last reading can be withdrawn`
      );
  }
}

export type InForceReading = LogReading & { readonly line: number };

/** a correction or a withdrawal, with what it replaced */
export interface Amendment {
  readonly kind: 'correction' | 'withdraw';
  readonly step: number;
  readonly line: number;
  readonly by: string | null;
  readonly time: string;
  readonly reason: string | null;
  /** the reading in force before, or null */
  readonly old: InForceReading | null;
  /** the correcting reading; null for a withdrawal */
  readonly new: InForceReading | null;
}

/** a vent of the tank, with the readings of the tank after it (the last is its final pressure) */
export interface VentRecord extends LogVent {
  readonly line: number;
  /** the readings after venting, in file order; empty: the pressure after venting was not logged */
  readonly readings: readonly (LogVentReading & { readonly line: number })[];
}

export interface ParsedLog {
  readonly file: string;
  readonly header: LogHeader;
  /** the format version of the header (1 or 2) */
  readonly version: number;
  /** the reading in force for each step (corrections and withdrawals applied), in step order, with its line number */
  readonly readings: readonly InForceReading[];
  /** every reading and correction line, in file order, including those later replaced */
  readonly allReadings: readonly InForceReading[];
  readonly amendments: readonly Amendment[];
  /** the last barometer event, if any */
  readonly barometer?: LogBarometer & { readonly line: number };
  /** the starting pressure of a top-up, if logged */
  readonly start?: LogStartPressure & { readonly line: number };
  /** the acknowledgements, in file order, each with its line number */
  readonly acknowledgements: readonly (LogAck & { readonly line: number })[];
  /** the vents of the tank, in file order (a guided fill logs at most one; older logs none) */
  readonly vents: readonly VentRecord[];
  /** stage 2: the premix confirmed mixed, and the premix tank's readings before drawing from it, in file order */
  readonly premixMixed: readonly (LogPremixMixed & { readonly line: number })[];
  readonly premixReadings: readonly (LogPremixReading & { readonly line: number })[];
  readonly closed: boolean;
  /** the note of the close line, if any */
  readonly closeNote?: string;
  /** the time of the close line, if any (a premix log's: when its mixing time starts at the latest) */
  readonly closeTime?: string;
  readonly issues: readonly RecordIssue[];
  /** the issues of severity warning, as sentences (e.g. a torn last line) */
  readonly warnings: readonly string[];
  /** number of complete lines */
  readonly lines: number;
  /** the link the next appended line chains to */
  readonly lastLink: string;
  /** byte length of the complete lines */
  readonly bytes: number;
}

/** a line that breaks the log format, at its line */
function fault(log: LogFault, file: string, line?: number, field?: string): never {
  return fail({ code: 'schema', log }, { file, line, field });
}

function bad(file: string, line: number, event: string, issues: readonly z.ZodIssue[]): never {
  const i = issues[0];
  return fault({ kind: 'invalid-event', event, path: i.path.join('.'), message: i.message }, file, line);
}

/** a write of the log that failed: what happened to the event is said in the outcome */
function writeFailed(file: string, e: unknown, outcome: string): never {
  return fail({ code: 'write-failed', cause: writeCauseOf(e), outcome }, { file });
}

/** the reader's state after some lines: kept by a fill's handle, so an append reads only the new line */
interface ReaderState {
  header?: LogHeader;
  version: number;
  byStep: Map<number, InForceReading>;
  all: InForceReading[];
  amendments: Amendment[];
  acks: (LogAck & { line: number })[];
  vents: { vent: LogVent & { line: number }; readings: (LogVentReading & { line: number })[] }[];
  premixMixed: (LogPremixMixed & { line: number })[];
  premixReadings: (LogPremixReading & { line: number })[];
  barometer?: ParsedLog['barometer'];
  start?: ParsedLog['start'];
  closed: boolean;
  closeNote?: string;
  closeTime?: string;
  issues: RecordIssue[];
  link: string;
  complete: number;
  bytes: number;
}

const emptyReader = (): ReaderState => ({
  version: 0,
  byStep: new Map(),
  all: [],
  amendments: [],
  acks: [],
  vents: [],
  premixMixed: [],
  premixReadings: [],
  closed: false,
  issues: [],
  link: '',
  complete: 0,
  bytes: 0,
});

const cloneReader = (st: ReaderState): ReaderState => ({
  ...st,
  byStep: new Map(st.byStep),
  all: [...st.all],
  amendments: [...st.amendments],
  acks: [...st.acks],
  vents: st.vents.map((v) => ({ vent: v.vent, readings: [...v.readings] })),
  premixMixed: [...st.premixMixed],
  premixReadings: [...st.premixReadings],
  issues: [...st.issues],
});

/** read one complete line (its line feed written) into the state */
function readLine(st: ReaderState, raw: string, lineNo: number, file: string): void {
  st.complete = lineNo;
  st.bytes += Buffer.byteLength(raw, 'utf8') + 1;
  if (raw.trim() === '') return;
  let obj: unknown;
  try {
    obj = JSON.parse(raw);
  } catch {
    return fault({ kind: 'not-json' }, file, lineNo);
  }
  if (typeof obj !== 'object' || obj === null || Array.isArray(obj))
    fault({ kind: 'not-json' }, file, lineNo);
  const rec = obj as Record<string, unknown>;
  if (typeof rec.chain === 'string') {
    if (chainOf(st.link, withoutChain(rec)) !== rec.chain)
      st.issues.push({ code: 'line-edited', line: lineNo });
  } else if (st.version >= 2) st.issues.push({ code: 'line-unhashed', line: lineNo });
  st.link = linkOf(rec, raw);
  if (!st.header) return readHeader(st, rec, lineNo, file);
  const kind = String(rec.kind);
  const read = Object.hasOwn(EVENT_READERS, kind) ? EVENT_READERS[kind] : undefined;
  if (!read) fault({ kind: 'unknown-event', eventKind: kind }, file, lineNo);
  read(st, rec, lineNo, file);
}

/** the first line: the header, in a format this version reads */
function readHeader(st: ReaderState, rec: Record<string, unknown>, lineNo: number, file: string): void {
  if (rec.kind !== 'batch') fault({ kind: 'no-header' }, file, lineNo);
  const fmt = String(rec.format ?? '');
  const m = /^mixwright-batch\/(\d+)$/.exec(fmt);
  if (!m) fault({ kind: 'unknown-format', format: fmt, reads: LOG_FORMAT }, file, lineNo, 'format');
  if (Number(m[1]) > LOG_VERSION)
    fault({ kind: 'newer-format', format: fmt, reads: LOG_FORMAT }, file, lineNo, 'format');
  const h = headerSchema().safeParse(rec);
  if (!h.success) bad(file, lineNo, 'batch header', h.error.issues);
  // a logged charge must be the one the steps' sources give: one source id is one cylinder
  const counted = chargesOf(h.data.steps);
  h.data.steps.forEach((s, i) => {
    const c = s.charge;
    if (c && (c.number !== counted[i].number || c.of !== counted[i].of))
      fault(
        {
          kind: 'charge-mismatch',
          step: s.step,
          named: { source: s.source, ...c },
          planned: { source: s.source, ...counted[i] },
        },
        file,
        lineNo,
        `steps.${i}.charge`,
      );
  });
  st.header = h.data;
  st.version = Number(m[1]);
  if (st.version < 2) st.issues.push({ code: 'log-unhashed', format: fmt });
}

type EventReader = (st: ReaderState, rec: Record<string, unknown>, lineNo: number, file: string) => void;

/**
 * a reading or correction that names its charge must name its step's (source and charge): the
 * reading of Ar's first charge is never taken for its second. A line without a charge (a log made
 * before split charges) is read as before.
 */
function checkCharge(st: ReaderState, r: LogReading, lineNo: number, file: string): void {
  const c = r.charge;
  if (!c || !st.header) return;
  const i = st.header.steps.findIndex((s) => s.step === r.step);
  const planned = i >= 0 ? chargesOfHeader(st.header)[i] : undefined;
  const source = i >= 0 ? st.header.steps[i].source : undefined;
  if (planned && source === r.source && planned.number === c.number && planned.of === c.of) return;
  fault(
    {
      kind: 'charge-mismatch',
      step: r.step,
      named: { source: r.source, ...c },
      planned: planned && source !== undefined ? { source, ...planned } : null,
    },
    file,
    lineNo,
    'charge',
  );
}

function readReading(st: ReaderState, rec: Record<string, unknown>, lineNo: number, file: string): void {
  const r = readingSchema().safeParse(rec);
  if (!r.success) bad(file, lineNo, 'reading', r.error.issues);
  checkCharge(st, r.data, lineNo, file);
  // a fill after a vent would start from the vented tank, which the re-check's readings cannot say
  const vented = st.vents[st.vents.length - 1];
  if (vented)
    fault(
      { kind: 'vent-order', what: 'reading-after-vent', step: r.data.step, ventLine: vented.vent.line },
      file,
      lineNo,
    );
  // a second reading on a line off the hash chain: the line before it (a withdrawal) was removed. That is
  // a record altered after writing (the line-edited issue stands), not a format error: the later reading
  // stands, as the removed withdrawal had it
  const offChain = st.issues.some((i) => i.code === 'line-edited' && i.line === lineNo);
  if (st.byStep.has(r.data.step) && !offChain)
    fault({ kind: 'second-reading', step: r.data.step }, file, lineNo);
  const x = { ...r.data, line: lineNo };
  st.byStep.set(x.step, x);
  st.all.push(x);
}

function readCorrection(st: ReaderState, rec: Record<string, unknown>, lineNo: number, file: string): void {
  const r = correctionSchema().safeParse(rec);
  if (!r.success) bad(file, lineNo, 'correction', r.error.issues);
  checkCharge(st, r.data, lineNo, file);
  if (st.version >= 2) {
    const missing = !r.data.by
      ? 'by'
      : !r.data.reason?.trim()
        ? 'reason'
        : r.data.replaces_line === undefined
          ? 'replaces_line'
          : undefined;
    if (missing) fault({ kind: 'correction-incomplete', missing }, file, lineNo, missing);
  }
  const old = st.byStep.get(r.data.step) ?? null;
  if (!old || (r.data.replaces_line !== undefined && old.line !== r.data.replaces_line)) {
    st.issues.push({
      code: 'amend-target',
      line: lineNo,
      step: r.data.step,
      named: old ? (r.data.replaces_line ?? null) : null,
      inForce: old?.line ?? null,
    });
  }
  const x = { ...r.data, line: lineNo };
  st.byStep.set(x.step, x);
  st.all.push(x);
  st.amendments.push({
    kind: 'correction',
    step: x.step,
    line: lineNo,
    by: x.by ?? null,
    time: x.time,
    reason: x.reason ?? null,
    old,
    new: x,
  });
}

function readWithdraw(st: ReaderState, rec: Record<string, unknown>, lineNo: number, file: string): void {
  const r = withdrawSchema().safeParse(rec);
  if (!r.success) bad(file, lineNo, 'withdrawal', r.error.issues);
  const { byStep } = st;
  const old = byStep.get(r.data.step) ?? null;
  if (!old || old.line !== r.data.withdraws_line)
    st.issues.push({
      code: 'amend-target',
      line: lineNo,
      step: r.data.step,
      named: old ? r.data.withdraws_line : null,
      inForce: old?.line ?? null,
    });
  const later = Math.max(0, ...[...byStep.keys()].filter((x) => x > r.data.step));
  if (later) st.issues.push({ code: 'withdraw-not-last', line: lineNo, step: r.data.step, later });
  byStep.delete(r.data.step);
  st.amendments.push({
    kind: 'withdraw',
    step: r.data.step,
    line: lineNo,
    by: r.data.by,
    time: r.data.time,
    reason: r.data.reason ?? null,
    old,
    new: null,
  });
}

const EVENT_READERS: Readonly<Record<string, EventReader>> = {
  reading: readReading,
  correction: readCorrection,
  withdraw: readWithdraw,
  barometer(st, rec, lineNo, file) {
    const r = barometerSchema().safeParse(rec);
    if (!r.success) bad(file, lineNo, 'barometer reading', r.error.issues);
    st.barometer = { ...r.data, line: lineNo };
  },
  'start-pressure'(st, rec, lineNo, file) {
    const r = startSchema().safeParse(rec);
    if (!r.success) bad(file, lineNo, 'starting pressure', r.error.issues);
    if (st.all.length > 0) fault({ kind: 'start-after-reading' }, file, lineNo);
    st.start = { ...r.data, line: lineNo };
  },
  acknowledge(st, rec, lineNo, file) {
    const a = ackSchema().safeParse(rec);
    if (!a.success) bad(file, lineNo, 'acknowledgement', a.error.issues);
    st.acks.push({ ...a.data, line: lineNo });
  },
  vent(st, rec, lineNo, file) {
    const v = ventSchema().safeParse(rec);
    if (!v.success) bad(file, lineNo, 'vent', v.error.issues);
    st.vents.push({ vent: { ...v.data, line: lineNo }, readings: [] });
  },
  'vent-reading'(st, rec, lineNo, file) {
    const v = ventReadingSchema().safeParse(rec);
    if (!v.success) bad(file, lineNo, 'reading after venting', v.error.issues);
    const last = st.vents[st.vents.length - 1];
    if (!last)
      fault({ kind: 'vent-order', what: 'vent-reading-without-vent', step: v.data.step }, file, lineNo);
    last.readings.push({ ...v.data, line: lineNo });
  },
  'premix-mixed'(st, rec, lineNo, file) {
    const r = premixMixedSchema().safeParse(rec);
    if (!r.success) bad(file, lineNo, 'premix mixed', r.error.issues);
    st.premixMixed.push({ ...r.data, line: lineNo });
  },
  'premix-reading'(st, rec, lineNo, file) {
    const r = premixReadingSchema().safeParse(rec);
    if (!r.success) bad(file, lineNo, 'premix tank reading', r.error.issues);
    st.premixReadings.push({ ...r.data, line: lineNo });
  },
  close(st, rec, lineNo, file) {
    const c = closeSchema().safeParse(rec);
    if (!c.success) bad(file, lineNo, 'close', c.error.issues);
    st.closed = true;
    st.closeNote = c.data.note;
    st.closeTime = c.data.time;
  },
};

function parsedOf(st: ReaderState, file: string): ParsedLog {
  const header = st.header;
  if (!header) return fault({ kind: 'empty' }, file);
  const readings = [...st.byStep.values()].sort((a, b) => a.step - b.step);
  const warnings = st.issues.filter((i) => recordIssueSeverity(i) === 'warning').map(describeRecordIssue);
  return {
    file,
    header,
    version: st.version,
    readings,
    allReadings: [...st.all],
    amendments: [...st.amendments],
    barometer: st.barometer,
    start: st.start,
    acknowledgements: [...st.acks],
    vents: st.vents.map((v) => ({ ...v.vent, readings: [...v.readings] })),
    premixMixed: [...st.premixMixed],
    premixReadings: [...st.premixReadings],
    closed: st.closed,
    closeNote: st.closeNote,
    closeTime: st.closeTime,
    issues: [...st.issues],
    warnings,
    lines: st.complete,
    lastLink: st.link,
    bytes: st.bytes,
  };
}

function readText(text: string, file: string): ReaderState {
  const lines = text.split('\n');
  const endsClean = text.endsWith('\n') || text === '';
  const st = emptyReader();
  const limit = endsClean ? lines.length - 1 : lines.length;
  for (let i = 0; i < limit; i++) {
    if (i === lines.length - 1 && !endsClean) {
      st.issues.push({ code: 'torn-tail', line: i + 1, bytes: Buffer.byteLength(lines[i], 'utf8') });
      break;
    }
    readLine(st, lines[i], i + 1, file);
  }
  return st;
}

export function parseLog(text: string, file: string): ParsedLog {
  return parsedOf(readText(text, file), file);
}

export function readLog(file: string): ParsedLog {
  const text = readTextFile(file);
  return parseLog(text, file);
}

/** side files beside a log holding torn last lines that a fill moved aside */
export function tornSideFiles(logFile: string): string[] {
  const dir = dirname(logFile);
  const prefix = `${basename(logFile)}.torn-`;
  try {
    return readdirSync(dir)
      .filter((f) => f.startsWith(prefix))
      .sort()
      .map((f) => join(dir, f));
  } catch {
    return [];
  }
}

// ---------------------------------------------------------------- writing

/** write one line at the end of the log: every byte or none (a partial line is cut back off), then fsync */
function appendBytes(path: string, expectedBytes: number, text: string): void {
  let fd: number;
  try {
    fd = openSync(path, 'a');
  } catch (e) {
    return writeFailed(path, e, 'the event was NOT logged');
  }
  let size = expectedBytes;
  try {
    size = fstatSync(fd).size;
    if (size !== expectedBytes) fail({ code: 'log-changed', bytes: size, expectedBytes }, { file: path });
    writeAllSync(fd, Buffer.from(text, 'utf8'));
    fsyncSync(fd);
  } catch (e) {
    if (e instanceof ProblemError) {
      closeSync(fd);
      throw e;
    }
    let cutBack = false;
    try {
      ftruncateSync(fd, size);
      fsyncSync(fd);
      cutBack = true;
    } catch {
      // the torn line stays; it is moved aside when the log is next opened for a fill
    }
    try {
      closeSync(fd);
    } catch {
      // the write error is what is reported
    }
    const rest = cutBack
      ? 'the event was NOT logged (the log is as it was before)'
      : 'the event was NOT logged; a partial line may be left at the end of the log, ' +
        'and is moved aside when the fill is resumed';
    return writeFailed(path, e, rest);
  }
  try {
    closeSync(fd);
  } catch (e) {
    writeFailed(
      path,
      e,
      "the log could not be closed; the event was written and fsync'd, but check the disk",
    );
  }
}

/** writer rules beyond the schema: what a new event must carry */
function checkNew(event: NewLogEvent, file: string): void {
  if (event.kind === 'correction') {
    const missing = !event.by?.trim()
      ? 'by'
      : !event.reason?.trim()
        ? 'reason'
        : event.replaces_line === undefined
          ? 'replaces_line'
          : undefined;
    if (missing) fault({ kind: 'correction-incomplete', missing }, file, undefined, missing);
  }
}

/**
 * the log with one more event, as it would read: refuses (before anything is written) an
 * event the reader would refuse, or one that amends anything but the reading in force.
 * Only the new line is read: the state of the lines before is kept.
 */
function nextState(
  current: { st: ReaderState; file: string },
  event: NewLogEvent,
): { line: string; st: ReaderState; log: ParsedLog; chain: string } {
  const file = current.file;
  checkNew(event, file);
  const { text: line, chain: c } = lineFor(current.st.link, event);
  const st = cloneReader(current.st);
  const lineNo = st.complete + 1;
  readLine(st, line.slice(0, -1), lineNo, file);
  const fresh = st.issues.find((i) => 'line' in i && i.line === lineNo);
  if (fresh) fail(refusalOf(fresh), { file, line: lineNo });
  return { line, st, log: parsedOf(st, file), chain: c };
}

/** a record issue that a new line would bring, as the problem that refuses it */
function refusalOf(i: RecordIssue): Problem {
  switch (i.code) {
    case 'amend-target':
      return { code: 'amend-not-in-force', step: i.step, named: i.named, inForce: i.inForce };
    case 'withdraw-not-last':
      return { code: 'withdraw-not-last', step: i.step, later: i.later };
    default:
      // a fresh line is hashed by the writer and written whole: no other issue can arise
      throw new Error(`internal: a new log line has the record issue ${i.code}`);
  }
}

/**
 * Start a new log; refuses to touch an existing name. The header is written to a temporary
 * file (every byte, fsync), then hard-linked into place (the link fails if the name exists,
 * so there is no window in which a half-written header or an overwrite can happen).
 */
export function createLog(path: string, header: LogHeader): void {
  const exists = () => {
    try {
      lstatSync(path);
      return true;
    } catch {
      return false;
    }
  };
  const taken: Problem = { code: 'write-failed', cause: { kind: 'log-exists' } };
  if (exists()) fail(taken, { file: path });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  let fd: number | undefined;
  try {
    fd = openSync(tmp, 'wx');
    // every step's charge written out: a split source's charges are named in the record itself
    writeAllSync(fd, Buffer.from(lineFor('', withCharges(header)).text, 'utf8'));
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    linkSync(tmp, path);
    fsyncFolder(dirname(path) || '.');
  } catch (e) {
    if (fd !== undefined) {
      try {
        closeSync(fd);
      } catch {
        // reported below
      }
    }
    if ((e as NodeJS.ErrnoException).code === 'EEXIST' && exists()) fail(taken, { file: path });
    writeFailed(path, e, 'the batch log was not created');
  } finally {
    try {
      unlinkSync(tmp);
    } catch {
      // never created
    }
  }
}

/**
 * Append one event (its chain added) and fsync it before returning. Outside a guided fill
 * (tools, tests); the fill appends through the handle of openLogForFill, which holds the lock.
 * A log with a torn last line is refused here: open it for a fill to move the tail aside.
 */
export function appendEvent(path: string, event: NewLogEvent): { line: number; chain: string } {
  const text = readTextFile(path);
  const st = readText(text, path);
  parsedOf(st, path);
  const torn = st.issues.find((i) => i.code === 'torn-tail');
  if (torn) fail({ code: 'log-torn-tail', line: torn.line }, { file: path, line: torn.line });
  const next = nextState({ st, file: path }, event);
  appendBytes(path, st.bytes, next.line);
  return { line: next.st.complete, chain: next.chain };
}

// ---------------------------------------------------------------- the fill's handle and lock

/** what a lock file holds */
export interface LockInfo {
  readonly pid: number;
  readonly host: string;
  readonly started: string;
  /** Linux boot id: a lock from before a reboot is stale whatever its pid */
  readonly boot?: string;
}

export interface LogHandle {
  readonly path: string;
  readonly lockPath: string;
  /** the log as it stands, with every event appended through this handle */
  current(): ParsedLog;
  /**
   * append one event: checked against the log (a second reading for a step, a correction of
   * anything but the reading in force, a withdrawal of anything but the last reading are
   * refused before writing), every byte written, fsync'd; a write that fails throws a
   * `write-failed` ProblemError naming the path and cause, and the event is then not in the log
   */
  append(event: NewLogEvent): { line: number; chain: string };
  /** remove the lock (also done when the process exits) */
  release(): void;
}

export interface OpenedLog {
  readonly log: ParsedLog;
  readonly handle: LogHandle;
  /** what the operator must be told: a torn tail moved aside, a stale lock taken over */
  readonly messages: readonly string[];
}

function bootId(): string | undefined {
  try {
    return readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim() || undefined;
  } catch {
    return undefined;
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
  // a killed fill whose parent has not yet reaped it is a zombie: it answers signal 0 but
  // holds nothing (Linux: state Z or X in /proc/PID/stat; elsewhere the signal decides)
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const state = stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
    return state !== 'Z' && state !== 'X';
  } catch (e) {
    return (e as NodeJS.ErrnoException).code !== 'ENOENT';
  }
}

function readLock(lockPath: string): { text: string; info?: LockInfo } | undefined {
  let text: string;
  try {
    text = readFileSync(lockPath, 'utf8');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw e;
  }
  try {
    const o = JSON.parse(text) as LockInfo;
    if (Number.isInteger(o.pid) && typeof o.host === 'string' && typeof o.started === 'string')
      return { text, info: o };
  } catch {
    // an unreadable lock: reported by the caller
  }
  return { text };
}

function holderText(h: LockInfo): string {
  return `process ${h.pid} on host ${h.host}, started ${h.started}`;
}

const LOCK_ATTEMPTS = 4;

/** take the lock or refuse, naming its holder; a stale lock of a dead process on this host is taken over */
function acquireLock(lockPath: string, logPath: string, now: string): { info: LockInfo; message?: string } {
  const info: LockInfo = {
    pid: process.pid,
    host: nodeOs().hostname(),
    started: now,
    ...(bootId() ? { boot: bootId() } : {}),
  };
  let message: string | undefined;
  for (let attempt = 0; attempt < LOCK_ATTEMPTS; attempt++) {
    if (createLockFile(lockPath, info)) return { info, message };
    const held = readLock(lockPath);
    if (!held) continue;
    const h = held.info;
    if (!h) fail({ code: 'lock-unreadable', log: logPath, lockFile: lockPath }, { file: logPath });
    const rebooted = refuseLiveHolder(h, info, lockPath, logPath);
    if (!moveStaleLock(lockPath, held.text)) continue;
    message =
      `took over a stale lock: the fill of ${holderText(h)} is no longer running` +
      (rebooted ? ' (the computer was restarted since)' : '');
  }
  return fail({ code: 'lock-contended', lockFile: lockPath, attempts: LOCK_ATTEMPTS }, { file: logPath });
}

/** make the lock file with this fill's details, written in full and fsync'd; false if it exists */
function createLockFile(lockPath: string, info: LockInfo): boolean {
  let fd: number;
  try {
    fd = openSync(lockPath, 'wx');
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'EEXIST') return false;
    return fail(
      { code: 'lock-unwritable', lockFile: lockPath, stage: 'create', cause: writeCauseOf(e) },
      { file: lockPath },
    );
  }
  try {
    writeAllSync(fd, Buffer.from(JSON.stringify(info) + '\n', 'utf8'));
    fsyncSync(fd);
  } catch (e) {
    closeSync(fd);
    unlinkSync(lockPath);
    fail(
      { code: 'lock-unwritable', lockFile: lockPath, stage: 'write', cause: writeCauseOf(e) },
      { file: lockPath },
    );
  }
  closeSync(fd);
  return true;
}

/**
 * refuse a lock whose holder may still run (another host, this process, a live process here);
 * returns whether the holder's computer was restarted since it took the lock (then it is stale)
 */
function refuseLiveHolder(h: LockInfo, me: LockInfo, lockPath: string, logPath: string): boolean {
  const holder = { pid: h.pid, host: h.host, started: h.started };
  const locked = (held: 'another-host' | 'this-process' | 'running') =>
    fail({ code: 'log-locked', log: logPath, lockFile: lockPath, holder, held }, { file: logPath });
  if (h.host !== me.host) locked('another-host');
  const rebooted = h.boot !== undefined && me.boot !== undefined && h.boot !== me.boot;
  if (h.pid === process.pid && !rebooted) locked('this-process');
  if (!rebooted && alive(h.pid)) locked('running');
  return rebooted;
}

/**
 * move a stale lock aside by rename (atomic), and put it back if what was moved is not what
 * was judged (another fill took the name meanwhile); true when the stale lock is gone
 */
function moveStaleLock(lockPath: string, judged: string): boolean {
  const aside = `${lockPath}.stale-${process.pid}`;
  try {
    renameSync(lockPath, aside);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return false;
    throw e;
  }
  const moved = readLock(aside);
  if (moved?.text !== judged) {
    try {
      linkSync(aside, lockPath);
    } catch {
      // someone holds the name again; the loop reads it
    }
    unlinkSync(aside);
    return false;
  }
  unlinkSync(aside);
  return true;
}

function tornStamp(now: string): string {
  return (
    now
      .replace(/[-:]/g, '')
      .replace(/\.\d+/, '')
      .replace(/[^0-9A-Za-z]/g, '') || String(Date.now())
  );
}

/**
 * move an incomplete last line (no line feed) aside: the fragment is first written in full to
 * a side file beside the log (fsync), and only then cut off the log; returns the side file
 */
function moveTornTail(
  path: string,
  buf: Buffer,
  now: string,
): { side: string; bytes: number; line: number } | undefined {
  if (buf.length === 0 || buf[buf.length - 1] === 0x0a) return undefined;
  const cut = buf.lastIndexOf(0x0a) + 1;
  if (cut === 0) fail({ code: 'log-header-torn' }, { file: path });
  const fragment = buf.subarray(cut);
  let side = `${path}.torn-${tornStamp(now)}`;
  for (let n = 2; tornSideFiles(path).includes(side); n++) side = `${path}.torn-${tornStamp(now)}-${n}`;
  writeFileAtomic(side, fragment, false);
  let fd: number | undefined;
  try {
    fd = openSync(path, 'r+');
    ftruncateSync(fd, cut);
    fsyncSync(fd);
  } catch (e) {
    fail({ code: 'torn-tail-stuck', sideFile: side, cause: writeCauseOf(e) }, { file: path });
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
  const line = buf.subarray(0, cut).toString('utf8').split('\n').length;
  return { side, bytes: fragment.length, line };
}

/**
 * Open a batch log for a guided fill (new or resumed): take the exclusive lock (a second fill
 * on the same log is refused and told who holds it; a stale lock from a dead process on this
 * host, or from before a reboot, is taken over with a message), move a torn tail aside, read
 * the log. The lock is removed by release() or when the process exits.
 */
export function openLogForFill(path: string, opts: { now?: string } = {}): OpenedLog {
  const now = opts.now ?? new Date().toISOString();
  try {
    if (!lstatSync(path).isFile() && !lstatSync(path).isSymbolicLink())
      fail({ code: 'log-not-file' }, { file: path });
  } catch (e) {
    if (e instanceof ProblemError) throw e;
    const err = e as NodeJS.ErrnoException;
    if (err.code === 'ENOENT') fail({ code: 'log-not-found' }, { file: path });
    fail(
      { code: 'log-unopenable', errno: err.code ?? 'no error code', message: String(err.message ?? e) },
      { file: path },
    );
  }
  const lockPath = `${path}.lock`;
  const { info, message } = acquireLock(lockPath, path, now);
  let released = false;
  const release = () => {
    if (released) return;
    released = true;
    process.removeListener('exit', release);
    const held = readLock(lockPath);
    if (
      held?.info &&
      held.info.pid === info.pid &&
      held.info.started === info.started &&
      held.info.host === info.host
    ) {
      try {
        unlinkSync(lockPath);
      } catch {
        // gone already
      }
    }
  };
  process.once('exit', release);
  try {
    const messages: string[] = [];
    if (message) messages.push(message);
    const buf = readFileSync(path);
    const torn = moveTornTail(path, buf, now);
    if (torn)
      messages.push(
        `the last line of the log (line ${torn.line}, ${torn.bytes} bytes) was incomplete ` +
          `- cut off mid-write - and was moved to ${torn.side}; nothing in it was confirmed. ` +
          `The log now ends at line ${torn.line - 1}`,
      );
    const text = torn ? buf.subarray(0, buf.length - torn.bytes).toString('utf8') : buf.toString('utf8');
    const st = readText(text, path);
    let state = { st, file: path, log: parsedOf(st, path) };
    const handle: LogHandle = {
      path,
      lockPath,
      current: () => state.log,
      append(event) {
        if (released) fail({ code: 'log-released' }, { file: path });
        const next = nextState(state, event);
        appendBytes(path, state.st.bytes, next.line);
        state = { st: next.st, file: path, log: next.log };
        return { line: next.st.complete, chain: next.chain };
      },
      release,
    };
    return { log: state.log, handle, messages };
  } catch (e) {
    release();
    throw e;
  }
}
