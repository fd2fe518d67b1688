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

/** run the CLI in-process; returns exit code and captured output */
export async function runCli(
  argv: string[],
  isTTY = false,
): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const { run } = createProgram({
    stdout: { write: (s: string) => (stdout += s) },
    stderr: { write: (s: string) => (stderr += s) },
    isTTY,
  });
  cliRuns.count++;
  const code = await run(argv);
  return { code, stdout, stderr };
}
