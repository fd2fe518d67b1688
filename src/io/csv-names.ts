/**
 * The names a readings CSV may give a fill: the plan's step label (a species, or a premix's
 * major gases joined by "+", e.g. "N2+O2" in any order) or a cylinder id of the lab profile
 * ("cyl-air"). The names a CSV accepts and the plan's step labels are the same. A name that
 * fits more than one source is refused with the choices; a gas that is only a component of a
 * premix fill is refused with the fill's names (a row "O2" is never read as a charge of air).
 */
import { fail, fillLabel, getSpecies, ProblemError, type GasSource } from '../core/index.js';

/** how a two-stage plan names the premix of an earlier stage: premix-<its tank> */
const PREMIX_PREFIX = 'premix-';

/** a CSV row's place, for messages */
export interface RowWhere {
  readonly file: string;
  readonly line: number;
  readonly field: string;
}

/** how a CSV names its sources: whether a name is one, and the source it names */
export interface SourceNames {
  /** true when the name is a cylinder id or fill label this basis knows (not only a species) */
  readonly accepts: (name: string) => boolean;
  /** the source a row names (refuses an unknown, ambiguous or premix-component name) */
  readonly resolve: (name: string, where: RowWhere) => GasSource;
  /** the names of the fills, for messages */
  readonly fills: readonly string[];
}

/** the species keys of a label ("N2+O2" -> [N2, O2] sorted); undefined when a part is not a species */
function labelKeys(name: string): string[] | undefined {
  const parts = name.split('+').map((p) => p.trim());
  if (parts.some((p) => p === '')) return undefined;
  try {
    return parts.map((p) => getSpecies(p).key).sort();
  } catch (e) {
    if (e instanceof ProblemError) return undefined;
    throw e;
  }
}

const sameKeys = (a: readonly string[], b: readonly string[]) =>
  a.length === b.length && a.every((k, i) => k === b[i]);

/** "cyl-air (N2+O2)" */
export const sourceChoice = (s: GasSource) => `${s.id} (${fillLabel(s)})`;

function unique(sources: readonly GasSource[]): GasSource[] {
  return [...new Map(sources.map((s) => [s.id, s])).values()];
}

/**
 * The names of `filled` (the plan's sources, in fill order) and of `cylinders` (the lab
 * profile's, nameable by id only). `pure(species)` makes the source of a species the
 * basis does not fill from a listed cylinder (the CSV without a recipe: a pure gas);
 * `notFilled` refuses a name that fits nothing.
 */
export function sourceNames(args: {
  readonly filled: readonly GasSource[];
  readonly cylinders: readonly GasSource[];
  readonly pure?: (species: string) => GasSource;
  readonly notFilled: (name: string, where: RowWhere) => never;
  /** the lab profile's tanks, and the premix of --premix-log if one was given (a row naming another premix) */
  readonly premixes?: { readonly tanks: readonly string[]; readonly given?: string };
}): SourceNames {
  const filled = unique(args.filled);
  const byId = new Map([...args.cylinders, ...filled].map((s) => [s.id, s]));
  const byLabel = (keys: readonly string[]) =>
    filled.filter((s) => {
      const k = labelKeys(fillLabel(s));
      return k !== undefined && sameKeys(k, keys);
    });
  const ambiguous = (name: string, found: readonly GasSource[], where: RowWhere): never =>
    fail({ code: 'csv-name-ambiguous', name, choices: found.map(sourceChoice) }, where);
  const resolve = (name: string, where: RowWhere): GasSource => {
    const direct = byId.get(name);
    if (direct) return direct;
    const keys = labelKeys(name);
    if (!keys && name.startsWith(PREMIX_PREFIX) && args.premixes) {
      const tank = name.slice(PREMIX_PREFIX.length);
      const { tanks, given } = args.premixes;
      fail({ code: 'csv-premix-needs-log', name, tank, tankKnown: tanks.includes(tank), given }, where);
    }
    if (!keys) {
      // not a cylinder id and not a species: the species lookup's own refusal (with suggestions)
      if (!name.includes('+')) getSpecies(name);
      return args.notFilled(name, where);
    }
    const found = byLabel(keys);
    if (found.length === 1) return found[0];
    if (found.length > 1) return ambiguous(name, found, where);
    if (keys.length === 1) {
      const inPremix = filled.filter((s) => (s.composition[keys[0]] ?? 0) > 0 && s.kind === 'premix');
      if (args.pure) return args.pure(keys[0]);
      if (inPremix.length)
        return fail({ code: 'csv-name-in-premix', name, premixes: inPremix.map(sourceChoice) }, where);
    }
    return args.notFilled(name, where);
  };
  return {
    // a premix of an earlier stage is taken up by resolve, which says what the row needs
    accepts: (name) =>
      byId.has(name) ||
      (labelKeys(name)?.length ?? 0) > 1 ||
      (args.premixes !== undefined && name.startsWith(PREMIX_PREFIX)),
    resolve,
    fills: filled.map(fillLabel),
  };
}
