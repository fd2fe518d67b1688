/**
 * Sources of each fill (pure cylinders with impurities, premixed cylinders,
 * vapour from a degassed liquid, gas already in the tank) and the amounts drawn
 * from each, by non-negative least squares on the species amounts.
 */
import { nnls } from './nnls.js';
import { FRACTION_SUM_TOL, type Fractions } from './composition.js';
import { fail } from './problems.js';

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
  /** regulator / cylinder delivery pressure, Pa, when known */
  readonly supplyPressurePa?: number;
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
}

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

/** how a fill is named: its gas, or for a premix its major gases ("N2+O2") */
export function fillLabel(s: GasSource): string {
  if (s.kind !== 'premix') return s.mainSpecies;
  return majorComponents(s)
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

/**
 * Choose the sources for a design from the cylinders on hand: a premixed cylinder
 * when the design holds its major components in the same ratio (within 0.1 %
 * relative), else the purest cylinder of each species, else an assumed-pure one
 * (flagged by the planner).
 */
export function chooseSources(design: Fractions, available: readonly GasSource[]): GasSource[] {
  const need = new Set(Object.keys(design).filter((k) => design[k] > 0));
  const chosen: GasSource[] = [];
  const premixes = available
    .filter((s) => s.kind === 'premix')
    .map((s) => ({ s, major: majorComponents(s) }))
    .filter(({ major }) => major.length > 1 && major.every(([k]) => need.has(k)))
    .filter(({ major }) => {
      const [k0, v0] = major[0];
      return major.every(([k, v]) => Math.abs(design[k] / design[k0] / (v / v0) - 1) <= PREMIX_RATIO_MATCH);
    })
    .sort((a, b) => b.major.length - a.major.length);
  for (const { s, major } of premixes) {
    if (major.every(([k]) => need.has(k))) {
      chosen.push(s);
      for (const [k] of major) need.delete(k);
    }
  }
  for (const sp of need) {
    const pure = available
      .filter((s) => s.kind !== 'premix' && s.kind !== 'in-tank' && s.mainSpecies === sp)
      .sort((a, b) => (b.composition[sp] ?? 0) - (a.composition[sp] ?? 0));
    chosen.push(
      pure[0] ??
        pureCylinder({ id: `${sp}-assumed`, label: `${sp} (no cylinder in lab profile)`, species: sp }),
    );
  }
  return chosen;
}

/**
 * Put sources in the order the user names them. Each name is a source id or the
 * main species of one source; every source must be named exactly once.
 */
export function orderSources(
  sources: readonly GasSource[],
  names: readonly string[],
  resolve: (n: string) => string | undefined,
): GasSource[] {
  const picked: GasSource[] = [];
  const unknown: string[] = [];
  const repeated: string[] = [];
  for (const n of names) {
    const key = resolve(n) ?? n;
    const s =
      sources.find((x) => x.id === n) ??
      sources.find((x) => x.mainSpecies === key) ??
      sources.find((x) => (x.composition[key] ?? 0) >= MAJOR_COMPONENT_FRACTION);
    if (!s) unknown.push(n);
    else if (picked.includes(s)) repeated.push(n);
    else picked.push(s);
  }
  const choices = sources.map((s) => (s.kind === 'premix' ? s.id : s.mainSpecies));
  if (unknown.length) fail({ code: 'order-unknown', unknown, choices }, { field: 'order' });
  if (repeated.length) fail({ code: 'order-repeated', repeated }, { field: 'order' });
  const missing = sources
    .filter((s) => !picked.includes(s))
    .map((s) => (s.kind === 'premix' ? s.id : s.mainSpecies));
  if (missing.length) fail({ code: 'order-missing', missing }, { field: 'order' });
  return picked;
}
