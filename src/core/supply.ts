/**
 * Sources of each fill (pure cylinders with impurities, premixed cylinders,
 * vapour from a degassed liquid, gas already in the tank) and the amounts drawn
 * from each, by non-negative least squares on the species amounts.
 */
import { nnls } from './nnls.js';
import { FRACTION_SUM_TOL, speciesRole, type Fractions } from './composition.js';
import type { Finding } from './findings.js';
import { allowedDeviation, type Tolerance } from './plan/types.js';
import { fail, type StopFault, type Where } from './problems.js';

export type SourceKind = 'cylinder' | 'premix' | 'vapour' | 'in-tank';

export interface GasSource {
  readonly id: string;
  readonly label: string;
  readonly kind: SourceKind;
  /** delivered composition: main gas at its purity plus the listed impurities */
  readonly composition: Fractions;
  /** the part of (1 - purity) that no listed impurity accounts for */
  readonly unidentified: number;
  /** the species the fill is named by: the largest component */
  readonly mainSpecies: string;
  /**
   * a premix: the gases it was made to carry (a recipe's listed components, a first stage's design
   * species), whatever their fraction; they name the fill (fillLabel), so that a premix of 0.12 % O2
   * in Ar reads "Ar+O2", never "Ar"
   */
  readonly gases?: readonly string[];
  /** regulator / cylinder delivery pressure, Pa, when known (a tank's: its pressure before the batch draws) */
  readonly supplyPressurePa?: number;
  /**
   * the tank the gas is drawn from, when it is a tank of known volume (a premix tank): its pressure
   * falls as it delivers (supply-check.ts)
   */
  readonly supplyTank?: { readonly id: string; readonly volumeM3: number };
  /** true when the purity was not given and 1 was assumed */
  readonly purityAssumed?: boolean;
  /**
   * the standard uncertainty of the composition itself, as independent inputs that move it
   * (a premix made in a first stage: the inputs of that stage's budget); counted by the budget
   */
  readonly compositionTerms?: readonly CompositionTerm[];
}

/**
 * One input of a source's composition uncertainty: its distribution (rectangular: half-width;
 * normal: standard deviation, in its unit) and the change of each mole fraction of the source per
 * unit of the input (linear, as the GUM law of propagation uses it). The changes sum to zero.
 */
export interface CompositionTerm {
  readonly name: string;
  readonly dist: 'rectangular' | 'normal';
  readonly scale: number;
  readonly unit: string;
  /** d(mole fraction of the species in the source) / d(input), per unit of the input */
  readonly sensitivity: Readonly<Record<string, number>>;
  /**
   * The instrument error this input is, when the same instrument may read the batch too: a
   * gauge's span or zero (by gauge id) or the thermometer's offset. Where the batch's budget has
   * that input with the same distribution and scale, the term moves the source's composition by
   * the batch's own component (one input, both stages) instead of an independent one.
   */
  readonly shared?: SharedInstrument;
}

/** an instrument error common to the stages that one instrument reads */
export type SharedInstrument =
  { readonly kind: 'span' | 'zero'; readonly gauge: string } | { readonly kind: 'thermometer' };

/**
 * A pure cylinder: the main species at `purity`, the listed impurities, and the
 * rest of (1 - purity) as an unidentified remainder that is carried through to the
 * tank's composition report.
 */
export function pureCylinder(args: {
  id: string;
  label?: string;
  species: string;
  purity?: number;
  impurities?: Fractions;
  kind?: 'cylinder' | 'vapour';
  supplyPressurePa?: number;
}): GasSource {
  const purity = args.purity ?? 1;
  if (!(purity > 0 && purity <= 1))
    fail(
      { code: 'out-of-range', what: `purity of ${args.id}`, value: purity, allowed: '(0, 1]' },
      { field: 'purity' },
    );
  const imp = args.impurities ?? {};
  let impSum = 0;
  for (const [k, v] of Object.entries(imp)) {
    if (!(v >= 0))
      fail(
        { code: 'out-of-range', what: `impurity ${k} of ${args.id}`, value: v, allowed: '[0, 1 - purity]' },
        { field: 'impurities' },
      );
    if (k === args.species)
      fail(
        { code: 'design-conflict', kind: 'impurity-is-main-gas', cylinder: args.id, species: k },
        { field: 'impurities' },
      );
    impSum += v;
  }
  if (impSum > 1 - purity + 1e-12) {
    fail(
      {
        code: 'design-conflict',
        kind: 'impurities-over-purity',
        cylinder: args.id,
        impuritySum: impSum,
        allowed: 1 - purity,
      },
      { field: 'impurities' },
    );
  }
  const composition: Record<string, number> = { [args.species]: purity };
  for (const [k, v] of Object.entries(imp)) if (v > 0) composition[k] = v;
  return {
    id: args.id,
    label: args.label ?? `${args.species} cylinder`,
    kind: args.kind ?? 'cylinder',
    composition,
    unidentified: Math.max(0, 1 - purity - impSum),
    mainSpecies: args.species,
    supplyPressurePa: args.supplyPressurePa,
    purityAssumed: args.purity === undefined,
  };
}

export function premix(args: {
  id: string;
  label?: string;
  composition: Fractions;
  /** the gases that name it (default: every component given) */
  gases?: readonly string[];
  supplyPressurePa?: number;
}): GasSource {
  const entries = Object.entries(args.composition);
  const sum = entries.reduce((s, [, v]) => s + v, 0);
  if (Math.abs(sum - 1) > FRACTION_SUM_TOL)
    fail({ code: 'fractions-sum', sum }, { field: `cylinders.${args.id}.composition` });
  const main = entries.reduce((a, b) => (b[1] > a[1] ? b : a))[0];
  return {
    id: args.id,
    label: args.label ?? args.id,
    kind: 'premix',
    composition: args.composition,
    unidentified: 0,
    mainSpecies: main,
    gases: args.gases ?? entries.filter(([, v]) => v > 0).map(([k]) => k),
    supplyPressurePa: args.supplyPressurePa,
  };
}

/**
 * A premix's major components: those of 1 % or more (our limit). They name the fill ("N2+O2"),
 * let an order name the premix by one of them, and must match the design for the premix to be used.
 */
export const MAJOR_COMPONENT_FRACTION = 0.01;
/** a premix is used when the design holds its major components in its ratios within this (relative) */
export const PREMIX_RATIO_MATCH = 1e-3;

function majorComponents(s: GasSource): [string, number][] {
  return Object.entries(s.composition).filter(([, v]) => v >= MAJOR_COMPONENT_FRACTION);
}

/**
 * How a fill is named: its gas, or for a premix every gas it was made to carry, largest first
 * ("N2+O2"; a premix of 0.12 % O2 in Ar "Ar+O2"), so that its oxidizer or fuel shows on every
 * line that names the fill (plan, sheet, diagram, guided fill). A premix without `gases`: its
 * major components. One name for every shell; `--order` accepts it for the premix.
 */
export function fillLabel(s: GasSource): string {
  if (s.kind !== 'premix') return s.mainSpecies;
  const named = s.gases
    ? s.gases.map((k): [string, number] => [k, s.composition[k] ?? 0])
    : majorComponents(s);
  return named
    .sort((a, b) => b[1] - a[1])
    .map(([k]) => k)
    .join('+');
}

export interface Allocation {
  /** mol drawn from each source, same order as the sources */
  readonly amountsMol: number[];
  /** resulting composition of the whole tank, including listed impurities, normalised over identified species */
  readonly composition: Record<string, number>;
  /** mole fraction of the tank that comes from unidentified cylinder remainders */
  readonly unidentified: number;
  /** largest |x_actual - x_design| / x_design over design species */
  readonly worstRelativeDeviation: number;
}

/**
 * Amounts per source: minimise sum_i ((sum_s a_s w_si - b_i)/x_i)^2 over design species i,
 * with b_i = N x_i - (mol of i already in the tank), a_s >= 0. Rows are scaled by 1/x_i so
 * that the fit is on relative error of each component.
 */
export function allocate(
  sources: readonly GasSource[],
  design: Fractions,
  totalMol: number,
  inTank?: { composition: Fractions; amountMol: number },
): Allocation {
  const designSpecies = Object.keys(design).filter((k) => design[k] > 0);
  for (const sp of designSpecies) {
    if (
      !sources.some((s) => (s.composition[sp] ?? 0) > 0) &&
      !(inTank && (inTank.composition[sp] ?? 0) > 0)
    ) {
      fail({ code: 'no-supply', kind: 'no-cylinder', species: sp });
    }
  }
  const A = designSpecies.map((sp) => sources.map((s) => (s.composition[sp] ?? 0) / design[sp]));
  const b = designSpecies.map(
    (sp) =>
      (totalMol * design[sp] - (inTank ? inTank.amountMol * (inTank.composition[sp] ?? 0) : 0)) / design[sp],
  );
  if (b.some((v) => v < -1e-9 * totalMol)) {
    const over = designSpecies.filter((_, i) => b[i] < 0);
    fail({ code: 'design-conflict', kind: 'in-tank-excess', species: over });
  }
  const { x } = nnls(A, b);
  const composition: Record<string, number> = {};
  let total = 0;
  let unknown = 0;
  const add = (c: Fractions, n: number) => {
    for (const [k, v] of Object.entries(c)) {
      composition[k] = (composition[k] ?? 0) + v * n;
      total += v * n;
    }
  };
  if (inTank) add(inTank.composition, inTank.amountMol);
  sources.forEach((s, i) => {
    add(s.composition, x[i]);
    unknown += s.unidentified * x[i];
  });
  for (const k of Object.keys(composition)) composition[k] /= total;
  let worst = 0;
  for (const sp of designSpecies)
    worst = Math.max(worst, Math.abs((composition[sp] ?? 0) - design[sp]) / design[sp]);
  return {
    amountsMol: x,
    composition,
    unidentified: unknown / (total + unknown),
    worstRelativeDeviation: worst,
  };
}

/** the purest single-gas cylinder of a species on hand, else an assumed-pure one (flagged by the planner) */
function singleGasCylinder(sp: string, available: readonly GasSource[]): GasSource {
  const pure = available
    .filter((s) => s.kind !== 'premix' && s.kind !== 'in-tank' && s.mainSpecies === sp)
    .sort((a, b) => (b.composition[sp] ?? 0) - (a.composition[sp] ?? 0));
  return (
    pure[0] ?? pureCylinder({ id: `${sp}-assumed`, label: `${sp} (no cylinder in lab profile)`, species: sp })
  );
}

/** the premixes whose major components are all in the design, in the design's ratios (within 0.1 %) */
function matchingPremixes(design: Fractions, available: readonly GasSource[]) {
  const need = new Set(Object.keys(design).filter((k) => design[k] > 0));
  return available
    .filter((s) => s.kind === 'premix')
    .map((s) => ({ s, major: majorComponents(s) }))
    .filter(({ major }) => major.length > 1 && major.every(([k]) => need.has(k)))
    .filter(({ major }) => {
      const [k0, v0] = major[0];
      return major.every(([k, v]) => Math.abs(design[k] / design[k0] / (v / v0) - 1) <= PREMIX_RATIO_MATCH);
    })
    .sort((a, b) => b.major.length - a.major.length);
}

/**
 * Choose the sources for a design from the cylinders on hand, when no fill order names them:
 * a premixed cylinder when the design holds its major components in the same ratio (within
 * 0.1 % relative), else the purest cylinder of each species, else an assumed-pure one
 * (flagged by the planner). A premix used in place of single gases is a substitution that the
 * plan states (`premixFindings`); naming the gases in the order avoids it.
 */
export function chooseSources(design: Fractions, available: readonly GasSource[]): GasSource[] {
  const need = new Set(Object.keys(design).filter((k) => design[k] > 0));
  const chosen: GasSource[] = [];
  for (const { s, major } of matchingPremixes(design, available)) {
    if (major.every(([k]) => need.has(k))) {
      chosen.push(s);
      for (const [k] of major) need.delete(k);
    }
  }
  for (const sp of need) chosen.push(singleGasCylinder(sp, available));
  return chosen;
}

/** one entry of a fill order: a source's name, and the absolute tank pressure to stop that charge at */
export interface OrderEntry {
  readonly name: string;
  /** Pa, absolute; only on a charge that is not its source's last */
  readonly stopPa?: number;
  /** the entry as typed, for messages ("Ar@400 Torr") */
  readonly text: string;
  /** where the entry was given (its option or recipe line), for messages */
  readonly where?: Where;
}

/** the charges of a fill order: the distinct sources in order of first charge, and every charge */
export interface OrderedCharges {
  readonly sources: readonly GasSource[];
  readonly charges: readonly { readonly source: GasSource; readonly stopPa?: number }[];
  /** true when some source is filled in more than one charge */
  readonly split: boolean;
}

/** how an order names a source: its gas for a single-gas cylinder, its id for a premix */
const orderName = (s: GasSource) => (s.kind === 'premix' ? s.id : s.mainSpecies);

/**
 * The sources an order names, when it names them from the whole lab: a cylinder id; a premix by
 * its fill label ("N2+O2"); a species of the design by its single-gas cylinder. Species named one
 * by one are never taken from a premix. Returns the resolver and the names it accepts.
 */
export function sourcesByName(
  design: Fractions,
  available: readonly GasSource[],
  resolve: (n: string) => string | undefined,
): { pick: (name: string) => GasSource | undefined; choices: string[] } {
  // a premix serves when every gas it brings is in the design (else it would add a gas not asked for)
  const inDesign = (s: GasSource) =>
    s.kind === 'premix'
      ? majorComponents(s).every(([k]) => (design[k] ?? 0) > 0)
      : (design[s.mainSpecies] ?? 0) > 0;
  const usable = available.filter((s) => s.kind !== 'in-tank' && inDesign(s));
  const single = new Map<string, GasSource>();
  const pick = (name: string): GasSource | undefined => {
    const byId =
      usable.find((s) => s.id === name) ?? usable.find((s) => s.kind === 'premix' && fillLabel(s) === name);
    if (byId) return byId;
    const key = resolve(name) ?? name;
    if (!((design[key] ?? 0) > 0)) return undefined;
    if (!single.has(key)) single.set(key, singleGasCylinder(key, available));
    return single.get(key);
  };
  const species = Object.keys(design).filter((k) => design[k] > 0);
  const premixIds = usable.filter((s) => s.kind === 'premix').map((s) => s.id);
  return { pick, choices: [...species, ...premixIds] };
}

/**
 * The sources of the given list (a recipe's `sources`) by name: a source id, the main species of
 * one source, or a major component of a premix among them.
 */
export function sourcesFromList(
  sources: readonly GasSource[],
  resolve: (n: string) => string | undefined,
): { pick: (name: string) => GasSource | undefined; choices: string[] } {
  const pick = (n: string) => {
    const key = resolve(n) ?? n;
    return (
      sources.find((x) => x.id === n) ??
      sources.find((x) => x.mainSpecies === key) ??
      sources.find((x) => (x.composition[key] ?? 0) >= MAJOR_COMPONENT_FRACTION)
    );
  };
  return { pick, choices: sources.map(orderName) };
}

/** stops rise: each above the stop before it, the gas already in the tank, or the evacuated tank */
function checkStopsRise(entries: readonly OrderEntry[], inTankPa: number | undefined): void {
  type Previous = Extract<StopFault, { kind: 'not-above-previous' }>['previous'];
  let previous: Previous =
    inTankPa !== undefined && inTankPa > 0
      ? { kind: 'in-tank', pressurePa: inTankPa }
      : { kind: 'evacuated' };
  let floorPa = previous.kind === 'in-tank' ? previous.pressurePa : 0;
  for (const e of entries) {
    if (e.stopPa === undefined) continue;
    if (!(e.stopPa > floorPa))
      fail(
        {
          code: 'order-stop',
          entry: e.text,
          fault: { kind: 'not-above-previous', stopPa: e.stopPa, previous },
        },
        e.where,
      );
    previous = { kind: 'stop', entry: e.text, stopPa: e.stopPa };
    floorPa = e.stopPa;
  }
}

/**
 * Put the charges in the order the user names them. A source may be named more than once (one
 * charge each); a charge that is not its source's last may carry the absolute tank pressure to
 * stop at, and stops rise along the order. `required`: the sources that must each be named (a
 * recipe's list), or the design species the named sources must together supply.
 */
export function orderCharges(
  entries: readonly OrderEntry[],
  names: { pick: (name: string) => GasSource | undefined; choices: readonly string[] },
  required: { readonly sources: readonly GasSource[] } | { readonly species: readonly string[] },
  inTankPa?: number,
): OrderedCharges {
  const unknown: string[] = [];
  const charges: { source: GasSource; stopPa?: number }[] = [];
  const picked: GasSource[] = [];
  for (const e of entries) {
    const s = names.pick(e.name);
    if (!s) {
      if (!unknown.includes(e.name)) unknown.push(e.name);
    } else {
      charges.push(e.stopPa === undefined ? { source: s } : { source: s, stopPa: e.stopPa });
      if (!picked.includes(s)) picked.push(s);
    }
  }
  if (unknown.length)
    fail({ code: 'order-unknown', unknown, choices: [...names.choices] }, { field: 'order' });
  const missing =
    'sources' in required
      ? required.sources.filter((s) => !picked.includes(s)).map(orderName)
      : required.species.filter(
          (sp) => !picked.some((s) => (s.composition[sp] ?? 0) >= MAJOR_COMPONENT_FRACTION),
        );
  if (missing.length) fail({ code: 'order-missing', missing }, { field: 'order' });
  charges.forEach((c, k) => {
    if (c.stopPa === undefined || charges.slice(k + 1).some((d) => d.source === c.source)) return;
    const count = charges.filter((d) => d.source === c.source).length;
    fail(
      {
        code: 'order-stop',
        entry: entries[k].text,
        fault: { kind: 'on-last-charge', source: orderName(c.source), charges: count },
      },
      entries[k].where,
    );
  });
  checkStopsRise(entries, inTankPa);
  return { sources: picked, charges, split: charges.length > picked.length };
}

/** the gases of a premix in the order a single-gas fill would take them: inerts first, oxidizers last */
function gasesOf(s: GasSource): string[] {
  const rank = (k: string) => ({ fuel: 0, inert: 1, oxidizer: 2 })[speciesRole(k)];
  return majorComponents(s)
    .map(([k]) => k)
    .sort((a, b) => rank(a) - rank(b) || (s.composition[b] ?? 0) - (s.composition[a] ?? 0));
}

/**
 * The premixes a plan fills in place of single gases, stated: which cylinder fills which gases,
 * and the composition change it causes (design against filled fraction of each of its gases, the
 * filled one with every cylinder's impurities). A warning when a change exceeds the tolerance,
 * else a note. `order` is the plan's order with each premix replaced by its gases: naming them so
 * in the fill order uses single-gas cylinders instead.
 */
export function premixFindings(
  premixes: readonly GasSource[],
  plan: {
    readonly design: { readonly composition: Fractions };
    readonly composition: Fractions;
    readonly tolerance: Tolerance;
    readonly steps: readonly { readonly source: GasSource }[];
  },
): Finding[] {
  const order: string[] = [];
  for (const { source } of plan.steps)
    for (const n of source.kind === 'premix' ? gasesOf(source) : [source.mainSpecies])
      if (!order.includes(n)) order.push(n);
  return premixes
    .filter((p) => plan.steps.some((s) => s.source === p))
    .map((p) => {
      const changes = gasesOf(p).map((species) => ({
        species,
        design: plan.design.composition[species] ?? 0,
        filled: plan.composition[species] ?? 0,
      }));
      const outside = changes.some(
        (c) => Math.abs(c.filled - c.design) > allowedDeviation(plan.tolerance, c.design),
      );
      return {
        severity: outside ? 'warning' : 'note',
        code: 'premix-in-place',
        source: p.id,
        label: p.label,
        gases: gasesOf(p),
        changes,
        order,
      };
    });
}
