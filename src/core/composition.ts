/**
 * Mixture design: from an equivalence ratio and one dilution measure (or from
 * explicit mole fractions) to the target composition.
 *
 * Stoichiometry on an O-atom basis: each species needs d = c + h/4 - o/2 mol O2
 * (formula.ts). phi = sum_fuel x d / (-sum_oxidizer x d), so N2O and NO count as
 * oxidizers by the oxygen they carry.
 */
import { getSpecies } from './lookup.js';
import { oxygenDemand } from './formula.js';
import { fail } from './problems.js';

/** species -> fraction; a blend's fractions sum to 1 */
export type Fractions = Readonly<Record<string, number>>;

export type DilutionBasis =
  | { readonly kind: 'dilution'; readonly value: number } // diluent mole fraction of the final mixture
  | { readonly kind: 'diluent-ratio'; readonly value: number } // mol diluent per mol O2 (O2-equivalent) supplied
  | { readonly kind: 'fuel-fraction'; readonly value: number }; // total fuel mole fraction

export type DesignInput =
  | {
      readonly kind: 'phi';
      readonly fuel: Fractions;
      readonly oxidizer: Fractions;
      readonly diluent: Fractions;
      readonly phi: number;
      readonly basis: DilutionBasis;
    }
  | { readonly kind: 'fractions'; readonly fractions: Fractions };

export interface Design {
  readonly composition: Fractions;
  /** undefined when the mixture has no fuel or no oxidizer */
  readonly phi: number | undefined;
  readonly fuelFraction: number;
  readonly oxidizerFraction: number;
  readonly diluentFraction: number;
  /** mol O2 needed per mol of fuel blend for complete combustion */
  readonly stoichO2PerFuel: number | undefined;
  readonly groups: { readonly fuel: Fractions; readonly oxidizer: Fractions; readonly diluent: Fractions };
}

/** how far from 1 the mole fractions of a blend or premix may sum */
export const FRACTION_SUM_TOL = 1e-6;

export type SpeciesRole = 'fuel' | 'oxidizer' | 'inert';

/** role by oxygen demand: fuel (d > 0), oxidizer (d < 0), inert (d = 0: noble gases, N2, CO2, H2O, SF6) */
export function speciesRole(key: string): SpeciesRole {
  const d = oxygenDemand(getSpecies(key).elements);
  if (d > 1e-12) return 'fuel';
  if (d < -1e-12) return 'oxidizer';
  return 'inert';
}

function checkBlend(blend: Fractions, field: string, allowEmpty: boolean): Record<string, number> {
  const out: Record<string, number> = {};
  let sum = 0;
  for (const [name, v] of Object.entries(blend)) {
    const key = getSpecies(name).key;
    if (!Number.isFinite(v) || v < 0)
      fail({ code: 'out-of-range', what: `fraction of ${key}`, value: v, allowed: '[0, 1]' }, { field });
    out[key] = (out[key] ?? 0) + v;
    sum += v;
  }
  if (Object.keys(out).length === 0) {
    if (allowEmpty) return out;
    fail({ code: 'design-missing', kind: 'empty-blend', blend: field }, { field });
  }
  if (Math.abs(sum - 1) > FRACTION_SUM_TOL) fail({ code: 'fractions-sum', sum }, { field });
  return out;
}

function addInto(target: Record<string, number>, blend: Fractions, scale: number): void {
  for (const [k, v] of Object.entries(blend)) target[k] = (target[k] ?? 0) + v * scale;
}

function demandOf(blend: Fractions): number {
  let d = 0;
  for (const [k, v] of Object.entries(blend)) d += v * oxygenDemand(getSpecies(k).elements);
  return d;
}

/** split an arbitrary composition into fuel, oxidizer and inert parts */
function groupsOf(x: Fractions): {
  fuel: number;
  ox: number;
  inert: number;
  fuelBlend: Record<string, number>;
  oxBlend: Record<string, number>;
  inertBlend: Record<string, number>;
} {
  const fuelBlend: Record<string, number> = {};
  const oxBlend: Record<string, number> = {};
  const inertBlend: Record<string, number> = {};
  let fuel = 0;
  let ox = 0;
  let inert = 0;
  for (const [k, v] of Object.entries(x)) {
    const role = speciesRole(k);
    if (role === 'fuel') {
      fuel += v;
      fuelBlend[k] = v;
    } else if (role === 'oxidizer') {
      ox += v;
      oxBlend[k] = v;
    } else {
      inert += v;
      inertBlend[k] = v;
    }
  }
  const norm = (b: Record<string, number>, s: number) => {
    if (s > 0) for (const k of Object.keys(b)) b[k] /= s;
  };
  norm(fuelBlend, fuel);
  norm(oxBlend, ox);
  norm(inertBlend, inert);
  return { fuel, ox, inert, fuelBlend, oxBlend, inertBlend };
}

/**
 * The oxygen balance of a composition: mol O2 its fuels need for complete combustion,
 * and mol O2 (O2-equivalent) its oxidizers supply, per mole of mixture.
 */
export function oxygenBalance(x: Fractions): { need: number; supply: number } {
  let need = 0;
  let supply = 0;
  for (const [k, v] of Object.entries(x)) {
    const d = oxygenDemand(getSpecies(k).elements);
    if (d > 0) need += v * d;
    else supply -= v * d;
  }
  return { need, supply };
}

/**
 * Equivalence ratio of any composition on the O-atom basis.
 * Example: equivalenceRatio({ CH4: 0.095, O2: 0.19, N2: 0.715 }) -> 1.000 (CH4 + 2 O2 -> CO2 + 2 H2O:
 *   phi = 0.095 x 2 / 0.19 = 1 by hand).
 */
export function equivalenceRatio(x: Fractions): number | undefined {
  const { need, supply } = oxygenBalance(x);
  if (need <= 0 || supply <= 0) return undefined;
  return need / supply;
}

/**
 * The equivalence ratios a design may ask for (our limits, common practice): far
 * outside them one of fuel and oxidizer is below the resolution of any fill, and the
 * arithmetic of the plan loses meaning (phi 1e300 overflows it).
 */
export const PHI_RANGE = { min: 1e-3, max: 1e3 } as const;
/** the largest diluent ratio (mol diluent per mol O2): beyond it O2 is below 1 ppm */
export const DILUENT_RATIO_MAX = 1e6;
/**
 * The smallest mole fraction a design may give a species: 1e-9 (1 ppb). Below it no
 * partial-pressure fill can meter the gas (at 10 bar it is 1 mPa of a gauge reading);
 * a trace that small is made by serial dilution of a premix (common practice).
 */
export const MIN_DESIGN_FRACTION = 1e-9;

function checkTrace(x: Fractions, field: string): void {
  for (const [k, v] of Object.entries(x)) {
    if (v > 0 && v < MIN_DESIGN_FRACTION) {
      fail(
        {
          code: 'out-of-range',
          what: `the mole fraction of ${k}`,
          value: v,
          allowed:
            `0, or from ${MIN_DESIGN_FRACTION} (1 ppb) to 1: a smaller fraction cannot ` +
            `be metered by partial pressure; fill a premix of ${k} instead, or check ` +
            `the design's numbers`,
        },
        { field },
      );
    }
  }
}

/**
 * Build the target composition of a design.
 * Example: designMixture({ kind: 'phi', fuel: { CH4: 1 }, oxidizer: { O2: 0.21, N2: 0.79 }, diluent: {},
 *   phi: 1, basis: { kind: 'dilution', value: 0 } }).composition.CH4 -> 0.0950 (CH4 in air, phi 1, no
 *   diluent: x_CH4 = 1/(1 + 2/0.21) = 0.0950 by hand).
 */
export function designMixture(input: DesignInput): Design {
  if (input.kind === 'fractions') return designFromFractions(input.fractions);
  const { phi, basis } = input;
  checkPhi(phi);
  const blends = checkRoles({
    fuel: checkBlend(input.fuel, 'fuel', false),
    oxidizer: checkBlend(input.oxidizer, 'oxidizer', false),
    diluent: checkBlend(input.diluent, 'diluent', true),
  });
  const needPerFuel = demandOf(blends.fuel); // mol O2 per mol fuel blend
  const supplyPerOx = -demandOf(blends.oxidizer); // mol O2-equivalent per mol oxidizer blend
  if (supplyPerOx <= 0)
    fail({ code: 'design-conflict', kind: 'oxidizer-without-oxygen' }, { field: 'oxidizer' });
  const { F, X, D } = groupFractions({
    phi,
    basis,
    oxPerFuel: needPerFuel / (phi * supplyPerOx),
    supplyPerOx,
    hasDiluent: Object.keys(blends.diluent).length > 0,
  });
  const composition: Record<string, number> = {};
  addInto(composition, blends.fuel, F);
  addInto(composition, blends.oxidizer, X);
  if (D > 0) addInto(composition, blends.diluent, D);
  // the groups, not each species of a blend: a trace inside a blend comes with it from a premix cylinder
  checkTrace({ fuel: F, oxidizer: X, diluent: D }, BASIS_FIELD[basis.kind]);
  return {
    composition,
    phi,
    fuelFraction: F,
    oxidizerFraction: X,
    diluentFraction: D,
    stoichO2PerFuel: needPerFuel,
    groups: blends,
  };
}

/** the recipe field that gives each dilution basis */
const BASIS_FIELD: Readonly<Record<DilutionBasis['kind'], string>> = {
  dilution: 'dilution',
  'diluent-ratio': 'diluent_ratio',
  'fuel-fraction': 'fuel_fraction',
};

function designFromFractions(fractions: Fractions): Design {
  const x = checkBlend(fractions, 'fractions', false);
  checkTrace(x, 'fractions');
  const g = groupsOf(x);
  const fuelD = demandOf(g.fuelBlend);
  return {
    composition: x,
    phi: equivalenceRatio(x),
    fuelFraction: g.fuel,
    oxidizerFraction: g.ox,
    diluentFraction: g.inert,
    stoichO2PerFuel: g.fuel > 0 ? fuelD : undefined,
    groups: { fuel: g.fuelBlend, oxidizer: g.oxBlend, diluent: g.inertBlend },
  };
}

function checkPhi(phi: number): void {
  if (!Number.isFinite(phi) || phi <= 0)
    fail({ code: 'not-positive', what: 'phi (equivalence ratio)', value: phi }, { field: 'phi' });
  if (phi < PHI_RANGE.min || phi > PHI_RANGE.max) {
    fail(
      {
        code: 'out-of-range',
        what: 'phi (equivalence ratio)',
        value: phi,
        allowed:
          `${PHI_RANGE.min} to ${PHI_RANGE.max}: beyond it the mixture is, to the precision ` +
          `of a fill, the pure oxidizer or the pure fuel; give such a mixture by its fractions`,
      },
      { field: 'phi' },
    );
  }
}

type Blends = {
  fuel: Record<string, number>;
  oxidizer: Record<string, number>;
  diluent: Record<string, number>;
};

/** each species in a group whose role it has: fuels burn, the oxidizer holds no fuel, diluents are inert */
function checkRoles(blends: Blends): Blends {
  for (const k of Object.keys(blends.fuel))
    if (speciesRole(k) !== 'fuel')
      fail({ code: 'design-conflict', kind: 'not-a-fuel', species: k }, { field: 'fuel' });
  for (const k of Object.keys(blends.oxidizer))
    if (speciesRole(k) === 'fuel')
      fail({ code: 'design-conflict', kind: 'fuel-in-oxidizer', species: k }, { field: 'oxidizer' });
  for (const k of Object.keys(blends.diluent))
    if (speciesRole(k) !== 'inert')
      fail({ code: 'design-conflict', kind: 'reactive-diluent', species: k }, { field: 'diluent' });
  return blends;
}

interface GroupArgs {
  readonly phi: number;
  readonly basis: DilutionBasis;
  /** mol oxidizer blend per mol fuel blend at this phi */
  readonly oxPerFuel: number;
  /** mol O2-equivalent per mol oxidizer blend */
  readonly supplyPerOx: number;
  readonly hasDiluent: boolean;
}

/** mole fractions of the fuel (F), oxidizer (X) and diluent (D) groups, from the dilution basis */
function groupFractions(a: GroupArgs): { F: number; X: number; D: number } {
  switch (a.basis.kind) {
    case 'dilution':
      return byDilution(a.basis.value, a);
    case 'diluent-ratio':
      return byDiluentRatio(a.basis.value, a);
    case 'fuel-fraction':
      return byFuelFraction(a.basis.value, a);
  }
}

function byDilution(xd: number, a: GroupArgs): { F: number; X: number; D: number } {
  if (!(xd >= 0 && xd < 1))
    fail(
      { code: 'out-of-range', what: 'dilution (diluent mole fraction)', value: xd, allowed: '[0, 1)' },
      { field: 'dilution' },
    );
  if (xd > 0 && !a.hasDiluent)
    fail({ code: 'design-missing', kind: 'diluent-for-dilution', dilution: xd }, { field: 'diluent' });
  const F = (1 - xd) / (1 + a.oxPerFuel);
  return { F, X: F * a.oxPerFuel, D: xd };
}

function byDiluentRatio(r: number, a: GroupArgs): { F: number; X: number; D: number } {
  if (!(r >= 0) || !Number.isFinite(r) || r > DILUENT_RATIO_MAX)
    fail(
      {
        code: 'out-of-range',
        what: 'diluent ratio (mol diluent per mol O2)',
        value: r,
        allowed:
          `0 to ${DILUENT_RATIO_MAX} (a larger ratio leaves less than 1 ppm of O2; ` +
          `give such a mixture by its fractions)`,
      },
      { field: 'diluent_ratio' },
    );
  if (r > 0 && !a.hasDiluent)
    fail({ code: 'design-missing', kind: 'diluent-for-ratio', ratio: r }, { field: 'diluent' });
  // per mol fuel: oxPerFuel mol oxidizer carrying oxPerFuel * supplyPerOx mol O2-equivalent
  const dPerFuel = r * a.oxPerFuel * a.supplyPerOx;
  const F = 1 / (1 + a.oxPerFuel + dPerFuel);
  return { F, X: F * a.oxPerFuel, D: F * dPerFuel };
}

function byFuelFraction(xf: number, a: GroupArgs): { F: number; X: number; D: number } {
  if (!(xf > 0 && xf < 1))
    fail(
      { code: 'out-of-range', what: 'fuel fraction', value: xf, allowed: '(0, 1)' },
      { field: 'fuel_fraction' },
    );
  const F = xf;
  const X = xf * a.oxPerFuel;
  let D = 1 - F - X;
  if (D < -1e-12) {
    fail(
      {
        code: 'design-conflict',
        kind: 'fuel-fraction-too-large',
        phi: a.phi,
        fuelFraction: xf,
        reactantFraction: F + X,
        maxFuelFraction: 1 / (1 + a.oxPerFuel),
      },
      { field: 'fuel_fraction' },
    );
  }
  D = Math.max(D, 0);
  if (D > 1e-12 && !a.hasDiluent)
    fail(
      { code: 'design-missing', kind: 'diluent-for-fuel-fraction', fuelFraction: xf, diluentFraction: D },
      { field: 'diluent' },
    );
  return { F, X, D };
}

/** sum and non-negativity check used by tests and by the planner's own guard */
export function isNormalised(x: Fractions, tol = 1e-9): boolean {
  let s = 0;
  for (const v of Object.values(x)) {
    if (v < 0) return false;
    s += v;
  }
  return Math.abs(s - 1) <= tol;
}
