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
  orderSources,
  premix,
  pureCylinder,
  resolveSpeciesKey,
  type DesignInput,
  type Fractions,
  type GasSource,
  type Gauge,
  type PlanInput,
  type TankSpec,
  type ReactorSpec,
  finalPressureForExperiments,
} from '../core/index.js';
import { parseLength, parseQuantity } from './quantity.js';
import { labSchema, type LabFile } from './lab.js';
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
  if (parts.some((p) => p === '')) fail({ code: 'bad-list', text, reason: 'an empty entry' }, where);
  if (parts.length === 1 && !parts[0].includes(':')) {
    return { [at(where, () => getSpecies(parts[0]).key)]: 1 };
  }
  for (const p of parts) {
    const m = /^([^:\s]+)\s*:\s*([-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?)$/.exec(p);
    if (!m) fail({ code: 'bad-list', text, reason: `"${p}" is not species:fraction` }, where);
    const key = at(where, () => getSpecies(m[1]).key);
    if (key in out) fail({ code: 'bad-list', text, reason: `${key} appears twice` }, where);
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
  /** tank thermometer: standard uncertainty and resolution, K; undefined when the profile gives none */
  readonly thermometer?: {
    readonly uncertaintyK: number;
    readonly resolutionK: number;
    /** gas-thermometer difference left after settling, K (predicted uncertainty); undefined: the default */
    readonly settlingK?: number;
  };
  readonly condensationFraction?: number;
}

export function loadLab(file?: string): LoadedLab {
  // the embedded profile comes pre-parsed (reading YAML costs ~20 ms of start-up); a test keeps it equal to its text
  const src: YamlSource = file
    ? readYamlFile(file)
    : { file: DEMO_LAB_NAME, data: DEMO_LAB_DATA, locate: () => ({ file: DEMO_LAB_NAME }) };
  const lab = validate(labSchema, src, (p) => keysAt(labSchema, p));
  const w = (path: DataPath, field: string): Where => ({ ...src.locate(path), field });
  const air = lab.air !== undefined ? parseBlend(lab.air, w(['air'], 'air')) : { O2: 0.21, N2: 0.79 };
  // the barometer first: gauge pressures elsewhere in the profile ("4 barg") are converted with it
  const baroPa = lab.barometer
    ? parseQuantity(lab.barometer.pressure, 'pressure', w(['barometer', 'pressure'], 'barometer.pressure'))
    : 101325;
  const baroU = lab.barometer
    ? parseQuantity(
        lab.barometer.uncertainty,
        'pressure',
        w(['barometer', 'uncertainty'], 'barometer.uncertainty'),
      )
    : 100;
  if (!(baroPa > 0))
    fail(
      { code: 'not-positive', what: 'barometric pressure', value: baroPa, text: lab.barometer?.pressure },
      w(['barometer', 'pressure'], 'barometer.pressure'),
    );
  const gaugeCtx = { barometricPa: lab.barometer ? baroPa : undefined };
  const ids = new Set<string>();
  const unique = (id: string, path: DataPath) => {
    if (ids.has(id))
      fail(
        {
          code: 'schema',
          reason: `the id "${id}" is used twice; ids of tanks, gauges and cylinders must be unique`,
        },
        w(path, 'id'),
      );
    ids.add(id);
  };
  const tanks = lab.tanks.map((t, i): LoadedLab['tanks'][number] => {
    unique(t.id, ['tanks', i, 'id']);
    const volumeM3 = parseQuantity(t.volume, 'volume', w(['tanks', i, 'volume'], `tanks[${i}].volume`));
    if (!(volumeM3 > 0))
      fail(
        { code: 'not-positive', what: `volume of tank ${t.id}`, value: volumeM3, text: t.volume },
        w(['tanks', i, 'volume'], `tanks[${i}].volume`),
      );
    const rated =
      t.rating === undefined
        ? undefined
        : parseQuantity(t.rating, 'pressure', w(['tanks', i, 'rating'], `tanks[${i}].rating`), gaugeCtx);
    if (rated !== undefined && !(rated > 0))
      fail(
        { code: 'not-positive', what: `rating of tank ${t.id}`, value: rated, text: t.rating },
        w(['tanks', i, 'rating'], `tanks[${i}].rating`),
      );
    const q = (
      key: 'height' | 'base_vacuum' | 'leak_rate',
      dim: 'volume' | 'pressure' | 'pressure rate' | 'length',
    ) => {
      const text = t[key];
      if (text === undefined) return undefined;
      return dim === 'length'
        ? parseLength(text, w(['tanks', i, key], `tanks[${i}].${key}`))
        : parseQuantity(text, dim, w(['tanks', i, key], `tanks[${i}].${key}`));
    };
    return {
      id: t.id,
      label: t.label ?? t.id,
      volumeM3,
      ratedPressurePa: rated,
      workingFraction: t.working_fraction,
      heightM: q('height', 'length'),
      stirred: t.stirred,
      baseVacuumPa: q('base_vacuum', 'pressure'),
      leakRatePaPerS: q('leak_rate', 'pressure rate'),
    };
  });
  const reactors = lab.reactors.map((r, i): ReactorSpec => {
    unique(r.id, ['reactors', i, 'id']);
    const at = (key: string) => w(['reactors', i, key], `reactors[${i}].${key}`);
    return {
      id: r.id,
      label: r.label ?? r.id,
      volumeM3: parseQuantity(r.volume, 'volume', at('volume')),
      lineVolumeM3:
        r.line_volume === undefined ? 0 : parseQuantity(r.line_volume, 'volume', at('line_volume')),
      fillPressurePa: parseQuantity(r.fill_pressure, 'pressure', at('fill_pressure'), gaugeCtx),
      temperatureK:
        r.temperature === undefined
          ? undefined
          : parseQuantity(r.temperature, 'temperature', at('temperature')),
    };
  });
  const gauges = lab.gauges.map((g, i): Gauge => {
    unique(g.id, ['gauges', i, 'id']);
    const q = (key: 'full_scale' | 'minimum' | 'resolution' | 'overpressure', text: string) =>
      parseQuantity(text, 'pressure', w(['gauges', i, key], `gauges[${i}].${key}`));
    const fullScalePa = q('full_scale', g.full_scale);
    if (!(fullScalePa > 0))
      fail(
        { code: 'not-positive', what: `full scale of gauge ${g.id}`, value: fullScalePa, text: g.full_scale },
        w(['gauges', i, 'full_scale'], `gauges[${i}].full_scale`),
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
          : parseQuantity(
              g.overpressure,
              'pressure',
              w(['gauges', i, 'overpressure'], `gauges[${i}].overpressure`),
              gaugeCtx,
            ),
    };
  });
  const cylinders = lab.cylinders.map((c, i): GasSource => {
    unique(c.id, ['cylinders', i, 'id']);
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
      return at(where, () =>
        premix({ id: c.id, label: c.label, composition: comp, supplyPressurePa: supply }),
      );
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
  });
  const coldestK =
    lab.coldest === undefined
      ? undefined
      : parseQuantity(lab.coldest, 'temperature', w(['coldest'], 'coldest'));
  // a temperature difference: K (or degC steps) only, never an offset conversion
  const kelvinDiff = (text: string, path: DataPath, field: string) => {
    const m = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(K|mK)\s*$/.exec(text);
    if (!m)
      fail(
        {
          code: 'bad-quantity',
          text,
          expected: 'temperature difference',
          reason: 'give it in K (e.g. "0.3 K")',
        },
        w(path, field),
      );
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
        w(path, field),
      );
    return v;
  };
  const thermometer = lab.thermometer && {
    uncertaintyK: kelvinDiff(
      lab.thermometer.uncertainty,
      ['thermometer', 'uncertainty'],
      'thermometer.uncertainty',
    ),
    resolutionK:
      lab.thermometer.resolution === undefined
        ? 0
        : kelvinDiff(lab.thermometer.resolution, ['thermometer', 'resolution'], 'thermometer.resolution'),
    settlingK:
      lab.thermometer.settling === undefined
        ? undefined
        : kelvinDiff(lab.thermometer.settling, ['thermometer', 'settling'], 'thermometer.settling'),
  };
  return {
    name: lab.name,
    origin: file ?? DEMO_LAB_NAME,
    file: lab,
    barometricPa: baroPa,
    barometricUncertaintyPa: baroU,
    air,
    tanks,
    reactors,
    fillMargin: lab.fill_margin ?? 0.1,
    gauges,
    cylinders,
    coldestK,
    thermometer,
    condensationFraction: lab.condensation_fraction,
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
  readonly sizing?: import('../core/index.js').SizingInput;
  /** the experiment count the final pressure was sized for */
  readonly sizedFor?: number;
  /** the lab's record of the tank (height, stirrer, vacuum), when it came from the profile */
  readonly tankInfo?: LoadedLab['tanks'][number];
}

export interface Overrides {
  /** --barometer: today's barometric pressure, Pa; it also converts gauge pressures ("15 psig") */
  readonly barometricPa?: number;
}

/** Build the core's plan input from a recipe (file or options) and its lab profile. */
export function buildPlanRequest(
  rs: RecipeSource,
  labFileOverride?: string,
  overrides: Overrides = {},
): PlanRequest {
  const r = rs.recipe;
  const W = (path: DataPath, field = path.join('.')): Where => ({
    ...rs.locate(path),
    field: rs.locate(path).field ?? field,
  });
  const lab = loadLab(labFileOverride ?? (r.lab ? resolvePath(rs.baseDir, r.lab) : undefined));
  // gauge pressures in the recipe are converted with the barometer given now, else the lab profile's own
  const gaugeCtx = {
    barometricPa: overrides.barometricPa ?? (lab.file.barometer ? lab.barometricPa : undefined),
  };

  // tank and volume
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
    const volumeM3 = parseQuantity(r.volume, 'volume', W(['volume']));
    if (!(volumeM3 > 0))
      fail({ code: 'not-positive', what: 'tank volume', value: volumeM3, text: r.volume }, W(['volume']));
    tank = tank
      ? { ...tank, volumeM3 }
      : { id: 'given-volume', label: 'tank of the given volume (no rating known)', volumeM3 };
  }
  if (r.rating !== undefined || r.working_fraction !== undefined) {
    // a rating belongs to the tank of a given volume; a lab tank's rating is the profile's, never overridden here
    if (r.tank !== undefined)
      fail(
        {
          code: 'design-conflict',
          reason:
            `the tank ${r.tank} has its rating in the lab profile; a rating here is for ` +
            `a tank given by its volume only`,
        },
        W([r.rating !== undefined ? 'rating' : 'working_fraction']),
      );
    if (r.rating === undefined)
      fail(
        {
          code: 'design-missing',
          reason: 'a working fraction is a fraction of the rating: give the rating too',
        },
        W(['working_fraction'], 'working_fraction'),
      );
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
  if (!tank)
    fail(
      {
        code: 'design-missing',
        reason:
          `name a tank from the lab profile (${lab.tanks.map((t) => t.id).join(', ') || 'none listed'}) ` +
          `or give a volume`,
      },
      W(['tank'], 'tank'),
    );

  const count = r.experiments?.count;
  if (count !== undefined && r.pressure !== undefined) {
    fail(
      {
        code: 'design-conflict',
        reason:
          'give the final pressure or the number of experiments, not both (the count sets the pressure)',
      },
      W(['experiments', 'count'], 'experiments.count'),
    );
  }
  if (count === undefined && r.pressure === undefined)
    fail(
      {
        code: 'design-missing',
        reason: 'give the final pressure, or the number of experiments the batch must serve',
      },
      W(['pressure'], 'pressure'),
    );
  const temperatureK = parseQuantity(r.temperature, 'temperature', W(['temperature']));
  // the reactor the batch serves: the recipe's, else the lab's first
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
        W(['experiments', 'reactor'], 'experiments.reactor'),
      );
  } else if (ex?.reactor_volume === undefined) reactor = lab.reactors[0];
  if (ex?.reactor_volume !== undefined || ex?.fill_pressure !== undefined || ex?.line_volume !== undefined) {
    const volumeM3 =
      ex.reactor_volume !== undefined
        ? parseQuantity(ex.reactor_volume, 'volume', W(['experiments', 'reactor_volume']))
        : reactor?.volumeM3;
    const fillPressurePa =
      ex.fill_pressure !== undefined
        ? parseQuantity(ex.fill_pressure, 'pressure', W(['experiments', 'fill_pressure']), gaugeCtx)
        : reactor?.fillPressurePa;
    if (volumeM3 === undefined || fillPressurePa === undefined)
      fail(
        {
          code: 'design-missing',
          reason:
            'give both the reactor volume and the fill pressure of one experiment (or a reactor from the lab profile)',
        },
        W(['experiments'], 'experiments'),
      );
    reactor = {
      id: reactor?.id ?? 'reactor',
      label: reactor?.label ?? 'reactor of the given volume',
      volumeM3,
      lineVolumeM3:
        ex.line_volume !== undefined
          ? parseQuantity(ex.line_volume, 'volume', W(['experiments', 'line_volume']))
          : (reactor?.lineVolumeM3 ?? 0),
      fillPressurePa,
      temperatureK: reactor?.temperatureK,
    };
  }
  if (count !== undefined && !reactor)
    fail(
      {
        code: 'design-missing',
        reason:
          'sizing for a number of experiments needs a reactor: name one from the lab ' +
          'profile or give its volume and fill pressure',
      },
      W(['experiments'], 'experiments'),
    );
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

  // design
  const m = r.mixture;
  let designInput: DesignInput;
  if ('fractions' in m) {
    designInput = { kind: 'fractions', fractions: parseBlend(m.fractions, W(['mixture', 'fractions'])) };
  } else {
    const bases = (['dilution', 'diluent_ratio', 'fuel_fraction'] as const).filter((k) => m[k] !== undefined);
    if (bases.length > 1)
      fail(
        {
          code: 'design-conflict',
          reason: `give only one of dilution, diluent_ratio, fuel_fraction (got ${bases.join(' and ')})`,
        },
        W(['mixture', bases[1]]),
      );
    const diluent = m.diluent === undefined ? {} : parseBlend(m.diluent, W(['mixture', 'diluent']));
    const basisKey = bases[0];
    const basis =
      basisKey === 'diluent_ratio'
        ? ({ kind: 'diluent-ratio', value: m.diluent_ratio! } as const)
        : basisKey === 'fuel_fraction'
          ? ({ kind: 'fuel-fraction', value: m.fuel_fraction! } as const)
          : ({ kind: 'dilution', value: m.dilution ?? 0 } as const);
    if (!basisKey && Object.keys(diluent).length > 0) {
      fail(
        {
          code: 'design-missing',
          reason: 'a diluent is named but not how much: give dilution, diluent_ratio or fuel_fraction',
        },
        W(['mixture', 'diluent']),
      );
    }
    designInput = {
      kind: 'phi',
      fuel: parseBlend(m.fuel, W(['mixture', 'fuel'])),
      oxidizer: parseBlend(m.oxidizer, W(['mixture', 'oxidizer']), lab.air),
      diluent,
      phi: m.phi,
      basis,
    };
  }
  let design;
  try {
    design = designMixture(designInput);
  } catch (e) {
    // the core names the design field (phi, dilution, fuel, ...): point at it in the recipe
    if (e instanceof ProblemError)
      throw relocate(e, W(e.where.field ? ['mixture', e.where.field] : ['mixture']));
    throw e;
  }

  // sources
  let sources: GasSource[];
  if (r.sources) {
    sources = r.sources.map((id, i) => {
      const c = lab.cylinders.find((x) => x.id === id);
      if (!c)
        fail(
          { code: 'unknown-reference', kind: 'cylinder', id, choices: lab.cylinders.map((x) => x.id) },
          W(['sources', i], `sources[${i}]`),
        );
      return c;
    });
  } else {
    sources = chooseSources(design.composition, lab.cylinders);
  }
  if (r.order) {
    try {
      sources = orderSources(sources, r.order, resolveSpeciesKey);
    } catch (e) {
      if (e instanceof ProblemError) throw relocate(e, W(['order']));
      throw e;
    }
  }

  let inTank: PlanInput['inTank'];
  if (r.in_tank) {
    inTank = {
      composition: parseBlend(r.in_tank.composition, W(['in_tank', 'composition'])),
      pressurePa: parseQuantity(r.in_tank.pressure, 'pressure', W(['in_tank', 'pressure']), gaugeCtx),
    };
  }
  const tolerance = { relative: r.tolerance?.relative ?? 0.005, absolute: r.tolerance?.absolute ?? 0 };
  const sizingInput = reactor && {
    composition: design.composition,
    tankVolumeM3: tank.volumeM3,
    temperatureK,
    reactor,
    margin: lab.fillMargin,
  };
  let pressurePa: number;
  if (count !== undefined) {
    pressurePa = at(
      W(['experiments', 'count'], 'experiments.count'),
      () => finalPressureForExperiments(sizingInput!, count).pressurePa,
    );
  } else {
    pressurePa = parseQuantity(r.pressure!, 'pressure', W(['pressure']), gaugeCtx);
    if (!(pressurePa > 0))
      fail(
        { code: 'not-positive', what: 'final pressure', value: pressurePa, text: r.pressure },
        W(['pressure']),
      );
  }
  const input: PlanInput = {
    design,
    finalPressurePa: pressurePa,
    temperatureK,
    tank,
    sources,
    order: r.order ? 'given' : 'recommend',
    safety: { coldestK: lab.coldestK, condensationFraction: lab.condensationFraction },
    inTank,
    gauges: lab.gauges,
    reading: {
      barometricPa: overrides.barometricPa ?? lab.barometricPa,
      barometricUncertaintyPa: lab.barometricUncertaintyPa,
    },
    tolerance,
  };
  return {
    input,
    lab,
    recipe: r,
    orderRecommended: !r.order,
    sizing: sizingInput,
    sizedFor: count,
    tankInfo: lab.tanks.find((t) => t.id === tank.id),
  };
}
