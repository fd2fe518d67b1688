/** mixwright species: the data browser, every value with its unit and source. */
import {
  blendLimits,
  DETONATION_LIMITS,
  FUEL_SAFETY,
  getSource,
  getSpecies,
  lookup,
  referenceCrossPartners,
  speciesKeys,
  VIRIAL_TABLE_RANGE_K,
  speciesProperties,
  speciesRole,
  virialModel,
  type PropertyRow,
} from '../core/index.js';
import { fixedSig, padTable } from './format.js';

/** the units the tables are usually read in (SI inside) */
function display(p: PropertyRow): { value: string; unit: string } {
  switch (p.id) {
    case 'M':
      return { value: (p.value * 1000).toFixed(3), unit: 'g/mol' };
    case 'Pc':
      return { value: fixedSig(p.value / 1e6, 5), unit: 'MPa' };
    case 'Vc':
      return { value: fixedSig(p.value * 1e6, 5), unit: 'cm3/mol' };
    case 'B':
      return { value: fixedSig(p.value * 1e6, 5), unit: 'cm3/mol' };
    case 'Tc':
      return { value: fixedSig(p.value, 6), unit: 'K' };
    case 'omega':
      return { value: p.value.toFixed(4), unit: '-' };
    case 'dipole':
      return { value: p.value.toFixed(2), unit: 'D' };
    case 'cp':
      return { value: p.value.toFixed(3), unit: 'J/(mol K)' };
    case 'lfl':
    case 'ufl':
    case 'uflO2':
    case 'loc':
      return { value: (p.value * 100).toPrecision(3), unit: 'vol %' };
    case 'ait':
      return { value: p.value.toFixed(0), unit: 'K' };
    case 'K':
      return { value: p.value.toFixed(2), unit: '-' };
    case 'psat':
      return { value: fixedSig(p.value / 1000, 4), unit: 'kPa' };
    case 'sigma':
      return { value: (p.value * 1e10).toFixed(3), unit: 'angstrom' };
    case 'epsK':
      return { value: p.value.toFixed(1), unit: 'K' };
    case 'fullerV':
      return { value: p.value.toFixed(2), unit: '-' };
  }
}

export function speciesList(): string {
  const rows: string[][] = [['key', 'name', 'role', 'M g/mol', 'Tc K', 'B(298 K) source']];
  for (const key of speciesKeys()) {
    const sp = getSpecies(key);
    const m = virialModel([key], 298.15).entries[0];
    rows.push([
      key,
      sp.name,
      speciesRole(key),
      (lookup('M', key).value * 1000).toFixed(3),
      fixedSig(lookup('Tc', key).value, 6),
      m.method,
    ]);
  }
  return (
    padTable(rows, [false, false, false, true, true, false]).join('\n') +
    '\n\n`mixwright species NAME` shows every property of one species with its source.\n'
  );
}

export function speciesDetail(name: string, temperatureK: number): string {
  const sp = getSpecies(name);
  const out: string[] = [
    `${sp.key}  ${sp.name}${sp.aliases.length ? `  (also: ${sp.aliases.join(', ')})` : ''}`,
    '',
  ];
  const rows: string[][] = [['property', 'value', 'unit', 'source', 'quality']];
  const cited = new Set<string>();
  for (const p of speciesProperties(sp.key, temperatureK)) {
    const d = display(p);
    rows.push([p.label, d.value, d.unit, p.source.key, p.source.quality]);
    cited.add(p.source.key);
  }
  rows.push(['role in combustion', speciesRole(sp.key), '', 'c + h/4 - o/2 rule', '']);
  out.push(...padTable(rows, [false, true, false, false, false]));
  // fire data that can raise a warning or danger: say which is still from memory or estimated
  const gating = new Set(['lfl', 'ufl', 'uflO2', 'loc', 'ait']);
  const recalled = speciesProperties(sp.key, temperatureK).filter(
    (p) => gating.has(p.id) && p.source.quality === 'from-memory',
  );
  const estimated = FUEL_SAFETY.has(sp.key) ? blendLimits({ [sp.key]: 1 }, 298.15, 101325).estimated : [];
  if (recalled.length || estimated.length) {
    out.push('');
    if (recalled.length) {
      const list = recalled
        .map((p) => `${p.label} ${display(p).value} ${display(p).unit} (${p.source.key})`)
        .join('; ');
      out.push(
        `Still from memory (not read in a stored copy of the source; check it before ` +
          `relying on it): ${list}. The safety review uses these values.`,
      );
    }
    if (estimated.length)
      out.push(
        `Estimated, no published value on file: ${estimated.join('; ')}. The safety ` +
          `review uses a conservative estimate and says so.`,
      );
  }
  // detonation limits gate the detonable-state finding: list them with their source and quality
  const det = DETONATION_LIMITS.filter((r) => r.fuel === sp.key);
  if (FUEL_SAFETY.has(sp.key)) {
    out.push('');
    if (det.length) {
      const recalledDet = det.filter(
        (r) =>
          getSource(r.low.source).quality === 'from-memory' ||
          getSource(r.high.source).quality === 'from-memory',
      );
      const pctOf = (v: number) => (v * 100).toPrecision(3);
      const limits = det
        .map((r) => `in ${r.oxidizer} ${pctOf(r.low.value)}-${pctOf(r.high.value)} vol % (${r.low.source})`)
        .join('; ');
      const recalled = recalledDet.length
        ? ' These are from memory (check before relying on them); the safety review uses them.'
        : '';
      out.push(`Detonation limits: ${limits}.${recalled}`);
      for (const r of det) {
        cited.add(r.low.source);
        cited.add(r.high.source);
      }
    }
    if (!det.some((r) => r.oxidizer === 'air'))
      out.push(
        'No detonation limits in air on file: a flammable state with an oxidizer ' +
          'about as rich in O2 as air, or with less than 50 % N2-equivalent inert, ' +
          'counts as detonable (our conservative rule).',
      );
  }
  const partners = referenceCrossPartners(sp.key);
  out.push('');
  if (partners.length) {
    const names = partners.map((p) => `${p.species}${p.withC ? '' : ' (B only)'}`).join(', ');
    out.push(
      `Cross virial coefficients B and C from reference mixture models (coolprop-8-mixture, ` +
        `${VIRIAL_TABLE_RANGE_K.min}-${VIRIAL_TABLE_RANGE_K.max} K) with: ${names}. ` +
        `With every other species: Prausnitz combining rules (prausnitz-1999).`,
    );
    cited.add('coolprop-8-mixture');
  } else {
    out.push(
      'Cross virial coefficients with every other species: Prausnitz combining ' +
        'rules (prausnitz-1999); no reference mixture model qualifies for this species.',
    );
  }
  cited.add('prausnitz-1999');
  out.push('', 'Sources');
  for (const k of cited) out.push(`  ${k}: ${getSource(k).citation}`);
  return out.join('\n') + '\n';
}
