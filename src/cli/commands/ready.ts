/** `mixwright ready`: mixing time and contamination of the filled tank. */
import type { Command } from 'commander';
import {
  contamination,
  drawDown,
  drawDownPressures,
  worstAgainstTolerance,
  mixingEstimate,
  ProblemError,
} from '../../core/index.js';
import { parseLength, parseQuantity } from '../../io/quantity.js';
import { readyToJson, readyToText } from '../../report/ready-report.js';
import { VERSION } from '../../version.js';
import type { Cli } from '../context.js';
import { addDesignOptions, type DesignValues } from '../design-options.js';
import { numberOption } from '../numbers.js';
import { planFrom, stateGaugeConversions } from '../plan-from.js';

type ReadyOptions = DesignValues & {
  json?: boolean;
  stirred?: boolean;
  height?: string;
  leak?: string;
  baseVacuum?: string;
  days: string;
};

/** the tank's height, leak-up rate and base vacuum: the option, else the lab profile, else refused */
function tankData(o: ReadyOptions, info: ReturnType<typeof planFrom>['req']['tankInfo']) {
  const heightM = o.height !== undefined ? parseLength(o.height, { field: '--height' }) : info?.heightM;
  if (heightM === undefined)
    throw new ProblemError({ code: 'tank-data-missing', quantity: 'height' }, { field: '--height' });
  if (!(heightM > 0))
    throw new ProblemError(
      { code: 'not-positive', what: 'tank height', value: heightM },
      { field: '--height' },
    );
  const leak =
    o.leak !== undefined ? parseQuantity(o.leak, 'pressure rate', { field: '--leak' }) : info?.leakRatePaPerS;
  if (leak === undefined)
    throw new ProblemError({ code: 'tank-data-missing', quantity: 'leak-rate' }, { field: '--leak' });
  const base =
    o.baseVacuum !== undefined
      ? parseQuantity(o.baseVacuum, 'pressure', { field: '--base-vacuum' })
      : info?.baseVacuumPa;
  if (base === undefined)
    throw new ProblemError(
      { code: 'tank-data-missing', quantity: 'base-vacuum' },
      { field: '--base-vacuum' },
    );
  return { heightM, leak, base };
}

function storageDays(text: string): number {
  const days = numberOption(text, '--days');
  if (!(days >= 0 && days <= 36500))
    throw new ProblemError(
      { code: 'out-of-range', what: 'days', value: days, text, allowed: '0 to 36500 (100 years)' },
      { field: '--days' },
    );
  return days;
}

function ready(cli: Cli, recipeFile: string | undefined, o: ReadyOptions): void {
  const { plan, req, meta } = planFrom(recipeFile, o);
  stateGaugeConversions(req, cli);
  const info = req.tankInfo;
  const { heightM, leak, base } = tankData(o, info);
  const notes: string[] = [];
  if (o.leak === undefined)
    notes.push('leak-up rate from the lab profile; measure it before each batch and give --leak');
  const days = storageDays(o.days);
  const stirred = Boolean(o.stirred ?? info?.stirred);
  const y = plan.composition;
  const atmosphericPa = req.input.reading.barometricPa;
  const c = contamination({
    composition: y,
    tankPressurePa: plan.final.pressurePa,
    baseVacuumPa: base,
    leakRatePaPerS: leak,
    days,
    atmosphericPa,
    air: req.lab.air,
  });
  // the batch as its experiments draw it down (the lab's reactor): below ambient air leaks in
  const count = meta.experiments?.count ?? 0;
  const drawn =
    req.sizing && count > 0
      ? drawDown({
          composition: y,
          pressuresPa: drawDownPressures(req.sizing, plan.final.pressurePa, count),
          residualFraction: c.residualFraction,
          leakRatePaPerS: leak,
          days,
          atmosphericPa,
          air: req.lab.air,
        })
      : undefined;
  // the air the last experiment draws, against the recipe's tolerance (computed: never assumed within)
  const tolerance = drawn && {
    relative: plan.tolerance.relative,
    absolute: plan.tolerance.absolute,
    evenly: worstAgainstTolerance(drawn.evenly.composition, plan.design, plan.tolerance),
    held: worstAgainstTolerance(drawn.heldAtLowest.composition, plan.design, plan.tolerance),
  };
  const report = {
    id: req.recipe.id,
    tank: plan.tank.id,
    heightM,
    pressurePa: plan.final.pressurePa,
    temperatureK: plan.temperatureK,
    mixing: mixingEstimate(y, plan.temperatureK, plan.final.pressurePa, heightM, stirred),
    contamination: c,
    atmosphericPa,
    drawDown: drawn,
    drawDownTolerance: tolerance,
    reactor: meta.experiments?.reactor.id,
    days,
    leakRatePaPerS: leak,
    baseVacuumPa: base,
    notes,
  };
  cli.out(o.json ? JSON.stringify(readyToJson(report, VERSION), null, 2) + '\n' : readyToText(report));
}

export function registerReady(program: Command, cli: Cli): void {
  addDesignOptions(
    program
      .command('ready')
      .description(
        'readiness of the filled tank: diffusion mixing time, and contamination from ' +
          'the base vacuum and leak-up over storage',
      ),
  )
    .option('--json', 'print one JSON object')
    .option('--stirred', 'the tank is stirred')
    .option('--height <length>', 'inside height of the tank, e.g. "0.8 m" (default: the lab profile)')
    .option(
      '--leak <rate>',
      'leak-up rate measured under vacuum, e.g. "2e-5 Torr/min" (default: the lab profile)',
    )
    .option(
      '--base-vacuum <pressure>',
      'pressure before the first fill, e.g. "1e-4 Torr" (default: the lab profile)',
    )
    .option('--days <n>', 'storage time for the contamination estimate', '14')
    .action((recipeFile: string | undefined, o: ReadyOptions) => ready(cli, recipeFile, o));
}
