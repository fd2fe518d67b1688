/** `mixwright plan`: the fill plan of a mixture, as text or JSON. */
import type { Command } from 'commander';
import { allStageFindings, worstSeverity } from '../../core/index.js';
import { planToJson } from '../../report/plan-json.js';
import { planToText } from '../../report/plan-text.js';
import { EXIT, ExitSignal, type Cli } from '../context.js';
import { addDesignOptions, type DesignValues } from '../design-options.js';
import { planFrom } from '../plan-from.js';

export function registerPlan(program: Command, cli: Cli): void {
  addDesignOptions(
    program
      .command('plan')
      .description('fill plan of a mixture: real-gas target readings, gauges, tolerance bands and findings'),
  )
    .option('--json', 'print one JSON object (SI units in the key names)')
    .action(async (recipeFile: string | undefined, o: DesignValues & { json?: boolean }) => {
      const { plan, unit, meta } = planFrom(recipeFile, o, true);
      if (o.json) cli.out(JSON.stringify(planToJson(plan, meta, unit), null, 2) + '\n');
      else cli.out(planToText(plan, meta, unit));
      if (worstSeverity(allStageFindings(plan)) === 'danger') throw new ExitSignal(EXIT.danger);
    });
}
