/** `mixwright wizard` (and bare `mixwright` in a terminal): the design built step by step. */
import type { Command } from 'commander';
import { ProblemError } from '../../core/index.js';
import { VERSION } from '../../version.js';
import { fromTui, type Cli } from '../context.js';
import { fillEnded } from '../fill-ended.js';
import { loadTui } from '../load-tui.js';

export function registerWizard(program: Command, cli: Cli): void {
  program
    .command('wizard')
    .description(
      'build a mixture design step by step, with the plan and findings updating ' +
        'live (interactive; also what bare `mixwright` opens)',
    )
    .option('--lab <file>', 'lab profile (YAML); the embedded demo lab if absent')
    .action(async (o: { lab?: string }) => {
      if (!cli.isTTY)
        throw new ProblemError({ code: 'needs-terminal', command: 'wizard' }, { field: 'wizard' });
      const tui = await loadTui();
      const r = await fromTui(() => tui.runWizard({ version: VERSION, labFile: o.lab }));
      if (r) fillEnded(cli, r, r.logFile);
    });
}
