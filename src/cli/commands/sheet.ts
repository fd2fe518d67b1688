/** `mixwright sheet`: the printable fill checklist. */
import { Option, type Command } from 'commander';
import { allStageFindings, worstSeverity } from '../../core/index.js';
import { buildSheetModel, type SheetModel } from '../../report/sheet-model.js';
import { joinSheets, stageSheets } from '../../report/two-stage-sheet.js';
import { sheetToHtml, sheetToMarkdown, sheetToText } from '../../report/sheet-render.js';
import { VERSION } from '../../version.js';
import { EXIT, ExitSignal, type Cli } from '../context.js';
import { addDesignOptions, titleOverrides, type DesignValues } from '../design-options.js';
import { checkOutputTarget, emitDocument, sheetFormat } from '../output.js';
import { planFrom, stateGaugeConversions } from '../plan-from.js';

type SheetOptions = DesignValues & {
  format?: string;
  output?: string;
  force?: boolean;
  paper: 'a4' | 'letter';
  batch?: string;
};

async function sheet(cli: Cli, recipeFile: string | undefined, o: SheetOptions): Promise<void> {
  const format = sheetFormat(o.format, o.output);
  if (o.output) checkOutputTarget(o.output, Boolean(o.force));
  const planned = planFrom(recipeFile, o, true);
  const { req, unit, meta, proposal } = planned;
  stateGaugeConversions(req, cli);
  // a premix in another tank proposed for a plan over its tolerance: among the findings, as `plan` says it
  const plan = proposal ? { ...planned.plan, findings: [...planned.plan.findings, proposal] } : planned.plan;
  // a two-stage plan prints one sheet per stage, stage 1 first (report/two-stage-sheet.ts)
  const models = stageSheets(
    plan,
    {
      recipe: req.recipe,
      overrides: titleOverrides(o),
      labName: req.lab.name,
      orderRecommended: req.orderRecommended,
      unit,
      batchId: o.batch,
      version: VERSION,
      paper: o.paper,
      // the lab's gauges and tank heights: the premix tank's check reading, each tank's mixing time
      lab: { gauges: req.input.gauges, reading: req.input.reading, tanks: req.lab.tanks },
      barometer: meta.barometer,
    },
    buildSheetModel,
  );
  const one = (model: SheetModel) =>
    format === 'md' ? sheetToMarkdown(model) : format === 'txt' ? sheetToText(model) : sheetToHtml(model);
  const render = () => joinSheets(models.map(one), format === 'md' || format === 'txt' ? format : 'html');
  await emitDocument(
    cli,
    { format, output: o.output, force: Boolean(o.force), example: 'fill.pdf' },
    render,
    () => joinSheets(models.map(sheetToHtml), 'html'),
  );
  if (worstSeverity(allStageFindings(plan)) === 'danger') throw new ExitSignal(EXIT.danger);
}

export function registerSheet(program: Command, cli: Cli): void {
  addDesignOptions(
    program
      .command('sheet')
      .description(
        'printable fill checklist: steps with targets and bands, checks, findings, and the fuel/O2/inert diagram',
      ),
  )
    .addOption(
      new Option('--format <format>', 'output format (default: from the extension of -o, else html)').choices(
        ['html', 'md', 'txt', 'pdf'],
      ),
    )
    .option('-o, --output <file>', 'write to this file (required for pdf); stdout otherwise')
    .option('--force', 'overwrite an existing output file')
    .addOption(
      new Option('--paper <size>', 'page size for html and pdf').choices(['a4', 'letter']).default('a4'),
    )
    .option('--batch <id>', 'batch id printed on the sheet (default: recipe id and date)')
    .action((recipeFile: string | undefined, o: SheetOptions) => sheet(cli, recipeFile, o));
}
