/**
 * One lookup per property. The shells read species data only through here.
 */
import { SPECIES, type SpeciesRecord } from './data/species.js';
import { getSource, type Source } from './data/sources.js';
import { ELEMENTS } from './data/elements.js';
import { molarMassKgPerMol } from './formula.js';
import { fail } from './problems.js';

export function speciesKeys(): string[] {
  return [...SPECIES.keys()];
}

function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => [
    i,
    ...new Array<number>(b.length).fill(0),
  ]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++)
    for (let j = 1; j <= b.length; j++)
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  return d[a.length][b.length];
}

/**
 * The one ranking of species for a typed name: the "did you mean" list of an unknown species
 * and the wizard's Tab completion both take it, so Tab completes to the first suggestion.
 * Order: an exact (case-insensitive) key, name or alias; then species whose key, name or alias
 * starts with the text, the shortest completion first; then the rest within an edit distance
 * of max(2, half the text's length), the closest first. Ties keep the species table's order.
 * rankSpecies('eth') -> ['C2H6', 'C2H4', 'C2H2', 'C2H5OH', ...]
 */
export function rankSpecies(name: string): string[] {
  const q = name.trim().toLowerCase();
  if (!q) return [];
  const limit = Math.max(2, Math.ceil(q.length / 2));
  const scored: { key: string; tier: number; d: number; order: number }[] = [];
  let order = 0;
  for (const sp of SPECIES.values()) {
    const names = [sp.key, sp.name, ...sp.aliases].map((n) => n.toLowerCase());
    order++;
    if (names.includes(q)) scored.push({ key: sp.key, tier: 0, d: 0, order });
    else if (names.some((n) => n.startsWith(q)))
      scored.push({
        key: sp.key,
        tier: 1,
        d: Math.min(...names.filter((n) => n.startsWith(q)).map((n) => n.length - q.length)),
        order,
      });
    else {
      const d = Math.min(...names.map((n) => editDistance(q, n)));
      if (d <= limit) scored.push({ key: sp.key, tier: 2, d, order });
    }
  }
  scored.sort((x, y) => x.tier - y.tier || x.d - y.d || x.order - y.order);
  return scored.map((s) => s.key);
}

/** closest known keys, for "did you mean": the head of rankSpecies */
export function suggestSpecies(name: string, max = 3): string[] {
  return rankSpecies(name).slice(0, max);
}

/** exact key first; else a unique case-insensitive match of key, name or alias; else undefined */
export function resolveSpeciesKey(name: string): string | undefined {
  if (SPECIES.has(name)) return name;
  const q = name.trim().toLowerCase();
  const hits = [...SPECIES.values()].filter(
    (sp) =>
      sp.key.toLowerCase() === q ||
      sp.name.toLowerCase() === q ||
      sp.aliases.some((a) => a.toLowerCase() === q),
  );
  return hits.length === 1 ? hits[0].key : undefined;
}

/** the longest species name looked up: the longest key, name or alias is far shorter; a longer text is a paste error */
export const MAX_SPECIES_NAME = 64;

export function getSpecies(name: string): SpeciesRecord {
  if (name.length > MAX_SPECIES_NAME)
    return fail({
      code: 'name-too-long',
      what: 'species name',
      start: name.slice(0, 24),
      length: name.length,
      limit: MAX_SPECIES_NAME,
    });
  const key = resolveSpeciesKey(name);
  const sp = key ? SPECIES.get(key) : undefined;
  if (!sp) return fail({ code: 'unknown-species', name, suggestions: suggestSpecies(name) });
  return sp;
}

export type PropertyName = 'M' | 'Tc' | 'Pc' | 'Vc' | 'omega' | 'dipole';

export interface PropertyValue {
  readonly property: PropertyName;
  readonly label: string;
  readonly value: number;
  /** SI unit of value */
  readonly unit: string;
  readonly source: Source;
}

const LABELS: Record<PropertyName, string> = {
  M: 'molar mass',
  Tc: 'critical temperature',
  Pc: 'critical pressure',
  Vc: 'critical molar volume',
  omega: 'acentric factor',
  dipole: 'dipole moment',
};

/** lookup('Tc', 'CH4') -> { value: 190.564, unit: 'K', source: ... } */
export function lookup(property: PropertyName, species: string): PropertyValue {
  const sp = getSpecies(species);
  const make = (value: number, unit: string, sourceKey: string): PropertyValue => ({
    property,
    label: LABELS[property],
    value,
    unit,
    source: getSource(sourceKey),
  });
  switch (property) {
    case 'M': {
      const srcs = Object.keys(sp.elements).map((e) => ELEMENTS.get(e)?.source ?? 'iupac-2021');
      const worst = srcs.includes('iupac-2021-memory') ? 'iupac-2021-memory' : 'iupac-2021';
      return make(molarMassKgPerMol(sp.elements), 'kg/mol', worst);
    }
    case 'Tc':
      return make(sp.Tc, 'K', sp.criticalSource);
    case 'Pc':
      return make(sp.Pc, 'Pa', sp.criticalSource);
    case 'Vc':
      return make(sp.Vc, 'm3/mol', sp.criticalSource);
    case 'omega':
      return make(sp.omega, '1', sp.criticalSource);
    case 'dipole':
      return make(sp.dipole, 'D', sp.dipoleSource);
  }
}

export const PROPERTY_NAMES: readonly PropertyName[] = ['M', 'Tc', 'Pc', 'Vc', 'omega', 'dipole'];
