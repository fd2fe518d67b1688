/**
 * From files and options to the core's plan input: read the lab profile and the
 * recipe, parse quantities and blends, build the sources and the order.
 */
import { dirname, resolve as resolvePath } from 'node:path';
import {
  fail,
  ProblemError,
  relocate,
  type Where,
  chooseSources,
  designMixture,
  getSpecies,
  orderCharges,
  premix,
  pureCylinder,
  resolveSpeciesKey,
  sourcesByName,
  sourcesFromList,
  type DesignInput,
  type OrderEntry,
  type StopFault,
  type Fractions,
  type GasSource,
  type Gauge,
  type PlanInput,
  type TankSpec,
  type ReactorSpec,
  finalPressureForExperiments,
  type SizingInput,
} from '../core/index.js';
import {
  checkPlausibleVolume,
  parseLength,
  parseQuantity,
  type GaugeConversion,
  type QuantityContext,
} from './quantity.js';
import { labSchema, type LabFile } from './lab.js';
import { predictionThermometer } from './plan-predict.js';
import { recipeSchema, type RecipeFile } from './recipe.js';
import { keysAt, validate } from './schema-util.js';
import { readYamlFile, type DataPath, type YamlSource } from './yaml-file.js';
import { DEMO_LAB_DATA, DEMO_LAB_NAME } from './demo-lab.js';

export type Locate = (path: DataPath) => Where;

/** rethrow a ProblemError with the location filled in */
function at<T>(where: Where, f: () => T): T {
  try {
    return f();
  } catch (e) {
    if (e instanceof ProblemError) throw e.at(where);
    throw e;
  }
}

/** "CH4", "CH4:0.8,C2H6:0.2" or a map -> fractions keyed by species key */
export function parseBlend(
  value: string | Readonly<Record<string, number>>,
  where: Where,
  air?: Fractions,
): Record<string, number> {
  const out: Record<string, number> = {};
  if (typeof value !== 'string') {
    for (const [k, v] of Object.entries(value)) {
      const key = at(where, () => getSpecies(k).key);
      out[key] = (out[key] ?? 0) + v;
    }
    return out;
  }
  const text = value.trim();
  if (air && text.toLowerCase() === 'air') return { ...air };
  const parts = text.split(',').map((p) => p.trim());
  if (parts.some((p) => p === '')) fail({ code: 'bad-list', text, fault: { kind: 'empty-entry' } }, where);
  if (parts.length === 1 && !parts[0].includes(':')) {
    return { [at(where, () => getSpecies(parts[0]).key)]: 1 };
  }
  for (const p of parts) {
    const m = /^([^:\s]+)\s*:\s*([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)$/.exec(p);
    if (!m) fail({ code: 'bad-list', text, fault: { kind: 'not-a-pair', entry: p } }, where);
    const key = at(where, () => getSpecies(m[1]).key);
    if (key in out) fail({ code: 'bad-list', text, fault: { kind: 'repeated', species: key } }, where);
    out[key] = Number(m[2]);
  }
  return out;
}

export interface LoadedLab {
  readonly name: string;
  readonly origin: string;
  readonly file: LabFile;
  readonly barometricPa: number;
  readonly barometricUncertaintyPa: number;
  readonly air: Fractions;
  readonly tanks: readonly (TankSpec & {
    readonly heightM?: number;
    readonly stirred?: boolean;
    readonly baseVacuumPa?: number;
    readonly leakRatePaPerS?: number;
  })[];
  readonly reactors: readonly ReactorSpec[];
  readonly fillMargin: number;
  readonly gauges: readonly Gauge[];
  readonly cylinders: readonly GasSource[];
  /** coldest wetted temperature of tank, lines and gauge heads, K */
  readonly coldestK?: number;
  /** warmest temperature a filled tank reaches, K */
  readonly warmestK?: number;
  /** tank thermometer: standard uncertainty and resolution, K; undefined when the profile gives none */
  readonly thermometer?: {
    readonly uncertaintyK: number;
    readonly resolutionK: number;
    /** gas-thermometer difference left after settling, K (predicted uncertainty); undefined: the default */
    readonly settlingK?: number;
  };
  readonly condensationFraction?: number;
  /** the profile's gauge pressures made absolute with its barometer: what the output states */
  readonly gaugeConversions: readonly GaugeConversion[];
}

type LabWhere = (path: DataPath, field: string) => Where;
type GaugeContext = QuantityContext;

/** the profile's barometer (default 101325 Pa +- 100 Pa): read first, it converts gauge pressures elsewhere */
function labBarometer(lab: LabFile, w: LabWhere): { pa: number; uPa: number } {
  if (!lab.barometer) return { pa: 101325, uPa: 100 };
  const pa = parseQuantity(
    lab.barometer.pressure,
    'pressure',
    w(['barometer', 'pressure'], 'barometer.pressure'),
  );
  const uPa = parseQuantity(
    lab.barometer.uncertainty,
    'pressure',
    w(['barometer', 'uncertainty'], 'barometer.uncertainty'),
  );
  if (!(pa > 0))
    fail(
      { code: 'not-positive', what: 'barometric pressure', value: pa, text: lab.barometer.pressure },
      w(['barometer', 'pressure'], 'barometer.pressure'),
    );
  return { pa, uPa };
}

/** ids of tanks, reactors, gauges and cylinders share one name space: a second use is refused */
function uniqueIds(w: LabWhere): (id: string, path: DataPath) => void {
  const ids = new Map<string, DataPath>();
  return (id, path) => {
    const first = ids.get(id);
    if (first) {
      const field = `${String(first[0])}[${String(first[1])}].id`;
      fail({ code: 'duplicate-id', id, first: { line: w(first, field).line, field } }, w(path, 'id'));
    }
    ids.set(id, path);
  };
}

function loadTank(t: LabFile['tanks'][number], i: number, w: LabWhere, gaugeCtx: GaugeContext) {
  const at = (key: string) => w(['tanks', i, key], `tanks[${i}].${key}`);
  const volumeM3 = parseQuantity(t.volume, 'volume', at('volume'));
  if (!(volumeM3 > 0))
    fail(
      { code: 'not-positive', what: `volume of tank ${t.id}`, value: volumeM3, text: t.volume },
      at('volume'),
    );
  checkPlausibleVolume(volumeM3, `volume of tank ${t.id}`, t.volume, at('volume'));
  const rated =
    t.rating === undefined ? undefined : parseQuantity(t.rating, 'pressure', at('rating'), gaugeCtx);
  if (rated !== undefined && !(rated > 0))
    fail(
      { code: 'not-positive', what: `rating of tank ${t.id}`, value: rated, text: t.rating },
      at('rating'),
    );
  const q = (key: 'base_vacuum' | 'leak_rate', dim: 'pressure' | 'pressure rate') =>
    t[key] === undefined ? undefined : parseQuantity(t[key], dim, at(key));
  return {
    id: t.id,
    label: t.label ?? t.id,
    volumeM3,
    ratedPressurePa: rated,
    workingFraction: t.working_fraction,
    heightM: t.height === undefined ? undefined : parseLength(t.height, at('height')),
    stirred: t.stirred,
    baseVacuumPa: q('base_vacuum', 'pressure'),
    leakRatePaPerS: q('leak_rate', 'pressure rate'),
  };
}

function loadReactor(
  r: LabFile['reactors'][number],
  i: number,
  w: LabWhere,
  gaugeCtx: GaugeContext,
): ReactorSpec {
  const at = (key: string) => w(['reactors', i, key], `reactors[${i}].${key}`);
  return {
    id: r.id,
    label: r.label ?? r.id,
    volumeM3: checkPlausibleVolume(
      parseQuantity(r.volume, 'volume', at('volume')),
      `volume of reactor ${r.id}`,
      r.volume,
      at('volume'),
    ),
    lineVolumeM3:
      r.line_volume === undefined
        ? 0
        : checkPlausibleVolume(
            parseQuantity(r.line_volume, 'volume', at('line_volume')),
            `line volume of reactor ${r.id}`,
            r.line_volume,
            at('line_volume'),
          ),
    fillPressurePa: parseQuantity(r.fill_pressure, 'pressure', at('fill_pressure'), gaugeCtx),
    temperatureK:
      r.temperature === undefined
        ? undefined
        : parseQuantity(r.temperature, 'temperature', at('temperature')),
  };
}

function loadGauge(g: LabFile['gauges'][number], i: number, w: LabWhere, gaugeCtx: GaugeContext): Gauge {
  const at = (key: string) => w(['gauges', i, key], `gauges[${i}].${key}`);
  const q = (key: 'full_scale' | 'minimum' | 'resolution' | 'overpressure', text: string) =>
    parseQuantity(text, 'pressure', at(key));
  const fullScalePa = q('full_scale', g.full_scale);
  if (!(fullScalePa > 0))
    fail(
      { code: 'not-positive', what: `full scale of gauge ${g.id}`, value: fullScalePa, text: g.full_scale },
      at('full_scale'),
    );
  return {
    id: g.id,
    label: g.label ?? g.id,
    reference: g.reference,
    fullScalePa,
    minimumPa: g.minimum === undefined ? 0 : q('minimum', g.minimum),
    accuracyOfReading: g.accuracy_pct_reading / 100,
    accuracyOfFullScale: (g.accuracy_pct_full_scale ?? 0) / 100,
    resolutionPa: q('resolution', g.resolution),
    unit: g.unit,
    overpressurePa:
      g.overpressure === undefined
        ? undefined
        : parseQuantity(g.overpressure, 'pressure', at('overpressure'), gaugeCtx),
  };
}

function loadCylinder(
  c: LabFile['cylinders'][number],
  i: number,
  w: LabWhere,
  gaugeCtx: GaugeContext,
): GasSource {
  const where = w(['cylinders', i], `cylinders[${i}]`);
  const supply =
    c.supply_pressure === undefined
      ? undefined
      : parseQuantity(
          c.supply_pressure,
          'pressure',
          w(['cylinders', i, 'supply_pressure'], `cylinders[${i}].supply_pressure`),
          gaugeCtx,
        );
  if ('composition' in c) {
    const comp = parseBlend(c.composition, where);
    return at(where, () => premix({ id: c.id, label: c.label, composition: comp, supplyPressurePa: supply }));
  }
  const species = at(where, () => getSpecies(c.species).key);
  const impurities = c.impurities
    ? parseBlend(c.impurities, w(['cylinders', i, 'impurities'], `cylinders[${i}].impurities`))
    : undefined;
  return at(where, () =>
    pureCylinder({
      id: c.id,
      label: c.label,
      species,
      purity: c.purity,
      impurities,
      kind: c.vapour ? 'vapour' : 'cylinder',
      supplyPressurePa: supply,
    }),
  );
}

/** a temperature difference: K or mK only, never an offset conversion from degC or degF */
function kelvinDiff(text: string, where: Where, field: string): number {
  const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(K|mK)\s*$/.exec(text);
  if (!m) return fail({ code: 'bad-temperature-difference', text }, where);
  const v = Number(m[1]) * (m[2] === 'mK' ? 1e-3 : 1);
  if (!(v >= 0 && v <= 100))
    fail(
      {
        code: 'out-of-range',
        what: field,
        value: v,
        text,
        allowed: '0 K to 100 K (a thermometer uncertainty or resolution)',
      },
      where,
    );
  return v;
}

function thermometerOf(lab: LabFile, w: LabWhere): LoadedLab['thermometer'] {
  if (!lab.thermometer) return undefined;
  const { uncertainty, resolution, settling } = lab.thermometer;
  const field = (key: string) => `thermometer.${key}`;
  return {
    uncertaintyK: kelvinDiff(
      uncertainty,
      w(['thermometer', 'uncertainty'], field('uncertainty')),
      field('uncertainty'),
    ),
    resolutionK:
      resolution === undefined
        ? 0
        : kelvinDiff(resolution, w(['thermometer', 'resolution'], field('resolution')), field('resolution')),
    settlingK:
      settling === undefined
        ? undefined
        : kelvinDiff(settling, w(['thermometer', 'settling'], field('settling')), field('settling')),
  };
}

export function loadLab(file?: string): LoadedLab {
  // the embedded profile comes pre-parsed (reading YAML costs ~20 ms of start-up); a test keeps it equal to its text
  const src: YamlSource = file
    ? readYamlFile(file)
    : { file: DEMO_LAB_NAME, data: DEMO_LAB_DATA, locate: () => ({ file: DEMO_LAB_NAME }) };
  const lab = validate(labSchema, src, (p) => keysAt(labSchema, p));
  const w: LabWhere = (path, field) => ({ ...src.locate(path), field });
  const air = lab.air !== undefined ? parseBlend(lab.air, w(['air'], 'air')) : { O2: 0.21, N2: 0.79 };
  const baro = labBarometer(lab, w);
  // gauge pressures in the profile (a tank rating in psig) are converted with its own barometer, and said
  const gaugeCtx: QuantityContext = {
    barometricPa: lab.barometer ? baro.pa : undefined,
    barometerFrom: "the lab profile's",
    conversions: [],
  };
  const unique = uniqueIds(w);
  const each = <T, R>(
    key: 'tanks' | 'reactors' | 'gauges' | 'cylinders',
    items: readonly (T & { id: string })[],
    load: (x: T, i: number, w: LabWhere, g: GaugeContext) => R,
  ) =>
    items.map((x, i) => {
      unique(x.id, [key, i, 'id']);
      return load(x, i, w, gaugeCtx);
    });
  return {
    name: lab.name,
    origin: file ?? DEMO_LAB_NAME,
    file: lab,
    barometricPa: baro.pa,
    barometricUncertaintyPa: baro.uPa,
    air,
    tanks: each('tanks', lab.tanks, loadTank),
    reactors: each('reactors', lab.reactors, loadReactor),
    fillMargin: lab.fill_margin ?? 0.1,
    gauges: each('gauges', lab.gauges, loadGauge),
    cylinders: each('cylinders', lab.cylinders, loadCylinder),
    coldestK:
      lab.coldest === undefined
        ? undefined
        : parseQuantity(lab.coldest, 'temperature', w(['coldest'], 'coldest')),
    warmestK:
      lab.warmest === undefined
        ? undefined
        : parseQuantity(lab.warmest, 'temperature', w(['warmest'], 'warmest')),
    thermometer: thermometerOf(lab, w),
    condensationFraction: lab.condensation_fraction,
    gaugeConversions: gaugeCtx.conversions!,
  };
}

/** a recipe with, for every field, where it came from */
export interface RecipeSource {
  readonly recipe: RecipeFile;
  readonly locate: Locate;
  /** directory that relative paths in the recipe are resolved against */
  readonly baseDir: string;
  readonly origin: string;
}

export function readRecipe(file: string): RecipeSource {
  const src = readYamlFile(file);
  const recipe = validate(recipeSchema, src, (p) => keysAt(recipeSchema, p));
  return { recipe, locate: (p) => src.locate(p), baseDir: dirname(resolvePath(file)), origin: file };
}

export function validateRecipeObject(data: unknown, origin: string, locate: Locate): RecipeFile {
  const src: YamlSource = { file: origin, data, locate };
  return validate(recipeSchema, src, (p) => keysAt(recipeSchema, p));
}

export interface PlanRequest {
  readonly input: PlanInput;
  readonly lab: LoadedLab;
  readonly recipe: RecipeFile;
  /** the order was recommended by the tool, not given */
  readonly orderRecommended: boolean;
  /** how experiments are counted, when a reactor is known */
  readonly sizing?: SizingInput;
  /** the experiment count the final pressure was sized for */
  readonly sizedFor?: number;
  /** the lab's record of the tank (height, stirrer, vacuum), when it came from the profile */
  readonly tankInfo?: LoadedLab['tanks'][number];
  /** premixes filled in place of single gases without being asked for: the plan states them (premixFindings) */
  readonly premixInPlace: readonly GasSource[];
  /**
   * how gauge pressures of this request are made absolute (later fields, e.g. a premix pressure, use
   * it too); its `conversions` hold every one so converted, the lab profile's first
   */
  readonly gaugeContext: QuantityContext & { readonly conversions: GaugeConversion[] };
}

export interface Overrides {
  /** --barometer: today's barometric pressure, Pa; it also converts gauge pressures ("15 psig") */
  readonly barometricPa?: number;
  /** sources beyond the lab's cylinders that a fill order may name (a premix tank named by its log) */
  readonly extraSources?: readonly GasSource[];
}

type RecipeWhere = (path: DataPath, field?: string) => Where;

/** where a recipe field is: its line in the file, or the option that gave it */
function recipeWhere(rs: RecipeSource): RecipeWhere {
  return (path, field = path.join('.')) => {
    const where = rs.locate(path);
    return { ...where, field: where.field ?? field };
  };
}

/** the recipe key of each field the core names in a problem */
const RECIPE_PATH_OF_CORE_FIELD: Readonly<Record<string, DataPath>> = {
  experiments: ['experiments', 'count'],
  'in_tank.pressure': ['in_tank', 'pressure'],
};

/**
 * A problem the core raised about a value of the plan (final pressure, volume, temperature,
 * ...) pointed at the recipe line or option that gave it, with the text typed there when the
 * core only knew the SI value. The value checks themselves are the core's.
 */
export function locateCoreProblem(e: ProblemError, rs: RecipeSource): ProblemError {
  const field = e.where.field;
  // no field, or one already pointed at the option that gave it (--premix-tank): nothing to locate
  if (!field || field.startsWith('--')) return e;
  // a final pressure set by the number of experiments is pointed at the count
  const byCount = field === 'pressure' && rs.recipe.experiments?.count !== undefined;
  const path = byCount ? ['experiments', 'count'] : (RECIPE_PATH_OF_CORE_FIELD[field] ?? field.split('.'));
  const where = recipeWhere(rs)(path, byCount ? 'experiments.count' : field);
  let typed: unknown = rs.recipe;
  for (const k of path)
    typed = typeof typed === 'object' && typed !== null ? (typed as Record<string, unknown>)[k] : undefined;
  const p = e.problem;
  if (
    (p.code === 'not-positive' || p.code === 'out-of-range') &&
    p.text === undefined &&
    typeof typed === 'string'
  )
    return new ProblemError({ ...p, text: typed }, where);
  return relocate(e, where);
}

/** the tank: a lab tank, a given volume (overriding the lab tank's), and a rating for a tank given by volume */
function resolveTank(r: RecipeFile, lab: LoadedLab, W: RecipeWhere, gaugeCtx: GaugeContext): TankSpec {
  let tank: TankSpec | undefined;
  if (r.tank !== undefined) {
    tank = lab.tanks.find((t) => t.id === r.tank);
    if (!tank)
      fail(
        { code: 'unknown-reference', kind: 'tank', id: r.tank, choices: lab.tanks.map((t) => t.id) },
        W(['tank']),
      );
  }
  if (r.volume !== undefined) {
    // a volume of zero or less is the core's to refuse (planner and sizing), pointed back here by locateCoreProblem
    const volumeM3 = checkPlausibleVolume(
      parseQuantity(r.volume, 'volume', W(['volume'])),
      'tank volume',
      r.volume,
      W(['volume']),
    );
    tank = tank
      ? { ...tank, volumeM3 }
      : { id: 'given-volume', label: 'tank of the given volume (no rating known)', volumeM3 };
  }
  if (r.rating !== undefined || r.working_fraction !== undefined) {
    // a rating belongs to the tank of a given volume; a lab tank's rating is the profile's, never overridden here
    if (r.tank !== undefined)
      fail(
        { code: 'rating-with-lab-tank', tank: r.tank },
        W([r.rating !== undefined ? 'rating' : 'working_fraction']),
      );
    if (r.rating === undefined) fail({ code: 'working-fraction-without-rating' }, W(['working_fraction']));
    const ratedPressurePa = parseQuantity(r.rating, 'pressure', W(['rating']), gaugeCtx);
    if (!(ratedPressurePa > 0))
      fail(
        { code: 'not-positive', what: 'tank rating', value: ratedPressurePa, text: r.rating },
        W(['rating']),
      );
    if (tank)
      tank = {
        ...tank,
        label: 'tank of the given volume and rating',
        ratedPressurePa,
        workingFraction: r.working_fraction,
      };
  }
  if (!tank) return fail({ code: 'tank-or-volume-missing', tanks: lab.tanks.map((t) => t.id) }, W(['tank']));
  return tank;
}

/** the reactor the batch serves: the recipe's (by id, or by volume and fill pressure), else the lab's first */
function resolveReactor(r: RecipeFile, lab: LoadedLab, W: RecipeWhere, gaugeCtx: GaugeContext) {
  let reactor: ReactorSpec | undefined;
  const ex = r.experiments;
  if (ex?.reactor !== undefined) {
    reactor = lab.reactors.find((x) => x.id === ex.reactor);
    if (!reactor)
      fail(
        {
          code: 'unknown-reference',
          kind: 'reactor',
          id: ex.reactor,
          choices: lab.reactors.map((x) => x.id),
        },
        W(['experiments', 'reactor']),
      );
  } else if (ex?.reactor_volume === undefined) reactor = lab.reactors[0];
  if (ex?.reactor_volume === undefined && ex?.fill_pressure === undefined && ex?.line_volume === undefined)
    return reactor;
  const volume = (key: 'reactor_volume' | 'line_volume', text: string, what: string) =>
    checkPlausibleVolume(
      parseQuantity(text, 'volume', W(['experiments', key])),
      what,
      text,
      W(['experiments', key]),
    );
  const volumeM3 =
    ex.reactor_volume !== undefined
      ? volume('reactor_volume', ex.reactor_volume, 'reactor volume')
      : reactor?.volumeM3;
  const fillPressurePa =
    ex.fill_pressure !== undefined
      ? parseQuantity(ex.fill_pressure, 'pressure', W(['experiments', 'fill_pressure']), gaugeCtx)
      : reactor?.fillPressurePa;
  if (volumeM3 === undefined || fillPressurePa === undefined)
    return fail({ code: 'reactor-incomplete' }, W(['experiments']));
  return {
    id: reactor?.id ?? 'reactor',
    label: reactor?.label ?? 'reactor of the given volume',
    volumeM3,
    lineVolumeM3:
      ex.line_volume !== undefined
        ? volume('line_volume', ex.line_volume, 'line volume')
        : (reactor?.lineVolumeM3 ?? 0),
    fillPressurePa,
    temperatureK: reactor?.temperatureK,
  };
}

/** the core's design input from the recipe's mixture: explicit fractions, or phi with one dilution measure */
function designInputOf(m: RecipeFile['mixture'], lab: LoadedLab, W: RecipeWhere): DesignInput {
  if ('fractions' in m)
    return { kind: 'fractions', fractions: parseBlend(m.fractions, W(['mixture', 'fractions'])) };
  const bases = (['dilution', 'diluent_ratio', 'fuel_fraction'] as const).filter((k) => m[k] !== undefined);
  if (bases.length > 1) fail({ code: 'dilution-measures', given: bases }, W(['mixture', bases[1]]));
  const diluent = m.diluent === undefined ? {} : parseBlend(m.diluent, W(['mixture', 'diluent']));
  const basisKey = bases[0];
  const basis =
    basisKey === 'diluent_ratio'
      ? ({ kind: 'diluent-ratio', value: m.diluent_ratio! } as const)
      : basisKey === 'fuel_fraction'
        ? ({ kind: 'fuel-fraction', value: m.fuel_fraction! } as const)
        : ({ kind: 'dilution', value: m.dilution ?? 0 } as const);
  if (!basisKey && Object.keys(diluent).length > 0)
    fail({ code: 'diluent-amount-missing' }, W(['mixture', 'diluent']));
  return {
    kind: 'phi',
    fuel: parseBlend(m.fuel, W(['mixture', 'fuel'])),
    oxidizer: parseBlend(m.oxidizer, W(['mixture', 'oxidizer']), lab.air),
    diluent,
    phi: m.phi,
    basis,
  };
}

function designOf(r: RecipeFile, lab: LoadedLab, W: RecipeWhere) {
  const input = designInputOf(r.mixture, lab, W);
  try {
    return designMixture(input);
  } catch (e) {
    // the core names the design field (phi, dilution, fuel, ...): point at it in the recipe
    if (e instanceof ProblemError)
      throw relocate(e, W(e.where.field ? ['mixture', e.where.field] : ['mixture']));
    throw e;
  }
}

/** what the fill order and the cylinders give the plan */
interface Supply {
  /** distinct sources, in fill order when the order is given */
  readonly sources: GasSource[];
  /** the charges in fill order, when a source is filled in more than one */
  readonly charges?: PlanInput['charges'];
  /** premixes the chooser filled in place of single gases (no order, no list given): the plan states them */
  readonly premixInPlace: GasSource[];
}

/** a stop's problem, as the typed problem of the order entry that carries it */
function stopProblem(e: ProblemError, entry: string): ProblemError {
  const p = e.problem;
  const fault: StopFault | undefined =
    p.code === 'bad-quantity'
      ? p.fault.kind === 'unit-missing'
        ? { kind: 'unit-missing' }
        : { kind: 'unreadable', quantity: p.fault }
      : p.code === 'wrong-dimension'
        ? { kind: 'not-a-pressure', got: p.got }
        : undefined;
  // a gauge pressure without a barometer, or a value outside the physical window: their own words
  return fault ? new ProblemError({ code: 'order-stop', entry, fault }, e.where) : e;
}

/** the recipe's order entries: "Ar", "Ar@400 Torr" or { fill: Ar, until: 400 Torr }, each stop parsed */
function orderEntries(
  order: NonNullable<RecipeFile['order']>,
  W: RecipeWhere,
  gaugeCtx: GaugeContext,
): OrderEntry[] {
  return order.map((item, i) => {
    const where = W(['order', i], `order[${i}]`);
    const typed =
      typeof item === 'string'
        ? item.trim()
        : `${item.fill}${item.until === undefined ? '' : `@${item.until}`}`;
    const at = typeof item === 'string' ? typed.indexOf('@') : -1;
    const name = (typeof item === 'string' ? (at < 0 ? typed : typed.slice(0, at)) : item.fill).trim();
    const stopText =
      typeof item === 'string' ? (at < 0 ? undefined : typed.slice(at + 1).trim()) : item.until;
    if (stopText === undefined) return { name, text: typed, where };
    if (stopText === '') return fail({ code: 'order-stop', entry: typed, fault: { kind: 'empty' } }, where);
    try {
      return { name, text: typed, where, stopPa: parseQuantity(stopText, 'pressure', where, gaugeCtx) };
    } catch (e) {
      if (e instanceof ProblemError) throw stopProblem(e, typed);
      throw e;
    }
  });
}

/**
 * The cylinders to fill from and the charges. A recipe's `sources` list, ordered by the order if
 * one is given; else an order names the cylinders itself (species one by one from single-gas
 * cylinders, a premix by its id); else the lab's best match, with a premix in place of single
 * gases where the design holds them in its ratio (stated by the plan).
 */
function supplyOf(
  r: RecipeFile,
  lab: LoadedLab,
  composition: Fractions,
  W: RecipeWhere,
  gaugeCtx: GaugeContext,
  inTankPa: number | undefined,
  extra: readonly GasSource[] = [],
): Supply {
  const listed = r.sources?.map((id, i) => {
    const c = lab.cylinders.find((x) => x.id === id);
    if (!c)
      fail(
        { code: 'unknown-reference', kind: 'cylinder', id, choices: lab.cylinders.map((x) => x.id) },
        W(['sources', i], `sources[${i}]`),
      );
    return c;
  });
  if (!r.order) {
    if (listed) return { sources: listed, premixInPlace: [] };
    const sources = chooseSources(composition, lab.cylinders);
    return { sources, premixInPlace: sources.filter((s) => s.kind === 'premix') };
  }
  const entries = orderEntries(r.order, W, gaugeCtx);
  try {
    const ordered = listed
      ? orderCharges(entries, sourcesFromList(listed, resolveSpeciesKey), { sources: listed }, inTankPa)
      : orderCharges(
          entries,
          sourcesByName(composition, [...extra, ...lab.cylinders], resolveSpeciesKey),
          { species: Object.keys(composition).filter((k) => composition[k] > 0) },
          inTankPa,
        );
    return {
      sources: [...ordered.sources],
      charges: ordered.split ? ordered.charges : undefined,
      premixInPlace: [],
    };
  } catch (e) {
    // a stop's problem carries its own entry's line; the others concern the whole order
    if (e instanceof ProblemError && e.problem.code !== 'order-stop') throw relocate(e, W(['order']));
    throw e;
  }
}

/** every stop below the final pressure: the charges after it need room */
function checkStopsBelowFinal(r: RecipeFile, supply: Supply, finalPa: number, W: RecipeWhere): void {
  supply.charges?.forEach((c, k) => {
    if (c.stopPa === undefined || c.stopPa < finalPa) return;
    const item = r.order![k];
    const entry = typeof item === 'string' ? item.trim() : `${item.fill}@${item.until}`;
    fail(
      { code: 'order-stop', entry, fault: { kind: 'not-below-final', stopPa: c.stopPa, finalPa } },
      W(['order', k], `order[${k}]`),
    );
  });
}

/** the final pressure or the number of experiments: one of them, not both (the count sets the pressure) */
function checkPressureOrCount(r: RecipeFile, W: RecipeWhere): void {
  const count = r.experiments?.count;
  if (count !== undefined && r.pressure !== undefined)
    fail({ code: 'pressure-and-count' }, W(['experiments', 'count']));
  if (count === undefined && r.pressure === undefined) fail({ code: 'pressure-missing' }, W(['pressure']));
}

/** the final pressure: given, or the one that serves the number of experiments */
function finalPressure(
  r: RecipeFile,
  rs: RecipeSource,
  sizing: SizingInput | undefined,
  gaugeCtx: GaugeContext,
): number {
  const W = recipeWhere(rs);
  const count = r.experiments?.count;
  // a final pressure of zero or less is the core's to refuse (the planner), pointed back here by planFrom
  if (count === undefined) return parseQuantity(r.pressure!, 'pressure', W(['pressure']), gaugeCtx);
  if (!sizing) return fail({ code: 'reactor-missing' }, W(['experiments']));
  try {
    return finalPressureForExperiments(sizing, count).pressurePa;
  } catch (e) {
    if (e instanceof ProblemError) throw locateCoreProblem(e, rs);
    throw e;
  }
}

/** the recipe's temperature, above absolute zero (the model's range is the planner's to check) */
function temperatureOf(r: RecipeFile, W: RecipeWhere): number {
  const temperatureK = parseQuantity(r.temperature, 'temperature', W(['temperature']));
  if (!(temperatureK > 0))
    fail(
      {
        code: 'out-of-range',
        what: 'temperature',
        text: r.temperature,
        value: temperatureK,
        allowed: 'above absolute zero (0 K = -273.15 degC)',
      },
      W(['temperature']),
    );
  return temperatureK;
}

/** Build the core's plan input from a recipe (file or options) and its lab profile. */
export function buildPlanRequest(
  rs: RecipeSource,
  labFileOverride?: string,
  overrides: Overrides = {},
): PlanRequest {
  const r = rs.recipe;
  const W = recipeWhere(rs);
  const lab = loadLab(labFileOverride ?? (r.lab ? resolvePath(rs.baseDir, r.lab) : undefined));
  // gauge pressures in the recipe are converted with the barometer given now, else the lab profile's own
  // (none: refused, never the default), and each conversion is recorded for the output to state
  const gaugeCtx: QuantityContext = {
    barometricPa: overrides.barometricPa ?? (lab.file.barometer ? lab.barometricPa : undefined),
    barometerFrom: overrides.barometricPa !== undefined ? '--barometer' : "the lab profile's",
    conversions: [],
  };
  const tank = resolveTank(r, lab, W, gaugeCtx);
  checkPressureOrCount(r, W);
  const temperatureK = temperatureOf(r, W);
  const reactor = resolveReactor(r, lab, W, gaugeCtx);
  if (r.experiments?.count !== undefined && !reactor) fail({ code: 'reactor-missing' }, W(['experiments']));
  const design = designOf(r, lab, W);
  const inTank: PlanInput['inTank'] = r.in_tank && {
    composition: parseBlend(r.in_tank.composition, W(['in_tank', 'composition'])),
    pressurePa: parseQuantity(r.in_tank.pressure, 'pressure', W(['in_tank', 'pressure']), gaugeCtx),
  };
  const supply = supplyOf(
    r,
    lab,
    design.composition,
    W,
    gaugeCtx,
    inTank?.pressurePa,
    overrides.extraSources,
  );
  const sizing: SizingInput | undefined = reactor && {
    composition: design.composition,
    tankVolumeM3: tank.volumeM3,
    temperatureK,
    reactor,
    margin: lab.fillMargin,
  };
  const finalPressurePa = finalPressure(r, rs, sizing, gaugeCtx);
  checkStopsBelowFinal(r, supply, finalPressurePa, W);
  const input: PlanInput = {
    design,
    finalPressurePa,
    temperatureK,
    tank,
    sources: supply.sources,
    order: r.order ? 'given' : 'recommend',
    charges: supply.charges,
    safety: {
      coldestK: lab.coldestK,
      condensationFraction: lab.condensationFraction,
      warmestK: lab.warmestK,
    },
    inTank,
    gauges: lab.gauges,
    reading: {
      barometricPa: overrides.barometricPa ?? lab.barometricPa,
      barometricUncertaintyPa: lab.barometricUncertaintyPa,
    },
    tolerance: { relative: r.tolerance?.relative ?? 0.005, absolute: r.tolerance?.absolute ?? 0 },
    thermometer: predictionThermometer(lab.thermometer),
  };
  return {
    input,
    lab,
    recipe: r,
    orderRecommended: !r.order,
    sizing,
    sizedFor: r.experiments?.count,
    tankInfo: lab.tanks.find((t) => t.id === tank.id),
    premixInPlace: supply.premixInPlace,
    gaugeContext: { ...gaugeCtx, conversions: [...lab.gaugeConversions, ...gaugeCtx.conversions!] },
  };
}
