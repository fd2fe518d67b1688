/**
 * An option given twice is refused, naming it (and, for a value option, both values): commander
 * would keep the last value silently, and a design typed with two values for one quantity is a
 * slip to be corrected, not guessed. A flag without a value (--json, --force) given twice is
 * refused the same way: the README says a repeated option is a usage error, and one rule for
 * every option is easier to trust than one with exceptions. A value option whose value is one
 * of the command's own options (`--recipe --json`) is refused as a missing value: the parser
 * would take `--json` as the file name and drop the flag.
 */
import type { Command, Option } from 'commander';
import { ProblemError } from '../core/index.js';

/** options meant to take several values: none today (a list option takes one comma-separated value) */
const REPEATABLE: ReadonlySet<string> = new Set<string>();

/** what a value option takes, from its argument's name in the flags (`--recipe <file>`: "a file") */
const NEEDS: Readonly<Record<string, string>> = {
  file: 'a file',
  log: 'a log file',
  n: 'a number',
  number: 'a number',
  quantity: 'a quantity',
  id: 'an id',
  list: 'a list',
};

function needsOf(option: Option): string {
  const arg = /[<[]([^>\]]+)[>\]]/.exec(option.flags)?.[1];
  return (arg && NEEDS[arg]) ?? (arg ? `a value (${arg})` : 'a value');
}

/** the option names a command knows (its own, the program's, and help) */
function namesOf(c: Command, program: Command): ReadonlySet<string> {
  const names = new Set<string>(['--help', '-h']);
  for (const o of [...(c.options as readonly Option[]), ...(program.options as readonly Option[])]) {
    if (o.long) names.add(o.long);
    if (o.short) names.add(o.short);
  }
  return names;
}

/** the option a value is, if it is one of the command's (`--json`, `--tank=T1`), else undefined */
function optionIn(value: unknown, names: ReadonlySet<string>): string | undefined {
  if (typeof value !== 'string' || !value.startsWith('-')) return undefined;
  const name = value.split('=')[0];
  return names.has(name) ? name : undefined;
}

function watch(
  c: Command,
  option: Option,
  seen: Map<Option, string | undefined>,
  names: ReadonlySet<string>,
) {
  const flag = option.long ?? option.short ?? option.flags;
  const takesValue = option.required || option.optional;
  c.on(`option:${option.name()}`, (value: unknown) => {
    const asOption = takesValue ? optionIn(value, names) : undefined;
    if (asOption !== undefined)
      throw new ProblemError(
        { code: 'option-value-missing', option: flag, needs: needsOf(option), got: asOption },
        { field: flag },
      );
    const shown = takesValue && typeof value === 'string' ? value : undefined;
    if (!seen.has(option)) {
      seen.set(option, shown);
      return;
    }
    const first = seen.get(option);
    throw new ProblemError(
      takesValue
        ? { code: 'option-repeated', option: flag, first: first ?? '', second: shown ?? '' }
        : { code: 'option-repeated', option: flag },
      { field: flag },
    );
  });
}

/** refuse a repeated option in every command of the program; returns the reset for the next parse */
export function refuseRepeatedOptions(program: Command): () => void {
  const seen = new Map<Option, string | undefined>();
  for (const c of [program, ...program.commands]) {
    const names = namesOf(c, program);
    for (const option of c.options as readonly Option[]) {
      if (option.variadic || REPEATABLE.has(option.long ?? '')) continue;
      // --version and --help end the parse themselves
      if (c === program) continue;
      watch(c, option, seen, names);
    }
  }
  return () => seen.clear();
}
