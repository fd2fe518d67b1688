/** The wording of every Problem, in one place. */
import type {
  FieldIssue,
  ListFault,
  LogFault,
  PlannerProblem,
  ChargeProblem,
  Problem,
  QuantityFault,
  ReadCause,
  ShownValue,
  Where,
  StopFault,
  WriteCause,
  YamlFault,
} from './problems.js';
import { TORR_PA } from './constants.js';
import { GIVEN_VOLUME_TANK } from './findings.js';
import { describeTwoStageProblem } from './two-stage-words.js';
import { describePremixLogProblem } from './premix-log-words.js';
import { describeStageProblem } from './stage-words.js';

function list(xs: readonly string[]): string {
  return xs.join(', ');
}

/** a number for a message: six significant digits at most, no float noise, never NaN or Infinity */
export function formatNumber(x: number): string {
  if (Number.isNaN(x)) return 'not a number';
  if (!Number.isFinite(x)) return x > 0 ? 'too large to represent' : 'too large (negative) to represent';
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (Number.isInteger(x) && a < 1e15) return String(x);
  if (a >= 1e-4 && a < 1e9) return String(Number(x.toPrecision(6)));
  // 2.0505e+5 -> 2.0505e5
  return x
    .toExponential(5)
    .replace(/\.?0+e/, 'e')
    .replace('e+', 'e');
}

function bytes(n: number): string {
  return n >= 1024 * 1024
    ? `${formatNumber(n / (1024 * 1024))} MB`
    : n >= 1024
      ? `${formatNumber(n / 1024)} kB`
      : `${n} bytes`;
}

/** a reason as one sentence: a library's own message may already end in a full stop */
const sentence = (reason: string): string =>
  /[.!?]$/.test(reason.trim()) ? reason.trim() : `${reason.trim()}.`;

export function describeProblem(p: Problem): string {
  // raised by the planner (variants sharing a code told apart by `kind`), split charges, two stages
  if (isPlannerProblem(p)) return describePlannerProblem(p);
  if (p.code === 'charges-invalid' || p.code === 'split-stop') return describeChargeProblem(p);
  if (p.code === 'two-stage-refused') return describeTwoStageProblem(p, describeProblem);
  if (p.code === 'premix-log-refused') return describePremixLogProblem(p, describeProblem);
  if (p.code === 'stage-fill' || p.code === 'stage-order') return describeStageProblem(p);
  switch (p.code) {
    case 'unknown-species':
      return (
        `unknown species "${p.name}"` +
        (p.suggestions.length
          ? `; did you mean ${list(p.suggestions)}?`
          : '; `mixwright species` lists the known species')
      );
    case 'not-positive':
      return (
        `${p.what} must be greater than zero ` +
        `(got ${p.text !== undefined ? `"${p.text}"` : formatNumber(p.value)})`
      );
    case 'out-of-range':
      return (
        `${p.what} = ${p.text !== undefined ? `"${p.text}"` : formatNumber(p.value)} ` +
        `is outside the allowed range ${p.allowed}`
      );
    case 'wrong-dimension':
      return (
        `"${p.text}" is a ${p.got}, but a ${p.expected} is needed here; give a number and a ` +
        `${p.expected} unit, e.g. ${exampleFor(p.expected)}`
      );
    case 'bad-quantity':
      return (
        `cannot read "${p.text}" as a ${p.expected}: ${sentence(describeQuantityFault(p.fault))} ` +
        giveHint(p.expected, p.bareUnit)
      );
    case 'order-missing':
    case 'order-repeated':
    case 'order-unknown':
    case 'fractions-sum':
    case 'needs-barometer':
    case 'unknown-reference':
    case 'no-gauge':
    case 'option-for-csv-only':
      return describeInputProblem(p);
    case 'unknown-key':
      return `unknown key "${p.key}"; allowed here: ${list(p.allowed)}`;
    case 'schema':
      return describeLogFault(p.log);
    case 'name-too-long':
      return (
        `the ${p.what} "${p.start}..." is ${p.length} characters long; names have ` +
        `at most ${p.limit} characters. Check what was pasted here`
      );
    case 'file-too-large':
      return (
        `cannot read the file: it holds ${bytes(p.bytes)} or more, and mixwright ` +
        `reads files of up to ${bytes(p.limitBytes)} (recipes, lab profiles, readings ` +
        `and batch logs are a few kB); check that this is the file you meant`
      );
    case 'no-equilibrium-data':
    case 'equilibrium-not-converged':
      return describeModelProblem(p);
    case 'write-failed':
      return `not written: ${describeWriteCause(p.cause)}${p.outcome ? `; ${p.outcome}` : ''}`;
    case 'not-converged':
      return describeModelProblem(p);
    // raised by the re-check
    case 'record-unknown-id':
    case 'reading-not-rising':
    case 'density-not-rising':
    case 'log-no-readings':
    case 'csv-empty':
    case 'csv-missing-column':
    case 'csv-field-count':
    case 'csv-not-rising':
    case 'csv-no-rows':
    case 'csv-species-not-filled':
    case 'csv-name-ambiguous':
    case 'csv-name-in-premix':
      return describeRecheckProblem(p);
    // raised by the batch log and the guided fill
    case 'log-locked':
    case 'log-changed':
    case 'log-torn-tail':
    case 'log-header-torn':
    case 'torn-tail-stuck':
    case 'log-released':
    case 'lock-unwritable':
    case 'lock-unreadable':
    case 'lock-contended':
    case 'log-not-found':
    case 'log-not-file':
    case 'log-unopenable':
    case 'amend-not-in-force':
    case 'withdraw-not-last':
    case 'reading-missing':
      return describeLogProblem(p);
    // raised by the command line and recipe files
    default:
      return describeCommandLineProblem(p);
  }
}

/** the fill order, the fractions, the barometer, lab-profile references and gauges of a reading */
function describeInputProblem(
  p: Extract<
    Problem,
    {
      code:
        | 'order-missing'
        | 'order-repeated'
        | 'order-unknown'
        | 'fractions-sum'
        | 'needs-barometer'
        | 'unknown-reference'
        | 'no-gauge'
        | 'option-for-csv-only';
    }
  >,
): string {
  switch (p.code) {
    case 'order-missing':
      return (
        `the fill order leaves out ${list(p.missing)}; name every fill at least once ` +
        `(a gas named again is filled in another charge)`
      );
    case 'order-repeated':
      return `the fill order names ${list(p.repeated)} more than once; name every fill exactly once`;
    case 'order-unknown':
      return (
        `the fill order names ${list(p.unknown)}, which this mixture does not fill; ` +
        `the fills are ${list(p.choices)}`
      );
    case 'fractions-sum':
      return (
        `the mole fractions add up to ${p.sum.toPrecision(6)}, not 1; correct them ` +
        `so that they sum to 1 (within 1e-6)`
      );
    case 'needs-barometer':
      return (
        `"${p.text}" is a gauge pressure (measured above the ambient pressure), and ` +
        `${p.field} needs an absolute pressure; converting it needs the barometric ` +
        `pressure. Give it with --barometer (e.g. "752.3 Torr") or in the lab profile's ` +
        `barometer section, or give the absolute pressure (e.g. "29.7 psia" or "2.2 bar")`
      );
    case 'unknown-reference':
      return (
        `no ${p.kind} "${p.id}" in the lab profile` +
        (p.choices.length ? `; it lists ${list(p.choices)}` : '')
      );
    case 'no-gauge':
      return (
        `no gauge in the lab profile reads ${p.pressurePa.toPrecision(6)} Pa; name ` +
        `the gauge in a "gauge" column` +
        (p.unitSlip ? `. ${p.unitSlip}` : '')
      );
    case 'option-for-csv-only':
      return `a batch log carries ${p.logCarries}; ${p.option} is for CSV readings only`;
  }
}

// raised by the re-check
type RecheckProblemCode =
  | 'record-unknown-id'
  | 'reading-not-rising'
  | 'density-not-rising'
  | 'log-no-readings'
  | 'csv-empty'
  | 'csv-missing-column'
  | 'csv-field-count'
  | 'csv-not-rising'
  | 'csv-no-rows'
  | 'csv-species-not-filled'
  | 'csv-name-ambiguous'
  | 'csv-name-in-premix';

function describeRecheckProblem(p: Extract<Problem, { code: RecheckProblemCode }>): string {
  switch (p.code) {
    case 'record-unknown-id':
      return `reading of step ${p.step} names the ${p.kind} "${p.id}", which the header does not list`;
    case 'reading-not-rising':
      return (
        `the reading of step ${p.step} is not above the one before it` +
        `${p.afterStart ? ' (the starting pressure of the top-up)' : ''}; readings must increase`
      );
    case 'density-not-rising': {
      const what =
        `reading ${p.reading} (${Number(p.pressurePa.toPrecision(6))} Pa) is not above the one before ` +
        `it; each fill must raise the tank pressure`;
      return p.inUncertainty
        ? `the readings are too close together, or too close to zero, for their uncertainty: ` +
            `in the uncertainty evaluation, ${what}. Check the pressures, and the gauge named for each reading`
        : what;
    }
    case 'log-no-readings':
      return 'the log holds no readings yet; nothing to re-check';
    case 'csv-empty':
      return 'the file is empty; it needs the header species,pressure,temperature and one row per fill';
    case 'csv-missing-column':
      return (
        `the header lacks the column "${p.column}"; it must be species,pressure,temperature ` +
        `(optional: ${p.optional.join(', ')})`
      );
    case 'csv-field-count':
      return `${p.got} fields where the header has ${p.expected}`;
    case 'csv-not-rising':
      return (
        `the reading ${p.text}${p.torr ? ` (${p.torr})` : ''} is not above the previous one` +
        (p.previous
          ? ` (line ${p.previous.line}: ${p.previous.text}${p.previous.torr ? `, ${p.previous.torr}` : ''})`
          : '') +
        `; each row is the absolute pressure after a fill, so readings must increase` +
        (p.cause ? `. ${p.cause}` : '')
      );
    case 'csv-no-rows':
      return 'no readings below the header';
    case 'csv-species-not-filled':
      return (
        `${p.species} is not filled in the design of ${p.recipe} (its fills: ${p.fills.join(', ')})` +
        (p.premixLogMissing
          ? '; a premix filled in an earlier stage is named by its gases (or premix-<tank>) only with ' +
            '--premix-log LOG, its stage-1 log'
          : '')
      );
    // how a CSV row names its source
    case 'csv-name-ambiguous':
      return (
        `"${p.name}" names more than one source: ${list(p.choices)}; write the cylinder id ` +
        `of the one filled in this row`
      );
    case 'csv-name-in-premix':
      return (
        `${p.name} is not filled on its own here: it comes in ${list(p.premixes)}; name ` +
        `that fill by its gases or its cylinder id, one row per charge`
      );
  }
}

/** the models that could not give a result: equilibrium data and convergence */
function describeModelProblem(
  p: Extract<Problem, { code: 'no-equilibrium-data' | 'equilibrium-not-converged' | 'not-converged' }>,
): string {
  switch (p.code) {
    case 'no-equilibrium-data':
      return (
        `no equilibrium can be computed for ${list(p.species)}: the product data ` +
        `(NASA polynomials) cover only species of C, H, O, N and the noble gases; ` +
        `the closed-vessel and detonation pressures of such a state are not estimated ` +
        `- judge them from the supplier's data or a specialist`
      );
    case 'equilibrium-not-converged':
      return (
        `the chemical equilibrium did not converge (${p.what}); the pressure estimate ` +
        `that needs it is not available - report this state to the maintainers`
      );
    case 'not-converged':
      return (
        `the ${p.computation} did not converge: after ${p.iterations} iterations the error is ` +
        `${formatNumber(p.residual)} against a tolerance of ${formatNumber(p.tolerance)}. No result is ` +
        `given; check the inputs for an extreme state, and report it to the maintainers if they are ordinary`
      );
  }
}

// raised by the batch log and the guided fill
type LogProblem = Extract<Problem, { code: LogProblemCode }>;
type LogProblemCode =
  | 'log-locked'
  | 'log-changed'
  | 'log-torn-tail'
  | 'log-header-torn'
  | 'torn-tail-stuck'
  | 'log-released'
  | 'lock-unwritable'
  | 'lock-unreadable'
  | 'lock-contended'
  | 'log-not-found'
  | 'log-not-file'
  | 'log-unopenable'
  | 'amend-not-in-force'
  | 'withdraw-not-last'
  | 'reading-missing';

function describeLogProblem(p: LogProblem): string {
  switch (p.code) {
    case 'log-locked':
      if (p.held === 'this-process')
        return `this program already has the batch log open for a fill (lock ${p.lockFile})`;
      return (
        `another guided fill holds this batch log: ${holderText(p.holder)} (lock ${p.lockFile}). ` +
        (p.held === 'another-host'
          ? `Only one fill may write a log. A lock from another computer cannot be checked from here; `
          : `Finish or stop that fill first; `) +
        removeLock(p.lockFile)
      );
    case 'log-changed':
      return (
        `the log changed on disk since it was read (${p.bytes} bytes, expected ${p.expectedBytes}): ` +
        `another program wrote to it. Nothing was appended, so the event was NOT logged; stop and look at the file`
      );
    case 'log-torn-tail':
      return (
        `the last line of the log (line ${p.line}) is incomplete; \`mixwright fill --resume\` moves ` +
        `it aside first. Nothing was appended, so the event was NOT logged`
      );
    case 'log-header-torn':
      return 'the log holds no complete line (its header was cut off); it cannot be resumed. Start a new batch';
    case 'torn-tail-stuck':
      return (
        `the incomplete last line was saved to ${p.sideFile} but could not be cut off the ` +
        `log: ${describeWriteCause(p.cause)}. Nothing was appended`
      );
    case 'log-released':
      return 'the log was released by this fill; open it again to write. The event was NOT logged';
    case 'lock-unwritable':
      return (
        `the lock file ${p.lockFile} cannot be ${p.stage === 'create' ? 'made' : 'written'}: ` +
        `${describeWriteCause(p.cause)}; the log was not opened for the fill`
      );
    case 'lock-unreadable':
      return (
        `the batch log ${p.log} has a lock file that cannot be read (${p.lockFile}), ` +
        `so another fill may hold it; ${removeLock(p.lockFile)}`
      );
    case 'lock-contended':
      return (
        `could not take the lock ${p.lockFile} in ${p.attempts} attempts: other fills keep taking it; ` +
        removeLock(p.lockFile)
      );
    case 'log-not-found':
      return 'cannot read the file: no such file';
    case 'log-not-file':
      return 'cannot read the file: not a regular file';
    case 'log-unopenable':
      return `cannot read the file: ${p.message} (${p.errno})`;
    case 'amend-not-in-force':
      return (
        'not logged: ' +
        (p.named === null
          ? `it amends step ${p.step}, which has no reading in force`
          : `it amends step ${p.step} naming line ${p.named}, but the reading in force for that step ` +
            `is ${p.inForce === null ? 'none' : `on line ${p.inForce}`}`)
      );
    case 'withdraw-not-last':
      return (
        `not logged: it withdraws the reading of step ${p.step}, but step ${p.later} was already ` +
        `filled after it; only the last reading can be withdrawn`
      );
    case 'reading-missing':
      return `cannot read "" as a ${p.expected}: type the reading first. ${giveHint(p.expected, p.bareUnit)}`;
  }
}

function holderText(h: { pid: number; host: string; started: string }): string {
  return `process ${h.pid} on host ${h.host}, started ${h.started}`;
}

const removeLock = (lockFile: string): string =>
  `if you are sure no fill is running on it, delete ${lockFile} and try again`;

function describeLogFault(f: LogFault): string {
  switch (f.kind) {
    case 'not-json':
      return 'not a JSON object; a batch log has one JSON event per line';
    case 'no-header':
      return 'the first line of a batch log must be its "batch" header';
    case 'unknown-format':
      return `unknown log format "${f.format}"; this version reads ${f.reads}`;
    case 'newer-format':
      return `the log is format ${f.format}, newer than this version of mixwright reads (${f.reads}); update mixwright`;
    case 'invalid-event':
      return `bad ${f.event}: ${f.path || '(event)'}: ${f.message}`;
    case 'second-reading':
      return (
        `step ${f.step} has a second reading; a changed reading is logged as ` +
        `a "correction", a taken-back one as a "withdraw"`
      );
    case 'correction-incomplete':
      return f.missing === 'by'
        ? 'a correction names who made it ("by": initials)'
        : f.missing === 'reason'
          ? 'a correction needs its reason ("reason")'
          : 'a correction names the line of the reading it replaces ("replaces_line")';
    case 'start-after-reading':
      return 'the starting pressure of a top-up is read before the first fill; this one comes after a reading';
    case 'unknown-event':
      return (
        `unknown event kind "${f.eventKind}": this version of mixwright does not know it, so the log ` +
        `is not checked (a newer version may have written it: update mixwright)`
      );
    case 'empty':
      return 'the log is empty (it holds no complete line)';
    // raised by the batch log
    case 'charge-mismatch': {
      const c = (x: { source: string; number: number; of: number }) =>
        `charge ${x.number} of ${x.of} of ${x.source}`;
      return f.planned
        ? `step ${f.step} names ${c(f.named)}, but step ${f.step} of the plan is ${c(f.planned)}: ` +
            `a reading belongs to the charge it was read after, and is never taken for another charge`
        : `step ${f.step} names ${c(f.named)}, but the plan has no step ${f.step}`;
    }
    case 'vent-order':
      return f.what === 'reading-after-vent'
        ? `a reading of fill ${f.step} follows the vent on line ${f.ventLine ?? '?'}: a fill after a vent ` +
            `starts from the vented tank, which a batch log does not record; finish the design as a ` +
            `top-up batch (a new log) instead`
        : `a reading after venting (fill ${f.step}) with no "vent" line before it`;
  }
}

// raised by the planner
// every kind with its code (the Record makes the compiler check the list), so the guard below knows them all
const PLANNER_KINDS: Readonly<Record<PlannerProblem['kind'], PlannerProblem['code']>> = {
  'not-a-fuel': 'design-conflict',
  'fuel-in-oxidizer': 'design-conflict',
  'reactive-diluent': 'design-conflict',
  'oxidizer-without-oxygen': 'design-conflict',
  'fuel-fraction-too-large': 'design-conflict',
  'impurity-is-main-gas': 'design-conflict',
  'impurities-over-purity': 'design-conflict',
  'in-tank-excess': 'design-conflict',
  'in-tank-at-final': 'design-conflict',
  'above-rating': 'design-conflict',
  'no-fills': 'design-missing',
  'empty-blend': 'design-missing',
  'diluent-for-dilution': 'design-missing',
  'diluent-for-ratio': 'design-missing',
  'diluent-for-fuel-fraction': 'design-missing',
  'no-cylinder': 'no-supply',
  temperature: 'model-range',
  'non-ideal': 'model-range',
  'no-gas-solution': 'model-range',
};

function isPlannerProblem(p: Problem): p is PlannerProblem {
  // other problems have a `kind` too (unknown-reference): the code must match as well
  return (
    'kind' in p &&
    typeof p.kind === 'string' &&
    Object.hasOwn(PLANNER_KINDS, p.kind) &&
    PLANNER_KINDS[p.kind as PlannerProblem['kind']] === p.code
  );
}

/** a pressure the plan would fill a tank to above its rating: what, why, what to do */
function describeAboveRating(p: Extract<PlannerProblem, { kind: 'above-rating' }>): string {
  const tank = p.tank === GIVEN_VOLUME_TANK ? 'the tank of the given volume' : `tank ${p.tank}`;
  const which = p.what === 'final' ? 'the final pressure' : `the premix pressure of ${tank}`;
  const what =
    p.bandPa === undefined
      ? `${which}, ${paTorr(p.pressurePa)}, is above the rating of ${tank}, ${paTorr(p.ratedPa)}`
      : `${which}, ${paTorr(p.pressurePa)}, is within the rating of ${tank}, ${paTorr(p.ratedPa)}, ` +
        `but a reading inside its band (+-${paTorr(p.bandPa)}) reaches ` +
        `${paTorr(p.pressurePa + p.bandPa)}, above it`;
  const most = p.bandPa === undefined ? p.ratedPa : p.ratedPa - p.bandPa;
  const limit =
    p.workingLimitPa < p.ratedPa
      ? `; at or below the working limit (rating x working fraction), ${paTorr(p.workingLimitPa)}, the ` +
        `plan is also free of the tank-over-rating danger`
      : '';
  const count = p.what === 'final' ? ' (or the number of experiments that sets it)' : '';
  return (
    `${what}: a tank is never filled past its rating (its maximum allowed working pressure), so nothing ` +
    `is planned - lower ${which}${count} to at most ${paTorr(most)}, or use a tank rated for it${limit}`
  );
}

function describePlannerProblem(p: PlannerProblem): string {
  switch (p.kind) {
    case 'not-a-fuel':
      return `${p.species} is not a fuel (it needs no oxygen to burn); list it as oxidizer or diluent`;
    case 'fuel-in-oxidizer':
      return `${p.species} is a fuel and cannot be part of the oxidizer`;
    case 'reactive-diluent':
      return (
        `${p.species} takes part in combustion and cannot be a diluent; ` +
        `use an inert gas (Ar, He, N2, CO2, ...)`
      );
    case 'oxidizer-without-oxygen':
      return 'the oxidizer carries no oxygen; it needs O2 (or N2O, NO)';
    case 'fuel-fraction-too-large':
      return (
        `at phi ${p.phi} a fuel fraction of ${p.fuelFraction} leaves no room: fuel and oxidizer ` +
        `alone would be ${p.reactantFraction.toFixed(4)} of the mixture; the largest fuel fraction ` +
        `is ${p.maxFuelFraction.toFixed(5)}`
      );
    case 'impurity-is-main-gas':
      return `cylinder ${p.cylinder} lists its own gas ${p.species} as an impurity`;
    case 'impurities-over-purity':
      return (
        `cylinder ${p.cylinder}: impurities add up to ${p.impuritySum}, more than 1 - purity ` +
        `= ${p.allowed.toPrecision(3)}`
      );
    case 'in-tank-excess':
      return (
        `the gas already in the tank holds more ${list(p.species)} than the finished ` +
        `batch should; evacuate the tank or raise the final pressure`
      );
    case 'in-tank-at-final':
      return 'the tank already holds gas at or above the final pressure; evacuate it or raise the final pressure';
    case 'above-rating':
      return describeAboveRating(p);
    case 'no-fills':
      return 'the plan has no fills';
    case 'empty-blend':
      return `${p.blend} names no species`;
    case 'diluent-for-dilution':
      return `dilution is ${p.dilution} but no diluent is named; add a diluent (e.g. Ar)`;
    case 'diluent-for-ratio':
      return `diluent ratio is ${p.ratio} but no diluent is named; add a diluent (e.g. N2)`;
    case 'diluent-for-fuel-fraction':
      return (
        `the fuel fraction ${p.fuelFraction} leaves ${p.diluentFraction.toFixed(4)} of the mixture ` +
        `for a diluent, but none is named`
      );
    case 'no-cylinder':
      return `no source can supply ${p.species}: no cylinder in the lab profile carries it; add one under cylinders`;
    case 'temperature':
      return (
        `a fill at ${p.temperatureK.toFixed(2)} K is outside the range the gas model is built ` +
        `for (${p.minK}-${p.maxK} K); check the temperature and its unit`
      );
    case 'no-gas-solution':
      return (
        `the virial equation has no gas-phase solution at ${p.pressurePa.toPrecision(6)} ` +
        `Pa and ${p.temperatureK.toFixed(2)} K (B = ${(p.secondVirialM3PerMol * 1e6).toPrecision(4)} ` +
        `cm3/mol); the state is outside the model's range - lower the pressure`
      );
    case 'non-ideal':
      return (
        `the finished batch would have Z = ${p.compressibility.toFixed(4)}; the truncated virial ` +
        `model is trusted only within ${p.maxDeviation * 100} % of ideal gas. Lower ` +
        `the final pressure or plan this mixture with a full equation of state`
      );
  }
}

type FileProblemCode =
  | 'file-unreadable'
  | 'yaml-syntax'
  | 'bad-list'
  | 'not-a-number'
  | 'number-too-large'
  | 'usage'
  | 'option-repeated'
  | 'option-value-missing'
  | 'options-exclusive'
  | 'options-missing'
  | 'format-unknown'
  | 'format-mismatch'
  | 'pdf-needs-file'
  | 'pdf-no-browser'
  | 'pdf-not-made';
type RecipeProblemCode =
  | 'invalid-field'
  | 'rating-with-lab-tank'
  | 'pressure-and-count'
  | 'dilution-measures'
  | 'working-fraction-without-rating'
  | 'tank-or-volume-missing'
  | 'pressure-missing'
  | 'reactor-incomplete'
  | 'reactor-missing'
  | 'diluent-amount-missing';
type CommandLineProblemCode =
  | 'tank-data-missing'
  | 'needs-terminal'
  | 'resume-with-recipe'
  | 'log-closed'
  | 'bad-batch-id'
  | 'bad-initials'
  | 'no-logs-in-folder'
  | 'label-needs-log'
  | 'unknown-schema'
  | 'duplicate-id'
  | 'bad-temperature-difference'
  | 'order-stop'
  | FileProblemCode
  | RecipeProblemCode
  // a readings CSV row naming a premix of an earlier stage (io/csv-names.ts)
  | 'csv-premix-needs-log';

/** the wording of the problems raised by the command line and recipe files (continued) */
function describeCommandLineProblem(p: Extract<Problem, { code: CommandLineProblemCode }>): string {
  switch (p.code) {
    case 'tank-data-missing':
      return describeMissingTankData(p.quantity);
    case 'needs-terminal':
      return p.command === 'fill'
        ? 'the guided fill needs a terminal (stdin and stdout are not one). Use `mixwright ' +
            'plan` or `mixwright sheet` to prepare, and `mixwright check` on the log ' +
            'or a CSV of the readings'
        : 'the wizard needs a terminal. Use `mixwright plan`, `mixwright sheet` and `mixwright check`';
    case 'resume-with-recipe':
      return 'a resumed fill takes its design from the log; give --resume LOG alone';
    case 'log-closed':
      if (p.made === undefined || p.of === undefined || p.made >= p.of)
        return 'this batch log is closed: the fill is finished. Re-check it with `mixwright check`';
      return (
        `this batch log was closed before fill ${p.made + 1} of ${p.of}: the batch is INCOMPLETE ` +
        `(${p.made} of ${p.of} fills logged${p.note ? `; closed: ${p.note}` : ''}) and a closed log is not ` +
        'resumed. Re-check it with `mixwright check` (the tank is what its readings say, not the design). ' +
        "To finish the tank, make it a top-up batch in a new log: add the `in_tank` line (the tank's " +
        'composition from the readings, at the pressure read now) to a copy of its recipe, then `mixwright ' +
        'plan` and `mixwright fill` on the copy (README, Usage: the guided fill); if `plan` refuses the ' +
        'copy, the design cannot be reached from that tank'
      );
    case 'bad-batch-id':
      return `batch id "${p.id}" may hold letters, digits, '.', '_' and '-' only`;
    case 'bad-initials':
      return p.column
        ? `initials "${p.text}" must be 1-6 letters (e.g. AB), as the guided fill logs them: the by ` +
            `column names who read the gauge; correct it from the paper record, or leave it empty where ` +
            `the record names nobody, and check again; nothing was checked`
        : `initials "${p.text}" must be 1-6 letters (e.g. --by AB): every reading of the fill is logged with them`;
    case 'no-logs-in-folder':
      return 'the folder holds no .jsonl or .csv files; give a folder of batch logs or CSV readings';
    case 'label-needs-log':
      return (
        'a label is made from one batch log (.jsonl) written by `mixwright fill`; ' +
        're-check CSV readings with `mixwright check`'
      );
    case 'unknown-schema':
      return `unknown format "${p.name}"; choose ${p.choices.join(' or ')}`;
    case 'duplicate-id':
      return (
        `the id "${p.id}" is used twice` +
        (p.first
          ? ` (first at ${p.first.line !== undefined ? `line ${p.first.line}, ` : ''}${p.first.field}, again here)`
          : '') +
        `; ids of tanks, reactors, gauges and cylinders must be unique - rename one of them`
      );
    case 'bad-temperature-difference':
      return (
        `cannot read "${p.text}" as a temperature difference: give it in K or mK, e.g. "0.3 K" ` +
        `(a difference, so never in degC or degF, whose zero is offset)`
      );
    // raised by the fill order (charges and their stops)
    case 'order-stop':
      return describeOrderStop(p.entry, p.fault);
    case 'csv-premix-needs-log':
      return (
        `"${p.name}" names the premix filled in tank ${p.tank} in an earlier stage (the premix of a ` +
        `two-stage preparation); its composition and uncertainty come from that stage's log, ` +
        (p.given === undefined
          ? `which this check was not given`
          : `and the --premix-log given is the log of ${p.given}, another premix`) +
        (p.tankKnown ? '' : ` (the lab profile lists no tank ${p.tank}: check the name)`) +
        ` - ${p.given === undefined ? 'add' : 'give instead'} --premix-log LOG with the stage-1 log ` +
        `of tank ${p.tank} ` +
        `(the guided fill wrote it as batches/<batch>-premix.jsonl)`
      );
    default:
      return describeFileProblem(p);
  }
}

/** the wording of unreadable files and options (continued) */
function describeFileProblem(p: Extract<Problem, { code: FileProblemCode | RecipeProblemCode }>): string {
  switch (p.code) {
    case 'file-unreadable':
      return `cannot read the file: ${describeReadCause(p.cause)}`;
    case 'yaml-syntax':
      return `not valid YAML: ${describeYamlFault(p.fault)}`;
    case 'bad-list':
      return (
        `cannot read "${p.text}": ${describeListFault(p.fault)}. Write species, or species:fraction ` +
        `pairs separated by commas, e.g. CH4:0.8,C2H6:0.2`
      );
    case 'not-a-number':
      return `"${p.text}" is not a number`;
    case 'number-too-large':
      return `"${p.text}" is too large a number to represent; check the exponent`;
    case 'usage':
      return p.text;
    case 'option-repeated':
      return p.first === undefined
        ? `${p.option} is given twice; give it once`
        : `${p.option} is given twice ("${p.first}" and "${p.second}"); give it once, with the value you mean`;
    case 'option-value-missing':
      return (
        `${p.option} needs ${p.needs}; got the option ${p.got} (the value of ${p.option} is missing: ` +
        `give it right after ${p.option})`
      );
    case 'options-exclusive':
      return (
        `give either ${p.option}, or --fuel/--oxidizer/--phi with one dilution measure, not both ` +
        `(got ${p.option} with ${list(p.others)})`
      );
    case 'options-missing':
      return `give a recipe file, or on the command line: ${p.missing.join('; ')}`;
    case 'format-unknown':
      return (
        `cannot tell the sheet format from the file name "${p.file}" (extension ${p.extension || 'none'}); ` +
        `name the file ${list(p.known)}, or give --format html|md|txt|pdf`
      );
    case 'format-mismatch':
      return (
        `--format ${p.format} would write ${p.format} into a file named ${p.extension}; give ` +
        `a file name that ends in the format's extension, or leave --format out to take it from the name`
      );
    case 'pdf-needs-file':
      return `a PDF needs a file: give -o ${p.example}`;
    case 'pdf-no-browser':
      return (
        'Chromium is not installed, so no PDF can be made here. Write the sheet with ' +
        '--format html and print it from any browser (File > Print, margins "default"), ' +
        'or install Chromium (apt-get install chromium)'
      );
    case 'pdf-not-made':
      return `Chromium did not write a PDF (exit ${p.status ?? 'none'})${p.detail ? `: ${p.detail}` : ''}`;
    default:
      return describeRecipeProblem(p);
  }
}

/** the wording of the recipe's conflicting and missing fields */
function describeRecipeProblem(p: Extract<Problem, { code: RecipeProblemCode }>): string {
  switch (p.code) {
    case 'rating-with-lab-tank':
      return (
        `the tank ${p.tank} has its rating in the lab profile; a rating here is for ` +
        `a tank given by its volume only`
      );
    case 'pressure-and-count':
      return 'give the final pressure or the number of experiments, not both (the count sets the pressure)';
    case 'dilution-measures':
      return `give only one of dilution, diluent_ratio, fuel_fraction (got ${p.given.join(' and ')})`;
    case 'working-fraction-without-rating':
      return 'a working fraction is a fraction of the rating: give the rating too';
    case 'tank-or-volume-missing':
      return `name a tank from the lab profile (${list(p.tanks) || 'none listed'}) or give a volume`;
    case 'pressure-missing':
      return 'give the final pressure, or the number of experiments the batch must serve';
    case 'reactor-incomplete':
      return 'give both the reactor volume and the fill pressure of one experiment (or a reactor from the lab profile)';
    case 'reactor-missing':
      return (
        'sizing for a number of experiments needs a reactor: name one from the lab ' +
        'profile or give its volume and fill pressure'
      );
    case 'diluent-amount-missing':
      return 'a diluent is named but not how much: give dilution, diluent_ratio or fuel_fraction';
    case 'invalid-field':
      return describeFieldIssue(p.field, p.issue);
  }
}

/** a value for a message: short, and a number without float noise */
function shownValue(v: ShownValue): string {
  switch (v.type) {
    case 'number':
      return formatNumber(v.value);
    case 'text':
      return `"${v.value}"`;
    case 'null':
      return 'null (an empty value)';
    case 'list':
      return 'a list';
    case 'map':
      return 'a map of keys';
    case 'other':
      return v.value;
  }
}

function typeName(expected: string): string {
  switch (expected) {
    case 'string':
      return 'a text';
    case 'number':
      return 'a number';
    case 'int':
      return 'a whole number';
    case 'boolean':
      return 'true or false';
    case 'array':
      return 'a list';
    case 'object':
    case 'record':
      return 'a map of keys';
    default:
      return `a ${expected}`;
  }
}

/** our wording of a field the format refuses: what is wrong, and what to write instead */
/**
 * a field's fault in words; `field` undefined where the location before the message names it already
 * ("r.yaml:16:13 tolerance.relative: the value 2 is too large"), so it is said once
 */
function describeFieldIssue(field: string | undefined, i: FieldIssue): string {
  const hint = (h: string | undefined) => (h ? ` (${h})` : '');
  const subject = field ?? 'the value';
  switch (i.kind) {
    case 'missing':
      return (
        (field === undefined
          ? 'this required field is missing'
          : `the required field "${field}" is missing`) +
        (i.hint ? `; it is the ${i.hint}` : '') +
        (i.misspelled
          ? `; the key "${i.misspelled.key}" is there instead - did you mean "${i.misspelled.wanted}"?`
          : i.unknown
            ? `; there is an unknown key "${i.unknown.key}" (allowed here: ${list(i.unknown.allowed)})`
            : '')
      );
    case 'bare-number':
      return `${subject} is the bare number ${formatNumber(i.value)}; it needs a unit (${i.hint})`;
    case 'wrong-type':
      return `${subject} must be ${typeName(i.expected)}, not ${shownValue(i.got)}` + hint(i.hint);
    case 'too-large':
    case 'too-small':
      return (
        `${field === undefined ? 'the value' : `${field} =`} ${shownValue(i.got)} is ` +
        `${i.kind === 'too-large' ? 'too large' : 'too small'}; ` +
        `the allowed range is ` +
        (i.kind === 'too-large' ? (i.inclusive ? 'at most' : 'below') : i.inclusive ? 'at least' : 'above') +
        ` ${formatNumber(i.limit)}` +
        hint(i.hint)
      );
    case 'empty':
      return `${subject} is empty; give a value` + hint(i.hint);
    case 'not-a-choice':
      return (
        `${field === undefined ? 'the value' : `${field} =`} ${shownValue(i.got)} is not one of the ` +
        `choices: ${list(i.choices)}`
      );
    case 'no-form':
      return `${subject} has neither accepted form; see \`mixwright schema recipe\``;
    case 'library':
      return field === undefined ? i.message : `${field}: ${i.message}`;
  }
}

function describeMissingTankData(quantity: 'height' | 'leak-rate' | 'base-vacuum'): string {
  switch (quantity) {
    case 'height':
      return 'the tank height is not known: give --height or add "height" to the tank in the lab profile';
    case 'leak-rate':
      return (
        'the leak-up rate is not known: measure it and give --leak, or add "leak_rate" ' +
        'to the tank in the lab profile'
      );
    case 'base-vacuum':
      return 'the base vacuum is not known: give --base-vacuum or add "base_vacuum" to the tank in the lab profile';
  }
}

function describeReadCause(c: ReadCause): string {
  switch (c.kind) {
    case 'system':
      return readErrno(c.errno);
    case 'not-regular':
      return notRegular(c.what);
    case 'binary':
      return 'it holds NUL bytes, so it is not a text file; give a YAML, CSV or JSON-lines text file';
  }
}

function readErrno(errno: string): string {
  switch (errno) {
    case 'ENOENT':
      return 'no such file';
    case 'EISDIR':
      return 'it is a folder, not a file';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied; check the file permissions';
    case 'ENOTDIR':
      return 'a part of the path is not a folder';
    case 'ENAMETOOLONG':
      return 'the path is too long';
    case 'ELOOP':
      return 'the path has a symbolic link loop';
    default:
      return `the system refused it (${errno})`;
  }
}

function notRegular(what: 'folder' | 'fifo' | 'device' | 'socket' | 'other'): string {
  switch (what) {
    case 'folder':
      return 'it is a folder, not a file';
    case 'fifo':
      return (
        'it is a named pipe (FIFO), not a regular file; pipes are not read because ' +
        'they can wait forever. Save the content to a file and give that file'
      );
    case 'device':
      return 'it is a device, not a regular file; give a recipe, lab profile, readings or log file';
    case 'socket':
      return 'it is a socket, not a regular file';
    case 'other':
      return 'it is not a regular file';
  }
}

function describeYamlFault(f: YamlFault): string {
  switch (f.kind) {
    case 'parser':
      return f.message;
    case 'collection-key':
      return 'a key is a list or map; keys must be plain names such as "volume"';
    case 'too-many-aliases':
      return (
        `the file expands its aliases (*name) more than ${f.limit} times, ` +
        `which would make it far larger than it looks; write the values out, or use fewer aliases`
      );
    case 'unresolved-alias':
      return (
        `an alias (*${f.alias}) refers to no anchor (&name) set before it; define the anchor ` +
        `first, or write the value out`
      );
    case 'not-data':
      return `the file cannot be read as data (${f.message})`;
  }
}

function describeQuantityFault(f: QuantityFault): string {
  switch (f.kind) {
    case 'unrepresentable':
      return `the number is too large to represent; the allowed range is ${f.range}`;
    case 'unit-missing':
      return 'a unit is required';
    case 'too-long':
      return `the text is ${f.length} characters long; a quantity is a number and a unit`;
    case 'ambiguous-unit':
      return (
        `"${f.unit}" alone is ${f.means}; did you mean ${f.meant}? Write "${f.number} ` +
        `${f.meant}" or "${f.number} °${f.meant.slice(3)}"`
      );
    case 'not-number-and-unit':
      return 'not a number followed by a unit';
    case 'library':
      return f.message;
  }
}

function describeListFault(f: ListFault): string {
  switch (f.kind) {
    case 'empty-entry':
      return 'an empty entry';
    case 'not-a-pair':
      return `"${f.entry}" is not species:fraction`;
    case 'repeated':
      return `${f.species} appears twice`;
  }
}

function describeWriteCause(c: WriteCause): string {
  switch (c.kind) {
    case 'is-folder':
      return (
        'the name is a folder; give a file name inside it, e.g. FOLDER/fill.html ' +
        '(--force never replaces a folder)'
      );
    case 'exists':
      return c.what === 'file'
        ? 'a file of that name exists; add --force to replace it, or choose another name'
        : c.what === 'symlink'
          ? 'a symbolic link of that name exists (it may point nowhere); add --force to replace ' +
            'the link, or choose another name'
          : 'something that is not a regular file (a device, a fifo or a socket) has that name; choose another name';
    case 'appeared-while-writing':
      return 'a file of that name appeared while writing; add --force to replace it, or choose another name';
    case 'no-folder':
      return `the folder ${c.folder} does not exist; create it first, or choose another place`;
    case 'folder-not-writable':
      return (
        `the folder ${c.folder} is not writable (permission denied); choose another place, ` +
        `or ask for write access`
      );
    case 'short-write':
      return `only ${c.written} of ${c.expected} bytes reached the disk (the disk is probably full)`;
    case 'missing-after-write':
      return 'the file is not there after writing it';
    case 'system':
      // a message that names its own code (as io/atomic.ts words them) is not given it twice
      return c.message.includes(c.errno) ? c.message : `${c.message} (${c.errno})`;
    // raised by the batch log
    case 'log-exists':
      return 'a batch log of that name exists already; it is never overwritten - choose another batch id';
  }
}

/** what to type: a number and a unit, or (where the field has a unit) a bare number in it */
function giveHint(expected: string, bareUnit: string | undefined): string {
  return bareUnit
    ? `Give a number in ${bareUnit} (the gauge's unit), or a number and a unit, e.g. ${exampleFor(expected)}`
    : `Give a number and a unit, e.g. ${exampleFor(expected)}`;
}

function exampleFor(expected: string): string {
  switch (expected) {
    case 'pressure':
      return '"1500 Torr", "200 kPa" or "2 bar"';
    case 'volume':
      return '"30 L" or "0.03 m^3"';
    case 'temperature':
      return '"22 degC", "22 °C", "71.6 degF" or "295.15 K"';
    case 'pressure rate':
      return '"1e-4 Torr/min"';
    case 'length':
      return '"0.32 m" or "320 mm"';
    case 'time':
      return '"30 min" or "2 h"';
    case 'mass':
      return '"1.5 g" or "0.2 kg"';
    default:
      return '"1 bar"';
  }
}

export function describeWhere(w: Where): string {
  const parts: string[] = [];
  if (w.file) parts.push(w.line ? `${w.file}:${w.line}${w.column ? `:${w.column}` : ''}` : w.file);
  if (w.field) parts.push(w.field);
  return parts.join(' ');
}

/** "recipes/x.yaml:7 design.phi: phi must be greater than zero (got -1)" */
export function describeProblemAt(p: Problem, w: Where): string {
  const at = describeWhere(w);
  // a field's fault where the location names that field: the field said once, in the location
  const named =
    p.code === 'invalid-field' &&
    w.field !== undefined &&
    (w.field === p.field || w.field.endsWith(`.${p.field}`));
  const text = named ? describeFieldIssue(undefined, p.issue) : describeProblem(p);
  return at ? `${at}: ${text}` : text;
}

// raised by the planner's split charges
/** a pressure in a charge problem: Pa, and Torr for the manifold's usual unit */
function paTorr(pa: number): string {
  return `${formatNumber(pa)} Pa (${formatNumber(pa / TORR_PA)} Torr)`;
}

function describeChargeProblem(p: ChargeProblem): string {
  // `charge` is the entry's place in the fill order, not the source's own charge number ("charge 1 of 2")
  const which = (c: { source: string; charge: number }) => `the fill order's entry ${c.charge} (${c.source})`;
  switch (p.kind) {
    case 'not-given-order':
      return (
        'charges (a source named more than once, or a stop reading) are a fill order, but the plan was ' +
        'asked to recommend the order; give the order with the charges, or leave the charges out'
      );
    case 'unknown-source':
      return (
        `the fill order charges ${list(p.sources)}, which this mixture does not fill; ` +
        `the fills are ${list(p.choices)}`
      );
    case 'source-not-charged':
      return `the fill order leaves out ${list(p.sources)}; charge every fill at least once`;
    case 'consecutive':
      return (
        `${which(p)} follows a charge of the same source: two charges in a row are one ` +
        `charge; name it once, or put another fill between them`
      );
    case 'stop-on-last':
      return (
        `${which(p)} has a stop reading (${paTorr(p.stopPa)}) but is the last charge of ` +
        `${p.source}, which fills to the plan's own target; remove the stop from its last charge`
      );
    case 'stop-missing':
      return `${which(p)} is not the last charge of ${p.source} and has no stop reading; give one after "@"`;
    case 'not-above-previous':
      return (
        `the stop reading of ${which(p)}, ${paTorr(p.stopPa)}, is not above the reading before it ` +
        `(${paTorr(p.previousPa)}), so the charge would fill nothing; give a higher stop`
      );
    case 'not-below-last':
      return (
        `the stop reading of ${which(p)}, ${paTorr(p.stopPa)}, is not below the reading the last charge ` +
        `of ${p.source} reaches (${paTorr(p.lastPa)}); give a lower stop`
      );
    case 'over-allocation':
      return (
        `the stop reading of ${which(p)}, ${paTorr(p.stopPa)}, needs all of the ${p.source} the batch ` +
        `takes or more, leaving nothing for its last charge; a stop must be below ${paTorr(p.largestPa)} - ` +
        `give a lower stop, or raise the final pressure`
      );
  }
}

// raised by the fill order (charges and their stops)
/** a pressure of a stop message: Pa and Torr, absolute */
const stopPressure = (pa: number) => `${formatNumber(pa)} Pa (${formatNumber(pa / TORR_PA)} Torr) absolute`;

const STOP_FORM =
  'the absolute tank reading to stop at after @, a number and a pressure unit, ' +
  'e.g. "Ar@400 Torr" or "Ar@53.3 kPa"';

/** why a charge's stop (after @ in a fill order) is refused, and what to write instead */
function describeOrderStop(entry: string, f: StopFault): string {
  const at = `the fill order entry "${entry}"`;
  switch (f.kind) {
    case 'on-last-charge':
      return (
        `${at} gives a stop on the last charge of ${f.source}` +
        (f.charges > 1 ? ` (charge ${f.charges} of ${f.charges})` : ' (its only charge)') +
        `; the last charge fills to the design amount, so its reading is the plan's. Leave out ` +
        `the @ on it, or name ${f.source} again later for a further charge`
      );
    case 'empty':
      return `${at} has nothing after @; write ${STOP_FORM}, or leave out the @ and let the plan choose`;
    case 'unit-missing':
      return `${at} gives a stop without a unit; write ${STOP_FORM}`;
    case 'not-a-pressure':
      return `${at} gives a stop that is a ${f.got}, not a pressure; write ${STOP_FORM}`;
    case 'unreadable':
      return `${at}: cannot read its stop: ${sentence(describeQuantityFault(f.quantity))} Write ${STOP_FORM}`;
    case 'not-above-previous': {
      const before =
        f.previous.kind === 'stop'
          ? `the stop before it ("${f.previous.entry}", ${stopPressure(f.previous.stopPa)})`
          : f.previous.kind === 'in-tank'
            ? `the gas already in the tank (${stopPressure(f.previous.pressurePa)})`
            : 'the evacuated tank (0 Pa)';
      return (
        `${at} stops at ${stopPressure(f.stopPa)}, not above ${before}; the tank pressure ` +
        `only rises during a fill, so each stop must be higher than the one before it - ` +
        `correct the stops, or leave one out and let the plan choose`
      );
    }
    case 'not-below-final':
      return (
        `${at} stops at ${stopPressure(f.stopPa)}, not below the final pressure ` +
        `${stopPressure(f.finalPa)}; a stop must leave room for the charges after it - ` +
        `give a lower stop, or leave it out and let the plan choose`
      );
  }
}
