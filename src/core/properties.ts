/**
 * Every sourced property of one species, as rows the shells can show: SI values with
 * their units and sources. The data browser reads species data only through here and
 * lookup.ts.
 */
import { getSource, type Source } from './data/sources.js';
import { FUEL_SAFETY, INERT_K } from './data/safety-data.js';
import { FULLER_VOLUMES, LENNARD_JONES } from './data/transport-data.js';
import { getSpecies, lookup, PROPERTY_NAMES, type PropertyName } from './lookup.js';
import { virialModel } from './mixture-eos.js';
import { cpMolar, hasThermo, thermoRangeK } from './thermo.js';
import { saturationPressure } from './vapour-pressure.js';

export type PropertyId =
  | PropertyName
  | 'B'
  | 'cp'
  | 'lfl'
  | 'ufl'
  | 'uflO2'
  | 'loc'
  | 'ait'
  | 'K'
  | 'psat'
  | 'sigma'
  | 'epsK'
  | 'fullerV';

export interface PropertyRow {
  readonly id: PropertyId;
  readonly label: string;
  /** SI value (mole fractions for limits, m for sigma, K for epsilon/k) */
  readonly value: number;
  readonly unit: string;
  readonly source: Source;
}

export function speciesProperties(name: string, temperatureK: number): PropertyRow[] {
  const sp = getSpecies(name);
  const rows: PropertyRow[] = PROPERTY_NAMES.map((p) => {
    const v = lookup(p, sp.key);
    return { id: p, label: v.label, value: v.value, unit: v.unit, source: v.source };
  });
  const row = (id: PropertyId, label: string, value: number, unit: string, source: string) =>
    rows.push({ id, label, value, unit, source: getSource(source) });
  const v = virialModel([sp.key], temperatureK).entries[0];
  row('B', `second virial coefficient at ${temperatureK.toFixed(2)} K`, v.valueM3PerMol, 'm3/mol', v.source);
  const range = thermoRangeK(sp.key);
  if (hasThermo(sp.key) && range && temperatureK >= range.min * 0.9 && temperatureK <= range.max)
    row(
      'cp',
      `cp at ${temperatureK.toFixed(2)} K`,
      cpMolar(sp.key, temperatureK),
      'J/(mol K)',
      'nasa-tm-4513',
    );
  const fire = FUEL_SAFETY.get(sp.key);
  if (fire) {
    for (const x of fire.lflAir) row('lfl', 'LFL in air', x.value, 'mol/mol', x.source);
    for (const x of fire.uflAir) row('ufl', 'UFL in air', x.value, 'mol/mol', x.source);
    if (fire.uflO2) row('uflO2', 'UFL in O2', fire.uflO2.value, 'mol/mol', fire.uflO2.source);
    if (fire.loc) row('loc', 'limiting O2 concentration (N2)', fire.loc.value, 'mol/mol', fire.loc.source);
    const aits = fire.aitListed ?? (fire.ait ? [fire.ait] : []);
    for (const x of aits)
      row(
        'ait',
        aits.length > 1 && x === fire.ait
          ? 'autoignition temperature (lower, used)'
          : 'autoignition temperature',
        x.value,
        'K',
        x.source,
      );
  }
  const k = INERT_K.get(sp.key);
  if (k) row('K', 'N2-equivalence coefficient K', k.value, '1', k.source);
  const ps = saturationPressure(sp.key, temperatureK);
  if (ps)
    row(
      'psat',
      `saturation pressure at ${temperatureK.toFixed(2)} K (${ps.method})`,
      ps.pressurePa,
      'Pa',
      ps.source,
    );
  const lj = LENNARD_JONES.get(sp.key);
  if (lj) {
    row('sigma', 'Lennard-Jones sigma', lj.sigmaA * 1e-10, 'm', lj.source); // angstrom -> m
    row('epsK', 'Lennard-Jones epsilon/k', lj.epsK, 'K', lj.source);
  }
  const fv = FULLER_VOLUMES.get(sp.key);
  if (fv) row('fullerV', 'Fuller diffusion volume', fv.volume, '1', fv.source);
  return rows;
}
