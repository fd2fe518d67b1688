/**
 * Invalid input as data. The core and the shells raise a Problem with a code and
 * its particulars; core/messages.ts turns it into the one sentence that the CLI,
 * the wizard and the printed sheet all show.
 */

export interface Where {
  /** file path, when the input came from a file */
  readonly file?: string;
  readonly line?: number;
  readonly column?: number;
  /** the field or option, e.g. "design.phi" or "--phi" */
  readonly field?: string;
}

export type Problem =
  | { readonly code: 'unknown-species'; readonly name: string; readonly suggestions: readonly string[] }
  | {
      readonly code: 'not-positive';
      readonly what: string;
      readonly value: number;
      /** what the user typed, shown instead of the SI value */ readonly text?: string;
    }
  | {
      readonly code: 'out-of-range';
      readonly what: string;
      readonly value: number;
      readonly allowed: string;
      /** what the user typed, shown instead of the value */ readonly text?: string;
    }
  | {
      readonly code: 'wrong-dimension';
      readonly text: string;
      readonly expected: string;
      readonly got: string;
    }
  | {
      readonly code: 'bad-quantity';
      readonly text: string;
      readonly expected: string;
      readonly fault: QuantityFault;
      /** the field reads a bare number in this unit (a reading in the gauge's unit) */
      readonly bareUnit?: string;
    }
  | { readonly code: 'order-missing'; readonly missing: readonly string[] }
  | { readonly code: 'order-repeated'; readonly repeated: readonly string[] }
  | {
      readonly code: 'order-unknown';
      readonly unknown: readonly string[];
      readonly choices: readonly string[];
    }
  | { readonly code: 'fractions-sum'; readonly sum: number }
  | { readonly code: 'unknown-key'; readonly key: string; readonly allowed: readonly string[] }
  | {
      readonly code: 'name-too-long';
      readonly what: string;
      readonly start: string;
      readonly length: number;
      readonly limit: number;
    }
  | { readonly code: 'file-too-large'; readonly bytes: number; readonly limitBytes: number }
  | { readonly code: 'needs-barometer'; readonly text: string; readonly field: string }
  | {
      readonly code: 'unknown-reference';
      readonly kind: string;
      readonly id: string;
      readonly choices: readonly string[];
    }
  /**
   * a CSV reading that no gauge of the lab profile reads, and no gauge column names one; `unitSlip`:
   * the row read in the other rows' unit would fit the fill (io/readings-csv.ts), in words
   */
  | { readonly code: 'no-gauge'; readonly pressurePa: number; readonly unitSlip?: string }
  /** an option of `check` that only a CSV of readings needs: a batch log carries it */
  | { readonly code: 'option-for-csv-only'; readonly option: string; readonly logCarries: string }
  | { readonly code: 'no-equilibrium-data'; readonly species: readonly string[] }
  | { readonly code: 'equilibrium-not-converged'; readonly what: string }
  /**
   * a file not written in full, or a write refused (disk full, I/O error, short write, no
   * permission, name taken); `outcome` says what happened to the data, e.g. "the event was
   * not logged"
   */
  | { readonly code: 'write-failed'; readonly cause: WriteCause; readonly outcome?: string }
  /**
   * an iterative computation stopped without meeting its tolerance; `computation` names it
   * (e.g. "fill amounts", "density from pressure"), `residual` is what was left of the error
   */
  | {
      readonly code: 'not-converged';
      readonly computation: string;
      readonly iterations: number;
      readonly residual: number;
      readonly tolerance: number;
    }
  // raised by the batch log and the guided fill
  /** another guided fill (another process, here or on another host) holds the batch log */
  | {
      readonly code: 'log-locked';
      readonly log: string;
      readonly lockFile: string;
      readonly holder: LockHolder;
      /**
       * another-host: whether it still runs cannot be checked from here; this-process: this very
       * program has the log open for a fill already; running: a live process on this host
       */
      readonly held: 'another-host' | 'this-process' | 'running';
    }
  /** a batch log line that breaks the log format, typed by its fault (the code stays `schema`) */
  | { readonly code: 'schema'; readonly log: LogFault }
  /** the log's size on disk is not what this fill read and wrote: another program wrote to it */
  | { readonly code: 'log-changed'; readonly bytes: number; readonly expectedBytes: number }
  /** the log's last line is incomplete (cut off mid-write); only a resumed fill moves it aside */
  | { readonly code: 'log-torn-tail'; readonly line: number }
  /** the log holds no complete line: its header was cut off mid-write */
  | { readonly code: 'log-header-torn' }
  /** a torn last line was saved to a side file, but cutting it off the log failed */
  | { readonly code: 'torn-tail-stuck'; readonly sideFile: string; readonly cause: WriteCause }
  /** an append through a fill's handle after the fill released the log */
  | { readonly code: 'log-released' }
  /** the lock file of a fill could not be made or written; no fill was started */
  | {
      readonly code: 'lock-unwritable';
      readonly lockFile: string;
      readonly stage: 'create' | 'write';
      readonly cause: WriteCause;
    }
  /** a lock file beside the log that cannot be read: another fill may hold the log */
  | { readonly code: 'lock-unreadable'; readonly log: string; readonly lockFile: string }
  /** the lock kept being taken by other fills while this one tried to take it */
  | { readonly code: 'lock-contended'; readonly lockFile: string; readonly attempts: number }
  /** the batch log to open for a fill is not there, or not a regular file, or cannot be opened */
  | { readonly code: 'log-not-found' }
  | { readonly code: 'log-not-file' }
  | { readonly code: 'log-unopenable'; readonly errno: string; readonly message: string }
  /** a correction or withdrawal that names anything but the reading in force for its step */
  | {
      readonly code: 'amend-not-in-force';
      readonly step: number;
      readonly named: number | null;
      readonly inForce: number | null;
    }
  /** a withdrawal of a reading that is not the last one (a later step was filled after it) */
  | { readonly code: 'withdraw-not-last'; readonly step: number; readonly later: number }
  /** Enter on an empty reading field */
  | { readonly code: 'reading-missing'; readonly expected: string; readonly bareUnit?: string }
  // raised by the re-check
  /** a log's reading names a source or gauge that its header does not list */
  | {
      readonly code: 'record-unknown-id';
      readonly kind: 'source' | 'gauge';
      readonly id: string;
      readonly step: number;
    }
  /** a logged reading is not above the one before it (or above a top-up's starting pressure) */
  | {
      readonly code: 'reading-not-rising';
      readonly step: number;
      readonly pressurePa: number;
      readonly previousPa: number;
      readonly afterStart: boolean;
    }
  /**
   * the inverse model found a fill that does not raise the tank's density: reading `reading`
   * (1-based) at `pressurePa`; `inUncertainty`: it happened in a perturbed evaluation
   */
  | {
      readonly code: 'density-not-rising';
      readonly reading: number;
      readonly pressurePa: number;
      readonly inUncertainty: boolean;
    }
  /** a batch log holds no readings */
  | { readonly code: 'log-no-readings' }
  /** a readings CSV holds no header (empty or comments only) */
  | { readonly code: 'csv-empty' }
  | { readonly code: 'csv-missing-column'; readonly column: string; readonly optional: readonly string[] }
  | { readonly code: 'csv-field-count'; readonly got: number; readonly expected: number }
  /** a CSV row's pressure (as typed) is not above the row before */
  | {
      readonly code: 'csv-not-rising';
      readonly text: string;
      /** the reading in Torr, where typed in another unit (the two compared in one unit) */
      readonly torr?: string;
      /** the row before, as typed, with its line; `cause`: the likely cause and what to do, worded by io */
      readonly previous?: { readonly line: number; readonly text: string; readonly torr?: string };
      readonly cause?: string;
    }
  | { readonly code: 'csv-no-rows' }
  /** a CSV row names a species that the recipe's plan does not fill */
  | {
      readonly code: 'csv-species-not-filled';
      readonly species: string;
      readonly recipe: string;
      readonly fills: readonly string[];
      /** the name is a premix's gases ("Ar+O2") and no --premix-log was given */
      readonly premixLogMissing?: boolean;
    }
  // raised by the command line and recipe files
  /** a file that cannot be read, and why */
  | { readonly code: 'file-unreadable'; readonly cause: ReadCause }
  /** a YAML file the parser refuses, or one whose data cannot be used */
  | { readonly code: 'yaml-syntax'; readonly fault: YamlFault }
  /** a species list ("CH4:0.8,C2H6:0.2") that cannot be read */
  | { readonly code: 'bad-list'; readonly text: string; readonly fault: ListFault }
  /** a number option (--phi, --days, --trials, ...) that is not a number, or too large for one */
  | { readonly code: 'not-a-number'; readonly text: string }
  | { readonly code: 'number-too-large'; readonly text: string }
  /**
   * a command line the parser refuses (an unknown option, a missing argument or option value, a value
   * outside an option's choices): `text` as the parser words it, e.g. "unknown option '--bogus'"
   */
  | { readonly code: 'usage'; readonly text: string }
  /** an option given twice, e.g. --phi 1 --phi 0.5 (values), or --json --json (a flag: no values) */
  | {
      readonly code: 'option-repeated';
      readonly option: string;
      readonly first?: string;
      readonly second?: string;
    }
  /** a value option whose value is another of the command's options: `--recipe --json` */
  | {
      readonly code: 'option-value-missing';
      readonly option: string;
      /** what the option takes, e.g. "a file" */
      readonly needs: string;
      /** the option found where the value belongs */
      readonly got: string;
    }
  /** explicit fractions together with a phi design */
  | { readonly code: 'options-exclusive'; readonly option: string; readonly others: readonly string[] }
  /** a plan from options alone that lacks some: the options (or groups) to give */
  | { readonly code: 'options-missing'; readonly missing: readonly string[] }
  /** the sheet's format cannot be told from the output's extension */
  | {
      readonly code: 'format-unknown';
      readonly file: string;
      readonly extension: string;
      readonly known: readonly string[];
    }
  /** --format and the output's extension disagree */
  | { readonly code: 'format-mismatch'; readonly format: string; readonly extension: string }
  /** a PDF goes to a file only; `example` is the file name to suggest */
  | { readonly code: 'pdf-needs-file'; readonly example: string }
  /** no Chromium to print a PDF with */
  | { readonly code: 'pdf-no-browser' }
  /** Chromium ran but wrote no PDF: its exit status and its own error lines */
  | { readonly code: 'pdf-not-made'; readonly status: number | null; readonly detail: string }
  /** `ready` lacks a property of the tank that neither an option nor the lab profile gives */
  | { readonly code: 'tank-data-missing'; readonly quantity: 'height' | 'leak-rate' | 'base-vacuum' }
  /** an interactive command run where stdin and stdout are not a terminal */
  | { readonly code: 'needs-terminal'; readonly command: 'fill' | 'wizard' }
  | { readonly code: 'resume-with-recipe' }
  /**
   * a closed batch log given to --resume: `made` of `of` fills logged when it was closed (fewer: it was
   * stopped before its last fill), and the close line's note
   */
  | { readonly code: 'log-closed'; readonly made?: number; readonly of?: number; readonly note?: string }
  /** a batch id that cannot be a file name */
  | { readonly code: 'bad-batch-id'; readonly id: string }
  /** `fill --by` given something other than initials (1-6 letters) */
  | {
      readonly code: 'bad-initials';
      readonly text: string;
      /** true: a CSV reading's `by` column (else the fill's --by) */
      readonly column?: boolean;
    }
  /** `check FOLDER` on a folder without logs or readings */
  | { readonly code: 'no-logs-in-folder' }
  /** `label` given something other than one batch log */
  | { readonly code: 'label-needs-log' }
  | { readonly code: 'unknown-schema'; readonly name: string; readonly choices: readonly string[] }
  /** an id used twice among the tanks, reactors, gauges and cylinders of a lab profile */
  | {
      readonly code: 'duplicate-id';
      readonly id: string;
      /** where the id was first used: its line (when the profile is a file) and field */
      readonly first?: { readonly line?: number; readonly field: string };
    }
  /** a thermometer uncertainty or resolution not in K or mK */
  | { readonly code: 'bad-temperature-difference'; readonly text: string }
  /** recipe fields that exclude each other */
  | { readonly code: 'rating-with-lab-tank'; readonly tank: string }
  | { readonly code: 'pressure-and-count' }
  | { readonly code: 'dilution-measures'; readonly given: readonly string[] }
  /** recipe fields missing */
  | { readonly code: 'working-fraction-without-rating' }
  | { readonly code: 'tank-or-volume-missing'; readonly tanks: readonly string[] }
  | { readonly code: 'pressure-missing' }
  | { readonly code: 'reactor-incomplete' }
  | { readonly code: 'reactor-missing' }
  | { readonly code: 'diluent-amount-missing' }
  /** a recipe or lab-profile field that its format refuses (the schema's verdict, in our words) */
  | { readonly code: 'invalid-field'; readonly field: string; readonly issue: FieldIssue }
  // raised by the planner
  | PlannerProblem
  // raised by the planner's split charges (a source filled in more than one charge)
  | ChargeProblem
  // raised by the fill order (charges and their stops)
  | {
      readonly code: 'order-stop';
      /** the order entry as typed, e.g. "Ar@400 Torr" */
      readonly entry: string;
      readonly fault: StopFault;
    }
  // raised by the re-check of readings (how a CSV row names its source)
  /** a CSV name that fits more than one source: the choices as "id (label)" */
  | { readonly code: 'csv-name-ambiguous'; readonly name: string; readonly choices: readonly string[] }
  /** a CSV row naming a gas that is filled only as part of a premix: the premixes as "id (label)" */
  | { readonly code: 'csv-name-in-premix'; readonly name: string; readonly premixes: readonly string[] }
  // raised by two-stage preparation (plan/two-stage.ts)
  | {
      readonly code: 'two-stage-refused';
      readonly kind: 'same-tank';
      readonly tank: string;
    }
  | { readonly code: 'two-stage-refused'; readonly kind: 'no-diluent' }
  | {
      readonly code: 'two-stage-refused';
      readonly kind: 'no-plan';
      readonly tried: number;
      /** the first choice's refusal */
      readonly cause?: Problem;
    }
  // raised by a batch planned or checked from a premix log (plan/premix-log.ts, io/premix-check.ts)
  | {
      readonly code: 'premix-log-refused';
      /** the premix log as named (recipe, option or batch log header) */
      readonly log: string;
      readonly cause: PremixLogCause;
    }
  // raised by the guided fill of a two-stage preparation (cli/stage-fill.ts) and the fill order of one
  | StageProblem
  // a readings CSV row naming the premix of an earlier stage without its log (io/csv-names.ts)
  | {
      readonly code: 'csv-premix-needs-log';
      /** the name as the row gives it ("premix-MT-2") */
      readonly name: string;
      /** the premix tank the name points to, and whether the lab profile lists it */
      readonly tank: string;
      readonly tankKnown: boolean;
      /** the premix the --premix-log given is of, when one was given (another premix) */
      readonly given?: string;
    };

/**
 * Two-stage preparation at the manifold: a stage fill that cannot start (`stage-fill`, its
 * `cause` typed), and a fill order given with a premix tank (`stage-order`). Worded in
 * core/stage-words.ts.
 */
export type StageProblem =
  | { readonly code: 'stage-order'; readonly premixTank: string; readonly order: string }
  | { readonly code: 'stage-fill'; readonly cause: StageFillCause };

/** why a stage of a two-stage fill cannot start */
export type StageFillCause =
  /** the stage's log exists already: a fill of it was started (resume it, or give another batch id) */
  | {
      readonly kind: 'log-exists';
      readonly stage: 1 | 2;
      readonly file: string;
      /** the log is closed (the fill finished): it cannot be resumed */
      readonly closed?: boolean;
      /** a closed premix log's stage-2 command, as its header records it */
      readonly next?: string;
    }
  /** the premix tank, filled as planned, would fall below what the batch must reach (Pa, absolute) */
  | {
      readonly kind: 'premix-low';
      readonly tank: string;
      readonly startPa: number;
      readonly endPa: number;
      readonly targetPa: number;
      readonly requiredPa: number;
    }
  /** the premix log differs from the one the batch was started from (its sha256) */
  | {
      readonly kind: 'premix-changed';
      readonly file: string;
      readonly expected: string;
      readonly found: string | null;
    };

/** why a premix log cannot be the batch's source (or the source its batch log names) */
export type PremixLogCause =
  /** the file cannot be read as a batch log: the reader's own problem */
  | { readonly kind: 'unreadable'; readonly problem: Problem }
  /** steps without a reading, or no close event */
  | { readonly kind: 'not-finished'; readonly missingSteps: readonly number[]; readonly closed: boolean }
  /** the log drew from its own premix before that premix's least mixing time (confirmed mixed early) */
  | { readonly kind: 'drawn-early' }
  /** its re-check fails, or cannot show its composition within its own tolerance */
  | {
      readonly kind: 'recheck-not-passed';
      readonly verdict: 'fail' | 'pass-uncertain';
      /** the species (and phi, dilution) out of tolerance or not shown within it */
      readonly off: readonly string[];
    }
  /** its record carries a danger (a reading past the tank's working limit or a gauge's range) */
  | { readonly kind: 'danger'; readonly codes: readonly string[] }
  /** the premix tank would fall below the batch reading its last charge must reach (plus the margin) */
  | {
      readonly kind: 'too-little-gas';
      readonly tank: string;
      /** the premix tank's present pressure (its last reading less the draws of other batches), Pa */
      readonly startPa: number;
      /** its settled pressure after this batch's draw, Pa (0: it runs empty) */
      readonly endPa: number;
      readonly targetPa: number;
      readonly requiredPa: number;
      readonly deliveredMol: number;
    }
  /** the premix holds a gas the design does not */
  | { readonly kind: 'foreign-gas'; readonly species: readonly string[]; readonly design: readonly string[] }
  /** the premix tank is the batch tank */
  | { readonly kind: 'same-tank'; readonly tank: string }
  /** a given fill order that does not name the premix */
  | { readonly kind: 'not-in-order'; readonly source: string }
  /** the log's last entry is not the one the batch log recorded */
  | { readonly kind: 'changed'; readonly recorded: string; readonly now: string }
  /** a premix log that names, through its own premix logs, the log that names it */
  | { readonly kind: 'loop' }
  /** a premix log asked for together with a premix to make (its tank, gases, fraction, pressure or order) */
  | { readonly kind: 'with-premix-tank'; readonly places: readonly [string, string] }
  /** lines that do not match the log's hash chain: the record was changed after it was written */
  | { readonly kind: 'record-altered'; readonly lines: readonly number[] }
  /**
   * its record stands against a pass though its composition is within tolerance (check's outcome, exit
   * 6): the plan's dangers with no acknowledgement, a danger in the fill as recorded not shown accepted,
   * or hazards the fill went on through (accepted at the manifold); `by`: who accepted them, when
   */
  | {
      readonly kind: 'not-a-pass';
      readonly outcome: 'plan-danger-not-acknowledged' | 'recorded-fill-danger' | 'accepted-hazard';
      readonly hazards: readonly { readonly code: string; readonly step: number | null }[];
      readonly by?: readonly string[];
    }
  /**
   * CSV readings: a --premix-log given, but no row draws from that premix (each row names a cylinder,
   * a gas or another premix), so its re-checked composition and budget would go unused
   */
  | {
      readonly kind: 'not-drawn';
      /** the readings file */
      readonly file: string;
      /** the names a row may give the premix: its source id (`premix-MT-2`) and its fill label (`Ar+O2`) */
      readonly names: readonly string[];
      /** the distinct names the rows give, in their order */
      readonly rows: readonly string[];
    }
  /**
   * CSV readings: the --premix-log given is not the log of the premix a row names (the log of
   * another tank's premix, or a batch log: a single-tank batch, or a batch filled from a premix)
   */
  | {
      readonly kind: 'not-the-premix';
      /**
       * the row that names the premix (`premix-MT-2`, or its gases: `Ar+O2`), its file and line, the
       * tank it names (none for a row named by its gases) and whether the lab profile lists it
       */
      readonly row: {
        readonly name: string;
        readonly file: string;
        readonly line: number;
        readonly tank?: string;
        readonly tankKnown: boolean;
      };
      /** what the log given is */
      readonly given: {
        readonly id: string;
        readonly tank: string;
        /**
         * 'premix': stage 1 of a two-stage preparation; 'from-premix': a batch filled from a premix;
         * 'single': a log that records no stage nor premix (a single-tank fill: a batch, or a premix
         * logged before logs recorded their stage)
         */
        readonly is: 'premix' | 'from-premix' | 'single';
        /** the batch id of its two-stage preparation, where its header records one */
        readonly batch?: string;
        /** a batch filled from the premix the row names: that premix's log, as a path to give */
        readonly premixLog?: string;
      };
    };

/** a list of charges that cannot be planned (plan/charges.ts), told apart by `kind` */
export type ChargeProblem =
  /** charges are a fill order: they need order 'given' */
  | { readonly code: 'charges-invalid'; readonly kind: 'not-given-order' }
  | {
      readonly code: 'charges-invalid';
      readonly kind: 'unknown-source';
      readonly sources: readonly string[];
      readonly choices: readonly string[];
    }
  | {
      readonly code: 'charges-invalid';
      readonly kind: 'source-not-charged';
      readonly sources: readonly string[];
    }
  /** the same source in two charges in a row (`charge` is the 1-based position of the second) */
  | {
      readonly code: 'charges-invalid';
      readonly kind: 'consecutive';
      readonly source: string;
      readonly charge: number;
    }
  | {
      readonly code: 'charges-invalid';
      readonly kind: 'stop-on-last';
      readonly source: string;
      readonly charge: number;
      readonly stopPa: number;
    }
  | {
      readonly code: 'split-stop';
      readonly kind: 'stop-missing';
      readonly source: string;
      readonly charge: number;
    }
  | {
      readonly code: 'split-stop';
      readonly kind: 'not-above-previous';
      readonly source: string;
      readonly charge: number;
      readonly stopPa: number;
      readonly previousPa: number;
    }
  | {
      readonly code: 'split-stop';
      readonly kind: 'not-below-last';
      readonly source: string;
      readonly charge: number;
      readonly stopPa: number;
      /** the reading the source's last charge reaches */
      readonly lastPa: number;
    }
  | {
      readonly code: 'split-stop';
      readonly kind: 'over-allocation';
      readonly source: string;
      readonly charge: number;
      readonly stopPa: number;
      /** the reading with all that is left of the source's allocation: a stop must be below it */
      readonly largestPa: number;
    };

/** why the tank reading to stop a charge at (after `@` in a fill order) is refused */
export type StopFault =
  /** a stop on the last charge of its source: that charge fills to the design amount */
  | { readonly kind: 'on-last-charge'; readonly source: string; readonly charges: number }
  | { readonly kind: 'empty' }
  | { readonly kind: 'unit-missing' }
  | { readonly kind: 'not-a-pressure'; readonly got: string }
  | { readonly kind: 'unreadable'; readonly quantity: QuantityFault }
  /** stops rise with the fill: each above the stop before it, the gas already in the tank, or zero */
  | {
      readonly kind: 'not-above-previous';
      readonly stopPa: number;
      readonly previous:
        | { readonly kind: 'stop'; readonly entry: string; readonly stopPa: number }
        | { readonly kind: 'in-tank'; readonly pressurePa: number }
        | { readonly kind: 'evacuated' };
    }
  | { readonly kind: 'not-below-final'; readonly stopPa: number; readonly finalPa: number };

/** who holds a batch log's lock: from the lock file */
export interface LockHolder {
  readonly pid: number;
  readonly host: string;
  readonly started: string;
}

/** how a batch log line breaks the log format */
export type LogFault =
  | { readonly kind: 'not-json' }
  | { readonly kind: 'no-header' }
  | { readonly kind: 'unknown-format'; readonly format: string; readonly reads: string }
  | { readonly kind: 'newer-format'; readonly format: string; readonly reads: string }
  /** the event does not match its schema; `message` is the schema library's own */
  | {
      readonly kind: 'invalid-event';
      readonly event: string;
      readonly path: string;
      readonly message: string;
    }
  | { readonly kind: 'second-reading'; readonly step: number }
  | { readonly kind: 'correction-incomplete'; readonly missing: 'by' | 'reason' | 'replaces_line' }
  | { readonly kind: 'start-after-reading' }
  | { readonly kind: 'unknown-event'; readonly eventKind: string }
  | { readonly kind: 'empty' }
  // raised by the batch log: a reading (or a header step) whose charge of a split source is not its step's
  | {
      readonly kind: 'charge-mismatch';
      readonly step: number;
      /** what the line names: source id and charge */
      readonly named: { readonly source: string; readonly number: number; readonly of: number };
      /** what the plan in the header has at that step, or null for a step it does not have */
      readonly planned: { readonly source: string; readonly number: number; readonly of: number } | null;
    }
  // raised by the batch log: a fill reading after a vent, or a reading after venting with no vent before it
  | {
      readonly kind: 'vent-order';
      readonly what: 'reading-after-vent' | 'vent-reading-without-vent';
      readonly step: number;
      /** the line of the vent the reading follows */
      readonly ventLine?: number;
    };

/** a value as a message shows it: a number, a text (cut at 40 characters), or what kind of thing it is */
export type ShownValue =
  | { readonly type: 'number'; readonly value: number }
  | { readonly type: 'text'; readonly value: string }
  | { readonly type: 'null' | 'list' | 'map' }
  | { readonly type: 'other'; readonly value: string };

/** what is wrong with a field; `hint` is the field's own description (its unit and an example) */
export type FieldIssue =
  | {
      readonly kind: 'missing';
      readonly hint?: string;
      /** an unknown key beside it that is close to its name (`wanted`) */
      readonly misspelled?: { readonly key: string; readonly wanted: string };
      /** an unknown key beside it, and the keys allowed there */
      readonly unknown?: { readonly key: string; readonly allowed: readonly string[] };
    }
  | { readonly kind: 'bare-number'; readonly value: number; readonly hint: string }
  | {
      readonly kind: 'wrong-type';
      readonly expected: string;
      readonly got: ShownValue;
      readonly hint?: string;
    }
  | {
      readonly kind: 'too-large' | 'too-small';
      readonly got: ShownValue;
      readonly limit: number;
      readonly inclusive: boolean;
      readonly hint?: string;
    }
  | { readonly kind: 'empty'; readonly hint?: string }
  | { readonly kind: 'not-a-choice'; readonly got: ShownValue; readonly choices: readonly string[] }
  | { readonly kind: 'no-form' }
  /** an issue the schema library words itself */
  | { readonly kind: 'library'; readonly message: string };

/** why a file was not read; `system` carries the operating system's error code */
export type ReadCause =
  | { readonly kind: 'system'; readonly errno: string }
  | { readonly kind: 'not-regular'; readonly what: 'folder' | 'fifo' | 'device' | 'socket' | 'other' }
  | { readonly kind: 'binary' };

/** what is wrong with a YAML file; `message` is the parser's own first line */
export type YamlFault =
  | { readonly kind: 'parser'; readonly message: string }
  | { readonly kind: 'collection-key' }
  | { readonly kind: 'too-many-aliases'; readonly limit: number }
  | { readonly kind: 'unresolved-alias'; readonly alias: string }
  | { readonly kind: 'not-data'; readonly message: string };

/** what is wrong with a species list */
export type ListFault =
  | { readonly kind: 'empty-entry' }
  | { readonly kind: 'not-a-pair'; readonly entry: string }
  | { readonly kind: 'repeated'; readonly species: string };

export type ProblemCode = Problem['code'];

/**
 * The typed problems of the planner, design and supply (one variant per condition, its
 * particulars as fields). Several share a code (`design-conflict`, `design-missing`,
 * `no-supply`, `model-range`), so the printed error code stays what it was; `kind` tells
 * the conditions apart.
 */
export type PlannerProblem =
  | { readonly code: 'design-conflict'; readonly kind: 'not-a-fuel'; readonly species: string }
  | { readonly code: 'design-conflict'; readonly kind: 'fuel-in-oxidizer'; readonly species: string }
  | { readonly code: 'design-conflict'; readonly kind: 'reactive-diluent'; readonly species: string }
  | { readonly code: 'design-conflict'; readonly kind: 'oxidizer-without-oxygen' }
  | {
      readonly code: 'design-conflict';
      readonly kind: 'fuel-fraction-too-large';
      readonly phi: number;
      readonly fuelFraction: number;
      /** fuel and oxidizer together at this fuel fraction */
      readonly reactantFraction: number;
      readonly maxFuelFraction: number;
    }
  | {
      readonly code: 'design-conflict';
      readonly kind: 'impurity-is-main-gas';
      readonly cylinder: string;
      readonly species: string;
    }
  | {
      readonly code: 'design-conflict';
      readonly kind: 'impurities-over-purity';
      readonly cylinder: string;
      readonly impuritySum: number;
      /** 1 - purity */
      readonly allowed: number;
    }
  /** the gas already in the tank holds more of these species than the finished batch should */
  | { readonly code: 'design-conflict'; readonly kind: 'in-tank-excess'; readonly species: readonly string[] }
  /**
   * a pressure the plan would fill a tank to is above the tank's rating (its maximum allowed working
   * pressure): the final pressure (or a premix tank's), or the top of the band of a reading
   */
  | {
      readonly code: 'design-conflict';
      readonly kind: 'above-rating';
      /** 'final': the batch's final pressure; 'premix': the premix tank's (two stages) */
      readonly what: 'final' | 'premix';
      readonly tank: string;
      readonly pressurePa: number;
      readonly ratedPa: number;
      /** rating times working fraction */
      readonly workingLimitPa: number;
      /** the band half-width of the reading when the pressure itself is at or below the rating, Pa */
      readonly bandPa?: number;
    }
  | {
      readonly code: 'design-conflict';
      readonly kind: 'in-tank-at-final';
      readonly inTankPa: number;
      readonly finalPa: number;
    }
  | { readonly code: 'design-missing'; readonly kind: 'no-fills' }
  /** a blend (fuel, oxidizer, diluent or fractions) names no species */
  | { readonly code: 'design-missing'; readonly kind: 'empty-blend'; readonly blend: string }
  | { readonly code: 'design-missing'; readonly kind: 'diluent-for-dilution'; readonly dilution: number }
  | { readonly code: 'design-missing'; readonly kind: 'diluent-for-ratio'; readonly ratio: number }
  | {
      readonly code: 'design-missing';
      readonly kind: 'diluent-for-fuel-fraction';
      readonly fuelFraction: number;
      readonly diluentFraction: number;
    }
  | { readonly code: 'no-supply'; readonly kind: 'no-cylinder'; readonly species: string }
  | {
      readonly code: 'model-range';
      readonly kind: 'temperature';
      readonly temperatureK: number;
      readonly minK: number;
      readonly maxK: number;
    }
  | {
      readonly code: 'model-range';
      readonly kind: 'non-ideal';
      readonly compressibility: number;
      /** the largest |1 - Z| the truncated virial series is trusted for */
      readonly maxDeviation: number;
    }
  /** the truncated virial equation has no gas-phase root at this pressure and temperature */
  | {
      readonly code: 'model-range';
      readonly kind: 'no-gas-solution';
      readonly pressurePa: number;
      readonly temperatureK: number;
      readonly secondVirialM3PerMol: number;
    };

/** why a quantity ("1500 Torr") cannot be read */
export type QuantityFault =
  | { readonly kind: 'unrepresentable'; readonly range: string }
  | { readonly kind: 'unit-missing' }
  | { readonly kind: 'too-long'; readonly length: number }
  /** a unit that the unit library reads as something else (e.g. "C" as coulomb) */
  | {
      readonly kind: 'ambiguous-unit';
      readonly unit: string;
      readonly means: string;
      readonly meant: string;
      readonly number: string;
    }
  | { readonly kind: 'not-number-and-unit' }
  /** the unit library's own message */
  | { readonly kind: 'library'; readonly message: string };

/**
 * Why a file was not written or a write was refused. `system` carries the operating system's
 * error code (ENOSPC, EACCES, EROFS, EIO, ...) and its message.
 */
export type WriteCause =
  | { readonly kind: 'is-folder' }
  | { readonly kind: 'exists'; readonly what: 'file' | 'symlink' | 'other' }
  | { readonly kind: 'appeared-while-writing' }
  | { readonly kind: 'no-folder'; readonly folder: string }
  | { readonly kind: 'folder-not-writable'; readonly folder: string }
  | { readonly kind: 'short-write'; readonly written: number; readonly expected: number }
  | { readonly kind: 'missing-after-write' }
  | { readonly kind: 'system'; readonly errno: string; readonly message: string }
  /** a batch log of that name exists (raised by the batch log: a log is never overwritten) */
  | { readonly kind: 'log-exists' };

export class ProblemError extends Error {
  readonly problem: Problem;
  readonly where: Where;
  constructor(problem: Problem, where: Where = {}) {
    super(problem.code);
    this.name = 'ProblemError';
    this.problem = problem;
    this.where = where;
  }
  /** the same problem, with more of the location filled in (outer values fill gaps only) */
  at(where: Where): ProblemError {
    return new ProblemError(this.problem, {
      ...where,
      ...this.where,
      field: joinField(where.field, this.where.field),
    });
  }
}

/** the same problem at another place: file, line and field all from `where` */
export function relocate(e: ProblemError, where: Where): ProblemError {
  return new ProblemError(e.problem, { ...where, field: where.field ?? e.where.field });
}

function joinField(outer?: string, inner?: string): string | undefined {
  if (outer && inner) return inner.startsWith('--') ? inner : `${outer}.${inner}`;
  return inner ?? outer;
}

export function fail(problem: Problem, where: Where = {}): never {
  throw new ProblemError(problem, where);
}
