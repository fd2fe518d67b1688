/**
 * The command on the process's streams, as the bundle's entry exports it: dist/mixwright.mjs (the
 * loader, scripts/cli-loader.mjs) calls `startCli`, and the build's code-cache run
 * (scripts/code-cache.mjs) calls `createProgram` with streams of its own.
 */
import { createProgram } from './program.js';

export { createProgram };

/** run the command line `argv` on stdout and stderr; the exit code */
export function startCli(argv: readonly string[]): Promise<number> {
  const { run } = createProgram({
    stdout: process.stdout,
    stderr: process.stderr,
    isTTY: Boolean(process.stdin.isTTY && process.stdout.isTTY),
  });
  return run(argv);
}
