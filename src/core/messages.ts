/** The wording of every Problem, in one place. */
import type { Problem, Where, WriteCause } from './problems.js';

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
  switch (p.code) {
    case 'unknown-species':
      return (
        `unknown species "${p.name}"` +
        (p.suggestions.length
          ? `; did you mean ${list(p.suggestions)}?`
          : '; `mixwright species` lists the known species')
      );
    case 'not-positive':
      return `${p.what} must be greater than zero (got ${p.text !== undefined ? `"${p.text}"` : formatNumber(p.value)})`;
    case 'out-of-range':
      return (
        `${p.what} = ${p.text !== undefined ? `"${p.text}"` : formatNumber(p.value)} ` +
        `is outside the allowed range ${p.allowed}`
      );
    case 'wrong-dimension':
      return `"${p.text}" is a ${p.got}, but a ${p.expected} is needed here`;
    case 'bad-quantity':
      return (
        `cannot read "${p.text}" as a ${p.expected}: ${sentence(p.reason)} Give a ` +
        `number and a unit, e.g. ${exampleFor(p.expected)}`
      );
    case 'bad-list':
      return (
        `cannot read "${p.text}": ${sentence(p.reason)} Write species, or species:fraction ` +
        `pairs separated by commas, e.g. CH4:0.8,C2H6:0.2`
      );
    case 'order-missing':
      return `the fill order leaves out ${list(p.missing)}; name every fill exactly once`;
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
    case 'design-conflict':
      return p.reason;
    case 'design-missing':
      return p.reason;
    case 'unknown-key':
      return `unknown key "${p.key}"; allowed here: ${list(p.allowed)}`;
    case 'schema':
      return p.reason;
    case 'yaml-syntax':
      return `not valid YAML: ${p.reason}`;
    case 'file-unreadable':
      return `cannot read the file: ${p.reason}`;
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
    case 'file-unwritable':
      return `cannot write the file: ${p.reason}`;
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
    case 'no-supply':
      return `no source can supply ${p.species}: ${p.reason}`;
    case 'no-gauge':
      return p.reason;
    case 'model-range':
      return p.reason;
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
    case 'write-failed':
      if ('cause' in p)
        return `not written: ${describeWriteCause(p.cause)}${p.outcome ? `; ${p.outcome}` : ''}`;
      return `not written: ${p.reason}`;
    case 'not-converged':
      return (
        `the ${p.computation} did not converge: after ${p.iterations} iterations the error is ` +
        `${formatNumber(p.residual)} against a tolerance of ${formatNumber(p.tolerance)}. No result is ` +
        `given; check the inputs for an extreme state, and report it to the maintainers if they are ordinary`
      );
    case 'log-locked':
      return p.reason;
    // raised by the re-check
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
        `the reading ${p.text} is not above the previous one; each row ` +
        `is the absolute pressure after a fill, so readings must increase`
      );
    case 'csv-no-rows':
      return 'no readings below the header';
    case 'csv-fill-repeated':
      return `${p.species} is filled twice; each fill has one row`;
    case 'csv-species-not-filled':
      return `${p.species} is not filled in the design of ${p.recipe} (its fills: ${p.fills.join(', ')})`;
  }
}

function describeWriteCause(c: WriteCause): string {
  switch (c.kind) {
    case 'is-folder':
      return 'the name is a folder; give a file name inside it, e.g. FOLDER/fill.html (--force never replaces a folder)';
    case 'exists':
      return c.what === 'file'
        ? 'a file of that name exists; add --force to replace it, or choose another name'
        : c.what === 'symlink'
          ? 'a symbolic link of that name exists (it may point nowhere); add --force to replace the link, or choose another name'
          : 'something that is not a regular file (a device, a fifo or a socket) has that name; choose another name';
    case 'appeared-while-writing':
      return 'a file of that name appeared while writing; add --force to replace it, or choose another name';
    case 'no-folder':
      return `the folder ${c.folder} does not exist; create it first, or choose another place`;
    case 'folder-not-writable':
      return `the folder ${c.folder} is not writable (permission denied); choose another place, or ask for write access`;
    case 'short-write':
      return `only ${c.written} of ${c.expected} bytes reached the disk (is it full?)`;
    case 'missing-after-write':
      return 'the file is not there after writing it';
    case 'system':
      return `${c.message} (${c.errno})`;
  }
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
  return at ? `${at}: ${describeProblem(p)}` : describeProblem(p);
}
