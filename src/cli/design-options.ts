/**
 * The design options that plan, sheet, ready and fill share, declared once: each entry
 * gives commander's option (flag, help text, choices), the recipe key it overrides (and
 * what it replaces there), how its text becomes the recipe's value, and the key of
 * `plan --json` that reports it. `addDesignOptions`, `mergeOptions` and the locator that
 * points a refusal at the option are all derived from this table.
 */
import { Option, type Command } from 'commander';
import { ProblemError } from '../core/index.js';
import { validateRecipeObject, type Locate, type RecipeSource } from '../io/load.js';
import type { RecipeFile } from '../io/recipe.js';
import { PRESSURE_UNITS } from '../io/quantity.js';
import { numberOption } from './numbers.js';

/** how an option's text becomes the recipe's value */
type Parse = 'text' | 'number' | 'list';

export interface DesignOption {
  /** commander's flag, e.g. "--phi <number>" */
  readonly flag: string;
  readonly help: string;
  readonly choices?: readonly string[];
  /** the recipe key it overrides, e.g. "mixture.phi"; absent for options the plan reads directly */
  readonly recipe?: string;
  readonly parse?: Parse;
  /** recipe keys dropped from the recipe file's design when this option is given (and their own option is not) */
  readonly replaces?: readonly string[];
  /** the design group: a phi design and explicit fractions exclude each other */
  readonly group?: 'phi' | 'fractions';
  /**
   * the key of `plan --json` that reports the value (dotted path); null for the two options that
   * only shape the text (--units: the JSON is in SI units) or the limit (--working-fraction: the
   * JSON reports the findings it leads to, not the fraction)
   */
  readonly json: string | null;
}

const BASES = ['mixture.dilution', 'mixture.diluent_ratio', 'mixture.fuel_fraction'];
const basis = (key: string) => BASES.filter((b) => b !== key);

/** in the order `--help` lists them */
export const DESIGN_OPTIONS: readonly DesignOption[] = [
  {
    flag: '--fuel <blend>',
    help: 'fuel species or blend, e.g. CH4 or CH4:0.8,C2H6:0.2',
    recipe: 'mixture.fuel',
    group: 'phi',
    json: 'mixture.fuel',
  },
  {
    flag: '--oxidizer <blend>',
    help: 'O2, air, or a blend such as O2:0.21,N2:0.79',
    recipe: 'mixture.oxidizer',
    group: 'phi',
    json: 'mixture.oxidizer',
  },
  {
    flag: '--phi <number>',
    help: 'equivalence ratio',
    recipe: 'mixture.phi',
    parse: 'number',
    group: 'phi',
    json: 'mixture.phi',
  },
  {
    flag: '--diluent <blend>',
    help: 'bath gas, e.g. Ar or Ar:0.5,He:0.5',
    recipe: 'mixture.diluent',
    group: 'phi',
    json: 'mixture.diluent',
  },
  {
    flag: '--dilution <fraction>',
    help: 'diluent mole fraction of the final mixture',
    recipe: 'mixture.dilution',
    parse: 'number',
    group: 'phi',
    replaces: basis('mixture.dilution'),
    json: 'mixture.diluent_fraction',
  },
  {
    flag: '--diluent-ratio <number>',
    help: 'mol diluent per mol O2',
    recipe: 'mixture.diluent_ratio',
    parse: 'number',
    group: 'phi',
    replaces: basis('mixture.diluent_ratio'),
    json: 'mixture.diluent_fraction',
  },
  {
    flag: '--fuel-fraction <fraction>',
    help: 'total fuel mole fraction',
    recipe: 'mixture.fuel_fraction',
    parse: 'number',
    group: 'phi',
    replaces: basis('mixture.fuel_fraction'),
    json: 'mixture.fuel_fraction',
  },
  {
    flag: '--fractions <list>',
    help: 'explicit mole fractions, e.g. CH4:0.05,O2:0.10,Ar:0.85',
    recipe: 'mixture.fractions',
    group: 'fractions',
    replaces: ['mixture'],
    json: 'mixture.composition',
  },
  { flag: '--volume <quantity>', help: 'tank volume, e.g. "30 L"', recipe: 'volume', json: 'tank.volume_m3' },
  { flag: '--tank <id>', help: 'tank from the lab profile', recipe: 'tank', json: 'tank.id' },
  {
    flag: '--rating <quantity>',
    help: 'maximum allowed working pressure of the tank given by --volume, e.g. "4 bar" or "45 psig"',
    recipe: 'rating',
    json: 'tank.rated_pressure_Pa',
  },
  {
    flag: '--working-fraction <fraction>',
    help: 'fraction of --rating used as the working limit (default 1)',
    recipe: 'working_fraction',
    parse: 'number',
    json: null,
  },
  {
    flag: '--pressure <quantity>',
    help: 'final pressure, absolute, e.g. "1500 Torr"',
    recipe: 'pressure',
    replaces: ['experiments.count'],
    json: 'final.pressure_Pa',
  },
  {
    flag: '--temperature <quantity>',
    help: 'tank temperature, e.g. "22 degC"',
    recipe: 'temperature',
    json: 'final.temperature_K',
  },
  {
    flag: '--order <list>',
    help:
      'fill order, e.g. CH4,O2,Ar; a gas named again is filled in another charge, which may ' +
      'stop at an absolute reading: "CH4,Ar@400 Torr,O2,Ar"',
    recipe: 'order',
    parse: 'list',
    json: 'order.fills',
  },
  { flag: '--lab <file>', help: 'lab profile (YAML); the embedded demo lab if absent', json: 'lab' },
  {
    flag: '--tolerance <fraction>',
    help: 'allowed relative deviation of each mole fraction (default 0.005)',
    recipe: 'tolerance.relative',
    parse: 'number',
    json: 'tolerance.relative',
  },
  {
    flag: '--barometer <quantity>',
    help:
      'barometric pressure now, for gauge-referenced readings and gauge pressures ' +
      'such as "15 psig", e.g. "752.3 Torr"',
    json: 'barometer.pressure_Pa',
  },
  {
    flag: '--experiments <n>',
    help: 'size the batch for n experiments (sets the final pressure)',
    recipe: 'experiments.count',
    parse: 'number',
    replaces: ['pressure'],
    json: 'experiments.sized_for',
  },
  {
    flag: '--reactor <id>',
    help: 'reactor or driven section from the lab profile',
    recipe: 'experiments.reactor',
    json: 'experiments.reactor',
  },
  {
    flag: '--reactor-volume <quantity>',
    help: 'reactor volume filled per experiment, e.g. "0.9 L"',
    recipe: 'experiments.reactor_volume',
    json: 'experiments.reactor_volume_m3',
  },
  {
    flag: '--line-volume <quantity>',
    help: 'line volume to the reactor, e.g. "0.05 L"',
    recipe: 'experiments.line_volume',
    json: 'experiments.line_volume_m3',
  },
  {
    flag: '--fill-pressure <quantity>',
    help: 'fill pressure of one experiment, e.g. "50 Torr"',
    recipe: 'experiments.fill_pressure',
    json: 'experiments.fill_pressure_Pa',
  },
  {
    flag: '--units <unit>',
    help: 'pressure unit of the tables (default: the unit of the final pressure, else Torr)',
    choices: PRESSURE_UNITS,
    json: null,
  },
  {
    flag: '--premix-tank <id>',
    help: 'make a premix first in this second tank of the lab profile, then the batch from it (two stages)',
    recipe: 'premix.tank',
    json: 'two_stage',
  },
  {
    flag: '--premix-log <log>',
    help:
      'draw from an existing premix tank: the finished batch log of its fill ' +
      '(re-checked, its uncertainty carried into the batch)',
    recipe: 'premix.log',
    // a recipe's premix to make (stage 1's premix block) gives way to the premix log, as any option
    // overrides its recipe field: the recipe of a two-stage fill serves stage 2 with --premix-log
    replaces: ['premix.tank', 'premix.gases', 'premix.fraction', 'premix.pressure', 'premix.order'],
    json: 'premix_log',
  },
];

/** "--diluent-ratio <number>" -> "--diluent-ratio" */
export const optionName = (d: DesignOption): string => d.flag.split(' ')[0];
/** "--diluent-ratio" -> "diluentRatio", the key commander gives the value under */
export const attributeOf = (d: DesignOption): string =>
  optionName(d)
    .slice(2)
    .replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());

/** the values commander parsed: design options by attribute name, as typed */
export type DesignValues = Readonly<Record<string, string | undefined>>;

/** the option that overrides a recipe key, e.g. "mixture.phi" -> "--phi" */
export const OPTION_OF: Readonly<Record<string, string>> = Object.fromEntries(
  DESIGN_OPTIONS.filter((d) => d.recipe).map((d) => [d.recipe!, optionName(d)]),
);

/** add the recipe argument and every design option to a command */
export function addDesignOptions(c: Command): Command {
  c.argument('[recipe]', 'recipe file (YAML); inline options override its fields');
  for (const d of DESIGN_OPTIONS) {
    const o = new Option(d.flag, d.help);
    c.addOption(d.choices ? o.choices([...d.choices]) : o);
  }
  return c;
}

const given = (o: DesignValues, d: DesignOption) => o[attributeOf(d)] !== undefined;

function valueOf(d: DesignOption, text: string): unknown {
  if (d.parse === 'number') return numberOption(text, optionName(d));
  if (d.parse === 'list') return text.split(',').map((s) => s.trim());
  return text;
}

function setPath(r: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let cur = r;
  for (const k of keys.slice(0, -1)) {
    if (typeof cur[k] !== 'object' || cur[k] === null) cur[k] = {};
    cur = cur[k] as Record<string, unknown>;
  }
  cur[keys[keys.length - 1]] = value;
}

function deletePath(r: Record<string, unknown>, path: string): void {
  const keys = path.split('.');
  let cur: unknown = r;
  for (const k of keys.slice(0, -1)) {
    if (typeof cur !== 'object' || cur === null) return;
    cur = (cur as Record<string, unknown>)[k];
  }
  if (typeof cur === 'object' && cur !== null) delete (cur as Record<string, unknown>)[keys[keys.length - 1]];
}

/** the design options given, in table order, refusing a phi design together with explicit fractions */
function givenOptions(o: DesignValues): DesignOption[] {
  const list = DESIGN_OPTIONS.filter((d) => d.recipe && given(o, d));
  const phi = list.filter((d) => d.group === 'phi');
  const fractions = list.find((d) => d.group === 'fractions');
  if (fractions && phi.length)
    throw new ProblemError(
      { code: 'options-exclusive', option: optionName(fractions), others: phi.map(optionName) },
      { field: optionName(fractions) },
    );
  return list;
}

/** the recipe with the options merged over it: replaced keys dropped first, then every option set */
export function mergeIntoRecipe(
  base: Readonly<Record<string, unknown>> | undefined,
  o: DesignValues,
): { recipe: Record<string, unknown>; overridden: Set<string> } {
  const list = givenOptions(o);
  const r: Record<string, unknown> = base ? structuredClone(base) : { id: 'inline' };
  const overridden = new Set(list.map((d) => d.recipe!));
  for (const d of list) for (const p of d.replaces ?? []) if (!overridden.has(p)) deletePath(r, p);
  if (list.some((d) => d.group === 'phi') && typeof r.mixture === 'object' && r.mixture !== null)
    deletePath(r, 'mixture.fractions'); // a phi design replaces explicit fractions
  for (const d of list) setPath(r, d.recipe!, valueOf(d, o[attributeOf(d)]!));
  return { recipe: r, overridden };
}

/** what is missing for a plan from options alone, in option names */
function missingOptions(o: DesignValues): string[] {
  const missing: string[] = [];
  if (o.fractions === undefined && (o.fuel === undefined || o.oxidizer === undefined || o.phi === undefined))
    missing.push('--fuel, --oxidizer and --phi (or --fractions)');
  if (o.pressure === undefined && o.experiments === undefined) missing.push('--pressure (or --experiments)');
  if (o.temperature === undefined) missing.push('--temperature');
  if (o.volume === undefined && o.tank === undefined) missing.push('--volume or --tank');
  return missing;
}

/** merge inline options over a recipe (or build one from options alone) */
export function mergeOptions(base: RecipeSource | undefined, o: DesignValues): RecipeSource {
  const { recipe: r, overridden } = mergeIntoRecipe(base?.recipe, o);
  const locate: Locate = (path) => {
    const key = path.filter((p) => typeof p === 'string').join('.');
    for (const [p, opt] of Object.entries(OPTION_OF)) {
      if (overridden.has(p) && (key === p || key.startsWith(`${p}.`))) return { field: opt };
    }
    if (key.startsWith('mixture') && !base) return { field: '--fuel/--oxidizer/--phi or --fractions' };
    if (!base) {
      const top = String(path[0] ?? '');
      return { field: OPTION_OF[top] ?? top };
    }
    return base.locate(path);
  };
  if (!base) {
    const missing = missingOptions(o);
    if (missing.length) throw new ProblemError({ code: 'options-missing', missing }, { field: 'plan' });
  }
  const origin = base?.origin ?? 'command line';
  const recipe: RecipeFile = validateRecipeObject(r, origin, locate);
  return { recipe, locate, baseDir: base?.baseDir ?? process.cwd(), origin };
}

/** recipe fields a recipe's title may state: the mixture, the tank, the final state, the batch size */
const TITLE_FIELDS = /^(mixture\..+|volume|tank|pressure|temperature|experiments\.count)$/;

/**
 * the options given that override a field a recipe's title may state, as typed ("--pressure 3000 Torr"):
 * the sheet then does not print the recipe's title as its own
 */
export function titleOverrides(o: DesignValues): string[] {
  return DESIGN_OPTIONS.filter((d) => d.recipe && TITLE_FIELDS.test(d.recipe) && given(o, d)).map(
    (d) => `${optionName(d)} ${o[attributeOf(d)]!}`,
  );
}
