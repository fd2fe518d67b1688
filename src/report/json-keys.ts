/**
 * The key style of every JSON output: snake_case, with the SI unit as the last part of
 * the name in its own spelling (`pressure_Pa`, `temperature_K`, `velocity_m_per_s`).
 * The core names its fields in camelCase with the unit last (`uncertaintyPa`, `flameK`);
 * jsonKey turns one into the other where a core object goes out whole (a finding's numbers).
 */

/** camelCase unit endings of core field names and their spelling in a JSON key */
const UNIT_ENDINGS: readonly (readonly [RegExp, string])[] = [
  [/MPerS$/, 'm_per_s'],
  [/M3PerMol$/, 'm3_per_mol'],
  [/M6PerMol2$/, 'm6_per_mol2'],
  [/MolPerM3$/, 'mol_per_m3'],
  [/Pa$/, 'Pa'],
  [/K$/, 'K'],
  [/Mol$/, 'mol'],
  [/M3$/, 'm3'],
  [/Kg$/, 'kg'],
];

/** "uncertaintyPa" -> "uncertainty_Pa", "cjVelocityMPerS" -> "cj_velocity_m_per_s", "inLine" -> "in_line" */
export function jsonKey(name: string): string {
  let stem = name;
  let unit = '';
  for (const [re, spelled] of UNIT_ENDINGS) {
    // a unit ending counts only after a lower-case letter or digit ("topPa", not a bare "Pa")
    const m = re.exec(name);
    if (m && m.index > 0 && /[a-z0-9]/.test(name[m.index - 1])) {
      stem = name.slice(0, m.index);
      unit = spelled;
      break;
    }
  }
  const snake = stem.replace(/([a-z0-9])([A-Z])/g, '$1_$2').toLowerCase();
  return unit ? `${snake}_${unit}` : snake;
}

/** a copy of a plain object with every key (at every depth) in the JSON style */
export function withJsonKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(withJsonKeys);
  if (value === null || typeof value !== 'object') return value;
  return Object.fromEntries(Object.entries(value).map(([k, v]) => [jsonKey(k), withJsonKeys(v)]));
}
