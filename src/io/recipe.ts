/**
 * The recipe file (YAML): one mixture design and how to fill it. Validated with
 * zod; `mixwright schema recipe` prints the JSON Schema for editors.
 */
import { z } from './zod.js';

/** a quantity field: a string with a number and a unit (parsed later, with its line) */
export const quantity = (what: string, example: string) =>
  z.string().describe(`${what}: a number and a unit, e.g. "${example}"`);

/** "CH4", "CH4:0.8,C2H6:0.2" or { CH4: 0.8, C2H6: 0.2 } */
export const blendSchema = z
  .union([z.string().min(1), z.record(z.string(), z.number().min(0).max(1))])
  .describe(
    'one species ("Ar"), a list "Ar:0.5,He:0.5", or a map { Ar: 0.5, He: 0.5 } of fractions that sum to 1',
  );

const phiDesign = z
  .object({
    fuel: blendSchema,
    oxidizer: blendSchema.describe(
      'O2, air (composition from the lab profile), or a blend such as "O2:0.21,N2:0.79"',
    ),
    diluent: blendSchema.optional(),
    phi: z.number().describe('equivalence ratio, > 0'),
    dilution: z.number().optional().describe('diluent mole fraction of the final mixture, in [0, 1)'),
    diluent_ratio: z.number().optional().describe('mol diluent per mol O2 (O2-equivalent for N2O or NO)'),
    fuel_fraction: z.number().optional().describe('total fuel mole fraction, in (0, 1)'),
  })
  .strict();

const fractionsDesign = z
  .object({
    fractions: blendSchema.describe(
      'explicit mole fractions that sum to 1: a map { CH4: 0.05, O2: 0.10, Ar: ' +
        '0.85 } or a list "CH4:0.05,O2:0.10,Ar:0.85"',
    ),
  })
  .strict();

/** why a zero tolerance is refused, and what to give instead */
export const ZERO_TOLERANCE =
  'a tolerance of 0 allows no deviation of any mole fraction (no absolute floor is given): no ' +
  'reading can meet it, every fill band would be 0 and every re-check would fail; give the relative ' +
  'deviation you accept, such as 0.005 (0.5 %), or an absolute floor in tolerance.absolute';

export const recipeSchema = z
  .object({
    id: z.string().min(1).describe('short identifier of the design, used in batch ids and file names'),
    title: z.string().optional(),
    notes: z.string().optional(),
    lab: z
      .string()
      .optional()
      .describe('path of the lab profile (YAML), relative to this recipe; the embedded demo lab if absent'),
    tank: z.string().optional().describe('tank id from the lab profile'),
    volume: quantity('tank volume, if no tank is named or to override it', '10 L').optional(),
    rating: quantity(
      'maximum allowed working pressure of the tank given by volume, absolute or gauge with the barometer',
      '4 bar',
    ).optional(),
    working_fraction: z
      .number()
      .gt(0)
      .max(1)
      .optional()
      .describe('fraction of the rating used as the working limit of the tank given by volume; default 1'),
    mixture: z.union([phiDesign, fractionsDesign]),
    pressure: quantity('final tank pressure, absolute (or give experiments.count)', '1000 Torr').optional(),
    experiments: z
      .object({
        count: z
          .number()
          .int()
          .positive()
          .optional()
          .describe('size the batch for this many experiments (sets the final pressure)'),
        reactor: z.string().optional().describe('reactor id from the lab profile'),
        reactor_volume: quantity('reactor volume, instead of a lab reactor', '0.9 L').optional(),
        line_volume: quantity('line volume to the reactor', '0.05 L').optional(),
        fill_pressure: quantity('fill pressure of one experiment', '50 Torr').optional(),
      })
      .strict()
      .optional(),
    temperature: quantity('tank temperature during the fill', '22 degC'),
    order: z
      .array(
        z.union([
          z
            .string()
            .min(1)
            .describe('a species or cylinder id, optionally with the stop after @, e.g. "Ar@400 Torr"'),
          z
            .object({
              fill: z.string().min(1).describe('species or cylinder id'),
              until: quantity(
                'absolute tank reading to stop this charge at (not on the last charge of its gas)',
                '400 Torr',
              ).optional(),
            })
            .strict(),
        ]),
      )
      .optional()
      .describe(
        'fill order: species or cylinder ids; a gas named again is filled in another charge, and a ' +
          'charge that is not its gas\'s last may stop at an absolute reading ("Ar@400 Torr")',
      ),
    sources: z.array(z.string()).optional().describe('cylinder ids from the lab profile to fill from'),
    in_tank: z
      .object({
        composition: blendSchema,
        pressure: quantity('pressure of the gas already in the tank, absolute', '120 Torr'),
      })
      .strict()
      .optional()
      .describe('gas already in the tank (topping up an earlier batch)'),
    premix: z
      .object({
        tank: z
          .string()
          .optional()
          .describe('a second tank id from the lab profile: the premix is made there first'),
        log: z
          .string()
          .min(1)
          .optional()
          .describe(
            'the finished batch log of an existing premix tank (relative to this file): the batch draws from it',
          ),
        gases: z
          .array(z.string())
          .optional()
          .describe('the gases the premix carries besides the diluent, e.g. [O2]; default: chosen'),
        fraction: z
          .number()
          .gt(0)
          .lt(1)
          .optional()
          .describe('mole fraction of those gases in the premix, e.g. 0.04; default: chosen'),
        pressure: quantity('final pressure of the premix tank, absolute', '2800 Torr').optional(),
        order: z
          .enum(['minor-first', 'recommended'])
          .optional()
          .describe(
            "the premix's fill order: its minor gases first, or the order the safety review recommends",
          ),
      })
      .strict()
      .refine((p) => p.tank !== undefined || p.log !== undefined, {
        message:
          'give premix.tank (a second tank to make the premix in) or premix.log (the log of an existing premix tank)',
      })
      .optional()
      .describe(
        'two-stage preparation: a premix in a second tank first (tank), or an existing premix tank (log), ' +
          'then the batch from it',
      ),
    tolerance: z
      .object({
        relative: z
          .number()
          .min(0)
          .max(0.5)
          .optional()
          .describe('allowed relative deviation of each mole fraction; default 0.005'),
        absolute: z
          .number()
          .min(0)
          .max(0.1)
          .optional()
          .describe('floor on the allowed absolute deviation of a mole fraction; default 0'),
      })
      .strict()
      // a zero tolerance (no absolute floor either) allows no deviation: no reading can meet it
      .refine((t) => t.relative !== 0 || (t.absolute ?? 0) > 0, {
        path: ['relative'],
        message: ZERO_TOLERANCE,
      })
      .optional(),
  })
  .strict();

export type RecipeFile = z.infer<typeof recipeSchema>;
