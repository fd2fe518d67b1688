/**
 * The command line, built by a factory so tests run it in-process:
 *   const { program, run } = createProgram({ stdout, stderr }); await run(argv)
 */
import { Command, CommanderError, Option } from 'commander';
import { z } from 'zod';
import {
  describeProblemAt,
  planFill,
  ProblemError,
  relocate,
  worstSeverity,
  experimentsServed,
  batchSizeFinding,
  mixingEstimate,
  contamination,
} from '../core/index.js';
import {
  buildPlanRequest,
  readRecipe,
  validateRecipeObject,
  type Locate,
  type RecipeSource,
} from '../io/load.js';
import { planWithPrediction } from '../io/plan-predict.js';
import { recipeSchema, type RecipeFile } from '../io/recipe.js';
import { labSchema } from '../io/lab.js';
import {
  isPressureUnit,
  parseLength,
  parseQuantity,
  PRESSURE_UNITS,
  type PressureUnit,
} from '../io/quantity.js';
import { readyToJson, readyToText } from '../report/ready-report.js';
import { planToJson } from '../report/plan-json.js';
import { planToText } from '../report/plan-text.js';
import { speciesDetail, speciesList } from '../report/species-text.js';
import { DEMO_LAB_YAML } from '../io/demo-lab.js';
import { checkFile, type CheckReport } from '../io/check.js';
import { buildSheetModel } from '../report/sheet-model.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../report/sheet-render.js';
import { writeFileAtomic } from '../io/atomic.js';
import { writePdf } from '../io/pdf.js';
import { checkToJson, checkToText, folderSummary } from '../report/check-report.js';
import { checkLog } from '../io/check.js';
import { buildCertificateModel } from '../report/label-certificate.js';
import { certificateToHtml, certificateToMarkdown, certificateToText } from '../report/label-render.js';
import {
  accessSync,
  constants as fsConstants,
  lstatSync,
  mkdirSync,
  readdirSync,
  statSync,
  unlinkSync,
} from 'node:fs';
import { createLog, readLog } from '../io/batch-log.js';
import { headerFromPlan } from '../io/check.js';
import { dirname, extname, join } from 'node:path';

/**
 * Refuse an output path that cannot take the file, before anything is computed or
 * written: a folder, a missing or read-only folder, an existing file (or link, even a
 * dangling one) without --force. The write itself stays atomic (io/atomic.ts).
 */
function checkOutputTarget(path: string, force: boolean): void {
  const where = { file: path, field: '--output' };
  let st: ReturnType<typeof lstatSync> | undefined;
  try {
    st = lstatSync(path);
  } catch {
    st = undefined;
  }
  if (st) {
    if (isDirectory(path))
      throw new ProblemError(
        {
          code: 'file-unwritable',
          reason:
            'it is a folder; give a file name inside it, e.g. -o FOLDER/fill.html (--force never replaces a folder)',
        },
        where,
      );
    if (!force)
      throw new ProblemError(
        {
          code: 'file-unwritable',
          reason:
            `${st.isSymbolicLink() ? 'a symbolic link of that name' : 'the file'} exists; ` +
            `add --force to replace it, or choose another name`,
        },
        where,
      );
  }
  const dir = dirname(path);
  if (!isDirectory(dir))
    throw new ProblemError(
      {
        code: 'file-unwritable',
        reason: `the folder ${dir} does not exist; create it first, or choose another place`,
      },
      where,
    );
  try {
    accessSync(dir, fsConstants.W_OK);
  } catch {
    throw new ProblemError(
      {
        code: 'file-unwritable',
        reason: `the folder ${dir} is not writable (permission denied); choose another place, or ask for write access`,
      },
      where,
    );
  }
}

/**
 * "wrote" is said only of a file that holds every byte: a short write (a full disk)
 * that slipped through is found here, the truncated file removed and the write refused.
 */
function verifyWritten(path: string, bytes: number): void {
  let size: number;
  try {
    size = statSync(path).size;
  } catch {
    throw new ProblemError(
      { code: 'file-unwritable', reason: 'the file is not there after writing it; nothing was written' },
      { file: path },
    );
  }
  if (size !== bytes) {
    try {
      unlinkSync(path);
    } catch {
      // removing it is a courtesy; the refusal below stands either way
    }
    throw new ProblemError(
      {
        code: 'file-unwritable',
        reason: `only ${size} of ${bytes} bytes reached the disk (is it full?); the incomplete file was removed`,
      },
      { file: path },
    );
  }
}

/** the sheet formats, by file extension */
const FORMAT_OF_EXTENSION: Readonly<Record<string, string>> = {
  '.html': 'html',
  '.htm': 'html',
  '.md': 'md',
  '.markdown': 'md',
  '.txt': 'txt',
  '.pdf': 'pdf',
};

/** the sheet's format: --format, else from the extension of -o, else html; a known extension that disagrees is refused */
function sheetFormat(format: string | undefined, output: string | undefined): string {
  const ext = output ? extname(output).toLowerCase() : '';
  const fromExt = Object.prototype.hasOwnProperty.call(FORMAT_OF_EXTENSION, ext)
    ? FORMAT_OF_EXTENSION[ext]
    : undefined;
  const known = Object.keys(FORMAT_OF_EXTENSION).join(', ');
  if (format === undefined) {
    if (!output) return 'html';
    if (fromExt) return fromExt;
    throw new ProblemError(
      {
        code: 'schema',
        reason:
          `cannot tell the sheet format from the file name "${output}" (extension ${ext || 'none'}); ` +
          `name the file ${known}, or give --format html|md|txt|pdf`,
      },
      { field: '--output' },
    );
  }
  // md and txt are both plain text; html and pdf are not interchangeable with anything
  const plain = (f: string) => f === 'md' || f === 'txt';
  if (fromExt && fromExt !== format && !(plain(fromExt) && plain(format))) {
    throw new ProblemError(
      {
        code: 'design-conflict',
        reason:
          `--format ${format} would write ${format} into a file named ${ext}; give ` +
          `a file name that ends in the format's extension, or leave --format out to ` +
          `take it from the name`,
      },
      { field: '--format' },
    );
  }
  return format;
}

function isDirectory(p: string): boolean {
  try {
    return statSync(p).isDirectory();
  } catch {
    return false;
  }
}

function listLogs(dir: string): string[] {
  return readdirSync(dir)
    .filter((f) => /\.(jsonl|csv)$/i.test(f))
    .sort()
    .map((f) => join(dir, f));
}
import { VERSION } from '../version.js';

/** the most Monte Carlo trials `check` runs (memory: about 1.2 GB at this count) */
const MAX_TRIALS = 10_000_000;

export interface Streams {
  readonly stdout: { write(s: string): unknown };
  readonly stderr: { write(s: string): unknown };
  /** whether stdin and stdout are a terminal (bare `mixwright` opens the wizard only then) */
  readonly isTTY?: boolean;
}

function systemReason(code: string): string {
  switch (code) {
    case 'ENOSPC':
      return 'the disk is full; free some space, or write elsewhere';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied; choose another place, or ask for access';
    case 'EISDIR':
      return 'a folder is in the way';
    case 'EROFS':
      return 'the file system is read-only';
    case 'EDQUOT':
      return 'the disk quota is used up';
    case 'ENOENT':
      return 'a folder on the path does not exist';
    default:
      return 'an input/output error';
  }
}

export const EXIT = { ok: 0, internal: 1, input: 2, danger: 3, outOfTolerance: 4, interrupted: 130 } as const;

class ExitSignal extends Error {
  constructor(readonly code: number) {
    super(`exit ${code}`);
  }
}

interface PlanOptions {
  json?: boolean;
  fuel?: string;
  oxidizer?: string;
  phi?: string;
  diluent?: string;
  dilution?: string;
  diluentRatio?: string;
  fuelFraction?: string;
  fractions?: string;
  volume?: string;
  tank?: string;
  pressure?: string;
  temperature?: string;
  order?: string;
  lab?: string;
  units?: string;
  barometer?: string;
  tolerance?: string;
  experiments?: string;
  rating?: string;
  workingFraction?: string;
  reactor?: string;
  reactorVolume?: string;
  lineVolume?: string;
  fillPressure?: string;
}

const OPTION_OF: Record<string, string> = {
  'mixture.fuel': '--fuel',
  'mixture.oxidizer': '--oxidizer',
  'mixture.phi': '--phi',
  'mixture.diluent': '--diluent',
  'mixture.dilution': '--dilution',
  'mixture.diluent_ratio': '--diluent-ratio',
  'mixture.fuel_fraction': '--fuel-fraction',
  'mixture.fractions': '--fractions',
  volume: '--volume',
  rating: '--rating',
  working_fraction: '--working-fraction',
  tank: '--tank',
  pressure: '--pressure',
  temperature: '--temperature',
  order: '--order',
  'tolerance.relative': '--tolerance',
  'experiments.count': '--experiments',
  'experiments.reactor': '--reactor',
  'experiments.reactor_volume': '--reactor-volume',
  'experiments.line_volume': '--line-volume',
  'experiments.fill_pressure': '--fill-pressure',
};

/** --barometer: an absolute pressure in the range of the atmosphere anywhere people work */
function parseBarometer(text: string): number {
  const pa = parseQuantity(text, 'pressure', { field: '--barometer' });
  if (!(pa >= 30000 && pa <= 110000)) {
    throw new ProblemError(
      {
        code: 'out-of-range',
        what: 'barometric pressure',
        value: pa,
        text,
        allowed:
          '300 hPa to 1100 hPa (225 to 825 Torr), absolute: the atmosphere from high mountains to below sea level',
      },
      { field: '--barometer' },
    );
  }
  return pa;
}

function numberOption(text: string, option: string): number {
  const s = text.trim();
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(s)) {
    throw new ProblemError({ code: 'schema', reason: `"${text}" is not a number` }, { field: option });
  }
  const v = Number(s);
  if (!Number.isFinite(v))
    throw new ProblemError(
      { code: 'schema', reason: `"${text}" is too large a number to represent; check the exponent` },
      { field: option },
    );
  return v;
}

/** merge inline options over a recipe (or build one from options alone) */
function mergeOptions(base: RecipeSource | undefined, o: PlanOptions): RecipeSource {
  const r: Record<string, unknown> = base ? structuredClone(base.recipe) : { id: 'inline' };
  const overridden = new Set<string>();
  const set = (path: string, value: unknown) => {
    const keys = path.split('.');
    let cur = r as Record<string, unknown>;
    for (const k of keys.slice(0, -1)) {
      if (typeof cur[k] !== 'object' || cur[k] === null) cur[k] = {};
      cur = cur[k] as Record<string, unknown>;
    }
    cur[keys[keys.length - 1]] = value;
    overridden.add(path);
  };
  const phiOptions =
    o.fuel ?? o.oxidizer ?? o.phi ?? o.diluent ?? o.dilution ?? o.diluentRatio ?? o.fuelFraction;
  if (o.fractions !== undefined && phiOptions !== undefined) {
    throw new ProblemError(
      {
        code: 'design-conflict',
        reason: 'give either --fractions, or --fuel/--oxidizer/--phi with one dilution measure, not both',
      },
      { field: '--fractions' },
    );
  }
  if (o.fractions !== undefined) {
    r.mixture = {};
    set('mixture.fractions', o.fractions);
  } else if (phiOptions !== undefined) {
    const m = (r.mixture ?? {}) as Record<string, unknown>;
    r.mixture = 'fractions' in m ? {} : m;
    if (o.dilution ?? o.diluentRatio ?? o.fuelFraction) {
      const mm = r.mixture as Record<string, unknown>;
      delete mm.dilution;
      delete mm.diluent_ratio;
      delete mm.fuel_fraction;
    }
    if (o.fuel !== undefined) set('mixture.fuel', o.fuel);
    if (o.oxidizer !== undefined) set('mixture.oxidizer', o.oxidizer);
    if (o.phi !== undefined) set('mixture.phi', numberOption(o.phi, '--phi'));
    if (o.diluent !== undefined) set('mixture.diluent', o.diluent);
    if (o.dilution !== undefined) set('mixture.dilution', numberOption(o.dilution, '--dilution'));
    if (o.diluentRatio !== undefined)
      set('mixture.diluent_ratio', numberOption(o.diluentRatio, '--diluent-ratio'));
    if (o.fuelFraction !== undefined)
      set('mixture.fuel_fraction', numberOption(o.fuelFraction, '--fuel-fraction'));
  }
  if (o.volume !== undefined) set('volume', o.volume);
  if (o.rating !== undefined) set('rating', o.rating);
  if (o.workingFraction !== undefined)
    set('working_fraction', numberOption(o.workingFraction, '--working-fraction'));
  if (o.tank !== undefined) set('tank', o.tank);
  if (o.pressure !== undefined) set('pressure', o.pressure);
  if (o.temperature !== undefined) set('temperature', o.temperature);
  if (o.order !== undefined)
    set(
      'order',
      o.order.split(',').map((s) => s.trim()),
    );
  if (o.tolerance !== undefined) set('tolerance.relative', numberOption(o.tolerance, '--tolerance'));
  if (o.experiments !== undefined) {
    set('experiments.count', numberOption(o.experiments, '--experiments'));
    if (o.pressure === undefined) delete r.pressure; // the count sets the final pressure
  }
  if (
    o.pressure !== undefined &&
    o.experiments === undefined &&
    r.experiments &&
    typeof r.experiments === 'object'
  )
    delete (r.experiments as Record<string, unknown>).count;
  if (o.reactor !== undefined) set('experiments.reactor', o.reactor);
  if (o.reactorVolume !== undefined) set('experiments.reactor_volume', o.reactorVolume);
  if (o.lineVolume !== undefined) set('experiments.line_volume', o.lineVolume);
  if (o.fillPressure !== undefined) set('experiments.fill_pressure', o.fillPressure);

  const locate: Locate = (path) => {
    const key = path.filter((p) => typeof p === 'string').join('.');
    for (const [p, opt] of Object.entries(OPTION_OF)) {
      if (overridden.has(p) && (key === p || key.startsWith(`${p}.`))) return { field: opt };
    }
    if (key.startsWith('mixture') && !base) return { field: '--fuel/--oxidizer/--phi or --fractions' };
    if (!base) {
      const top = String(path[0] ?? '');
      const opt = OPTION_OF[top];
      return { field: opt ?? top };
    }
    return base.locate(path);
  };
  if (!base) {
    // say which options are missing, in option names rather than recipe keys
    const missing: string[] = [];
    if (
      o.fractions === undefined &&
      (o.fuel === undefined || o.oxidizer === undefined || o.phi === undefined)
    )
      missing.push('--fuel, --oxidizer and --phi (or --fractions)');
    if (o.pressure === undefined && o.experiments === undefined)
      missing.push('--pressure (or --experiments)');
    if (o.temperature === undefined) missing.push('--temperature');
    if (o.volume === undefined && o.tank === undefined) missing.push('--volume or --tank');
    if (missing.length) {
      throw new ProblemError(
        {
          code: 'design-missing',
          reason: `give a recipe file, or on the command line: ${missing.join('; ')}`,
        },
        { field: 'plan' },
      );
    }
  }
  const recipe: RecipeFile = validateRecipeObject(r, base?.origin ?? 'command line', locate);
  return { recipe, locate, baseDir: base?.baseDir ?? process.cwd(), origin: base?.origin ?? 'command line' };
}

export function createProgram(streams: Streams): {
  program: Command;
  run: (argv: readonly string[]) => Promise<number>;
} {
  const out = (s: string) => streams.stdout.write(s);
  const err = (s: string) => streams.stderr.write(s);
  const program = new Command();
  program
    .name('mixwright')
    .description(
      'Plan, guide and re-check the manometric preparation of reactant gas mixtures.\nRun ' +
        'with no command in a terminal to open the wizard.',
    )
    .version(VERSION, '-V, --version')
    .configureOutput({ writeOut: out, writeErr: err })
    .exitOverride()
    .showHelpAfterError('(run with --help for usage)');

  /** the design options that plan and sheet share */
  const withDesignOptions = (c: Command) =>
    c
      .argument('[recipe]', 'recipe file (YAML); inline options override its fields')
      .option('--fuel <blend>', 'fuel species or blend, e.g. CH4 or CH4:0.8,C2H6:0.2')
      .option('--oxidizer <blend>', 'O2, air, or a blend such as O2:0.21,N2:0.79')
      .option('--phi <number>', 'equivalence ratio')
      .option('--diluent <blend>', 'bath gas, e.g. Ar or Ar:0.5,He:0.5')
      .option('--dilution <fraction>', 'diluent mole fraction of the final mixture')
      .option('--diluent-ratio <number>', 'mol diluent per mol O2')
      .option('--fuel-fraction <fraction>', 'total fuel mole fraction')
      .option('--fractions <list>', 'explicit mole fractions, e.g. CH4:0.05,O2:0.10,Ar:0.85')
      .option('--volume <quantity>', 'tank volume, e.g. "30 L"')
      .option('--tank <id>', 'tank from the lab profile')
      .option(
        '--rating <quantity>',
        'maximum allowed working pressure of the tank given by --volume, e.g. "4 bar" or "45 psig"',
      )
      .option('--working-fraction <fraction>', 'fraction of --rating used as the working limit (default 1)')
      .option('--pressure <quantity>', 'final pressure, absolute, e.g. "1500 Torr"')
      .option('--temperature <quantity>', 'tank temperature, e.g. "22 degC"')
      .option('--order <list>', 'fill order, e.g. CH4,O2,Ar')
      .option('--lab <file>', 'lab profile (YAML); the embedded demo lab if absent')
      .option('--tolerance <fraction>', 'allowed relative deviation of each mole fraction (default 0.005)')
      .option(
        '--barometer <quantity>',
        'barometric pressure now, for gauge-referenced readings and gauge pressures ' +
          'such as "15 psig", e.g. "752.3 Torr"',
      )
      .option('--experiments <n>', 'size the batch for n experiments (sets the final pressure)')
      .option('--reactor <id>', 'reactor or driven section from the lab profile')
      .option('--reactor-volume <quantity>', 'reactor volume filled per experiment, e.g. "0.9 L"')
      .option('--line-volume <quantity>', 'line volume to the reactor, e.g. "0.05 L"')
      .option('--fill-pressure <quantity>', 'fill pressure of one experiment, e.g. "50 Torr"')
      .addOption(
        new Option(
          '--units <unit>',
          'pressure unit of the tables (default: the unit of the final pressure, else Torr)',
        ).choices([...PRESSURE_UNITS]),
      );

  /** recipe and options -> plan, with errors pointed at the file line or option */
  const planFrom = (recipeFile: string | undefined, o: PlanOptions) => {
    const barometricPa = o.barometer === undefined ? undefined : parseBarometer(o.barometer);
    const base = recipeFile ? readRecipe(recipeFile) : undefined;
    const rs = mergeOptions(base, o);
    const req = buildPlanRequest(rs, o.lab, { barometricPa });
    let plan;
    try {
      plan = planWithPrediction(planFill(req.input), req);
    } catch (e) {
      // the core names the recipe field (pressure, temperature, ...): point at it in the file or option
      if (e instanceof ProblemError && e.where.field)
        throw relocate(e, {
          ...rs.locate([e.where.field]),
          field: rs.locate([e.where.field]).field ?? e.where.field,
        });
      throw e;
    }
    // default: the unit the final pressure was given in, when it is one of ours; else Torr
    const given = /[A-Za-z]+$/.exec((req.recipe.pressure ?? '').trim())?.[0] ?? '';
    const unit: PressureUnit =
      o.units && isPressureUnit(o.units) ? o.units : isPressureUnit(given) ? given : 'Torr';
    // a batch too small for one experiment is a warning finding, with the plan's own
    const tooSmall = req.sizing ? batchSizeFinding(req.sizing, plan.final.pressurePa) : undefined;
    if (tooSmall) plan = { ...plan, findings: [...plan.findings, tooSmall] };
    const served = req.sizing ? experimentsServed(req.sizing, plan.final.pressurePa) : undefined;
    const meta = {
      recipeId: req.recipe.id,
      labName: req.lab.name,
      orderRecommended: req.orderRecommended,
      version: VERSION,
      experiments:
        served && req.sizing
          ? {
              count: served.experiments,
              sizedFor: req.sizedFor,
              reactor: req.sizing.reactor,
              perExperimentMol: served.sizing.perExperimentMol,
              minTankPa: served.sizing.minTankPa,
              margin: req.sizing.margin,
            }
          : undefined,
      barometer: {
        pressurePa: req.input.reading.barometricPa,
        uncertaintyPa: req.input.reading.barometricUncertaintyPa,
        given: o.barometer !== undefined,
      },
    };
    return { plan, req, unit, meta };
  };

  withDesignOptions(
    program
      .command('plan')
      .description('fill plan of a mixture: real-gas target readings, gauges, tolerance bands and findings'),
  )
    .option('--json', 'print one JSON object (SI units in the key names)')
    .action(async (recipeFile: string | undefined, o: PlanOptions) => {
      const { plan, unit, meta } = planFrom(recipeFile, o);
      if (o.json) out(JSON.stringify(planToJson(plan, meta, unit), null, 2) + '\n');
      else out(planToText(plan, meta, unit));
      if (worstSeverity(plan.findings) === 'danger') throw new ExitSignal(EXIT.danger);
    });

  withDesignOptions(
    program
      .command('sheet')
      .description(
        'printable fill checklist: steps with targets and bands, checks, findings, and the fuel/O2/inert diagram',
      ),
  )
    .addOption(
      new Option('--format <format>', 'output format (default: from the extension of -o, else html)').choices(
        ['html', 'md', 'txt', 'pdf'],
      ),
    )
    .option('-o, --output <file>', 'write to this file (required for pdf); stdout otherwise')
    .option('--force', 'overwrite an existing output file')
    .addOption(
      new Option('--paper <size>', 'page size for html and pdf').choices(['a4', 'letter']).default('a4'),
    )
    .option('--batch <id>', 'batch id printed on the sheet (default: recipe id and date)')
    .action(
      async (
        recipeFile: string | undefined,
        o: PlanOptions & {
          format?: string;
          output?: string;
          force?: boolean;
          paper: 'a4' | 'letter';
          batch?: string;
        },
      ) => {
        const format = sheetFormat(o.format, o.output);
        if (o.output) checkOutputTarget(o.output, Boolean(o.force));
        const { plan, req, unit } = planFrom(recipeFile, o);
        const h = req.tankInfo?.heightM;
        const mixing = h
          ? mixingEstimate(
              plan.composition,
              plan.temperatureK,
              plan.final.pressurePa,
              h,
              Boolean(req.tankInfo?.stirred),
            )
          : undefined;
        const model = buildSheetModel(plan, {
          recipe: req.recipe,
          labName: req.lab.name,
          orderRecommended: req.orderRecommended,
          unit,
          batchId: o.batch,
          version: VERSION,
          paper: o.paper,
          mixing,
          barometer: {
            pressurePa: req.input.reading.barometricPa,
            uncertaintyPa: req.input.reading.barometricUncertaintyPa,
            given: o.barometer !== undefined,
          },
        });
        if (format === 'pdf') {
          if (!o.output)
            throw new ProblemError(
              { code: 'design-missing', reason: 'a PDF needs a file: give -o fill.pdf' },
              { field: '--output' },
            );
          await writePdf(sheetToHtml(model), o.output, Boolean(o.force));
          out(`wrote ${o.output}\n`);
        } else {
          const text =
            format === 'md'
              ? sheetToMarkdown(model)
              : format === 'txt'
                ? sheetToText(model)
                : sheetToHtml(model);
          if (o.output) {
            writeFileAtomic(o.output, text, Boolean(o.force));
            verifyWritten(o.output, Buffer.byteLength(text, 'utf8'));
            out(`wrote ${o.output}\n`);
          } else out(text);
        }
        if (worstSeverity(plan.findings) === 'danger') throw new ExitSignal(EXIT.danger);
      },
    );

  withDesignOptions(
    program
      .command('ready')
      .description(
        'readiness of the filled tank: diffusion mixing time, and contamination from ' +
          'the base vacuum and leak-up over storage',
      ),
  )
    .option('--json', 'print one JSON object')
    .option('--stirred', 'the tank is stirred')
    .option('--height <length>', 'inside height of the tank, e.g. "0.8 m" (default: the lab profile)')
    .option(
      '--leak <rate>',
      'leak-up rate measured under vacuum, e.g. "2e-5 Torr/min" (default: the lab profile)',
    )
    .option(
      '--base-vacuum <pressure>',
      'pressure before the first fill, e.g. "1e-4 Torr" (default: the lab profile)',
    )
    .option('--days <n>', 'storage time for the contamination estimate', '14')
    .action(
      async (
        recipeFile: string | undefined,
        o: PlanOptions & {
          stirred?: boolean;
          height?: string;
          leak?: string;
          baseVacuum?: string;
          days: string;
        },
      ) => {
        const { plan, req } = planFrom(recipeFile, o);
        const info = req.tankInfo;
        const notes: string[] = [];
        const heightM = o.height !== undefined ? parseLength(o.height, { field: '--height' }) : info?.heightM;
        if (heightM === undefined)
          throw new ProblemError(
            {
              code: 'design-missing',
              reason:
                'the tank height is not known: give --height or add "height" to the tank in the lab profile',
            },
            { field: '--height' },
          );
        if (!(heightM > 0))
          throw new ProblemError(
            { code: 'not-positive', what: 'tank height', value: heightM },
            { field: '--height' },
          );
        const leak =
          o.leak !== undefined
            ? parseQuantity(o.leak, 'pressure rate', { field: '--leak' })
            : info?.leakRatePaPerS;
        if (leak === undefined)
          throw new ProblemError(
            {
              code: 'design-missing',
              reason:
                'the leak-up rate is not known: measure it and give --leak, or add "leak_rate" ' +
                'to the tank in the lab profile',
            },
            { field: '--leak' },
          );
        const base =
          o.baseVacuum !== undefined
            ? parseQuantity(o.baseVacuum, 'pressure', { field: '--base-vacuum' })
            : info?.baseVacuumPa;
        if (base === undefined)
          throw new ProblemError(
            {
              code: 'design-missing',
              reason:
                'the base vacuum is not known: give --base-vacuum or add "base_vacuum" to the tank in the lab profile',
            },
            { field: '--base-vacuum' },
          );
        if (o.leak === undefined)
          notes.push('leak-up rate from the lab profile; measure it before each batch and give --leak');
        const days = numberOption(o.days, '--days');
        if (!(days >= 0 && days <= 36500))
          throw new ProblemError(
            {
              code: 'out-of-range',
              what: 'days',
              value: days,
              text: o.days,
              allowed: '0 to 36500 (100 years)',
            },
            { field: '--days' },
          );
        const stirred = Boolean(o.stirred ?? info?.stirred);
        const y = plan.composition;
        const report = {
          id: req.recipe.id,
          tank: plan.tank.id,
          heightM,
          pressurePa: plan.final.pressurePa,
          temperatureK: plan.temperatureK,
          mixing: mixingEstimate(y, plan.temperatureK, plan.final.pressurePa, heightM, stirred),
          contamination: contamination({
            composition: y,
            tankPressurePa: plan.final.pressurePa,
            baseVacuumPa: base,
            leakRatePaPerS: leak,
            days,
            atmosphericPa: req.input.reading.barometricPa,
            air: req.lab.air,
          }),
          days,
          leakRatePaPerS: leak,
          baseVacuumPa: base,
          notes,
        };
        out(o.json ? JSON.stringify(readyToJson(report, VERSION), null, 2) + '\n' : readyToText(report));
      },
    );

  /**
   * the interactive screens are a separate bundle (dist/tui.mjs) with its own copy of the core, so a
   * refusal thrown there is not an instance of this bundle's ProblemError: carry it over by its shape
   */
  const fromTui = async <T>(run: () => Promise<T>): Promise<T> => {
    try {
      return await run();
    } catch (e) {
      if (
        !(e instanceof ProblemError) &&
        e instanceof Error &&
        e.name === 'ProblemError' &&
        'problem' in e &&
        'where' in e
      )
        throw new ProblemError((e as ProblemError).problem, (e as ProblemError).where);
      throw e;
    }
  };

  /** Ctrl-C in the guided fill: what the log holds and how to go on, then exit 130 */
  const fillEnded = (
    r:
      { interrupted: boolean; logged: number; steps: number; verdict?: string; danger?: boolean } | undefined,
    logFile: string,
  ) => {
    if (!r) return;
    if (r.interrupted) {
      err(
        `mixwright: fill stopped by Ctrl-C: ${r.logged} of ${r.steps} readings are ` +
          `logged in ${logFile}. Resume with: mixwright fill --resume ${logFile}\n`,
      );
      throw new ExitSignal(EXIT.interrupted);
    }
    // the outcome as \`check\` of the log reports it: out of tolerance (or ended incomplete) 4, a danger in the record 3
    if (r.verdict === 'fail') {
      err(
        `mixwright: ${logFile}: the re-check of the batch is FAIL (out of tolerance, ` +
          `or stopped before the last fill); see \`mixwright check ${logFile}\`\n`,
      );
      throw new ExitSignal(EXIT.outOfTolerance);
    }
    if (r.danger) {
      err(
        `mixwright: ${logFile}: a danger finding stands in the record (e.g. a reading ` +
          `past the working limit): do not use the tank as fit until it is inspected; ` +
          `see \`mixwright check ${logFile}\`\n`,
      );
      throw new ExitSignal(EXIT.danger);
    }
  };

  withDesignOptions(
    program
      .command('fill')
      .description(
        'guided fill at the manifold: one step at a time, each reading logged at ' +
          'once, the rest re-targeted (interactive)',
      ),
  )
    .option('--resume <log>', 'continue an interrupted fill from its batch log')
    .option('--batch <id>', 'batch id (default: recipe id and date and time)')
    .option('--dir <folder>', 'folder of the batch logs', 'batches')
    .action(
      async (
        recipeFile: string | undefined,
        o: PlanOptions & { resume?: string; batch?: string; dir: string },
      ) => {
        if (!streams.isTTY) {
          throw new ProblemError(
            {
              code: 'design-missing',
              reason:
                'the guided fill needs a terminal (stdin and stdout are not one). Use `mixwright ' +
                'plan` or `mixwright sheet` to prepare, and `mixwright check` on the log ' +
                'or a CSV of the readings',
            },
            { field: 'fill' },
          );
        }
        const tui = await import('../tui/run.js');
        if (o.resume) {
          if (recipeFile)
            throw new ProblemError(
              {
                code: 'design-conflict',
                reason: 'a resumed fill takes its design from the log; give --resume LOG alone',
              },
              { field: '--resume' },
            );
          const log = readLog(o.resume);
          if (log.closed)
            throw new ProblemError(
              {
                code: 'design-conflict',
                reason: 'this batch log is closed: the fill is finished. Re-check it with `mixwright check`',
              },
              { file: o.resume },
            );
          for (const w of log.warnings) err(`mixwright: ${o.resume}: ${w}\n`);
          const resume = o.resume;
          fillEnded(await fromTui(() => tui.runFill({ header: log.header, logFile: resume, log })), resume);
          return;
        }
        const { plan, req } = planFrom(recipeFile, o);
        const stamp = new Date().toISOString().replace(/[-:]/g, '').slice(0, 13);
        const id = o.batch ?? `${req.recipe.id}-${stamp}`;
        if (!/^[A-Za-z0-9._-]+$/.test(id))
          throw new ProblemError(
            { code: 'schema', reason: `batch id "${id}" may hold letters, digits, '.', '_' and '-' only` },
            { field: '--batch' },
          );
        mkdirSync(o.dir, { recursive: true });
        const file = join(o.dir, `${id}.jsonl`);
        createLog(file, headerFromPlan(plan, req, id, new Date().toISOString()));
        fillEnded(await fromTui(() => tui.runFill({ header: readLog(file).header, logFile: file })), file);
      },
    );

  program
    .command('check')
    .description(
      're-check a batch from its logged fills: composition, phi and dilution with ' +
        'a GUM and Monte Carlo uncertainty budget, against the design',
    )
    .argument('<log>', 'batch log (.jsonl), CSV readings (species,pressure,temperature), or a folder of them')
    .option(
      '--recipe <file>',
      'the design the CSV readings were filled to (its lab profile, cylinders and tolerance)',
    )
    .option('--lab <file>', 'lab profile for CSV readings (gauges, barometer, thermometer)')
    .option('--json', 'print one JSON object')
    .option(
      '--trials <n>',
      'Monte Carlo trials, 100000 to 10000000 (default 200000 for one log; a folder ' +
        'is checked by GUM alone unless given)',
    )
    .option('--seed <n>', 'seed of the Monte Carlo generator', '1')
    .option(
      '--barometer <quantity>',
      'barometric pressure at the fill, for CSV readings of gauge-referenced sensors ' +
        'and gauge units such as "psig", e.g. "752.3 Torr" (default: the lab profile)',
    )
    .action(
      async (
        target: string,
        o: {
          recipe?: string;
          lab?: string;
          json?: boolean;
          trials?: string;
          seed: string;
          barometer?: string;
        },
      ) => {
        const folder = isDirectory(target);
        const trials = o.trials === undefined ? (folder ? 0 : 200000) : numberOption(o.trials, '--trials');
        // the trials are kept in memory for the interval: about 1.2 GB at 1e7 (measured), so that is the ceiling
        if (o.trials !== undefined && !(Number.isInteger(trials) && trials >= 1e5 && trials <= MAX_TRIALS)) {
          throw new ProblemError(
            {
              code: 'out-of-range',
              what: 'Monte Carlo trials',
              value: trials,
              allowed:
                `a whole number from 100000 (JCGM 101 needs enough trials for a 95 % interval) ` +
                `to ${MAX_TRIALS} (the trials are held in memory, about 1.2 GB at that count)`,
            },
            { field: '--trials' },
          );
        }
        const seed = numberOption(o.seed, '--seed');
        const opts = {
          trials,
          seed,
          recipeFile: o.recipe,
          labFile: o.lab,
          barometricPa: o.barometer === undefined ? undefined : parseBarometer(o.barometer),
        };
        if (folder) {
          const files = listLogs(target);
          if (files.length === 0)
            throw new ProblemError(
              { code: 'file-unreadable', reason: 'the folder holds no .jsonl or .csv files' },
              { file: target },
            );
          type Row = { file: string; report: CheckReport } | { file: string; error: string };
          const rows: Row[] = [];
          for (const f of files) {
            try {
              // --barometer is for CSV readings; a log in the folder keeps its own
              rows.push({
                file: f,
                report: await checkFile(f, /\.csv$/i.test(f) ? opts : { ...opts, barometricPa: undefined }),
              });
            } catch (e) {
              if (e instanceof ProblemError) {
                rows.push({ file: f, error: describeProblemAt(e.problem, e.where) });
                err(
                  `mixwright: ${describeProblemAt(e.problem, e.where.file ? e.where : { ...e.where, file: f })}\n ` +
                    ` (error code: ${e.problem.code})\n`,
                );
              } else throw e;
            }
          }
          if (o.json)
            out(
              JSON.stringify(
                rows.map((r) =>
                  'report' in r
                    ? {
                        file: r.file,
                        verdict: r.report.verdict.verdict,
                        check: checkToJson(r.report, VERSION),
                      }
                    : r,
                ),
                null,
                2,
              ) + '\n',
            );
          else out(folderSummary(rows));
          if (rows.some((r) => 'error' in r)) {
            err(
              `mixwright: ${rows.filter((r) => 'error' in r).length} of ${rows.length} ` +
                `files in ${target} could not be checked (above)\n`,
            );
            throw new ExitSignal(EXIT.input);
          }
          if (rows.some((r) => 'report' in r && r.report.verdict.verdict === 'fail'))
            throw new ExitSignal(EXIT.outOfTolerance);
          // a reading past a tank's working limit or a gauge's range stands beside any verdict
          if (rows.some((r) => 'report' in r && r.report.findings.some((f) => f.severity === 'danger')))
            throw new ExitSignal(EXIT.danger);
          return;
        }
        const report = await checkFile(target, opts);
        if (o.json) out(JSON.stringify(checkToJson(report, VERSION), null, 2) + '\n');
        else out(checkToText(report));
        if (report.verdict.verdict === 'fail') throw new ExitSignal(EXIT.outOfTolerance);
        if (report.findings.some((f) => f.severity === 'danger')) throw new ExitSignal(EXIT.danger);
      },
    );

  program
    .command('label')
    .description(
      'as-filled tank label and one-page batch certificate from a batch log (the ' +
        'composition and U of `check`, never the design)',
    )
    .argument('<log>', 'batch log (.jsonl)')
    .addOption(
      new Option('--format <format>', 'output format (txt: the label and the certificate as text)')
        .choices(['txt', 'md', 'html', 'pdf'])
        .default('txt'),
    )
    .option('-o, --output <file>', 'write to this file (required for pdf); stdout otherwise')
    .option('--force', 'overwrite an existing output file')
    .addOption(
      new Option('--paper <size>', 'page size for html and pdf').choices(['a4', 'letter']).default('a4'),
    )
    .option('--trials <n>', 'Monte Carlo trials, 100000 to 10000000 (default 200000, as check)')
    .option('--seed <n>', 'seed of the Monte Carlo generator', '1')
    .action(
      async (
        target: string,
        o: {
          format: string;
          output?: string;
          force?: boolean;
          paper: 'a4' | 'letter';
          trials?: string;
          seed: string;
        },
      ) => {
        if (isDirectory(target) || !/\.jsonl$/i.test(target))
          throw new ProblemError(
            {
              code: 'file-unreadable',
              reason:
                'a label is made from one batch log (.jsonl) written by `mixwright fill`; ' +
                're-check CSV readings with `mixwright check`',
            },
            { file: target },
          );
        const trials = o.trials === undefined ? 200000 : numberOption(o.trials, '--trials');
        if (o.trials !== undefined && !(Number.isInteger(trials) && trials >= 1e5 && trials <= MAX_TRIALS)) {
          throw new ProblemError(
            {
              code: 'out-of-range',
              what: 'Monte Carlo trials',
              value: trials,
              allowed: `a whole number from 100000 to ${MAX_TRIALS}`,
            },
            { field: '--trials' },
          );
        }
        const log = readLog(target);
        // the same computation as `check` of this log, so the label and `check --json` agree
        const report = await checkLog(log, { trials, seed: numberOption(o.seed, '--seed') });
        const model = buildCertificateModel(report, log, {
          version: VERSION,
          paper: o.paper,
          generated: new Date().toISOString().slice(0, 16).replace('T', ' ') + ' UTC',
        });
        if (o.format === 'pdf') {
          if (!o.output)
            throw new ProblemError(
              { code: 'design-missing', reason: 'a PDF needs a file: give -o label.pdf' },
              { field: '--output' },
            );
          await writePdf(certificateToHtml(model), o.output, Boolean(o.force));
          out(`wrote ${o.output}\n`);
        } else {
          const text =
            o.format === 'md'
              ? certificateToMarkdown(model)
              : o.format === 'html'
                ? certificateToHtml(model)
                : certificateToText(model);
          if (o.output) {
            writeFileAtomic(o.output, text, Boolean(o.force));
            out(`wrote ${o.output}\n`);
          } else out(text);
        }
        if (model.label.status === 'fail' || model.label.status === 'incomplete') {
          err(
            `mixwright: ${target}: the re-check FAILED; the label says so and gives the ` +
              `as-filled composition, not the design\n`,
          );
          throw new ExitSignal(EXIT.outOfTolerance);
        }
        // as `check`: a reading past the tank's working limit or a gauge's range stands whatever the composition
        if (model.label.danger) {
          err(`mixwright: ${target}: the log records a danger; the label says the tank is not fit to use\n`);
          throw new ExitSignal(EXIT.danger);
        }
      },
    );

  program
    .command('species')
    .description('species data: every property with its value, unit and source')
    .argument('[name]', 'species key or name (e.g. CH4, n-C7H16, toluene); all species if absent')
    .option('--temperature <quantity>', 'temperature for B(T) and cp', '298.15 K')
    .action((name: string | undefined, o: { temperature: string }) => {
      const T = parseQuantity(o.temperature, 'temperature', { field: '--temperature' });
      out(name ? speciesDetail(name, T) : speciesList());
    });

  program
    .command('schema')
    .description('JSON Schema of a file format, for editors')
    .argument('<format>', 'recipe or lab')
    .action((format: string) => {
      const schemas: Record<string, z.ZodType> = { recipe: recipeSchema, lab: labSchema };
      const s = Object.prototype.hasOwnProperty.call(schemas, format) ? schemas[format] : undefined;
      if (!s)
        throw new ProblemError(
          { code: 'schema', reason: `unknown format "${format}"; choose recipe or lab` },
          { field: 'schema' },
        );
      out(JSON.stringify(z.toJSONSchema(s, { io: 'input' }), null, 2) + '\n');
    });

  program
    .command('demo-lab')
    .description('print the embedded demo lab profile (YAML), a starting point for your own')
    .action(() => {
      out(DEMO_LAB_YAML);
    });

  program
    .command('wizard')
    .description(
      'build a mixture design step by step, with the plan and findings updating ' +
        'live (interactive; also what bare `mixwright` opens)',
    )
    .option('--lab <file>', 'lab profile (YAML); the embedded demo lab if absent')
    .action(async (o: { lab?: string }) => {
      if (!streams.isTTY)
        throw new ProblemError(
          {
            code: 'design-missing',
            reason:
              'the wizard needs a terminal. Use `mixwright plan`, `mixwright sheet` and `mixwright check`',
          },
          { field: 'wizard' },
        );
      const tui = await import('../tui/run.js');
      const r = await fromTui(() => tui.runWizard({ version: VERSION, labFile: o.lab }));
      if (r) fillEnded(r, r.logFile);
    });

  const run = async (argvIn: readonly string[]): Promise<number> => {
    let argv = argvIn;
    if (argv.length === 0) {
      if (!streams.isTTY) {
        err(
          'mixwright: not a terminal, so the wizard cannot open.\nUse `mixwright plan`, ' +
            '`mixwright sheet` and `mixwright check`; `mixwright --help` lists the commands.\n',
        );
        return EXIT.input;
      }
      argv = ['wizard'];
    }
    try {
      await program.parseAsync([...argv], { from: 'user' });
      return EXIT.ok;
    } catch (e) {
      if (e instanceof ExitSignal) return e.code;
      if (e instanceof CommanderError) {
        if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.exitCode === 0)
          return EXIT.ok;
        return EXIT.input;
      }
      if (e instanceof ProblemError) {
        err(`mixwright: ${describeProblemAt(e.problem, e.where)}\n  (error code: ${e.problem.code})\n`);
        return EXIT.input;
      }
      const sys = e as NodeJS.ErrnoException;
      if (typeof sys.code === 'string' && /^E[A-Z]+$/.test(sys.code) && typeof sys.syscall === 'string') {
        // a refusal by the system (full disk, permission, a folder in the way): the file and the cause, no stack
        err(
          `mixwright: ${sys.path ?? ''}${sys.path ? ': ' : ''}the system refused to ` +
            `${sys.syscall} it: ${systemReason(sys.code)} (${sys.code})\n  (error code: ` +
            `file-unwritable)\n`,
        );
        return EXIT.input;
      }
      err(
        `mixwright: internal error: ${(e as Error).message}\n  This is a fault in ` +
          `mixwright, not in your input; please report it with the command you ran.\n`,
      );
      return EXIT.internal;
    }
  };
  return { program, run };
}
