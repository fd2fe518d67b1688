/** `mixwright species`, `schema` and `demo-lab`: the data and formats the tool reads, printed. */
import type { Command } from 'commander';
import { z } from '../../io/zod.js';
import { ProblemError } from '../../core/index.js';
import { DEMO_LAB_YAML } from '../../io/demo-lab.js';
import { labSchema } from '../../io/lab.js';
import { parseQuantity } from '../../io/quantity.js';
import { recipeSchema } from '../../io/recipe.js';
import { speciesDetail, speciesList } from '../../report/species-text.js';
import type { Cli } from '../context.js';

export function registerSpecies(program: Command, cli: Cli): void {
  program
    .command('species')
    .description('species data: every property with its value, unit and source')
    .argument('[name]', 'species key or name (e.g. CH4, n-C7H16, toluene); all species if absent')
    .option('--temperature <quantity>', 'temperature for B(T) and cp', '298.15 K')
    .action((name: string | undefined, o: { temperature: string }) => {
      const T = parseQuantity(o.temperature, 'temperature', { field: '--temperature' });
      cli.out(name ? speciesDetail(name, T) : speciesList());
    });
}

export function registerSchema(program: Command, cli: Cli): void {
  program
    .command('schema')
    .description('JSON Schema of a file format, for editors')
    .argument('<format>', 'recipe or lab')
    .action((format: string) => {
      const schemas: Record<string, z.ZodType> = { recipe: recipeSchema, lab: labSchema };
      const s = Object.prototype.hasOwnProperty.call(schemas, format) ? schemas[format] : undefined;
      if (!s)
        throw new ProblemError(
          { code: 'unknown-schema', name: format, choices: Object.keys(schemas) },
          { field: 'schema' },
        );
      cli.out(JSON.stringify(z.toJSONSchema(s, { io: 'input' }), null, 2) + '\n');
    });
}

export function registerDemoLab(program: Command, cli: Cli): void {
  program
    .command('demo-lab')
    .description('print the embedded demo lab profile (YAML), a starting point for your own')
    .action(() => {
      cli.out(DEMO_LAB_YAML);
    });
}
