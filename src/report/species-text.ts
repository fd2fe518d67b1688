/** mixwright species: the data browser, every value with its unit and source. */
import {
  cpMolar,
  getSource,
  getSpecies,
  hasThermo,
  lookup,
  PROPERTY_NAMES,
  SPECIES,
  speciesRole,
  thermoRangeK,
  virialModel,
  FUEL_SAFETY,
  INERT_K,
  LENNARD_JONES,
  FULLER_VOLUMES,
  saturationPressure,
  type PropertyValue,
} from '../core/index.js';
import { fixedSig, padTable } from './format.js';

function display(p: PropertyValue): { value: string; unit: string } {
  // SI inside; the browser shows the units the tables are usually read in
  switch (p.property) {
    case 'M':
      return { value: (p.value * 1000).toFixed(3), unit: 'g/mol' };
    case 'Pc':
      return { value: fixedSig(p.value / 1e6, 5), unit: 'MPa' };
    case 'Vc':
      return { value: fixedSig(p.value * 1e6, 5), unit: 'cm3/mol' };
    case 'Tc':
      return { value: fixedSig(p.value, 6), unit: 'K' };
    case 'omega':
      return { value: p.value.toFixed(4), unit: '-' };
    case 'dipole':
      return { value: p.value.toFixed(2), unit: 'D' };
  }
}

export function speciesList(): string {
  const rows: string[][] = [['key', 'name', 'role', 'M g/mol', 'Tc K', 'B(298 K) source']];
  for (const sp of SPECIES.values()) {
    const m = virialModel([sp.key], 298.15).entries[0];
    rows.push([sp.key, sp.name, speciesRole(sp.key), (lookup('M', sp.key).value * 1000).toFixed(3), fixedSig(sp.Tc, 6), m.method]);
  }
  return padTable(rows, [false, false, false, true, true, false]).join('\n') + '\n\n`mixwright species NAME` shows every property of one species with its source.\n';
}

export function speciesDetail(name: string, temperatureK: number): string {
  const sp = getSpecies(name);
  const out: string[] = [`${sp.key}  ${sp.name}${sp.aliases.length ? `  (also: ${sp.aliases.join(', ')})` : ''}`, ''];
  const rows: string[][] = [['property', 'value', 'unit', 'source', 'quality']];
  const cited = new Set<string>();
  for (const prop of PROPERTY_NAMES) {
    const p = lookup(prop, sp.key);
    const d = display(p);
    rows.push([p.label, d.value, d.unit, p.source.key, p.source.quality]);
    cited.add(p.source.key);
  }
  const v = virialModel([sp.key], temperatureK).entries[0];
  rows.push([`B at ${temperatureK.toFixed(2)} K`, fixedSig(v.valueM3PerMol * 1e6, 5), 'cm3/mol', v.source, getSource(v.source).quality]);
  cited.add(v.source);
  if (hasThermo(sp.key)) {
    const r = thermoRangeK(sp.key)!;
    if (temperatureK >= r.min * 0.9 && temperatureK <= r.max) {
      rows.push([`cp at ${temperatureK.toFixed(2)} K`, cpMolar(sp.key, temperatureK).toFixed(3), 'J/(mol K)', 'nasa-tm-4513', getSource('nasa-tm-4513').quality]);
      cited.add('nasa-tm-4513');
    }
  }
  const add = (label: string, value: string, unit: string, source: string) => {
    rows.push([label, value, unit, source, getSource(source).quality]);
    cited.add(source);
  };
  const fire = FUEL_SAFETY.get(sp.key);
  if (fire) {
    for (const v of fire.lflAir) add('LFL in air', (v.value * 100).toPrecision(3), 'vol %', v.source);
    for (const v of fire.uflAir) add('UFL in air', (v.value * 100).toPrecision(3), 'vol %', v.source);
    if (fire.uflO2) add('UFL in O2', (fire.uflO2.value * 100).toPrecision(3), 'vol %', fire.uflO2.source);
    if (fire.loc) add('limiting O2 concentration (N2)', (fire.loc.value * 100).toPrecision(3), 'vol %', fire.loc.source);
    if (fire.ait) add('autoignition temperature', fire.ait.value.toFixed(0), 'K', fire.ait.source);
  }
  const k = INERT_K.get(sp.key);
  if (k) add('N2-equivalence coefficient K', k.value.toFixed(2), '-', k.source);
  const ps = saturationPressure(sp.key, temperatureK);
  if (ps) add(`saturation pressure at ${temperatureK.toFixed(2)} K (${ps.method})`, fixedSig(ps.pressurePa / 1000, 4), 'kPa', ps.source);
  const lj = LENNARD_JONES.get(sp.key);
  if (lj) {
    add('Lennard-Jones sigma', lj.sigmaA.toFixed(3), 'angstrom', lj.source);
    add('Lennard-Jones epsilon/k', lj.epsK.toFixed(1), 'K', lj.source);
  }
  const fv = FULLER_VOLUMES.get(sp.key);
  if (fv) add('Fuller diffusion volume', fv.volume.toFixed(2), '-', fv.source);
  rows.push(['role in combustion', speciesRole(sp.key), '', 'c + h/4 - o/2 rule', '']);
  out.push(...padTable(rows, [false, true, false, false, false]));
  out.push('', 'Sources');
  for (const k of cited) out.push(`  ${k}: ${getSource(k).citation}`);
  return out.join('\n') + '\n';
}
