/**
 * What the re-check renderers read: the report of `check` and the parts of a batch log a
 * label or certificate shows. Declared here, beside the renderers, so no renderer imports
 * the file-handling shell (src/io); src/io/check.ts builds a CheckReport and the parsed
 * batch log (src/io/batch-log.ts) fits LogView as it is.
 */
import type {
  CheckVerdict,
  CheckedReading,
  Design,
  ReadingTemperatures,
  Tolerance,
  UncertaintyResult,
} from '../core/index.js';

export type RecordSeverity = 'danger' | 'warning' | 'note';

/** a finding about the log as a record (a reading past a limit, an edited line), with its sentence */
export interface RecordFinding {
  readonly code: string;
  readonly severity: RecordSeverity;
  readonly step: number | null;
  readonly line: number | null;
  /** a finding on the record itself (an edited line, a torn tail) names its own issue code */
  readonly issue?: { readonly code: string };
  /** the sentence, worded once where the finding is made (describeLogFinding in the log audit) */
  readonly message: string;
}

/** a reading line of a batch log as it was written, with its line number */
export interface LoggedReading {
  readonly kind: 'reading' | 'correction';
  readonly step: number;
  readonly gauge: string;
  /** as shown on the gauge, with its unit */
  readonly reading: string;
  /** absolute tank pressure */
  readonly pressure_Pa: number;
  readonly temperature: string;
  readonly temperature_K: number;
  readonly time: string;
  readonly by?: string;
  readonly note?: string;
  readonly replaces_line?: number;
  readonly line: number;
}

/** who took a reading, and who corrected it where a correction is in force */
export interface ReadBy {
  /** the initials of who read the gauge; null: the line names nobody (an older log) */
  readonly by: string | null;
  /** the correction in force (its initials; null where it names nobody); null: not corrected */
  readonly corrected: { readonly by: string | null } | null;
}

/**
 * Who took the reading in force of a step and who corrected it: a correction's `by` is the
 * corrector's, so the reader is the `by` of the reading it replaced, through every correction
 * before it (each amendment's `old`); a chain that names no first reading leaves the reader null.
 */
export function readerOf(
  inForce: Pick<LoggedReading, 'kind' | 'by' | 'line'> | undefined,
  amendments: readonly Pick<AmendmentRecord, 'kind' | 'old' | 'new'>[],
): ReadBy {
  if (!inForce) return { by: null, corrected: null };
  if (inForce.kind !== 'correction') return { by: inForce.by ?? null, corrected: null };
  let first: Pick<LoggedReading, 'kind' | 'by' | 'line'> | null = inForce;
  const seen = new Set<number>();
  while (first?.kind === 'correction' && !seen.has(first.line)) {
    seen.add(first.line);
    const line: number = first.line;
    first = amendments.find((a) => a.kind === 'correction' && a.new?.line === line)?.old ?? null;
  }
  return {
    by: first?.kind === 'reading' ? (first.by ?? null) : null,
    corrected: { by: inForce.by ?? null },
  };
}

/** "AB", "AB; corrected by CD", "(not named); corrected (initials not logged)" */
export function readByText(r: ReadBy): string {
  const who = r.by ?? '(not named)';
  if (!r.corrected) return who;
  return `${who}; corrected ${r.corrected.by ? `by ${r.corrected.by}` : '(initials not logged)'}`;
}

/** a correction or a withdrawal, with what it replaced */
export interface AmendmentRecord {
  readonly kind: 'correction' | 'withdraw';
  readonly step: number;
  readonly line: number;
  readonly by: string | null;
  readonly time: string;
  readonly reason: string | null;
  /** the reading in force before, or null */
  readonly old: LoggedReading | null;
  /** the correcting reading; null for a withdrawal */
  readonly new: LoggedReading | null;
}

/** the report of `check` for one log or CSV; F is the record finding as its producer types it */
export interface CheckReportOf<F extends RecordFinding> {
  readonly file: string;
  readonly id: string;
  readonly kind: 'log' | 'csv';
  readonly readings: readonly CheckedReading[];
  /**
   * who took each reading (its `by`, the operator's initials), beside `readings`, and who corrected
   * it (readerOf: a correction's `by` is its corrector's, the reading's is the line it replaced);
   * `by` null where the line names nobody (an older log, a CSV row without a `by`)
   */
  readonly readBy?: readonly ReadBy[];
  readonly result: UncertaintyResult;
  readonly verdict: CheckVerdict;
  readonly design?: Design;
  readonly tolerance: Tolerance;
  readonly warnings: readonly string[];
  /** what is missing for a complete batch: planned steps without a reading, or design gases without a row */
  readonly incomplete: readonly string[];
  /**
   * the log as a record: readings past the working limit or a gauge's range (danger),
   * edited lines, text/number disagreements, torn tails
   */
  readonly findings: readonly F[];
  /** corrections and withdrawals, in the order logged (applied to the readings above) */
  readonly amendments: readonly AmendmentRecord[];
  /** the barometric pressure the re-check used, and where it came from */
  readonly barometer?: {
    readonly pressurePa: number;
    readonly uPa: number;
    readonly from: 'log' | 'plan' | 'lab';
    readonly by?: string;
    readonly time?: string;
    readonly text?: string;
  };
  /** a top-up: the gas already in the tank before the first fill */
  readonly start?: {
    readonly pressurePa: number;
    readonly temperatureK: number;
    readonly composition: Readonly<Record<string, number>>;
    readonly read: boolean;
    readonly by?: string;
    readonly time?: string;
  };
  /**
   * the tank the readings are checked against (working limit and rating, Pa, where known);
   * undefined when the re-check does not know it (CSV readings without --recipe or --tank)
   */
  readonly tank?: {
    readonly id: string;
    readonly ratedPa?: number;
    readonly limitPa?: number;
    readonly from: 'log' | 'recipe' | '--tank';
  };
  /** what stands beside the verdict: a danger in the record, an edited record */
  readonly caveats: readonly string[];
  /**
   * danger findings of the plan that nobody is recorded as having acknowledged: a log without an
   * `acknowledge` line of the code (a log not written by the guided fill, or the line missing), or
   * CSV readings against a recipe whose plan has dangers (a CSV records no acknowledgement). Never a
   * pass: the verdict says PLAN DANGER NOT ACKNOWLEDGED (exit 6, as an accepted hazard)
   */
  readonly planDangersNotAcknowledged?: readonly PlanDanger[];
  /**
   * the safety review of the fill as recorded (the states after each reading and each fill's path,
   * by the planner's own review): what it found, and the order filled against the plan's
   */
  readonly recordedFill?: RecordedFill;
  /**
   * the dangers of that review that the record does not show accepted (the guided fill's
   * acknowledgement of that danger): never a pass, DANGER IN THE RECORDED FILL (exit 6)
   */
  readonly recordedFillDangers?: readonly PlanDanger[];
  /**
   * the record itself (a log; absent for CSV readings): the lines that do not match their hash
   * chain (changed after writing, or not written by mixwright), and whether the fill was closed.
   * An altered record leads the verdict ("RECORD ALTERED AFTER WRITING - not a pass"), never a pass.
   */
  readonly record?: {
    readonly alteredLines: readonly number[];
    readonly closed: boolean;
    /** the guided fill went on through hazards its review found and the plan did not have */
    readonly acceptedHazards?: readonly AcceptedHazard[];
  };
  /**
   * the tank vented back after the last reading (a log with a vent line, or an older log whose close
   * note says so): venting keeps the composition above, but the tank's final pressure and amount are
   * those read after venting; without such a reading they are not known
   */
  readonly vent?: VentRecordOf;
  /** the premix logs the batch drew from, each re-checked (absent or empty: none) */
  readonly premixLogs?: readonly {
    /** as the batch log (or --premix-log) names it */
    readonly log: string;
    readonly path: string;
    /** the premix batch's id and tank */
    readonly id: string;
    readonly tank: string;
    readonly lastEntrySha256: string;
    /** re-checked mole fractions and standard uncertainties */
    readonly composition: Readonly<Record<string, { readonly value: number; readonly u: number }>>;
  }[];
  /**
   * the stage of a two-stage preparation the log records (header `stage`; absent: a single-tank
   * batch): stage 1 the premix of `batch`, with the command of stage 2; stage 2 the batch, with
   * the premix log it was filled from
   */
  readonly stage?: {
    readonly number: 1 | 2;
    readonly of: 2;
    readonly batch: string;
    readonly nextCommand?: string;
    readonly premixLog?: string;
  };
  /**
   * stage 2: the premix tank's checks before the first fill from it, as logged, in log order (the
   * premix confirmed mixed; the premix tank read against the minimum the batch needs, refused ones
   * too); absent or empty: none logged
   */
  readonly premixChecks?: readonly PremixCheckRecord[];
  /**
   * premix logs the batch log names that could not be re-checked (missing, changed since the batch
   * recorded them, or not usable; `label` only, as `check` refuses such a log): the composition then
   * uses the premix as the batch log recorded it, without the premix's uncertainty, and is never
   * shown as a checked result
   */
  readonly premixNotChecked?: readonly {
    /** as the batch log names it */
    readonly log: string;
    /** the premix's source id in the batch log, e.g. "premix-MT-2" */
    readonly source: string;
    /** the premix tank, where the batch log names it */
    readonly tank: string;
    /** why, in a few words for the label ("its log is missing or unreadable") */
    readonly short: string;
    /** why, as the refusal words it */
    readonly why: string;
  }[];
}

/** a vent of the tank after its last reading, and the tank as read after it */
export interface VentRecordOf {
  /** the fill after whose reading the tank was vented */
  readonly step: number;
  /** the vent's log line (null: only an older log's close note says so) */
  readonly line: number | null;
  readonly by?: string;
  readonly time?: string;
  /** the vent target shown at the manifold, absolute, Pa */
  readonly targetPa?: number;
  /** the tank before venting: the last reading in force */
  readonly before: {
    readonly pressurePa: number;
    readonly temperatureK: number;
    readonly amountMol?: number;
  };
  /** the tank read after venting (the last such reading); absent: the pressure after venting was not read */
  readonly after?: {
    readonly pressurePa: number;
    readonly temperatureK: number;
    /** as shown on the gauge, with its unit */
    readonly text: string;
    readonly gauge: string;
    readonly by: string;
    readonly time: string;
    readonly line: number;
    /** the amount in the tank (tank volume x the virial density of the composition at P, T) */
    readonly amountMol?: number;
  };
}

export type CheckReport = CheckReportOf<RecordFinding>;

/** the parts of a parsed batch log that the label and the certificate show */
export interface LogView {
  readonly header: {
    readonly created: string;
    readonly lab: string;
    readonly tank: {
      readonly id: string;
      readonly volume_m3: number;
      readonly rated_pressure_Pa: number | null;
    };
    readonly barometer: { readonly pressure_Pa: number; readonly u_Pa: number };
    readonly thermometer: { readonly u_K: number; readonly resolution_K: number };
    readonly recipe?: unknown;
    /** the batch's own design and planned final pressure (its title is made of them) */
    readonly design: {
      readonly composition: Readonly<Record<string, number>>;
      readonly phi: number | null;
      readonly diluent: readonly string[];
      readonly diluent_fraction: number;
    };
    readonly final_pressure_Pa: number;
    /** the planned fills (the charge of a split source: logged, or counted from the sources) */
    readonly steps?: readonly {
      readonly step: number;
      readonly source: string;
      readonly charge?: { readonly number: number; readonly of: number };
    }[];
    readonly findings?: readonly {
      readonly severity: RecordSeverity;
      readonly code: string;
      readonly step: number | null;
      readonly message: string;
    }[];
  };
  /** the reading in force for each step, in step order */
  readonly readings: readonly LoggedReading[];
  readonly acknowledgements: readonly {
    readonly code: string;
    readonly step: number | null;
    readonly by: string;
    readonly time: string;
    readonly note?: string;
    /** `went-on-below-band`: the reading the fill was left at (a choice, not an acceptance of a hazard) */
    readonly below?: { readonly reading: string };
  }[];
  /** the vents of the tank (a reading past the working limit), each with the readings after it */
  readonly vents?: readonly {
    readonly step: number;
    readonly line: number;
    readonly target_Pa: number;
    readonly by: string;
    readonly time: string;
    readonly readings: readonly {
      readonly gauge: string;
      readonly reading: string;
      readonly pressure_Pa: number;
      readonly temperature_K: number;
      readonly by: string;
      readonly time: string;
      readonly line: number;
    }[];
  }[];
  readonly closed: boolean;
}

/**
 * An operator's choice to go on through hazards: at the guided fill's review of the re-targeted
 * remaining fills, hazards the plan did not have (an `acknowledge` line with `review.outcome`
 * accepted; `found` "review"), or the plan's own danger findings, accepted on the fill's danger
 * screen before filling (plain `acknowledge` lines of the plan's codes; `found` "plan")
 */
export interface AcceptedHazard {
  /** who found the hazards: the plan's safety review, or the fill's review of its re-targeted remainder */
  readonly found: 'plan' | 'review';
  /** the fill the review stopped before (null: the plan's dangers, accepted before the fills went on) */
  readonly step: number | null;
  readonly by: string;
  readonly time: string;
  readonly hazards: readonly {
    readonly code: string;
    readonly step: number | null;
    readonly severity: RecordSeverity;
  }[];
}

/** a danger finding of the plan, by its code and the fill it concerns */
/** a finding of the review of the fill as recorded, with its sentence */
export interface RecordedFillFinding {
  readonly severity: RecordSeverity;
  readonly code: string;
  readonly step: number | null;
  readonly message: string;
  /** the record shows it accepted (the guided fill's acknowledgement of that danger or hazard) */
  readonly accepted: boolean;
}

/** the safety review of the fill as recorded (core/recorded-review.ts) */
export interface RecordedFill {
  /** the span of the readings' temperatures: each state is reviewed at its own, each fill's path at the warmer end */
  readonly temperatures: ReadingTemperatures;
  /** the sources in the order their readings were recorded */
  readonly order: readonly string[];
  /** the sources in the order of the plan (the recipe's, or the log's steps); absent without one */
  readonly plannedOrder?: readonly string[];
  /** its danger and warning findings */
  readonly findings: readonly RecordedFillFinding[];
  /** its notes, by code and fill ("oxygen-service (fill 3)"), not worded */
  readonly notes: readonly string[];
}

export interface PlanDanger {
  readonly code: string;
  readonly step: number | null;
}

/** "detonable-state (fill 3)" */
export const dangerList = (ds: readonly PlanDanger[]): string =>
  ds.map((z) => `${z.code}${z.step ? ` (fill ${z.step})` : ''}`).join(', ');

/** "flammable-state (fill 3), closed-vessel-pressure (fill 3)" */
export const hazardList = (a: AcceptedHazard): string =>
  a.hazards.map((z) => `${z.code}${z.step ? ` (fill ${z.step})` : ''}`).join(', ');

/** stage 2: a check of the premix tank before the first fill from it, as the batch log holds it */
export type PremixCheckRecord =
  | {
      readonly kind: 'mixed';
      readonly line: number;
      readonly tank: string;
      readonly by: string;
      readonly time: string;
      readonly note?: string;
      /**
       * confirmed before the least mixing time since the premix log closed (elapsed and asked, s; the
       * mixing asked, and when the premix log closed)
       */
      readonly early?: {
        readonly elapsedS: number;
        readonly neededS: number;
        readonly stirred?: boolean;
        readonly closed?: string;
      };
    }
  | {
      readonly kind: 'reading';
      readonly line: number;
      readonly tank: string;
      readonly gauge: string;
      /** as typed, with its unit */
      readonly reading: string;
      /** absolute premix-tank pressure, and the minimum the batch needs (absolute), Pa */
      readonly pressurePa: number;
      readonly minimumPa: number;
      /** at or above the minimum: the fill went on to draw from the premix; below it, it did not */
      readonly enough: boolean;
      /** the gauge's unit, for display */
      readonly unit: string;
      readonly by: string;
      readonly time: string;
      readonly note?: string;
    };

/** "35 s", "15 min", "2.0 h" */
function minutes(s: number): string {
  if (s < 90) return `${Math.max(0, Math.round(s))} s`;
  if (s < 5400) return `${Math.round(s / 60)} min`;
  return `${(s / 3600).toFixed(1)} h`;
}

/**
 * the note the guided fill logs with `mixed INITIALS` ("the premix in MT-2 was stirred ...; confirmed by
 * AB; 33 s since the premix log was closed (T), less than the stirring 15 min asked: confirmed as mixed
 * early by AB") less what the line before it says already: who confirmed it, and, drawn early, the time
 * since the premix log closed and the least asked. Any other text of the note is kept as logged.
 */
function mixedNoteBeyond(note: string, by: string, early: boolean): string {
  return note
    .split('; ')
    .filter((c) => c !== `confirmed by ${by}` && !(early && /since the premix log was closed \(/.test(c)))
    .join('; ');
}

/**
 * a premix check in words, the one wording of `check` and the certificate: "MT-2 read 600.0 Torr on
 * head-10kT (600.0 Torr absolute) by AB at T (line 3): BELOW the minimum 621.7 Torr absolute ..."
 */
export function premixCheckText(c: PremixCheckRecord, show: (pa: number, unit: string) => string): string {
  if (c.kind === 'mixed') {
    const e = c.early;
    const note = c.note && mixedNoteBeyond(c.note, c.by, Boolean(e));
    // the guided fill logs "confirmed as mixed early by AB" only after saying the time was short
    const knowingly = e && c.note?.includes(`confirmed as mixed early by ${c.by}`);
    const asked =
      e && `${minutes(e.neededS)}${e.stirred === undefined ? '' : e.stirred ? ' of stirring' : ' of rest'}`;
    return (
      `premix in ${c.tank} confirmed mixed${knowingly ? ' early' : ''} by ${c.by} at ${c.time} (line ${c.line})` +
      (e
        ? ` - DRAWN EARLY: ${minutes(e.elapsedS)} after the premix log closed` +
          `${e.closed ? ` (${e.closed})` : ''}, short of the least asked, ${asked}; the re-check assumes a ` +
          `uniform premix, which nothing shows here`
        : '') +
      (note ? `${e ? '; as logged' : ''}: ${note}` : '')
    );
  }
  return (
    `premix tank ${c.tank} read ${c.reading} on ${c.gauge} (${show(c.pressurePa, c.unit)} absolute) by ${c.by} ` +
    `at ${c.time} (line ${c.line}), against the minimum ${show(c.minimumPa, c.unit)} absolute the batch ` +
    `needs: ` +
    (c.enough
      ? 'enough, the fill went on to draw from it'
      : 'BELOW the minimum, refused: the fill did not draw from it on this reading') +
    (c.note ? ` (${c.note})` : '')
  );
}
