import { describe, expect, it } from 'vitest';
import type { Option } from 'commander';
import { z } from 'zod';
import { createProgram } from '../../src/cli/program.js';
import {
  attributeOf,
  DESIGN_OPTIONS,
  mergeIntoRecipe,
  OPTION_OF,
  optionName,
} from '../../src/cli/design-options.js';
import { recipeSchema } from '../../src/io/recipe.js';
import { runCli } from '../helpers.js';

const RECIPE = 'recipes/ch4-o2-ar-phi1.yaml';

/** a value each option accepts as typed, by the recipe value it becomes */
const SAMPLE: Record<string, string> = {
  number: '0.25',
  list: 'CH4, O2,Ar',
  text: 'sample text',
};
const expected = (parse: string | undefined, text: string): unknown =>
  parse === 'number' ? Number(text) : parse === 'list' ? ['CH4', 'O2', 'Ar'] : text;

/** the node at a dotted path of a JSON Schema (through the variants of a union), or undefined */
function schemaAt(schema: unknown, path: readonly string[]): unknown {
  if (path.length === 0) return schema;
  const s = schema as { properties?: Record<string, unknown>; anyOf?: unknown[]; oneOf?: unknown[] };
  const direct = s.properties?.[path[0]];
  if (direct) return schemaAt(direct, path.slice(1));
  for (const v of [...(s.anyOf ?? []), ...(s.oneOf ?? [])]) {
    const found = schemaAt(v, path);
    if (found) return found;
  }
  return undefined;
}

function hasPath(obj: unknown, path: readonly string[]): boolean {
  let cur = obj;
  for (const k of path) {
    if (typeof cur !== 'object' || cur === null || !(k in cur)) return false;
    cur = (cur as Record<string, unknown>)[k];
  }
  return true;
}

describe('the design options are declared once (src/cli/design-options.ts)', () => {
  it('every table entry is a commander option of plan, sheet, ready and fill, with its help text and choices', () => {
    const { program } = createProgram({ stdout: { write: () => 0 }, stderr: { write: () => 0 } });
    for (const name of ['plan', 'sheet', 'ready', 'fill']) {
      const cmd = program.commands.find((c) => c.name() === name)!;
      const options = cmd.options as readonly Option[];
      for (const d of DESIGN_OPTIONS) {
        const o = options.find((x) => x.long === optionName(d));
        expect(o, `${name} ${d.flag}`).toBeDefined();
        expect(o!.flags).toBe(d.flag);
        expect(o!.description).toBe(d.help);
        expect(o!.attributeName()).toBe(attributeOf(d));
        if (d.choices) expect(o!.argChoices).toEqual([...d.choices]);
      }
    }
  });

  it('every entry with a recipe key merges into the recipe at that key, which the recipe format (its JSON Schema) names', () => {
    const json = z.toJSONSchema(recipeSchema, { io: 'input' });
    for (const d of DESIGN_OPTIONS.filter((x) => x.recipe)) {
      const text = SAMPLE[d.parse ?? 'text'];
      const { recipe, overridden } = mergeIntoRecipe({ id: 'x' }, { [attributeOf(d)]: text });
      const path = d.recipe!.split('.');
      let value: unknown = recipe;
      for (const k of path) value = (value as Record<string, unknown>)[k];
      expect(value, d.flag).toEqual(expected(d.parse, text));
      expect(overridden.has(d.recipe!)).toBe(true);
      expect(schemaAt(json, path), `${d.recipe} in the recipe schema`).toBeDefined();
      expect(OPTION_OF[d.recipe!]).toBe(optionName(d));
    }
  });

  it('the three options the plan reads directly are not recipe keys: --lab, --barometer, --units', () => {
    expect(DESIGN_OPTIONS.filter((d) => !d.recipe).map(optionName)).toEqual([
      '--lab',
      '--barometer',
      '--units',
    ]);
  });

  it('every entry is named in plan --json, except --units (the JSON is SI) and --working-fraction (its findings are)', async () => {
    const r = await runCli(['plan', RECIPE, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const d of DESIGN_OPTIONS) {
      if (d.json === null) continue;
      expect(hasPath(j, d.json.split('.')), `${d.flag} -> ${d.json}`).toBe(true);
    }
    expect(DESIGN_OPTIONS.filter((d) => d.json === null).map(optionName)).toEqual([
      '--working-fraction',
      '--units',
    ]);
  });

  it('an option reported in JSON carries its value there: --phi, --pressure, --experiments', async () => {
    const phi = JSON.parse((await runCli(['plan', RECIPE, '--phi', '0.5', '--json'])).stdout);
    expect(phi.mixture.phi).toBe(0.5);
    const p = JSON.parse((await runCli(['plan', RECIPE, '--pressure', '100 kPa', '--json'])).stdout);
    expect(p.final.pressure_Pa).toBeCloseTo(1e5, 6);
    const n = JSON.parse((await runCli(['plan', RECIPE, '--experiments', '3', '--json'])).stdout);
    expect(n.experiments.sized_for).toBe(3);
  });

  it('a dilution measure replaces the recipe file’s other measure; --experiments replaces its pressure; --fractions its phi design', () => {
    const base = {
      id: 'b',
      mixture: { fuel: 'CH4', oxidizer: 'O2', phi: 1, diluent: 'Ar', dilution: 0.9 },
      pressure: '1 bar',
    };
    const a = mergeIntoRecipe(base, { diluentRatio: '3' }).recipe as typeof base & {
      mixture: Record<string, unknown>;
    };
    expect(a.mixture).toEqual({ fuel: 'CH4', oxidizer: 'O2', phi: 1, diluent: 'Ar', diluent_ratio: 3 });
    const b = mergeIntoRecipe(base, { experiments: '4' }).recipe;
    expect(b.pressure).toBeUndefined();
    expect(b.experiments).toEqual({ count: 4 });
    const c = mergeIntoRecipe(base, { fractions: 'CH4:0.1,O2:0.2,Ar:0.7' }).recipe;
    expect(c.mixture).toEqual({ fractions: 'CH4:0.1,O2:0.2,Ar:0.7' });
    expect(base.mixture.dilution).toBe(0.9); // the base is not changed
  });

  it('--fractions with a phi option is refused, naming both', async () => {
    const r = await runCli(['plan', RECIPE, '--fractions', 'CH4:0.1,O2:0.2,Ar:0.7', '--phi', '1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(error code: options-exclusive)');
    expect(r.stderr).toContain('give either --fractions, or --fuel/--oxidizer/--phi');
    expect(r.stderr).toContain('got --fractions with --phi');
  });
});

describe('a value option given twice is refused (exit 2), naming the option and both values', () => {
  it('--phi 1 --phi 0.5', async () => {
    const r = await runCli(['plan', RECIPE, '--phi', '1', '--phi', '0.5']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('--phi is given twice ("1" and "0.5"); give it once');
    expect(r.stderr).toContain('(error code: option-repeated)');
  });
  it('-o and --output are one option; --pressure=a --pressure b; check --trials twice', async () => {
    const o = await runCli(['sheet', RECIPE, '-o', 'a.md', '--output', 'b.md']);
    expect(o.code).toBe(2);
    expect(o.stderr).toContain('--output is given twice ("a.md" and "b.md")');
    const p = await runCli(['plan', RECIPE, '--pressure=1 bar', '--pressure', '2 bar']);
    expect(p.code).toBe(2);
    expect(p.stderr).toContain('--pressure is given twice ("1 bar" and "2 bar")');
    const t = await runCli([
      'check',
      'batches/demo-ch4-phi1-ar98.jsonl',
      '--trials',
      '100000',
      '--trials',
      '1e6',
    ]);
    expect(t.code).toBe(2);
    expect(t.stderr).toContain('--trials is given twice ("100000" and "1e6")');
  });
  it('the same value twice is still refused (it is a slip all the same); so is a flag given twice', async () => {
    const same = await runCli(['plan', RECIPE, '--tank', 'MT-1', '--tank', 'MT-1']);
    expect(same.code).toBe(2);
    expect(same.stderr).toContain('--tank is given twice');
    // README: a repeated option is a usage error, flags included, in every command that shares the parser
    for (const argv of [
      ['plan', RECIPE, '--json', '--json'],
      ['ready', RECIPE, '--json', '--json'],
      ['check', 'batches/demo-ch4-phi1-ar98.jsonl', '--json', '--json'],
      ['sheet', RECIPE, '--force', '--force', '-o', 'never-written.md'],
    ]) {
      const flags = await runCli(argv);
      expect(flags.code, argv.join(' ')).toBe(2);
      expect(flags.stderr).toContain(`${argv[2]} is given twice; give it once`);
      expect(flags.stderr).toContain('(error code: option-repeated)');
    }
  });
  it("a value option followed by another of its command's options is a missing value, not a file named so", async () => {
    const r = await runCli(['check', '--recipe', '--json', 'readings/ch4-phi1-ar98.csv']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--recipe needs a file; got the option --json');
    expect(r.stderr).toContain('(error code: option-value-missing)');
    const t = await runCli(['plan', RECIPE, '--tank', '--json']);
    expect(t.code).toBe(2);
    expect(t.stderr).toContain('--tank needs an id; got the option --json');
    // a value that only looks like an option is the value's own to judge (here refused as no pressure)
    const b = await runCli(['plan', RECIPE, '--barometer', '-5']);
    expect(b.stderr).not.toContain('option-value-missing');
  });
  it('a default value is not a first occurrence: --days given once is accepted', async () => {
    const r = await runCli(['ready', 'recipes/ng-blend-air.yaml', '--days', '7', '--height', '0.8 m']);
    expect(r.code, r.stderr).toBe(0);
  });
});

describe('volume and pressure are checked by the core and pointed back at the option or line', () => {
  it('a negative --volume: the core refuses it, the message names --volume and what was typed', async () => {
    const r = await runCli(['plan', RECIPE, '--volume', '-10 L']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--volume: tank volume must be greater than zero (got "-10 L")');
  });
  it('also when the pressure comes from --experiments (sizing refuses the volume first)', async () => {
    const r = await runCli(['plan', RECIPE, '--experiments', '3', '--volume', '0 L']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--volume: tank volume must be greater than zero (got "0 L")');
    expect(r.stderr).toContain('(error code: not-positive)');
  });
  it('a zero final pressure names --pressure and the text', async () => {
    const r = await runCli(['plan', RECIPE, '--pressure', '0 Torr']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--pressure: final pressure must be greater than zero (got "0 Torr")');
  });
});
