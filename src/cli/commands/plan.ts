/** `mixwright plan`: the fill plan of a mixture, as text or JSON. */
import type { Command } from 'commander';
import { allStageFindings, worstSeverity } from '../../core/index.js';
import { planToJson } from '../../report/plan-json.js';
import { planToText } from '../../report/plan-text.js';
import { proposalJson } from '../../report/two-stage-text.js';
import { EXIT, ExitSignal, type Cli } from '../context.js';
import { addDesignOptions, type DesignValues } from '../design-options.js';
import { planFrom, stateGaugeConversions } from '../plan-from.js';

export function registerPlan(program: Command, cli: Cli): void {
  addDesignOptions(
    program
      .command('plan')
      .description('fill plan of a mixture: real-gas target readings, gauges, tolerance bands and findings'),
  )
    .option('--json', 'print one JSON object (SI units in the key names)')
    .action(async (recipeFile: string | undefined, o: DesignValues & { json?: boolean }) => {
      const { plan, req, unit, meta, proposal } = planFrom(recipeFile, o, true);
      stateGaugeConversions(req, cli);
      // a proposed premix: among the text's (and the sheet's) findings, its own key in the JSON
      if (o.json) {
        const json = { ...planToJson(plan, meta, unit), two_stage_proposal: proposalJson(proposal, unit) };
        cli.out(JSON.stringify(json, null, 2) + '\n');
      } else
        cli.out(
          planToText(proposal ? { ...plan, findings: [...plan.findings, proposal] } : plan, meta, unit),
        );
      if (worstSeverity(allStageFindings(plan)) === 'danger') throw new ExitSignal(EXIT.danger);
    });
}
