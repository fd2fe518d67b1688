import { readFileSync } from 'node:fs';
import { createProgram } from '../src/cli/program.js';

// fixtures are free-form JSON read by many tests; each test narrows what it reads
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function fixture<T = any>(name: string): T {
  return JSON.parse(readFileSync(new URL(`./fixtures/reference/${name}`, import.meta.url), 'utf8')) as T;
}

export const TORR = 101325 / 760;

/** invocations of runCli in this test file's process (the fuzz suites report it) */
export const cliRuns = { count: 0 };

/**
 * stderr's words without the 80-column layout the CLI gives them (cli/context.ts wrapForStderr): each
 * line break with the indentation after it is one space again, so a test reads a message whole whatever
 * the width broke (the "(error code: ...)" line joins the message before it)
 */
export const stderrWords = (shown: string): string => shown.replace(/\n {2,}/g, ' ');

/**
 * a stack frame on its own line ("    at fn (file.js:12:3)"): read in stderr as written (stderrShown),
 * where a wrapped sentence that goes on with "at ..." does not end in a line and column
 */
export const STACK_LINE = /^\s+at .*:\d+:\d+\)?$/m;

/**
 * run the CLI in-process; returns exit code and captured output: `stderr` as its words (stderrWords),
 * `stderrShown` as written to the terminal (wrapped at 80 columns)
 */
export async function runCli(
  argv: string[],
  isTTY = false,
): Promise<{ code: number; stdout: string; stderr: string; stderrShown: string }> {
  let stdout = '';
  let stderr = '';
  const { run } = createProgram({
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    isTTY,
  });
  cliRuns.count++;
  const code = await run(argv);
  return { code, stdout, stderr: stderrWords(stderr), stderrShown: stderr };
}

/** an option given or changed by designOptions; undefined leaves it out */
export type DesignChange = Record<string, string | undefined>;

/**
 * A design given on the command line, as `--name value` pairs in this order: CH4/O2 at phi 1 in 85 % Ar,
 * 10 L at 1000 Torr and 298.15 K, each option changed (in its place), left out (undefined) or added
 * (at the end) by `change`.
 */
export function designOptions(change: DesignChange = {}): string[] {
  const options: DesignChange = {
    fuel: 'CH4',
    oxidizer: 'O2',
    phi: '1',
    diluent: 'Ar',
    dilution: '0.85',
    volume: '10 L',
    pressure: '1000 Torr',
    temperature: '298.15 K',
    ...change,
  };
  return Object.entries(options).flatMap(([name, value]) =>
    value === undefined ? [] : [`--${name}`, value],
  );
}

/**
 * the text label of `label`'s output (its box, before the certificate) read as its lines: the edges taken
 * off and each wrapped row (hanging indent, four spaces or more: the label wraps at 76 columns) joined to
 * the row before it, so that a phrase or a clause is found whole, as a reader reads it
 */
/**
 * the text certificate of `label` (from its heading on) with each block's rows joined: the certificate
 * wraps its paragraphs at 80 columns, so a sentence is read whole (blocks are parted by empty lines;
 * every run of white space made one space)
 */
export function certificateFlowed(stdout: string): string {
  return sheetFlowed(stdout.slice(stdout.indexOf('BATCH CERTIFICATE')));
}

/**
 * a text fill sheet with each block's rows joined: the sheet wraps its prose at 80 columns
 * (report/sheet-render.ts), so a sentence is read whole (blocks are parted by empty lines; every run of
 * white space made one space; a tank label's continuation row, "  |     ...", joins its row)
 */
export function sheetFlowed(text: string): string {
  return text
    .replace(/\n {2}\| {5}/g, ' ')
    .split(/\n\s*\n/)
    .map((b) => b.replace(/\s+/g, ' ').trim())
    .join('\n');
}

export function labelBoxText(stdout: string): string {
  return stdout
    .slice(0, stdout.indexOf('BATCH CERTIFICATE'))
    .split('\n')
    .map((l) => (/^[#|] .* [#|]$/.test(l) ? l.slice(2, -2).trimEnd() : l))
    .reduce<string[]>((out, l) => {
      if (/^ {4}\S/.test(l) && out.length) out[out.length - 1] += ` ${l.trim()}`;
      else out.push(l);
      return out;
    }, [])
    .join('\n');
}
