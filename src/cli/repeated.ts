/**
 * A value option given twice (`--phi 1 --phi 0.5`) is refused, naming the option and both
 * values: commander would keep the last one silently, and a design typed with two values
 * for one quantity is a slip to be corrected, not guessed. Flags without a value (--json,
 * --force) may repeat: saying them twice means the same.
 */
import type { Command, Option } from 'commander';
import { ProblemError } from '../core/index.js';

/** options meant to take several values: none today (a list option takes one comma-separated value) */
const REPEATABLE: ReadonlySet<string> = new Set<string>();

function watch(c: Command, option: Option, seen: Map<Option, string>): void {
  const flag = option.long ?? option.short ?? option.flags;
  c.on(`option:${option.name()}`, (value: string) => {
    const first = seen.get(option);
    if (first === undefined) {
      seen.set(option, value);
      return;
    }
    throw new ProblemError({ code: 'option-repeated', option: flag, first, second: value }, { field: flag });
  });
}

/** refuse a repeated value option in every command of the program; returns the reset for the next parse */
export function refuseRepeatedOptions(program: Command): () => void {
  const seen = new Map<Option, string>();
  for (const c of [program, ...program.commands]) {
    for (const option of c.options as readonly Option[]) {
      const takesValue = option.required || option.optional;
      if (takesValue && !option.variadic && !REPEATABLE.has(option.long ?? '')) watch(c, option, seen);
    }
  }
  return () => seen.clear();
}
