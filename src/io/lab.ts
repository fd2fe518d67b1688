/**
 * The lab profile (YAML): tanks, gauges, cylinders, the barometer and the air
 * composition. An embedded demo profile (io/demo-lab.ts) serves when none is given.
 */
import { z } from './zod.js';
import { blendSchema, quantity } from './recipe.js';
import { PRESSURE_UNITS } from './quantity.js';

const tankSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().optional(),
    volume: quantity('internal volume (tank and the manifold up to its valve)', '10.0 L'),
    rating: quantity('maximum allowed working pressure, absolute', '4 bar').optional(),
    working_fraction: z
      .number()
      .gt(0)
      .max(1)
      .optional()
      .describe('fraction of the rating used as working limit; default 1'),
    height: quantity('inside height, for the diffusion mixing time', '0.45 m').optional(),
    stirred: z.boolean().optional().describe('true when the tank has a stirrer or fan'),
    base_vacuum: quantity('usual pressure before the first fill', '1e-4 Torr').optional(),
    leak_rate: quantity('usual leak-up rate under vacuum', '2e-5 Torr/min').optional(),
  })
  .strict();

const reactorSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().optional(),
    volume: quantity('reactor or driven-section volume filled per experiment', '0.9 L'),
    line_volume: quantity(
      'line volume from the tank valve to the reactor, filled and lost each time',
      '0.05 L',
    ).optional(),
    fill_pressure: quantity('fill pressure of one experiment, absolute', '50 Torr'),
    temperature: quantity('temperature of reactor and line at fill', '22 degC').optional(),
  })
  .strict();

const gaugeSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().optional(),
    reference: z
      .enum(['absolute', 'gauge'])
      .describe('absolute head, or gauge-referenced (reads above ambient)'),
    full_scale: quantity('full-scale reading', '1000 Torr'),
    minimum: quantity('lowest reading (compound gauges may read below ambient)', '0 Torr').optional(),
    accuracy_pct_reading: z.number().min(0).max(10).describe('accuracy, % of reading'),
    accuracy_pct_full_scale: z
      .number()
      .min(0)
      .max(10)
      .optional()
      .describe('accuracy, % of full scale; default 0'),
    resolution: quantity('display resolution', '0.01 Torr'),
    unit: z.enum(PRESSURE_UNITS).describe('unit the readout shows'),
    overpressure: quantity('pressure it survives without damage, absolute', '2000 Torr').optional(),
  })
  .strict();

const pureCylinderSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().optional(),
    species: z.string().min(1),
    purity: z.number().gt(0).max(1).optional().describe('mole fraction of the main gas from the certificate'),
    impurities: z.record(z.string(), z.number().min(0).max(1)).optional(),
    vapour: z.boolean().optional().describe('true for vapour drawn from a degassed liquid'),
    supply_pressure: quantity('delivery pressure of the regulator or vapour, absolute', '2 bar').optional(),
  })
  .strict();

const premixSchema = z
  .object({
    id: z.string().min(1),
    label: z.string().optional(),
    composition: z
      .record(z.string(), z.number().min(0).max(1))
      .describe('certified mole fractions, summing to 1'),
    supply_pressure: quantity('delivery pressure, absolute', '3 bar').optional(),
  })
  .strict();

export const labSchema = z
  .object({
    name: z.string().min(1),
    notes: z.string().optional(),
    barometer: z
      .object({
        pressure: quantity('barometric pressure to assume when none is given', '760 Torr'),
        uncertainty: quantity('standard uncertainty of the barometer', '0.3 Torr'),
      })
      .strict()
      .optional(),
    air: blendSchema.optional().describe('composition used for oxidizer "air"; default O2 0.21, N2 0.79'),
    thermometer: z
      .object({
        uncertainty: quantity('standard uncertainty of the tank thermometer', '0.3 K'),
        resolution: quantity('display resolution of the tank thermometer', '0.1 K').optional(),
        settling: quantity(
          'largest difference between the gas and the thermometer left at a reading after the ' +
            'settling time, used by the predicted uncertainty of a plan; default 0.05 K (our own assumption)',
          '0.05 K',
        ).optional(),
      })
      .strict()
      .optional(),
    coldest: quantity(
      'coldest temperature any wetted part (tank, lines, gauge heads) reaches, for the condensation check',
      '18 degC',
    ).optional(),
    warmest: quantity(
      'warmest temperature a filled tank reaches in storage or use (the room in summer, sunlight, a heated ' +
        'line), for the pressure check of the filled tank; default 25 degC (standard ambient, common practice)',
      '30 degC',
    ).optional(),
    condensation_fraction: z
      .number()
      .gt(0)
      .max(1)
      .optional()
      .describe(
        'largest allowed fraction of the saturation pressure at the coldest point; default 0.5 (common practice)',
      ),
    tanks: z.array(tankSchema).default([]),
    reactors: z.array(reactorSchema).default([]).describe('reactors or driven sections the batches serve'),
    fill_margin: z
      .number()
      .min(0)
      .max(5)
      .optional()
      .describe('the tank is used down to fill pressure x (1 + margin); default 0.1'),
    gauges: z.array(gaugeSchema).default([]),
    cylinders: z.array(z.union([pureCylinderSchema, premixSchema])).default([]),
  })
  .strict();

export type LabFile = z.infer<typeof labSchema>;
