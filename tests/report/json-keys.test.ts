import { describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { runCli } from '../helpers.js';
import { jsonKey, withJsonKeys } from '../../src/report/json-keys.js';
import { planToJson } from '../../src/report/plan-json.js';
import { splitPlan } from '../split-plan.js';

// the house rule for JSON keys: snake_case, the SI unit in the name, the unit in its own
// spelling as a part of its own (`pressure_Pa`, `u_Pa`, `D_fuller_m2_per_s`)

/** capitalised parts a key may hold: SI unit symbols, the virial and diffusion symbols, O2 */
const CAPITALISED = new Set(['Pa', 'K', 'B', 'C', 'D', 'O2']);
/** units that are not SI (nor accepted for use with it): never a part of a key */
const NOT_SI = new Set(['torr', 'Torr', 'kPa', 'bar', 'mbar', 'psi', 'atm', 'degC', 'degF', 'L', 'mL', 'g']);
/** the last part of a key that names its unit */
const UNIT_LAST = /_(Pa|K|m|m2|m3|kg|mol|s|Pa_per_s|m_per_s|m2_per_s|m3_per_mol|m6_per_mol2|mol_per_m3)$/;
/** a number under one of these words is a dimensional quantity, so its key must end in its unit */
const QUANTITY_WORD = /(^|_)(pressure|temperature|volume|mass|height|length|density|velocity)(_|$)/;
/** objects whose keys are species names (composition maps), not field names */
const SPECIES_MAPS = new Set([
  'composition',
  'filled_composition',
  'composition_after',
  'source_composition',
  'fuel',
  'oxidizer',
  'diluent',
]);

/** every offence against the key style in one JSON document, as "path: why" */
function keyOffences(doc: unknown, path = '$', speciesMap = false): string[] {
  if (Array.isArray(doc)) return doc.flatMap((x, i) => keyOffences(x, `${path}[${i}]`));
  if (doc === null || typeof doc !== 'object') return [];
  const out: string[] = [];
  for (const [k, v] of Object.entries(doc)) {
    const at = `${path}.${k}`;
    if (!speciesMap) {
      const parts = k.split('_');
      for (const p of parts) {
        if (NOT_SI.has(p)) out.push(`${at}: the unit ${p} is not SI`);
        else if (!/^[a-z0-9]+$/.test(p) && !CAPITALISED.has(p)) out.push(`${at}: "${p}" is not snake_case`);
      }
      if (typeof v === 'number' && QUANTITY_WORD.test(k) && !UNIT_LAST.test(k))
        out.push(`${at}: a ${QUANTITY_WORD.exec(k)![2]} without its SI unit in the name`);
    }
    out.push(...keyOffences(v, at, !speciesMap && SPECIES_MAPS.has(k) && typeof v === 'object'));
  }
  return out;
}

async function jsonOf(argv: string[]): Promise<unknown> {
  const r = await runCli(argv);
  expect(r.stdout.length, `${argv.join(' ')}: ${r.stderr}`).toBeGreaterThan(0);
  return JSON.parse(r.stdout);
}

describe('JSON key style', () => {
  it('jsonKey turns core field names into snake_case with the unit last in its own spelling', () => {
    expect(jsonKey('uncertaintyPa')).toBe('uncertainty_Pa');
    expect(jsonKey('topPa')).toBe('top_Pa');
    expect(jsonKey('limitFlameK')).toBe('limit_flame_K');
    expect(jsonKey('cjVelocityMPerS')).toBe('cj_velocity_m_per_s');
    expect(jsonKey('graphiteMol')).toBe('graphite_mol');
    expect(jsonKey('fuelOverLfl')).toBe('fuel_over_lfl');
    expect(jsonKey('inLine')).toBe('in_line');
    expect(jsonKey('code')).toBe('code');
    expect(withJsonKeys({ phiLow: 1, list: [{ detonableFromPa: 2 }] })).toEqual({
      phi_low: 1,
      list: [{ detonable_from_Pa: 2 }],
    });
  });

  it('the walker finds camelCase, non-SI units and a pressure without its unit', () => {
    expect(keyOffences({ uncertaintyPa: 1, target_Torr: 2, pressure: 3, composition: { CH4: 0.1 } })).toEqual(
      [
        '$.uncertaintyPa: "uncertaintyPa" is not snake_case',
        '$.target_Torr: the unit Torr is not SI',
        '$.pressure: a pressure without its SI unit in the name',
      ],
    );
  });

  it('plan --json and ready --json of every demo recipe keep the style', async () => {
    const recipes = readdirSync('recipes').filter((f) => f.endsWith('.yaml'));
    expect(recipes.length).toBeGreaterThanOrEqual(4);
    for (const r of recipes) {
      const plan = await jsonOf(['plan', `recipes/${r}`, '--json']);
      expect((plan as { findings: unknown[] }).findings.length).toBeGreaterThan(0);
      expect(keyOffences(plan), `plan ${r}`).toEqual([]);
      expect(keyOffences(await jsonOf(['ready', `recipes/${r}`, '--json'])), `ready ${r}`).toEqual([]);
    }
  });

  it('plan --json of a split plan keeps the style: each step its charge {number, of}', () => {
    const { plan } = splitPlan();
    const doc = planToJson(plan, {
      recipeId: 'x',
      labName: 'demo',
      orderRecommended: false,
      version: 't',
    }) as {
      steps: { charge: { number: number; of: number } }[];
    };
    expect(keyOffences(doc)).toEqual([]);
    expect(doc.steps.map((x) => `${x.charge.number}/${x.charge.of}`)).toEqual(['1/1', '1/2', '1/1', '2/2']);
  });

  it('check --json of every demo batch log, the folder and the demo CSV keep the style', async () => {
    const logs = readdirSync('batches').filter((f) => f.endsWith('.jsonl'));
    expect(logs.length).toBeGreaterThanOrEqual(2);
    for (const l of logs) {
      const doc = await jsonOf(['check', `batches/${l}`, '--json', '--trials', '100000']);
      expect((doc as { deviations: unknown[] }).deviations.length).toBeGreaterThan(0);
      expect(keyOffences(doc), l).toEqual([]);
    }
    expect(keyOffences(await jsonOf(['check', 'batches/', '--json'])), 'folder').toEqual([]);
    const csv = ['check', 'readings/ch4-phi1-ar98.csv', '--recipe', 'recipes/ch4-o2-ar-phi1.yaml'];
    expect(keyOffences(await jsonOf([...csv, '--json', '--trials', '100000'])), 'csv').toEqual([]);
  });
});
